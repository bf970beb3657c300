/**
 * Exact asymptotics of a Gaussian result as one parameter p tends to a point or to
 * infinity. With u -> 0+ (u = 1/p, -1/p, p - p0 or p0 - p), every rational function of
 * the form (det A's pivots, the exponent E = J^T A^-1 J / 2 + c) has a Laurent expansion
 * in u, computed exactly; then
 *   Z = prefactor (2 pi)^(n/2) prod_k d_k^(-1/2) exp(E)
 *     ~ C u^gamma exp(e_-m u^-m + ... + e_-1 u^-1 + e_0),   C = prefactor (2 pi)^(n/2) / prod_k sqrt(lead_k)
 * where lead_k u^(o_k) is the leading term of the pivot d_k and gamma = -sum o_k / 2. Each
 * pivot has Re d_k > 0 on the convergent domain, so sqrt(d_k) ~ sqrt(lead_k) u^(o_k/2) on the
 * principal branch: the constant's branch needs no choice. log Z is the same sum of terms.
 * (The method is the leading-term part of a Puiseux expansion in one variable; for general
 * nested exp and log see D. Gruntz, "On computing limits in a symbolic manipulation
 * system", ETH Zurich thesis, 1996, from memory.)
 *
 * Example: Z = sqrt(2*pi/k), k -> inf: u = 1/k, d = 1/u, gamma = 1/2, so Z -> 0 like
 * sqrt(2*pi)/sqrt(k) and log Z ~ -1/2*log(k) + 1/2*log(2*pi).
 */
import type { Expr } from '../lang/ast.js';
import { coefficients, isZero, polyConst, polyVar, variables, type Poly } from '../exact/poly.js';
import { rfAdd, rfConst, rfDiv, rfIsZero, rfMul, rfNeg, rfPoly, RF0, ratfunc, type RatFunc } from '../exact/ratfunc.js';
import { leadingMinorsRat } from '../exact/matrix.js';
import { qint, qToNumber, type Q } from '../exact/q.js';
import type { ExactForm } from './exactGaussian.js';

/** How the parameter approaches: u = 1/p (inf), u = -1/p (-inf), u = s (p - p0) with s = +-1. */
export type Approach = { kind: 'inf' } | { kind: '-inf' } | { kind: 'point'; at: Q; side: 1 | -1 };

/** r(p) rewritten as a rational function of u (u -> 0+). */
export function inU(r: RatFunc, p: string, how: Approach, u: string): RatFunc {
  const conv = (poly: Poly): { c: RatFunc[] } => ({ c: coefficients(poly, p).map(rfPoly) });
  const N = conv(r.num).c; const D = conv(r.den).c;
  const U = rfPoly(polyVar(u));
  const powU = (k: number) => { let x = rfConst(1); for (let i = 0; i < k; i++) x = rfMul(x, U); return x; };
  if (how.kind === 'point') {
    // p = p0 + s*u
    const pOf = rfAdd(rfConst({ re: how.at, im: qint(0) }), rfMul(rfConst(how.side), U));
    const ev = (cs: RatFunc[]) => cs.reduceRight((acc, c) => rfAdd(rfMul(acc, pOf), c), RF0);
    return rfDiv(ev(N), ev(D));
  }
  // p = s/u: N(s/u) u^M / (D(s/u) u^M)
  const s = how.kind === 'inf' ? 1 : -1;
  const M = Math.max(N.length, D.length) - 1;
  const rev = (cs: RatFunc[]) => cs.reduce((acc, c, i) => rfAdd(acc, rfMul(rfMul(c, rfConst(s ** i)), powU(M - i))), RF0);
  return rfDiv(rev(N), rev(D));
}


/** Laurent expansion r(u) = sum_{k >= order} c_k u^k: the order and the coefficients up to u^upTo. */
export function laurent(r: RatFunc, u: string, upTo: number): { order: number; coeffs: RatFunc[] } | null {
  if (rfIsZero(r)) return null;
  const n = coefficients(r.num, u).map(rfPoly); const d = coefficients(r.den, u).map(rfPoly);
  const vN = n.findIndex((x) => !rfIsZero(x)); const vD = d.findIndex((x) => !rfIsZero(x));
  const np = n.slice(vN); const dp = d.slice(vD);
  const order = vN - vD;
  const count = Math.max(1, upTo - order + 1);
  const c: RatFunc[] = [];
  for (let k = 0; k < count; k++) {
    let acc = np[k] ?? RF0;
    for (let j = 1; j <= k; j++) if (dp[j]) acc = rfAdd(acc, rfNeg(rfMul(dp[j]!, c[k - j]!)));
    c.push(rfDiv(acc, dp[0]!));
  }
  return { order, coeffs: c };
}

export interface GaussianAsymptotics {
  /** C: the prefactor, (2 pi)^(n/2) and the pivots' leading coefficients (under principal roots). */
  pivotLeads: RatFunc[];
  /** Z ~ C u^gamma exp(sum exponentTerms) with exponentTerms e_k u^k for k <= 0 (k = 0 the constant). */
  gamma: Q;
  exponentTerms: { power: number; coeff: RatFunc }[];
}

/** The expansion of a Gaussian result, or null when a leading coefficient may vanish on the domain of the other parameters. */
export function gaussianAsymptotics(form: ExactForm, exponent: RatFunc, p: string, how: Approach, nonzero: (r: RatFunc) => boolean): GaussianAsymptotics | null {
  const u = '%u';
  const A = form.A.map((row) => row.map((x) => inU(x, p, how, u)));
  const minors = leadingMinorsRat(A);
  let prev: RatFunc = rfConst(1);
  const leads: RatFunc[] = [];
  let orderSum = 0;
  for (const m of minors) {
    if (rfIsZero(m)) return null;
    const pivot = rfDiv(m, prev);
    prev = m;
    const l = laurent(pivot, u, 0);
    if (!l || !nonzero(l.coeffs[0]!)) return null;
    leads.push(l.coeffs[0]!);
    orderSum += l.order;
  }
  const E = inU(exponent, p, how, u);
  const terms: { power: number; coeff: RatFunc }[] = [];
  if (!rfIsZero(E)) {
    const l = laurent(E, u, 0);
    if (!l) return null;
    l.coeffs.forEach((c, k) => { const power = l.order + k; if (power <= 0 && !rfIsZero(c)) terms.push({ power, coeff: c }); });
  }
  return { pivotLeads: leads, gamma: { n: BigInt(-orderSum), d: 2n }, exponentTerms: terms };
}

export { isZero, polyConst, variables, ratfunc, qToNumber };
export type { Expr };
