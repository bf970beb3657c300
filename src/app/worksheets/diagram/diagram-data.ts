import type { DiagramData, WithDiagram } from '@shared/diagram';
import type { ComplexValue, StatementReport } from '@shared/evaluation';

export type DiagramStatement = StatementReport & WithDiagram;

/** Statement kinds that have something to draw. */
const DRAWN = new Set<StatementReport['kind']>(['integral', 'rotate', 'continue', 'compare', 'verify']);

/**
 * What to draw for a statement: the core's diagram when it sends one; otherwise, for an
 * integral, the real contour, the principal cut of the square root and the eigenvalues of A
 * taken from the step record. Null when there is nothing to draw.
 */
export function diagramFor(st: DiagramStatement | null): DiagramData | null {
  if (!st || !DRAWN.has(st.kind)) return null;
  const given = st.diagram;
  const eigenvalues = given?.eigenvalues?.length
    ? given.eigenvalues
    : (st.steps.find((s) => s.eigenvalues?.length)?.eigenvalues ?? []);
  const data: DiagramData = {
    contours: given?.contours ?? [],
    sectors: given?.sectors ?? [],
    cuts: given?.cuts ?? [],
    paths: given?.paths ?? [],
    tracks: given?.tracks ?? [],
    eigenvalues,
  };
  if (!data.contours.length && st.kind === 'integral') {
    data.contours = [{ label: 'Real contour', role: 'real', points: [{ re: -1, im: 0 }, { re: 1, im: 0 }] }];
  }
  if (!data.cuts.length && (eigenvalues.length || data.contours.length || data.paths.length || data.tracks.length)) {
    data.cuts = [{ label: 'Principal cut of √', points: [{ re: 0, im: 0 }, { re: -Infinity, im: 0 }] }];
  }
  const empty =
    !data.contours.length && !data.sectors.length && !data.paths.length && !data.tracks.length && !eigenvalues.length;
  return empty ? null : data;
}

export function formatComplex(z: ComplexValue, digits = 3): string {
  const re = round(z.re, digits);
  const im = round(z.im, digits);
  if (im === 0) return `${re}`.replace(/^-/, '−');
  if (re === 0) return `${im === 1 ? '' : im === -1 ? '−' : im}i`.replace(/^-/, '−');
  const sign = im < 0 ? '−' : '+';
  const abs = Math.abs(im);
  return `${re} ${sign} ${abs === 1 ? '' : abs}i`.replace(/^-/, '−');
}

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
