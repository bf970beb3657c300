/** Words and formulas for the step record of a Gaussian integral. */
import type { Expr } from '../lang/ast.js';
import type { PolarValue } from '../../shared/evaluation.js';
import { toLatex, toText } from '../expr/print.js';
import { tidy } from '../expr/tidy.js';
import type { C } from '../numeric/cmatrix.js';

export const fmt = (x: number, digits = 6) => Number(x.toPrecision(digits)).toString();

export function polar(z: C): PolarValue { return { re: z.re, im: z.im, arg: Math.atan2(z.im, z.re) }; }

/** An angle as a multiple of pi, e.g. "0.4375*pi". */
export const piMultiple = (a: number) => `${fmt(a / Math.PI, 4)}*pi`;

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
  if (im === 0) return fmt(re, digits);
  if (re === 0) return `${fmt(im, digits)}*i`;
  return `${fmt(re, digits)} ${im < 0 ? '-' : '+'} ${fmt(Math.abs(im), digits)}*i`;
}
export const complexLatex = (z: C, digits = 6) => complexText(z, digits).replace(/\*i/g, '\\,i');
