/**
 * A Grassmann algebra over rational functions: elements are sums of coefficients times
 * ordered products theta_i1 theta_i2 ... (indices ascending, the sign of the reordering
 * folded into the coefficient), with the Berezin integral in the order the measure is
 * written (leftmost outermost). Used for averages under a Berezin integral, where a
 * direct expansion is the plainest way to get every sign right.
 *
 * Example: with theta = (t1, t2), exp(-a t1 t2) = 1 - a t1 t2, and
 * berezin(1 - a t1 t2, 2) = a (integral dt1 dt2 t1 t2 = -1).
 */
import { rfAdd, rfDiv, rfIsZero, rfMul, rfNeg, RF1, rfConst, type RatFunc } from './ratfunc.js';

export type GElement = Map<string, { idx: number[]; c: RatFunc }>;

const key = (idx: number[]) => idx.join(',');

/** Sorts an ordered product: the permutation's sign, or 0 when an index repeats. */
export function reorder(idx: number[]): { sign: 1 | -1 | 0; idx: number[] } {
  const v = [...idx];
  let sign: 1 | -1 = 1;
  for (let i = 0; i < v.length; i++) for (let j = 0; j + 1 < v.length - i; j++) {
    if (v[j]! === v[j + 1]!) return { sign: 0, idx: [] };
    if (v[j]! > v[j + 1]!) { [v[j], v[j + 1]] = [v[j + 1]!, v[j]!]; sign = sign === 1 ? -1 : 1; }
  }
  return { sign, idx: v };
}

export const gScalar = (c: RatFunc): GElement => (rfIsZero(c) ? new Map() : new Map([['', { idx: [], c }]]));
export const gVariable = (i: number): GElement => new Map([[String(i), { idx: [i], c: RF1 }]]);

export function gAdd(a: GElement, b: GElement, sign: 1 | -1 = 1): GElement {
  const out: GElement = new Map(a);
  for (const [k, t] of b) {
    const c = sign < 0 ? rfNeg(t.c) : t.c;
    const prev = out.get(k);
    const sum = prev ? rfAdd(prev.c, c) : c;
    if (rfIsZero(sum)) out.delete(k); else out.set(k, { idx: t.idx, c: sum });
  }
  return out;
}

export function gMul(a: GElement, b: GElement): GElement {
  let out: GElement = new Map();
  for (const x of a.values()) for (const y of b.values()) {
    const { sign, idx } = reorder([...x.idx, ...y.idx]);
    if (sign === 0) continue;
    out = gAdd(out, new Map([[key(idx), { idx, c: rfMul(x.c, y.c) }]]), sign);
  }
  return out;
}

/** exp of an even element without a scalar part: 1 + E + E^2/2! + ... (nilpotent, so finite). */
export function gExpEven(e: GElement, n: number): GElement {
  let term: GElement = gScalar(RF1);
  let sum: GElement = gScalar(RF1);
  for (let k = 1; k <= n / 2; k++) {
    term = gMul(term, e);
    term = new Map([...term].map(([kk, t]) => [kk, { idx: t.idx, c: rfDiv(t.c, rfConst(k)) }]));
    if (!term.size) break;
    sum = gAdd(sum, term);
  }
  return sum;
}

/** integral dtheta_0 ... dtheta_{n-1} of f, the leftmost outermost: the top coefficient times (-1)^(n(n-1)/2). */
export function berezin(f: GElement, n: number): RatFunc {
  const top = f.get(key(Array.from({ length: n }, (_, i) => i)));
  if (!top) return rfConst(0);
  return (n * (n - 1) / 2) % 2 ? rfNeg(top.c) : top.c;
}

/** -1/2 theta^T A theta for antisymmetric A, as a Grassmann element: sum over i < j of -A_ij theta_i theta_j. */
export function quadraticOf(A: readonly (readonly RatFunc[])[]): GElement {
  let e: GElement = new Map();
  A.forEach((row, i) => row.forEach((a, j) => { if (i < j && !rfIsZero(a)) e = gAdd(e, new Map([[`${i},${j}`, { idx: [i, j], c: rfNeg(a) }]])); }));
  return e;
}
