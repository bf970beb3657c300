/**
 * How the record writes numbers that come from floating point: always with "≈" in
 * front, six significant digits unless asked, never dressed up as a fraction.
 * Counts and exact values are written by their own code, not through here.
 *
 * Example: approx(3.14159265) is "≈ 3.14159"; complexApprox({re: 1, im: -2}) is "≈ 1 - 2*i".
 */
import type { ComplexValue, PointValues } from '../evaluation.js';

/** Six significant digits, no trailing zeros, no "-0". */
export function digits(x: number, n = 6): string {
  if (!Number.isFinite(x)) return Number.isNaN(x) ? 'NaN' : x > 0 ? 'infinity' : '-infinity';
  const s = Number(x.toPrecision(n)).toString();
  return s === '-0' ? '0' : s;
}

/** re + im*i with each part written by f; a unit imaginary part as i. */
export function complexParts(z: ComplexValue, f: (x: number) => string): string {
  const tiny = 1e-15 * Math.max(Math.abs(z.re), Math.abs(z.im));
  const re = Math.abs(z.re) <= tiny ? 0 : z.re;
  const im = Math.abs(z.im) <= tiny ? 0 : z.im;
  if (im === 0) return f(re);
  const mag = f(Math.abs(im));
  const imag = mag === '1' ? 'i' : `${mag}*i`;
  if (re === 0) return im < 0 ? `-${imag}` : imag;
  return `${f(re)} ${im < 0 ? '-' : '+'} ${imag}`;
}

export const approx = (x: number, n = 6) => `≈ ${digits(x, n)}`;
export const complexApprox = (z: ComplexValue, n = 6) => `≈ ${complexParts(z, (x) => digits(x, n))}`;
/** The LaTeX of a floating-point complex number, with \approx. */
export const complexApproxLatex = (z: ComplexValue, n = 6) => `\\approx ${complexParts(z, (x) => digits(x, n)).replace(/\*i/g, '\\,i')}`;

/** "= 2" when six digits write the value exactly, else "≈ 0.376412": a chosen point is exact, a rounded one is marked. */
export function valueText(z: ComplexValue, n = 6): string {
  const exact = [z.re, z.im].every((x) => Number(digits(x, n)) === x || x === 0);
  return `${exact ? '= ' : '≈ '}${complexParts(z, (x) => digits(x, n))}`;
}

/** k = 1, lam ≈ 0.376412: a point's parameter values. */
export function pointText(p: PointValues | undefined): string {
  if (!p) return '';
  return Object.entries(p).map(([k, v]) => `${k} ${valueText(v)}`).join(', ');
}

/** An angle in radians as a multiple of pi, marked as floating point unless it is 0. */
export function piMultipleText(a: number): string {
  // four decimals in units of pi: rounding noise of a zero sum shows as ≈ 0, never as -7.1e-17*pi
  const m = Number((a / Math.PI).toFixed(4)).toString().replace(/^-0$/, '0');
  if (m === '0') return a === 0 ? '0' : '≈ 0';
  if (m === '1') return '≈ pi';
  if (m === '-1') return '≈ -pi';
  return `≈ ${m}*pi`;
}

/** ≈ 2.50663 × 10^217147 (a value outside double range). */
export function scaledText(v: { mantissa: ComplexValue; exponent10: number }, n = 6): string {
  const m = complexParts(v.mantissa, (x) => digits(x, n));
  return `≈ ${v.mantissa.re !== 0 && v.mantissa.im !== 0 ? `(${m})` : m} × 10^${v.exponent10}`;
}

/** The same multiple of pi for LaTeX: four decimals, marked approximate. */
export function piMultipleLatex(a: number): string {
  const m = Number((a / Math.PI).toFixed(4)).toString().replace(/^-0$/, '0');
  return a === 0 ? '0' : `\\approx ${m}\\,\\pi`;
}
