/**
 * Exact sign tables of several one-variable polynomials over an interval: the basis of
 * verdicts that must hold on a whole one-parameter family.
 *
 *   signsOnIntervals([upolyFromCoeffs([-100, 0, 1])], -Infinity, Infinity)
 *   // roots -10, 10; intervals (-oo,-10) sign +, (-10,10) sign -, (10,oo) sign +
 *
 * The roots are those of the square-free part of the product, so roots shared by
 * several polynomials appear once; each root is then re-attached to the lowest-degree
 * input that vanishes there (its isolating interval stays valid for a factor).
 */
import {
  type UPoly, type RealRoot, type Ext, usqfree, umul, isolateRoots, signAtRoot, usign, bisectRoot, isExact, qFromFinite,
} from './univariate.js';
import { type Q, q, qint, qcmp, qfloor } from './q.js';

export type Sign = -1 | 0 | 1;
export interface RootSigns {
  root: RealRoot;
  /** indices of the input polynomials that vanish at the root */
  of: number[];
  signs: Sign[];
}
export interface IntervalSigns {
  /** the open interval's ends: the bound given, or the neighbouring root */
  lo: Ext | RealRoot;
  hi: Ext | RealRoot;
  /** a rational point strictly inside */
  sample: Q;
  signs: Sign[];
}
export interface SignTable { roots: RootSigns[]; intervals: IntervalSigns[] }

/**
 * The distinct real roots of the nonzero polys in the open (lo, hi), in increasing order,
 * with each poly's exact sign at each root and on each open interval between them
 * (zero polynomials have sign 0 everywhere).
 */
export function signsOnIntervals(polys: readonly UPoly[], lo: Ext = -Infinity, hi: Ext = Infinity): SignTable {
  const sq = polys.map((p) => (p.length > 1 ? usqfree(p) : null));
  const prod = sq.reduce<UPoly>((a, p) => (p ? umul(a, p) : a), [1n]);
  const roots = prod.length > 1 ? isolateRoots(prod, lo, hi) : [];
  const table: RootSigns[] = roots.map((r) => {
    const signs = polys.map((p) => signAtRoot(p, r));
    const of = signs.flatMap((s, i) => (s === 0 && polys[i]!.length ? [i] : []));
    // name the root by the smallest input that vanishes there
    let best = r;
    for (const i of of) {
      const f = sq[i]!;
      if (f.length < best.poly.length) best = { poly: f, lo: r.lo, hi: r.hi };
    }
    return { root: best, of, signs };
  });
  const bounds: (Ext | RealRoot)[] = [lo, ...table.map((t) => t.root), hi];
  const intervals: IntervalSigns[] = [];
  for (let k = 0; k + 1 < bounds.length; k++) {
    const { sample, left, right } = pointBetween(bounds[k]!, bounds[k + 1]!);
    // keep the refined roots so later samples need no repeated bisection
    if (k > 0) { bounds[k] = left; table[k - 1]!.root = left as RealRoot; }
    if (k + 1 < bounds.length - 1) { bounds[k + 1] = right; table[k]!.root = right as RealRoot; }
    intervals.push({ lo: bounds[k]!, hi: bounds[k + 1]!, sample, signs: polys.map((p) => usign(p, sample)) });
  }
  return { roots: table, intervals };
}

const isRoot = (x: Ext | RealRoot): x is RealRoot => typeof x === 'object' && 'poly' in x;

/**
 * A rational strictly between a and b (a < b), bisecting root intervals until one exists.
 * Ends of an open isolating interval are not the root, so they may serve as the point.
 */
function pointBetween(a: Ext | RealRoot, b: Ext | RealRoot): { sample: Q; left: Ext | RealRoot; right: Ext | RealRoot } {
  for (;;) {
    // every point >= L (> L when strictL) exceeds a; every point <= R (< R when strictR) is below b
    const lv = isRoot(a) ? a.hi : typeof a === 'number' ? (Number.isFinite(a) ? qFromFinite(a) : null) : a;
    const rv = isRoot(b) ? b.lo : typeof b === 'number' ? (Number.isFinite(b) ? qFromFinite(b) : null) : b;
    const strictL = !isRoot(a) || isExact(a), strictR = !isRoot(b) || isExact(b);
    if (!lv && !rv) return { sample: qint(0), left: a, right: b };
    if (!lv) return { sample: qint(qfloor(rv!) - 1n), left: a, right: b };
    if (!rv) return { sample: qint(qfloor(lv) + 1n), left: a, right: b };
    const c = qcmp(lv, rv);
    if (c < 0) return { sample: q(lv.n * rv.d + rv.n * lv.d, 2n * lv.d * rv.d), left: a, right: b };
    if (c === 0 && !strictL && !strictR) return { sample: lv, left: a, right: b };
    if (isRoot(a) && !isExact(a)) a = bisectRoot(a);
    if (isRoot(b) && !isExact(b)) b = bisectRoot(b);
    if (c === 0 && (!isRoot(a) || isExact(a)) && (!isRoot(b) || isExact(b)) && strictL && strictR) {
      throw new Error('internal: empty interval between equal points');
    }
  }
}
