/**
 * A sufficient, exact test that a real polynomial (or rational function) of parameters is
 * positive at every point of their declared domains, whatever the number of parameters:
 * after writing each negative parameter as -y with y > 0, every coefficient is positive,
 * every real or nonzero parameter appears with an even power in every monomial, and one
 * monomial has no real parameter (so it is positive everywhere, while every other one is
 * at least 0). A sum of such monomials is positive on the whole domain. The test can only
 * miss a positive polynomial ((a - b)^2 + 1 is not recognised), never accept another.
 *
 * pi counts as a positive parameter. Complex parameters are refused.
 *
 * Example: a^2 + b^2 (a positive, b real) is positive; a*b + 1 (b real) is not shown.
 */
import type { Domain } from '../../shared/evaluation.js';
import type { Poly } from '../exact/poly.js';
import { rfNeg, type RatFunc } from '../exact/ratfunc.js';

/** p > 0 at every point of the domains (shown exactly; false means "not shown"). */
export function polyPositiveOnDomain(p: Poly, domains: ReadonlyMap<string, Domain>): boolean {
  if (p.terms.size === 0) return false;
  let strictly = false;
  for (const t of p.terms.values()) {
    if (t.c.im.n !== 0n) return false;
    let sign = t.c.re.n > 0n ? 1 : -1;
    let hasReal = false;
    for (const [v, e] of t.m) {
      const d = v === 'pi' ? 'positive' : domains.get(v);
      if (d === 'negative') sign *= e % 2 ? -1 : 1;
      else if (d === 'real' || d === 'nonzero') {
        if (e % 2) return false;
        // x^2 > 0 for a nonzero x; for a real x it can be 0
        if (d === 'real') hasReal = true;
      } else if (d !== 'positive') return false;
    }
    if (sign < 0) return false;
    if (!hasReal) strictly = true;
  }
  return strictly;
}

/** r > 0 at every point of the domains: its numerator and denominator both shown positive, or both negative. */
export function positiveOnDomain(r: RatFunc, domains: ReadonlyMap<string, Domain>): boolean {
  if (polyPositiveOnDomain(r.num, domains) && polyPositiveOnDomain(r.den, domains)) return true;
  const n = rfNeg(r).num;
  const d = rfNeg({ num: r.den, den: r.num }).num;
  return polyPositiveOnDomain(n, domains) && polyPositiveOnDomain(d, domains);
}
