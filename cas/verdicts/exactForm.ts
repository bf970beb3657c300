/**
 * A quadratic form read exactly: every entry of A, J and c as a rational function of
 * the parameters with exact Gaussian-rational coefficients, or null when some entry is
 * not rational in them (a sqrt, an exp, a decimal power): such integrals are decided
 * by sampling instead, and say so.
 */
import type { QuadraticForm } from '../gaussian/form.js';
import { fromExpr } from '../exact/ratfunc.js';
import type { ExactForm } from './exactGaussian.js';

export function exactFormOf(form: QuadraticForm): ExactForm | null {
  const A = form.A.map((row) => row.map((e) => fromExpr(e)));
  const J = form.J.map((e) => fromExpr(e));
  const c = fromExpr(form.c);
  if (A.some((row) => row.some((x) => !x)) || J.some((x) => !x) || !c) return null;
  return { vars: form.vars, A: A as NonNullable<(typeof A)[number][number]>[][], J: J as NonNullable<(typeof J)[number]>[], c };
}
