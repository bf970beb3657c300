/**
 * Determinants and leading principal minors of matrices of polynomials by fraction-free
 * (Bareiss) elimination: every division is exact, so entries stay polynomials of
 * bounded degree and no gcd is ever taken.
 *
 *   const g = polyVar('g');
 *   leadingMinors([[ONE, g], [g, polyConst(100)]])   // [1, 100 - g^2]
 *
 * Without pivoting, after step k the (k,k) entry is the leading minor M_{k+1}, so one
 * elimination yields all of M_1..M_n. Bareiss divides by the previous pivot, so when a
 * leading minor is identically zero the plain sweep stops there; each remaining minor
 * M_j is then computed on its own as the determinant of the leading j x j block by
 * Bareiss with row pivoting (a row swap only flips the sign, and the division stays exact).
 */
import {
  type Poly, ZERO, ONE, polyMul, polySub, polyNeg, isZero, divideExact, gcd, isConstant,
} from './poly.js';
import { type RatFunc, ratfunc, RF1 } from './ratfunc.js';
import { checkDeadline } from '../deadline.js';

function exact(a: Poly, b: Poly): Poly {
  if (b === ONE) return a;
  const r = divideExact(a, b);
  if (!r) throw new Error('internal: Bareiss division was not exact');
  return r;
}

/** One Bareiss update: (p*a_ij - a_ik*a_kj)/prev, skipping work on zeros (sparse matrices). */
function update(p: Poly, aij: Poly, aik: Poly, akj: Poly, prev: Poly): Poly {
  const left = isZero(aij) ? ZERO : polyMul(p, aij);
  const right = isZero(aik) || isZero(akj) ? ZERO : polyMul(aik, akj);
  const s = polySub(left, right);
  return isZero(s) ? ZERO : exact(s, prev);
}

function check(m: readonly (readonly Poly[])[]): number {
  const n = m.length;
  for (const row of m) if (row.length !== n) throw new Error('a square matrix is required');
  return n;
}

/** Determinant (Bareiss with row pivoting on the sparsest nonzero candidate). */
export function det(m: readonly (readonly Poly[])[]): Poly {
  const n = check(m);
  if (n === 0) return ONE;
  const a = m.map((r) => r.slice());
  let prev = ONE, sign = false;
  for (let k = 0; k < n; k++) {
    let best = -1;
    for (let i = k; i < n; i++) {
      const s = a[i]![k]!.terms.size;
      if (s > 0 && (best < 0 || s < a[best]![k]!.terms.size)) best = i;
    }
    if (best < 0) return ZERO;
    if (best !== k) { [a[k], a[best]] = [a[best]!, a[k]!]; sign = !sign; }
    const p = a[k]![k]!;
    if (k === n - 1) return sign ? polyNeg(p) : p;
    for (let i = k + 1; i < n; i++) {
      checkDeadline();
      const ri = a[i]!, rk = a[k]!;
      for (let j = k + 1; j < n; j++) ri[j] = update(p, ri[j]!, ri[k]!, rk[j]!, prev);
      ri[k] = ZERO;
    }
    prev = p;
  }
  return ZERO; // not reached
}

/** Leading principal minors M_1..M_n (M_k = det of the top-left k x k block). */
export function leadingMinors(m: readonly (readonly Poly[])[]): Poly[] {
  const n = check(m);
  const a = m.map((r) => r.slice());
  const out: Poly[] = [];
  let prev = ONE;
  for (let k = 0; k < n; k++) {
    const p = a[k]![k]!;
    out.push(p);
    if (k === n - 1) break;
    if (isZero(p)) {
      // M_{k+1} = 0: Bareiss cannot divide by it; finish block by block with pivoting
      for (let j = k + 2; j <= n; j++) out.push(det(m.slice(0, j).map((r) => r.slice(0, j))));
      break;
    }
    for (let i = k + 1; i < n; i++) {
      checkDeadline();
      const ri = a[i]!, rk = a[k]!;
      for (let j = k + 1; j < n; j++) ri[j] = update(p, ri[j]!, ri[k]!, rk[j]!, prev);
    }
    prev = p;
  }
  return out;
}

function lcm(a: Poly, b: Poly): Poly {
  if (isConstant(a)) return b;
  if (isConstant(b)) return a;
  const g = gcd(a, b);
  return polyMul(a, exact(b, g));
}

/** Multiply each row by the lcm of its denominators: returns the polynomial rows and the factors. */
function clearRows(m: readonly (readonly RatFunc[])[]): { rows: Poly[][]; factors: Poly[] } {
  const rows: Poly[][] = [], factors: Poly[] = [];
  for (const r of m) {
    const L = r.reduce((l, x) => lcm(l, x.den), ONE);
    factors.push(L);
    rows.push(r.map((x) => polyMul(x.num, exact(L, x.den))));
  }
  return { rows, factors };
}

/**
 * Leading principal minors of a matrix of rational functions: row i is scaled by the lcm
 * L_i of its denominators, so M_k = M_k(scaled) / (L_1 ... L_k), in lowest terms.
 */
export function leadingMinorsRat(m: readonly (readonly RatFunc[])[]): RatFunc[] {
  check(m as unknown as Poly[][]);
  const { rows, factors } = clearRows(m);
  const minors = leadingMinors(rows);
  let den = ONE;
  return minors.map((p, k) => {
    den = polyMul(den, factors[k]!);
    return ratfunc(p, den);
  });
}

export function detRat(m: readonly (readonly RatFunc[])[]): RatFunc {
  check(m as unknown as Poly[][]);
  if (m.length === 0) return RF1;
  const { rows, factors } = clearRows(m);
  return ratfunc(det(rows), factors.reduce(polyMul, ONE));
}
