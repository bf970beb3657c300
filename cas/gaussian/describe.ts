/** Words and formulas for the step record of a Gaussian integral. */
import type { Expr } from '../lang/ast.js';
import type { PolarValue } from '../../shared/evaluation.js';
import { toLatex, toText } from '../expr/print.js';
import { tidy } from '../expr/tidy.js';
import type { C } from '../numeric/cmatrix.js';

export const fmt = (x: number, digits = 6) => Number(x.toPrecision(digits)).toString();

export function polar(z: C): PolarValue { return { re: z.re, im: z.im, arg: Math.atan2(z.im, z.re) }; }

/** An angle as a multiple of pi, e.g. "0.4375*pi". */
/** An angle as a multiple of pi: 0, pi, -pi, 0.25*pi. */
export function piMultiple(a: number): string {
  const m = fmt(a / Math.PI, 4);
  return m === '0' || m === '-0' ? '0' : m === '1' ? 'pi' : m === '-1' ? '-pi' : `${m}*pi`;
}

export function matrixLatex(m: readonly (readonly Expr[])[]): string {
  return `\\begin{pmatrix} ${m.map((row) => row.map((e) => toLatex(tidy(e))).join(' & ')).join(' \\\\ ')} \\end{pmatrix}`;
}
export function matrixText(m: readonly (readonly Expr[])[]): string {
  return `[${m.map((row) => `[${row.map((e) => toText(tidy(e))).join(', ')}]`).join(', ')}]`;
}
export function vectorLatex(v: readonly Expr[]): string {
  return `\\begin{pmatrix} ${v.map((e) => toLatex(tidy(e))).join(' \\\\ ')} \\end{pmatrix}`;
}
export function vectorText(v: readonly Expr[]): string { return `(${v.map((e) => toText(tidy(e))).join(', ')})`; }

export function complexText(z: C, digits = 6): string {
  const re = Math.abs(z.re) < 1e-15 * Math.abs(z.im) ? 0 : z.re;
  const im = Math.abs(z.im) < 1e-15 * Math.abs(z.re) ? 0 : z.im;
  return complexFromParts(re, im, (x) => fmt(x, digits));
}
/**
 * re + im*i written with f for each part; a unit imaginary part prints as i (0.33333 + i, -i, 2*i).
 * The one writer of complex numbers in the record's text (and, through complexLatex, its LaTeX).
 */
export function complexFromParts(re: number, im: number, f: (x: number) => string): string {
  if (im === 0) return f(re);
  const mag = f(Math.abs(im));
  const imag = mag === '1' ? 'i' : `${mag}*i`;
  if (re === 0) return im < 0 ? `-${imag}` : imag;
  return `${f(re)} ${im < 0 ? '-' : '+'} ${imag}`;
}
/** exp(m*i*pi/4) in text, with m = 1 and -1 written exp(i*pi/4) and exp(-i*pi/4). */
export const quarterPhaseText = (m: number) => (m === 1 ? 'exp(i*pi/4)' : m === -1 ? 'exp(-i*pi/4)' : `exp(${m}*i*pi/4)`);
export const complexLatex = (z: C, digits = 6) => complexText(z, digits).replace(/\*i/g, '\\,i');
