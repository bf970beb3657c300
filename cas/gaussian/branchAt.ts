/**
 * The branch of det(A)^(1/2) at one numeric point. Definition: the product of
 * principal roots of the eigenvalues (all in the closed right half plane when
 * Re A >= 0), i.e. the continuation from real positive A. The L D L^T pivots
 * give the same branch without eigenvalues; both are computed and compared.
 */
import { carg, cmul, csqrt, ldl, luSolveDet, pivots as pivotsOf, type C, type CMat } from '../numeric/cmatrix.js';
import { eigenvalues } from '../numeric/eigen.js';
import { LARGE_N } from './convergenceAt.js';

export interface BranchAt {
  eigenvalues: C[];
  pivots: C[] | null;
  /** The continuous square root of det A. */
  sqrtDet: C;
  det: C;
  /** +1 when the principal sqrt(det A) equals sqrtDet, -1 when it is its negative. */
  principalSign: 1 | -1;
  argumentSum: number;
  /** Whether the pivot route gave the same root as the eigenvalues (null without pivots). */
  pivotsAgree: boolean | null;
}

function prodSqrt(zs: readonly C[]): C {
  return zs.reduce<C>((p, z) => cmul(p, csqrt(z)), { re: 1, im: 0 });
}

function close(a: C, b: C, tol = 1e-8): boolean {
  return Math.hypot(a.re - b.re, a.im - b.im) <= tol * Math.max(Math.hypot(a.re, a.im), Math.hypot(b.re, b.im), 1e-300);
}

/**
 * `realPartPositive`: Re A > 0 is already established. With many variables the
 * eigenvalues are then skipped: every pivot lies in the right half plane (DESIGN §2
 * item 4), so the product of their principal roots is the continuous branch by itself.
 */
export function branchAt(a: CMat, realPartPositive = false): BranchAt {
  const fact = ldl(a);
  const piv = fact ? pivotsOf(fact) : null;
  const fromPiv = piv ? prodSqrt(piv) : null;
  const pivotsOnly = realPartPositive && a.n > LARGE_N && piv !== null;
  const ev = pivotsOnly ? [] : eigenvalues(a);
  const sqrtDet = pivotsOnly ? fromPiv! : prodSqrt(ev);
  const det = piv ? piv.reduce<C>((p, z) => cmul(p, z), { re: 1, im: 0 }) : (luSolveDet(a, Array.from({ length: a.n }, () => ({ re: 0, im: 0 })))?.det ?? { re: 0, im: 0 });
  const principal = csqrt(det);
  return {
    eigenvalues: ev,
    pivots: piv,
    sqrtDet,
    det,
    principalSign: principal.re * sqrtDet.re + principal.im * sqrtDet.im >= 0 ? 1 : -1,
    argumentSum: (pivotsOnly ? piv! : ev).reduce((s, z) => s + carg(z), 0),
    pivotsAgree: pivotsOnly || !fromPiv ? null : close(fromPiv, sqrtDet),
  };
}

/** Only the pivot route: for sampling many points quickly once the two routes have been shown to agree. */
export function sqrtDetByPivots(a: CMat): C | null {
  const f = ldl(a);
  return f ? prodSqrt(pivotsOf(f)) : null;
}
