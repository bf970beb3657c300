/**
 * Numbers for Gaussian sums over the integers and the Dedekind eta function, in complex double
 * precision. Two kinds of code live here and must stay apart:
 *
 *  - the closed-form side (`etaValue`, `poissonSum`): eta by the modular transformations
 *    eta(tau + 1) = exp(i*pi/12) * eta(tau) and eta(-1/tau) = sqrt(-i*tau) * eta(tau), which move tau
 *    into the fundamental domain (Im tau >= sqrt(3)/2, so |q| <= exp(-pi*sqrt(3)) < 0.005) where
 *    the q-product converges in a few terms; and the sum sum_n exp(-pi*a*n^2 + 2*pi*i*b*n) by
 *    Poisson resummation, a^(-1/2) * sum_m exp(-pi*(m - b)^2/a);
 *  - the checking side (`etaByProduct`, `sumByTerms`): the definitions themselves, partial
 *    products q^(1/24) * prod (1 - q^n) and partial sums sum_{|n| <= N} exp(-pi*a*n^2 + 2*pi*i*b*n),
 *    with no transformation, stopped when a term no longer changes the result (and refused when
 *    that does not happen within a fixed number of terms).
 *
 * `verify` compares the two; a mistake in a transformation cannot cancel out of that comparison.
 */
import { Complex } from 'complex.js';

const ONE = new Complex(1, 0);
const I = new Complex(0, 1);

/** eta(tau) at a tau already in the fundamental domain: q^(1/24) * prod (1 - q^n), |q| < 0.005. */
function etaNearInfinity(tau: Complex): Complex {
  const q = tau.mul(I).mul(2 * Math.PI).exp();
  let prod = ONE;
  let qn = q;
  for (let n = 1; n < 200 && qn.abs() > 1e-18; n++) { prod = prod.mul(ONE.sub(qn)); qn = qn.mul(q); }
  return tau.mul(I).mul(Math.PI / 12).exp().mul(prod);
}

/**
 * The Dedekind eta function for Im tau > 0 (NaN elsewhere: the product diverges there).
 * Reduction: shift Re tau into [-1/2, 1/2] (factor exp(i*pi*n/12) per shift by n), invert when
 * |tau| < 1 (eta(tau) = eta(-1/tau) / sqrt(-i*tau), principal root: -i*tau has positive real part
 * for Im tau > 0, and both sides are analytic in the upper half plane and agree on the imaginary
 * axis). Im tau grows at each inversion, so at most a few dozen steps are needed.
 */
export function etaValue(tau: Complex): Complex {
  if (!(tau.im > 0) || !Number.isFinite(tau.re)) return new Complex(NaN, NaN);
  let factor = ONE;
  let t = tau;
  for (let step = 0; step < 200; step++) {
    const n = Math.round(t.re);
    if (n !== 0) { factor = factor.mul(I.mul(Math.PI * n / 12).exp()); t = t.sub(n); }
    if (t.abs() >= 1 - 1e-15) break;
    factor = factor.div(t.mul(I).neg().sqrt());
    t = ONE.neg().div(t);
  }
  return factor.mul(etaNearInfinity(t));
}

/** The outcome of a partial sum or product: the value, the terms used, the size of the last term. */
export interface SeriesCheck { value: Complex; terms: number; lastTerm: number; converged: boolean }

/** Largest number of factors or pairs of terms a check adds before it gives up. */
export const CHECK_TERMS = 200_000;

/**
 * eta(tau) from its definition: q^(1/24) * prod_{n=1}^{N} (1 - q^n), q = exp(2*pi*i*tau), N grown
 * until |q^n| < 1e-17 (the factors after that change nothing in double precision).
 */
export function etaByProduct(tau: Complex): SeriesCheck {
  const q = tau.mul(I).mul(2 * Math.PI).exp();
  let prod = ONE; let qn = q; let n = 1;
  for (; n <= CHECK_TERMS && qn.abs() >= 1e-17; n++) { prod = prod.mul(ONE.sub(qn)); qn = qn.mul(q); }
  const value = tau.mul(I).mul(Math.PI / 12).exp().mul(prod);
  return { value, terms: n - 1, lastTerm: qn.abs(), converged: qn.abs() < 1e-17 };
}

/** The term exp(-alpha*n^2 + beta*n + gamma) of a Gaussian sum in its written coefficients. */
export interface GaussianSumNumbers { alpha: Complex; beta: Complex; gamma: Complex }

