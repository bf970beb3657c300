/**
 * A quadratic form read exactly: every entry of A, J and c as a rational function of
 * the parameters with exact Gaussian-rational coefficients, or null when some entry is
 * not rational in them (a sqrt, an exp, a decimal power): such integrals are decided
 * by sampling instead, and say so. An entry whose square roots cancel once reduced by
 * their squares is rational (expr/rootsReduced.ts): a contour rotated by exp(i*pi/4)
 * gives -i*w*exp(i*pi/4)^2 = w.
 */
import type { QuadraticForm } from '../gaussian/form.js';
import { fromExpr } from '../exact/ratfunc.js';
import { rationalWithRootsReduced } from '../expr/rootsReduced.js';
import type { ExactForm } from './exactGaussian.js';

export function exactFormOf(form: QuadraticForm): ExactForm | null {
  const exact = (e: Parameters<typeof fromExpr>[0]) => fromExpr(e) ?? rationalWithRootsReduced(e);
  const A = form.A.map((row) => row.map(exact));
  const J = form.J.map(exact);
  const c = exact(form.c);
  if (A.some((row) => row.some((x) => !x)) || J.some((x) => !x) || !c) return null;
  return { vars: form.vars, A: A as NonNullable<(typeof A)[number][number]>[][], J: J as NonNullable<(typeof J)[number]>[], c };
}
