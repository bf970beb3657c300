/** A quadratic form evaluated at a parameter point: the numbers every verdict is decided from. */
import { Complex } from 'complex.js';
import type { Expr } from '../lang/ast.js';
import { evaluate } from '../expr/evaluate.js';
import type { Point } from '../domains/sample.js';
import { cdiv, cexp, cmat, cmul, ldl, ldlSolve, luSolveDet, type C, type CMat } from '../numeric/cmatrix.js';
import type { QuadraticForm } from './form.js';
import { convergenceAt, type PointVerdict } from './convergenceAt.js';
import { branchAt, type BranchAt } from './branchAt.js';

export interface NumericForm { A: CMat; J: C[]; c: C; prefactor: C }

const toC = (z: Complex): C => ({ re: z.re, im: z.im });

export function numericForm(form: QuadraticForm, prefactor: Expr, p: Point): NumericForm {
  const n = form.vars.length;
  const A = cmat(n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
    const z = evaluate(form.A[i]![j]!, p);
    A.re[i * n + j] = z.re; A.im[i * n + j] = z.im;
  }
  return { A, J: form.J.map((e) => toC(evaluate(e, p))), c: toC(evaluate(form.c, p)), prefactor: toC(evaluate(prefactor, p)) };
}

export interface PointAnalysis { verdict: PointVerdict; branch: BranchAt | null; value: C | null }

/** (2 pi)^(n/2) pref / sqrtDet * exp(J^T A^-1 J / 2 + c). */
export function gaussianValue(f: NumericForm, sqrtDet: C): C {
  const n = f.A.n;
  const fact = ldl(f.A);
  const x = fact ? ldlSolve(fact, f.J) : luSolveDet(f.A, f.J)?.x;
  if (!x) return { re: NaN, im: NaN };
  let q: C = { re: 0, im: 0 };
  for (let k = 0; k < n; k++) { const t = cmul(f.J[k]!, x[k]!); q = { re: q.re + t.re, im: q.im + t.im }; }
  const e = cexp({ re: q.re / 2 + f.c.re, im: q.im / 2 + f.c.im });
  const scale = Math.pow(2 * Math.PI, n / 2);
  return cmul(cdiv(cmul(f.prefactor, e), sqrtDet), { re: scale, im: 0 });
}

export function analyzeAt(f: NumericForm): PointAnalysis {
  const verdict = convergenceAt(f.A);
  if (verdict.kind === 'divergent') return { verdict, branch: null, value: null };
  const branch = branchAt(f.A, verdict.kind === 'absolute');
  return { verdict, branch, value: gaussianValue(f, branch.sqrtDet) };
}

/**
 * The value through its logarithm, for values outside double range:
 * log V = log(prefactor) + (n/2) log(2 pi) - log(sqrt det A) + J^T A^-1 J / 2 + c,
 * returned as mantissa * 10^exponent10.
 */
export function gaussianValueScaled(f: NumericForm, sqrtDet: C): { mantissa: C; exponent10: number } | null {
  const n = f.A.n;
  const fact = ldl(f.A);
  const x = fact ? ldlSolve(fact, f.J) : luSolveDet(f.A, f.J)?.x;
  if (!x) return null;
  let q: C = { re: 0, im: 0 };
  for (let k = 0; k < n; k++) { const t = cmul(f.J[k]!, x[k]!); q = { re: q.re + t.re, im: q.im + t.im }; }
  const logAbs = Math.log(Math.hypot(f.prefactor.re, f.prefactor.im)) + (n / 2) * Math.log(2 * Math.PI)
    - Math.log(Math.hypot(sqrtDet.re, sqrtDet.im)) + q.re / 2 + f.c.re;
  const phase = Math.atan2(f.prefactor.im, f.prefactor.re) - Math.atan2(sqrtDet.im, sqrtDet.re) + q.im / 2 + f.c.im;
  if (!Number.isFinite(logAbs) || !Number.isFinite(phase)) return null;
  const log10 = logAbs / Math.LN10;
  const e = Math.floor(log10);
  const m = Math.pow(10, log10 - e);
  return { mantissa: { re: m * Math.cos(phase), im: m * Math.sin(phase) }, exponent10: e };
}