/**
 * sum over all integers n of exp(-alpha*n^2 + beta*n + gamma) term by term from the middle
 * outwards, n = 0, +-1, +-2, ..., until a pair of terms is below 1e-17 of the running sum after
 * the terms have started to decrease. Re alpha > 0 is the caller's to check.
 */
export function sumByTerms(g: GaussianSumNumbers): SeriesCheck {
  const term = (n: number) => g.alpha.mul(-n * n).add(g.beta.mul(n)).add(g.gamma).exp();
  // start at the integer nearest the peak of |term|: Re(-alpha n^2 + beta n) is largest at Re beta / (2 Re alpha)
  const peak = Math.round(g.beta.re / (2 * g.alpha.re));
  if (!Number.isFinite(peak) || Math.abs(peak) > 1e9) return { value: new Complex(NaN, NaN), terms: 0, lastTerm: NaN, converged: false };
  let sum = term(peak); let last = sum.abs(); let k = 1;
  for (; k <= CHECK_TERMS; k++) {
    const pair = term(peak + k).add(term(peak - k));
    sum = sum.add(pair);
    last = Math.max(term(peak + k).abs(), term(peak - k).abs());
    if (last < 1e-17 * Math.max(sum.abs(), 1e-300)) break;
  }
  return { value: sum, terms: 2 * Math.min(k, CHECK_TERMS) + 1, lastTerm: last, converged: k <= CHECK_TERMS };
}

/**
 * The same sum by Poisson resummation: with a = alpha/pi, b = beta/(2*pi*i),
 *   sum_n exp(-pi*a*n^2 + 2*pi*i*b*n) = a^(-1/2) * sum_m exp(-pi*(m - b)^2/a),   Re a > 0,
 * principal a^(-1/2). Whichever side decays faster is summed (both are exact identities).
 */
export function poissonSum(g: GaussianSumNumbers): Complex {
  const a = g.alpha.div(Math.PI);
  const b = g.beta.div(I.mul(2 * Math.PI));
  const inv = ONE.div(a);
  // decay per step: exp(-Re alpha) directly, exp(-pi*Re(1/a)) on the resummed side
  if (g.alpha.re >= Math.PI * inv.re) return sumByTerms(g).value;
  const dual: GaussianSumNumbers = {
    alpha: inv.mul(Math.PI),
    beta: b.mul(inv).mul(2 * Math.PI),
    gamma: b.mul(b).mul(inv).mul(-Math.PI),
  };
  // -pi*(m - b)^2/a = -(pi/a) m^2 + (2*pi*b/a) m - pi*b^2/a
  return sumByTerms(dual).value.div(a.sqrt()).mul(g.gamma.exp());
}

/**
 * The small-a form: sum = a^(-1/2) * (exp(-pi*(m0 - b)^2/a) + R) with m0 the integer nearest
 * c = Re b - Im b * Im(1/a)/Re(1/a) (where |exp(-pi*(m - b)^2/a)| peaks: it equals
 * exp(pi*(Im b)^2*|1/a|^2/s) * exp(-pi*s*(m - c)^2), s = Re(1/a)), and
 *   |R| <= 2*exp(-pi*s*(1 - d)^2) / (1 - exp(-2*pi*s*(1 - d))) * exp(pi*(Im b)^2*|1/a|^2/s),
 * d = |m0 - c| <= 1/2: each m != m0 is at distance at least |m - m0| - d from c, and
 * (j - d)^2 >= (1 - d)^2 + 2*(1 - d)*(j - 1) for j >= 1, a geometric series on each side.
 */
export function smallAForm(a: Complex, b: Complex): { m0: number; leading: Complex; bound: number } {
  const inv = ONE.div(a);
  const s = inv.re;
  const c = b.re - b.im * inv.im / s;
  const m0 = Math.round(c);
  const d = Math.abs(m0 - c);
  const lift = Math.exp(Math.PI * b.im * b.im * (inv.abs() ** 2) / s);
  const bound = 2 * Math.exp(-Math.PI * s * (1 - d) ** 2) / (1 - Math.exp(-2 * Math.PI * s * (1 - d))) * lift;
  const leading = b.neg().add(m0).pow(2).mul(inv).mul(-Math.PI).exp();
  return { m0, leading, bound };
}
