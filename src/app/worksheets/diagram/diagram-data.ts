import type { DiagramData, WithDiagram } from '@shared/diagram';
import type { ComplexValue, StatementReport } from '@shared/evaluation';

export type DiagramStatement = StatementReport & WithDiagram;

/**
 * What to draw for a statement: exactly the core's diagram, or null when it sends none or an
 * empty one. Nothing is made up here (no default contour, cut or eigenvalues from the steps):
 * the client draws only what the report gives.
 */
export function diagramFor(st: DiagramStatement | null): DiagramData | null {
  const d = st?.diagram;
  if (!d) return null;
  const empty = !d.contours.length && !d.sectors.length && !d.paths.length && !d.tracks.length && !d.eigenvalues.length && !d.cuts.length;
  return empty ? null : d;
}

/** The statement whose plane is drawn: the selected one, or the nearest drawable one before it. */
export function drawnStatement(selected: StatementReport | null, list: readonly StatementReport[]): StatementReport | null {
  if (selected && diagramFor(selected)) return selected;
  const before = list.filter((s) => (selected ? s.line <= selected.line : true) && diagramFor(s));
  return before[before.length - 1] ?? list.find((s) => diagramFor(s)) ?? null;
}

export function formatComplex(z: ComplexValue, digits = 3): string {
  const re = round(z.re, digits);
  const im = round(z.im, digits);
  if (im === 0) return minus(`${re}`);
  if (re === 0) return minus(`${im === 1 ? '' : im === -1 ? '−' : im}i`);
  const sign = im < 0 ? '−' : '+';
  const abs = Math.abs(im);
  return minus(`${re} ${sign} ${abs === 1 ? '' : abs}i`);
}

/** A leading minus sign set as the typographic one. */
const minus = (s: string) => (s.startsWith('-') ? `−${s.slice(1)}` : s);

function round(x: number, digits: number): number {
  const r = Number(x.toPrecision(digits));
  return Object.is(r, -0) ? 0 : r;
}

const EVENT_WORDS: Record<string, string> = {
  'branch-point': 'Branch point',
  'cut-crossed': 'Cut crossed',
  'convergence-lost': 'Real contour stops converging',
  'contour-rotated': 'Contour rotated',
  sheet: 'Sheet',
  end: 'End point',
};

export function eventWord(kind: string): string {
  return EVENT_WORDS[kind] ?? kind;
}
