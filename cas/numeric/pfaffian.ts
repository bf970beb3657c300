/**
 * Floating-point Pfaffians of antisymmetric (complex) matrices, by the Parlett-Reid
 * skew-symmetric elimination with partial pivoting: the stable method (its growth is that
 * of Gaussian elimination with partial pivoting), about n^3/3 complex operations, so n = 200
 * takes milliseconds. sqrt(det) would lose the sign; this keeps it.
 *
 *   pfaffianFloatReal([[0, 2], [-2, 0]])   // 2
 *   pfaffianFloatLog(A)                    // { logAbs, phase }: Pf = phase * exp(logAbs), no overflow
 *
 * Step k = 0, 2, 4, ...: the largest |a_ik| (i > k) is swapped to (k+1, k), rows and columns
 * together, each swap of two distinct indices flipping the sign (Pf(P A P^T) = det(P) Pf(A));
 * then with the pivot p = a_{k,k+1}, Pf(A) = p * Pf(S) for the trailing block
 *   S_ij = a_ij + (a_{k+1,i} a_{k,j} - a_{k,i} a_{k+1,j}) / p.
 * The full Parlett-Reid reduction to tridiagonal form also eliminates at odd k; for the
 * Pfaffian every second step suffices (M. Wimmer, "Efficient numerical computation of the
 * Pfaffian for dense and banded skew-symmetric matrices", ACM TOMS 38 (2012) 30, from memory).
 *
 * Only the strictly upper triangle is read; the input must be antisymmetric to 1e-12 of its
 * largest entry, else an Error. The exact route is cas/exact/pfaffian.ts.
 */
import type { C } from './cmatrix.js';

/** Relative tolerance of the antisymmetry check. */
const SKEW_TOLERANCE = 1e-12;

type Entry = C | number;
const re = (z: Entry) => (typeof z === 'number' ? z : z.re);
const im = (z: Entry) => (typeof z === 'number' ? 0 : z.im);

/** The pivots p_0, p_2, ... (Pf = (-1)^swaps * product), or null when Pf = 0. */
function eliminate(A: readonly (readonly Entry[])[]): { pr: Float64Array; pi: Float64Array; negative: boolean } | null {
  const n = A.length;
  for (const row of A) if (row.length !== n) throw new Error('a square matrix is required');
  const ar = new Float64Array(n * n), ai = new Float64Array(n * n);
  let scale = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
    const x = A[i]![j]!;
    if (!Number.isFinite(re(x)) || !Number.isFinite(im(x))) throw new Error('pfaffianFloat: the entries must be finite numbers');
    scale = Math.max(scale, Math.abs(re(x)), Math.abs(im(x)));
  }
  const tol = SKEW_TOLERANCE * scale;
  for (let i = 0; i < n; i++) {
    const d = A[i]![i]!;
    if (Math.abs(re(d)) > tol || Math.abs(im(d)) > tol) throw new Error('pfaffianFloat: the matrix is not antisymmetric (its diagonal is not zero)');
    for (let j = i + 1; j < n; j++) {
      const x = A[i]![j]!, y = A[j]![i]!;
      if (Math.abs(re(x) + re(y)) > tol || Math.abs(im(x) + im(y)) > tol) {
        throw new Error(`pfaffianFloat: the matrix is not antisymmetric (entries (${i + 1}, ${j + 1}) and (${j + 1}, ${i + 1}) are not opposite)`);
      }
      ar[i * n + j] = re(x); ai[i * n + j] = im(x);
      ar[j * n + i] = -re(x); ai[j * n + i] = -im(x);
    }
  }
  if (n % 2 === 1) return null;
  const half = n / 2;
  const pr = new Float64Array(half), pi = new Float64Array(half);
  let negative = false;
  /** swap indices x and y: rows and columns together */
  const swap = (x: number, y: number) => {
    for (let j = 0; j < n; j++) {
      let t = ar[x * n + j]!; ar[x * n + j] = ar[y * n + j]!; ar[y * n + j] = t;
      t = ai[x * n + j]!; ai[x * n + j] = ai[y * n + j]!; ai[y * n + j] = t;
    }
    for (let i = 0; i < n; i++) {
      let t = ar[i * n + x]!; ar[i * n + x] = ar[i * n + y]!; ar[i * n + y] = t;
      t = ai[i * n + x]!; ai[i * n + x] = ai[i * n + y]!; ai[i * n + y] = t;
    }
  };
  const tr = new Float64Array(n), ti = new Float64Array(n);
  for (let k = 0; k < n; k += 2) {
    // partial pivoting: the largest entry of row k right of the diagonal
    let best = -1, big = 0;
    for (let j = k + 1; j < n; j++) {
      const m = ar[k * n + j]! ** 2 + ai[k * n + j]! ** 2;
      if (m > big) { big = m; best = j; }
    }
    if (best < 0) return null; // row k vanishes in the trailing block: Pf = 0
    if (best !== k + 1) { swap(k + 1, best); negative = !negative; }
    const p = ar[k * n + k + 1]!, q = ai[k * n + k + 1]!;
    pr[k / 2] = p; pi[k / 2] = q;
    // t_j = a_kj / p
    const d = p * p + q * q;
    for (let j = k + 2; j < n; j++) {
      const x = ar[k * n + j]!, y = ai[k * n + j]!;
      tr[j] = (x * p + y * q) / d; ti[j] = (y * p - x * q) / d;
    }
    // S_ij = a_ij + w_i t_j - t_i w_j with w = row k + 1
    const w = (k + 1) * n;
    for (let i = k + 2; i < n; i++) {
      const wr = ar[w + i]!, wi = ai[w + i]!, ur = tr[i]!, ui = ti[i]!;
      const o = i * n;
      for (let j = k + 2; j < n; j++) {
        const vr = ar[w + j]!, vi = ai[w + j]!, sr = tr[j]!, si = ti[j]!;
        ar[o + j] = ar[o + j]! + (wr * sr - wi * si) - (ur * vr - ui * vi);
        ai[o + j] = ai[o + j]! + (wr * si + wi * sr) - (ur * vi + ui * vr);
      }
    }
  }
  return { pr, pi, negative };
}

