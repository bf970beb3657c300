/** Convergence of a Gaussian integral at one numeric point, from Re A and Im A. */
import { luSolveDet, type CMat } from '../numeric/cmatrix.js';
import { symEig } from '../numeric/symeig.js';
import { smallestCholeskyPivot } from '../numeric/cholesky.js';

/** Above this many variables, Re A > 0 is decided by Cholesky pivots instead of eigenvalues. */
export const LARGE_N = 24;

export type PointVerdict =
  | { kind: 'absolute'; realEigenvalues: number[]; smallestCholeskyPivot?: number }
  | { kind: 'oscillatory'; realEigenvalues: number[]; kernelDim: number }
  | { kind: 'divergent'; realEigenvalues: number[]; direction: number[]; grows: boolean };

function part(a: CMat, which: 're' | 'im'): number[][] {
  const n = a.n;
  return Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (a[which][i * n + j]! + a[which][j * n + i]!) / 2));
}

function scaleOf(a: CMat): number {
  let s = 0;
  for (let k = 0; k < a.n * a.n; k++) s = Math.max(s, Math.abs(a.re[k]!), Math.abs(a.im[k]!));
  return s;
}

/** Round a direction for display and make its largest entry positive. */
function tidyDirection(v: number[]): number[] {
  const big = v.reduce((m, x) => (Math.abs(x) > Math.abs(m) ? x : m), 0);
  const s = big < 0 ? -1 : 1;
  return v.map((x) => Number((s * x).toPrecision(6)) + 0);
}

/** |det A| clearly away from 0 relative to the entries' scale (LU with partial pivoting). */
function nonsingular(a: CMat): boolean {
  const n = a.n;
  const r = luSolveDet(a, Array.from({ length: n }, () => ({ re: 0, im: 0 })));
  if (!r) return false;
  const scale = Math.max(scaleOf(a), 1e-300);
  return Math.hypot(r.det.re, r.det.im) > 1e-10 * scale ** n;
}

export function convergenceAt(a: CMat): PointVerdict {
  const n = a.n;
  const tol = 1e-10 * Math.max(scaleOf(a), 1e-300);
  if (n > LARGE_N) {
    const reA = new Float64Array(n * n);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) reA[i * n + j] = (a.re[i * n + j]! + a.re[j * n + i]!) / 2;
    const pivot = smallestCholeskyPivot(reA, n, tol);
    // Not positive definite: the eigenvectors below name the direction that fails.
    if (pivot !== null) return { kind: 'absolute', realEigenvalues: [], smallestCholeskyPivot: pivot };
  }
  const re = symEig(part(a, 're'));
  const lo = re.values[0]!;
  if (lo > tol) return { kind: 'absolute', realEigenvalues: re.values };
  if (lo < -tol) return { kind: 'divergent', realEigenvalues: re.values, direction: tidyDirection(re.vectors[0]!), grows: true };
  // Re A is semidefinite: the integral is oscillatory when Im A is nondegenerate on the kernel of Re A.
  const kernel = re.vectors.filter((_, k) => Math.abs(re.values[k]!) <= tol);
  const im = part(a, 'im');
  const m = kernel.map((u) => kernel.map((w) => {
    let s = 0;
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) s += u[i]! * im[i]![j]! * w[j]!;
    return s;
  }));
  const me = symEig(m);
  const k = me.values.findIndex((x) => Math.abs(x) <= tol);
  // A semidefinite Re A with A nonsingular defines the integral as the limit of A + epsilon*I
  // (i*epsilon), even where Im A is degenerate on ker Re A (exp(-x^2 + i*x*y) is 2*pi).
  if (k < 0 || nonsingular(a)) return { kind: 'oscillatory', realEigenvalues: re.values, kernelDim: kernel.length };
  const coeffs = me.vectors[k]!;
  const direction = Array.from({ length: n }, (_, i) => kernel.reduce((s, u, j) => s + coeffs[j]! * u[i]!, 0));
  return { kind: 'divergent', realEigenvalues: re.values, direction: tidyDirection(direction), grows: false };
}
