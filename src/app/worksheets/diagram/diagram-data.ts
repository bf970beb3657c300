import type { DiagramData, WithDiagram } from '@shared/diagram';
import type { ComplexValue, StatementReport } from '@shared/evaluation';

export type DiagramStatement = StatementReport & WithDiagram;

/**
 * What to draw for a statement: exactly the core's diagram, or null when it sends none or one
 * with no plane to draw (see panelsOf). Nothing is made up here (no default contour, cut or eigenvalues from the steps):
 * the client draws only what the report gives.
 */
export function diagramFor(st: DiagramStatement | null): DiagramData | null {
  const d = st?.diagram;
  if (!d) return null;
  // Nothing to draw but the real line (a check along the real contour): no plane of its own.
  return panelsOf(d).length ? d : null;
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

/** One labelled panel of the diagram: a plane with what belongs to it. */
export interface DiagramPanel {
  key: 'variable' | 'parameter' | 'spectral';
  title: string;
  /** What the panel shows, in a short phrase (the point the eigenvalues belong to, for the spectral plane). */
  subtitle: string;
  data: DiagramData;
}

const NONE: DiagramData = { contours: [], sectors: [], cuts: [], paths: [], tracks: [], eigenvalues: [] };

/**
 * The diagram's planes, each drawn on its own axes: the integration variable's plane (contours,
 * swept sectors), the parameter plane (continuation paths with their numbered events), and the
 * plane of the eigenvalues of A and det A (tracks, the principal cut, the eigenvalues at the point
 * the record names). The real line alone is not drawn as a panel of its own.
 */
export function panelsOf(d: DiagramData | null): DiagramPanel[] {
  if (!d) return [];
  const panels: DiagramPanel[] = [];
  const rotatedContours = d.contours.some((c) => c.role !== 'real');
  if (d.sectors.length || rotatedContours) {
    panels.push({
      key: 'variable',
      title: d.sectors.length > 1 ? 'Plane of the integration variables' : 'Plane of the integration variable',
      subtitle: 'contours of integration and the sector swept by the rotation',
      data: { ...NONE, contours: d.contours, sectors: d.sectors },
    });
  }
  for (const p of d.paths) {
    panels.push({
      key: 'parameter',
      title: `Parameter plane of ${p.parameter}`,
      subtitle: 'the path, and what it meets numbered as the steps of the record',
      data: { ...NONE, paths: [p] },
    });
  }
  if (d.tracks.length || d.eigenvalues.length) {
    const det = d.tracks.some((t) => t.of === 'det');
    panels.push({
      key: 'spectral',
      title: det ? 'Plane of the eigenvalues of A and of det A' : 'Plane of the eigenvalues of A',
      subtitle: d.eigenvaluesAt ? `eigenvalues at ${d.eigenvaluesAt}` : d.tracks.length ? 'eigenvalues at the end of the path' : 'eigenvalues of A',
      data: { ...NONE, cuts: d.cuts, tracks: d.tracks, eigenvalues: d.eigenvalues, ...(d.eigenvaluesAt ? { eigenvaluesAt: d.eigenvaluesAt } : {}) },
    });
  }
  return panels;
}

/** Marks closer than `radius` (in screen units) drawn as one, with how many it holds. */
export function cluster<T>(items: readonly T[], at: (t: T) => [number, number], radius: number): { items: T[]; x: number; y: number }[] {
  const groups: { items: T[]; x: number; y: number }[] = [];
  for (const it of items) {
    const [x, y] = at(it);
    const g = groups.find((q) => Math.hypot(q.x - x, q.y - y) < radius);
    if (g) g.items.push(it);
    else groups.push({ items: [it], x, y });
  }
  return groups;
}
