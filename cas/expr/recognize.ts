/**
 * A number read off numerically, written as a simple closed form when it is one:
 * q * 2^(s/2) * pi^(m/2) with q a small fraction, s in {0, 1}, m in {0, ..., 4}, real
 * or purely imaginary. These are the constants Gaussian integrals produce ((2 pi)^(n/2),
 * sqrt(pi), ...). A match within `tolerance` is a guess that fits, not a proof: callers
 * confirm it at other points and say so.
 *
 * Example: recognizeConstant({ re: 6.283185307179586, im: 0 }) is 2*pi.
 */
import type { Expr } from '../lang/ast.js';
import { div, I, mul, neg, num, PI, pow } from './build.js';
import { tidy } from './tidy.js';

const MAX_DENOMINATOR = 24;
const MAX_NUMERATOR = 1000;

function fraction(x: number, tolerance: number): [number, number] | null {
  for (let q = 1; q <= MAX_DENOMINATOR; q++) {
    const p = Math.round(x * q);
    if (p !== 0 && Math.abs(p) <= MAX_NUMERATOR && Math.abs(p - x * q) <= tolerance * Math.abs(x * q)) return [p, q];
  }
  return null;
}

function realForm(x: number, tolerance: number): Expr | null {
  // Simplest first: fewer factors of sqrt(2), then lower powers of pi.
  for (const s of [0, 1]) for (let m = 0; m <= 4; m++) {
    const scale = Math.SQRT2 ** s * Math.PI ** (m / 2);
    const f = fraction(x / scale, tolerance);
    if (!f) continue;
    const [p, q] = f;
    let e: Expr = num(Math.abs(p));
    if (s) e = mul(e, pow(num(2), div(num(1), num(2))));
    if (m) e = mul(e, m === 2 ? PI : pow(PI, m % 2 ? div(num(m), num(2)) : num(m / 2)));
    if (q !== 1) e = div(e, num(q));
    return p < 0 ? neg(e) : e;
  }
  return null;
}

export function recognizeConstant(z: { re: number; im: number }, tolerance = 1e-9): Expr | null {
  const size = Math.hypot(z.re, z.im);
  if (!(size > 0) || !Number.isFinite(size)) return null;
  if (Math.abs(z.im) <= tolerance * size) {
    const e = realForm(z.re, tolerance);
    return e && tidy(e);
  }
  if (Math.abs(z.re) <= tolerance * size) {
    const e = realForm(z.im, tolerance);
    return e && tidy(mul(e, I));
  }
  return null;
}
