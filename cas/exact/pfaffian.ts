/**
 * Exact Pfaffians of antisymmetric matrices of rational functions over Q(i): the value of
 * a Grassmann Gaussian, integral of exp(-1/2 theta^T A theta) = Pf(A), sign included.
 * Pf(A)^2 = det(A) does not fix the sign, so the Pfaffian is eliminated directly.
 *
 *   // a..f = rfVar('a')..rfVar('f'), 0 = RF0, -a = rfNeg(a), ...
 *   pfaffianExact([[0, a, b, c], [-a, 0, d, e], [-b, -d, 0, f], [-c, -e, -f, 0]])   // a*f - b*e + c*d
 *
 * Skew-symmetric elimination, two indices at a time: with the pivot p = a_{m,m+1},
 * Pf(A) = p * Pf(S), S_ij = a_ij + (a_{i,m+1} a_{j,m} - a_{i,m} a_{j,m+1}) / p (the Schur
 * complement of the leading 2 x 2 block; M. Wimmer, ACM TOMS 38 (2012) 30, from memory).
 * It is run fraction-free, as Bareiss runs Gaussian elimination (matrix.ts): after step k
 * the entry (i, j) is the Pfaffian of the rows and columns {0..2k-1, i, j}, so
 *
 *   b'_ij = (b_{m,m+1} b_ij + b_{i,m+1} b_{j,m} - b_{i,m} b_{j,m+1}) / (previous pivot)
 *
 * divides exactly and entries stay polynomials of bounded degree, with no gcd taken.
 * The pivot is the sparsest nonzero entry of the trailing block, brought to (m, m+1) by
 * symmetric swaps of indices (rows and columns together): Pf(P A P^T) = det(P) Pf(A), so
 * each swap of two distinct indices flips the sign. A zero trailing row makes Pf = 0.
 * Rational entries: index i is scaled by the lcm L_i of its row's denominators (rows and
 * columns, D A D stays antisymmetric), and Pf(D A D) = det(D) Pf(A) = L_1 ... L_n Pf(A).
 */
import {
  type Poly, ZERO, ONE, polyAdd, polyMul, polySub, polyNeg, isZero, divideExact, gcd, isConstant,
} from './poly.js';
import { type RatFunc, ratfunc, RF0, RF1 } from './ratfunc.js';
import { checkDeadline } from '../deadline.js';

function exact(a: Poly, b: Poly): Poly {
  if (b === ONE) return a;
  const r = divideExact(a, b);
  if (!r) throw new Error('internal: fraction-free Pfaffian division was not exact');
  return r;
}

function square(A: readonly (readonly RatFunc[])[]): number {
  const n = A.length;
  for (const row of A) if (row.length !== n) throw new Error('a square matrix is required');
  return n;
}

/** a + b = 0, by cross-multiplication (does not rely on lowest terms). */
const sumIsZero = (a: RatFunc, b: RatFunc): boolean =>
  isZero(polyAdd(polyMul(a.num, b.den), polyMul(b.num, a.den)));

/** Square with A^T = -A (zero diagonal); false for a non-square input. */
export function isAntisymmetric(A: readonly (readonly RatFunc[])[]): boolean {
  const n = A.length;
  if (A.some((row) => row.length !== n)) return false;
  for (let i = 0; i < n; i++) {
    if (!isZero(A[i]![i]!.num)) return false;
    for (let j = i + 1; j < n; j++) if (!sumIsZero(A[i]![j]!, A[j]![i]!)) return false;
  }
  return true;
}

function lcm(a: Poly, b: Poly): Poly {
  if (isConstant(a)) return b;
  if (isConstant(b)) return a;
  return polyMul(a, exact(b, gcd(a, b)));
}

/** Pfaffian of an antisymmetric matrix of polynomials (fraction-free elimination). */
function pfaffianPoly(m: Poly[][]): Poly {
  const n = m.length;
  if (n % 2 === 1) return ZERO;
  const a = m.map((r) => r.slice());
  /** swap indices x and y: rows and columns together */
  const swap = (x: number, y: number) => {
    [a[x], a[y]] = [a[y]!, a[x]!];
    for (const row of a) [row[x], row[y]] = [row[y]!, row[x]!];
  };
  let prev = ONE, negative = false;
  for (let m0 = 0; m0 < n; m0 += 2) {
    const m1 = m0 + 1;
    // pivot: the sparsest nonzero entry (r, c), r < c, of the trailing block
    let r = -1, c = -1, size = Infinity;
    for (let i = m0; i < n; i++) {
      for (let j = i + 1; j < n; j++) {
        const s = a[i]![j]!.terms.size;
        if (s > 0 && s < size) { r = i; c = j; size = s; }
      }
    }
    if (r < 0) return ZERO; // the trailing block vanishes
    if (r !== m0) { swap(m0, r); negative = !negative; } // c is neither m0 nor r, so it stays put
    if (c !== m1) { swap(m1, c); negative = !negative; }
    const p = a[m0]![m1]!;
    if (m1 === n - 1) return negative ? polyNeg(p) : p;
    for (let i = m1 + 1; i < n; i++) {
      checkDeadline();
      const ri = a[i]!, aim = ri[m0]!, aim1 = ri[m1]!;
      for (let j = i + 1; j < n; j++) {
        const rj = a[j]!, ajm = rj[m0]!, ajm1 = rj[m1]!, aij = ri[j]!;
        let s = isZero(aij) ? ZERO : polyMul(p, aij);
        if (!isZero(aim1) && !isZero(ajm)) s = polyAdd(s, polyMul(aim1, ajm));
        if (!isZero(aim) && !isZero(ajm1)) s = polySub(s, polyMul(aim, ajm1));
        const v = isZero(s) ? ZERO : exact(s, prev);
        ri[j] = v;
        rj[i] = isZero(v) ? ZERO : polyNeg(v);
      }
    }
    prev = p;
  }
  return ZERO; // not reached: n is even and the loop returns at the last pair
}

/**
 * Pf(A) for an antisymmetric A of rational functions: 1 for n = 0, 0 for odd n.
 * Throws when A is not square or not antisymmetric.
 */
export function pfaffianExact(A: readonly (readonly RatFunc[])[]): RatFunc {
  const n = square(A);
  if (!isAntisymmetric(A)) throw new Error('pfaffianExact: the matrix is not antisymmetric (A^T = -A with a zero diagonal is required)');
  if (n === 0) return RF1;
  if (n % 2 === 1) return RF0;
  const L = A.map((row) => row.reduce((l, x) => lcm(l, x.den), ONE));
  // s_ij = a_ij L_i L_j, from the upper triangle; the lower one is its negative
  const s: Poly[][] = A.map(() => new Array<Poly>(n).fill(ZERO));
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const x = A[i]![j]!;
      if (isZero(x.num)) continue;
      const v = polyMul(polyMul(x.num, exact(L[i]!, x.den)), L[j]!);
      s[i]![j] = v;
      s[j]![i] = polyNeg(v);
    }
  }
  return ratfunc(pfaffianPoly(s), L.reduce(polyMul, ONE));
}