/** Pf(A) for an antisymmetric complex matrix (1 for n = 0, 0 for odd n). May overflow for large n: see pfaffianFloatLog. */
export function pfaffianFloat(A: readonly (readonly C[])[]): C {
  if (A.length === 0) return { re: 1, im: 0 };
  const e = eliminate(A);
  if (!e) return { re: 0, im: 0 };
  let zr = e.negative ? -1 : 1, zi = 0;
  for (let k = 0; k < e.pr.length; k++) {
    const p = e.pr[k]!, q = e.pi[k]!;
    [zr, zi] = [zr * p - zi * q, zr * q + zi * p];
  }
  return { re: zr, im: zi };
}

/** Pf(A) for an antisymmetric real matrix. */
export function pfaffianFloatReal(A: readonly (readonly number[])[]): number {
  if (A.length === 0) return 1;
  const e = eliminate(A);
  if (!e) return 0;
  let z = e.negative ? -1 : 1;
  for (const p of e.pr) z *= p;
  return z;
}

/**
 * Pf(A) = phase * exp(logAbs), for real or complex entries: no overflow at any n.
 * Pf = 0 gives logAbs = -Infinity and phase 0; otherwise |phase| = 1.
 */
export function pfaffianFloatLog(A: readonly (readonly C[])[] | readonly (readonly number[])[]): { logAbs: number; phase: C } {
  if (A.length === 0) return { logAbs: 0, phase: { re: 1, im: 0 } };
  const e = eliminate(A as readonly (readonly Entry[])[]);
  if (!e) return { logAbs: -Infinity, phase: { re: 0, im: 0 } };
  let logAbs = 0, zr = e.negative ? -1 : 1, zi = 0;
  for (let k = 0; k < e.pr.length; k++) {
    const p = e.pr[k]!, q = e.pi[k]!, m = Math.hypot(p, q);
    logAbs += Math.log(m);
    [zr, zi] = [(zr * p - zi * q) / m, (zr * q + zi * p) / m];
    const r = Math.hypot(zr, zi); // keep |phase| = 1 against drift
    zr /= r; zi /= r;
  }
  return { logAbs, phase: { re: zr, im: zi } };
}
