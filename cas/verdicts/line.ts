/**
 * The declared domain of one real parameter cut into cells by the real roots of some
 * polynomials: open intervals, each with a rational sample point, and the roots between
 * them. On each open interval every one of the polynomials keeps its sign, so a verdict
 * that depends only on those signs is decided for the whole interval by deciding it at
 * the sample point, exactly; at a root it is decided with exact signs at the root.
 * This is how "proved on the whole declared domain" is reached for one parameter.
 *
 * Example: cellsOf([t^2 - 3], 'real') gives (-inf, -sqrt(3)), -sqrt(3), (-sqrt(3), sqrt(3)),
 * sqrt(3), (sqrt(3), inf).
 */
import type { Domain, ExactNumber } from '../../shared/evaluation.js';
import { q, qadd, qdiv, qint, qcmp, qsign, qToNumber, type Q } from '../exact/q.js';
import {
  compareRoots, isolateRoots, recognizeRoot, rootToNumber, signAtRoot, usign, uIsZero, type RealRoot, type UPoly,
} from '../exact/univariate.js';
import { parseExpression } from '../lang/parse.js';
import { toLatex } from '../expr/print.js';

export type Cell =
  | { kind: 'interval'; lo: RealRoot | null; hi: RealRoot | null; sample: Q }
  | { kind: 'point'; root: RealRoot };

/** The open line of a domain: its ends (null for infinite) and whether 0 is left out. */
export function lineOf(domain: Domain): { lo: Q | null; hi: Q | null; without: Q | null } {
  switch (domain) {
    case 'positive': return { lo: qint(0), hi: null, without: null };
    case 'negative': return { lo: null, hi: qint(0), without: null };
    case 'nonzero': return { lo: null, hi: null, without: qint(0) };
    default: return { lo: null, hi: null, without: null };
  }
}

const exactRoot = (x: Q): RealRoot => ({ poly: [-x.n, x.d], lo: x, hi: x });

/** A rational strictly between two cell ends (null = infinite), simple where possible. */
function between(lo: RealRoot | null, hi: RealRoot | null): Q {
  if (!lo && !hi) return qint(1);
  if (!lo) { const h = hi!; const b = qToNumber(h.lo); return qint(Math.floor(Math.min(b, qToNumber(h.lo)) - 1)); }
  if (!hi) { const b = qToNumber(lo.hi); return qint(Math.ceil(Math.max(b, qToNumber(lo.hi)) + 1)); }
  // both finite: the simplest dyadic strictly inside
  let a = lo; let b = hi;
  for (let k = 0; k < 200; k++) {
    if (qcmp(a.hi, b.lo) <= 0) {
      const m = qdiv(qadd(a.hi, b.lo), qint(2));
      // a.hi may be the root itself when exact; keep strictly inside
      const inside = (x: Q) => sideOf(x, lo) > 0 && sideOf(x, hi) < 0;
      if (inside(m)) return m;
    }
    a = bisect(a); b = bisect(b);
  }
  throw new Error('no rational found between two roots');
}

function bisect(r: RealRoot): RealRoot {
  if (qcmp(r.lo, r.hi) === 0) return r;
  const m = qdiv(qadd(r.lo, r.hi), qint(2));
  const sm = usign(r.poly, m);
  if (sm === 0) return { poly: r.poly, lo: m, hi: m };
  return sm === usign(r.poly, r.lo) ? { poly: r.poly, lo: m, hi: r.hi } : { poly: r.poly, lo: r.lo, hi: m };
}

/** Sign of x - root. */
function sideOf(x: Q, r: RealRoot): number {
  if (qcmp(r.lo, r.hi) === 0) return qcmp(x, r.lo);
  return -compareRoots(r, exactRoot(x));
}

/** The cells of the domain cut by the real roots of `polys` (zero polynomials are ignored). */
export function cellsOf(polys: readonly UPoly[], domain: Domain): Cell[] {
  const { lo, hi, without } = lineOf(domain);
  const roots: RealRoot[] = [];
  for (const p of polys) {
    if (uIsZero(p) || p.length === 1) continue;
    for (const r of isolateRoots(p, lo ?? -Infinity, hi ?? Infinity)) {
      if (!roots.some((s) => compareRoots(s, r) === 0)) roots.push(r);
    }
  }
  if (without && !roots.some((s) => compareRoots(s, exactRoot(without)) === 0)) roots.push(exactRoot(without));
  roots.sort(compareRoots);
  const cells: Cell[] = [];
  const ends = [lo ? exactRoot(lo) : null, ...roots, hi ? exactRoot(hi) : null];
  for (let k = 0; k + 1 < ends.length; k++) {
    cells.push({ kind: 'interval', lo: ends[k]!, hi: ends[k + 1]!, sample: between(ends[k]!, ends[k + 1]!) });
    if (k + 1 < ends.length - 1) {
      const r = ends[k + 1]!;
      // 0 of a nonzero domain is not in the domain: no cell there
      if (!(without && qcmp(r.lo, r.hi) === 0 && qcmp(r.lo, without) === 0)) cells.push({ kind: 'point', root: r });
    }
  }
  return cells;
}

/** Exact sign of p on a cell. */
export function signOn(p: UPoly, cell: Cell): -1 | 0 | 1 {
  if (uIsZero(p)) return 0;
  return cell.kind === 'interval' ? usign(p, cell.sample) : signAtRoot(p, cell.root);
}

/** A root as an exact number for the record: text, LaTeX and decimal. */
export function rootNumber(r: RealRoot, name = 't'): ExactNumber {
  const named = recognizeRoot(r, name);
  let latex = `\\text{${named.text}}`;
  if (named.kind !== 'algebraic') {
    try { latex = toLatex(parseExpression(named.text)); } catch { /* keep the text form */ }
  }
  return { text: named.text, latex, approx: named.kind === 'rational' ? named.decimal : rootToNumber(r) };
}

export const isRationalRoot = (r: RealRoot) => qcmp(r.lo, r.hi) === 0;
export { q, qsign };
