/**
 * verify NAME [at p = v, ...] [with tolerance t]: the integral by numerical quadrature along the
 * contour the record says, by code that shares nothing with the closed-form path. The integrand is
 * read only by evaluating it (its exponent polarized into numbers, cross-checked against the whole
 * integrand at random points); no determinant, eigenvalue, pivot or square root of det A is used.
 */
import type { StatementReport } from '../../shared/evaluation.js';
import type { DiagramData } from '../../shared/diagram.js';
import type { Statement } from '../lang/ast.js';
import { Complex } from 'complex.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames } from '../expr/names.js';
import { splitIntegrand } from '../gaussian/integrand.js';
import { integrateGaussian, realPartScore, type QuadraticIntegrand } from '../numeric/quadrature.js';
import { describePoint, pointRecord, rng, type Point } from '../domains/sample.js';
import { complexApprox, complexApproxLatex } from '../../shared/record/numbers.js';
import { blankReport, StatementFailure, type Context } from './context.js';
import { angleFormula, bindPoint, rel, resultNamed, unitLine } from './shared.js';
import { isSeriesTarget, verifySeries } from './verifySeries.js';
import { verifyDeterminant } from './verifyDeterminant.js';

export const DEFAULT_TOLERANCE = 1e-8;
/** The quadrature's own time budget (below the statement's limit, so that hitting it is reported, not fatal). */
export const VERIFY_BUDGET_MS = 3500;

/** The verdict of a quadrature against a closed-form value: exported so tests can feed it a wrong closed form. */
export function agreesWithClosedForm(quad: { re: number; im: number }, closed: { re: number; im: number }, tolerance = DEFAULT_TOLERANCE): { agrees: boolean; relativeDifference: number } {
  const d = rel(quad, closed);
  return { agrees: Number.isFinite(d) && d <= tolerance, relativeDifference: d };
}

/** Numbers of the quadratic exponent by polarization: S(0), S(+-e_j), S(e_j + e_k). */
function polarize(exponent: ReturnType<typeof splitIntegrand>['exponent'], vars: readonly string[], p: Point): QuadraticIntegrand {
  const n = vars.length;
  const S = (x: number[]) => {
    const env = new Map(p);
    vars.forEach((v, k) => env.set(v, new Complex(x[k]!, 0)));
    return evaluate(exponent, env);
  };
  const e = (j: number, s = 1) => vars.map((_, k) => (k === j ? s : 0));
  const c = S(vars.map(() => 0));
  const are: number[] = new Array(n * n).fill(0); const aim: number[] = new Array(n * n).fill(0);
  const jre: number[] = []; const jim: number[] = [];
  const plus = vars.map((_, j) => S(e(j)));
  const minus = vars.map((_, j) => S(e(j, -1)));
  for (let j = 0; j < n; j++) {
    const jj = plus[j]!.sub(minus[j]!).div(2);
    jre.push(jj.re); jim.push(jj.im);
    const ajj = plus[j]!.add(minus[j]!).sub(c.mul(2)).neg();
    are[j * n + j] = ajj.re; aim[j * n + j] = ajj.im;
    for (let k = j + 1; k < n; k++) {
      const both = S(vars.map((_, m) => (m === j || m === k ? 1 : 0)));
      // S(e_j + e_k) = c + J_j + J_k - A_jj/2 - A_kk/2 - A_jk
      const ajk = both.sub(c).sub(plus[j]!.sub(c)).sub(plus[k]!.sub(c)).neg();
      are[j * n + k] = are[k * n + j] = ajk.re; aim[j * n + k] = aim[k * n + j] = ajk.im;
    }
  }
  return { n, are, aim, jre, jim, cre: c.re, cim: c.im, pre: 1, pim: 0 };
}

/** D A D, D J for x_j = e^(i d_j) y_j, with the Jacobian folded into the prefactor. */
function rotateNumbers(q: QuadraticIntegrand, d: readonly number[]): QuadraticIntegrand {
  const n = q.n;
  const u = d.map((a) => new Complex(Math.cos(a), Math.sin(a)));
  const are = [...q.are]; const aim = [...q.aim];
  for (let r = 0; r < n; r++) for (let s = 0; s < n; s++) {
    const z = new Complex(q.are[r * n + s]!, q.aim[r * n + s]!).mul(u[r]!).mul(u[s]!);
    are[r * n + s] = z.re; aim[r * n + s] = z.im;
  }
  const J = q.jre.map((re, k) => new Complex(re, q.jim[k]!).mul(u[k]!));
  const jac = u.reduce((a, b) => a.mul(b), new Complex(q.pre, q.pim));
  return { ...q, are, aim, jre: J.map((z) => z.re), jim: J.map((z) => z.im), pre: jac.re, pim: jac.im };
}

/** A further legal rotation that makes Re A positive definite, for an oscillatory integrand. */
function smallLegalRotation(q: QuadraticIntegrand): { angles: number[]; checked: number } | null {
  const n = q.n;
  let best: { angles: number[]; score: number } | null = null;
  let checked = 0;
  for (const mag of [Math.PI / 4, Math.PI / 8, Math.PI / 16, 0.05]) {
    for (let mask = 0; mask < 1 << n; mask++) {
      const angles = Array.from({ length: n }, (_, k) => ((mask >> k) & 1 ? -mag : mag));
      const end = realPartScore(rotateNumbers(q, angles));
      if (end === null) continue;
      // the swept family must not grow: Re A stays positive definite for every t in (0, 1]
      let ok = true;
      for (let t = 1; t <= 32 && ok; t++) { checked++; if (realPartScore(rotateNumbers(q, angles.map((a) => (a * t) / 32))) === null) ok = false; }
      if (ok && (!best || end > best.score)) best = { angles, score: end };
    }
    if (best) return { angles: best.angles, checked };
  }
  return null;
}

export function evaluateVerify(s: Extract<Statement, { kind: 'verify' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.target.name;
  const report = blankReport(line, 'verify', name);
  const result = resultNamed(ctx, s.target, line, 'check');
  const g = result.gaussian;
  const series = isSeriesTarget(result, ctx);
  if (!g && !series && !result.determinant) {
    throw new StatementFailure(`${name} is not something verify can recompute independently: it checks integrals and rotated results by quadrature, sums and eta by partial sums and products, and functional determinants by solving y'' = V y. (A zeta-regularised product is defined by continuation, with no convergent partial products to compare; a sliced determinant is checked against its explicit matrix in its own record.)`, line, s.target.span.start.column);
  }
  const p = bindPoint(ctx, s.at, line);
  const missing = result.params.filter((x) => !p.has(x));
  if (missing.length) throw new StatementFailure(`${name} depends on ${missing.join(', ')}; give ${missing.length > 1 ? 'them values' : 'it a value'} with at ${missing.map((m) => `${m} = ...`).join(', ')}.`, line, s.span.start.column);
  let tolerance = DEFAULT_TOLERANCE;
  if (s.tolerance) {
    if (freeNames(s.tolerance).size) throw new StatementFailure('The tolerance must be a number.', line, s.span.start.column);
    const t = evaluate(s.tolerance, new Map());
    if (!(t.im === 0 && t.re > 0 && t.re < 1)) throw new StatementFailure('The tolerance must be a number between 0 and 1.', line, s.span.start.column);
    tolerance = t.re;
  }
  // functional determinants: the initial-value problem (verifyDeterminant.ts)
  if (!g && result.determinant) return verifyDeterminant(name, result, p, tolerance, line, s.span.start.column, report);
  // sums and eta: partial sums and products against the closed-form side (verifySeries.ts)
  if (!g) return verifySeries(name, result, p, tolerance, line, s.span.start.column, ctx, report);
  const n = g.vars.length;
  const where = p.size ? ` at ${describePoint(p)}` : '';
  const contourWords = g.contour
    ? `along the rotated contour of ${g.contour.of} (${g.contour.labels.join(', ')}), written as the rotated integrand over real variables`
    : 'along the real contour';
  const base = {
    kind: 'numeric-check' as const, name, vars: n,
    contour: g.contour ? 'rotated' as const : 'real' as const, contourLabels: g.contour?.labels ?? [],
    ...(g.contour ? { contourOf: g.contour.of } : {}),
    ...(p.size ? { at: pointRecord(p) } : {}),
  };
  const fail = (refused: 'too-many-variables' | 'no-contour', message: string) => {
    report.status = 'error';
    report.agrees = false;
    report.steps.push({ ...base, refused, value: null, errorEstimate: null, evaluations: 0, timeMs: 0, tolerance, truncation: 0, timedOut: false, integrandCheck: 0 });
    report.error = { message, line, column: s.span.start.column };
    return report;
  };
  if (n > 3) {
    return fail('too-many-variables',
      `The numeric check is out of reach for ${n} variables (verify handles one to three).`);
  }
  const split = splitIntegrand(g.integrand, new Set(g.vars));
  const q0 = polarize(split.exponent, g.vars, p);
  const pref = evaluate(split.prefactor, p);
  q0.pre = pref.re; q0.pim = pref.im;
  // cross-check the numbers against the integrand as written, at random real points
  const r = rng(4242);
  let worst = 0;
  for (let k = 0; k < 5; k++) {
    const x = g.vars.map(() => (r() * 2 - 1) * 1.5);
    const env = new Map(p);
    g.vars.forEach((v, j) => env.set(v, new Complex(x[j]!, 0)));
    const direct = evaluate(g.integrand, env);
    let sr = q0.cre; let si = q0.cim;
    for (let a = 0; a < n; a++) {
      sr += q0.jre[a]! * x[a]!; si += q0.jim[a]! * x[a]!;
      for (let b = 0; b < n; b++) { sr -= q0.are[a * n + b]! * x[a]! * x[b]! / 2; si -= q0.aim[a * n + b]! * x[a]! * x[b]! / 2; }
    }
    const viaNumbers = new Complex(sr, si).exp().mul(pref);
    worst = Math.max(worst, rel(viaNumbers, direct));
  }
  if (!(worst < 1e-9)) throw new StatementFailure(`The integrand of ${name} is not reproduced by a quadratic exponent (relative difference ${worst.toExponential(2)}).`, line, s.span.start.column);

  let q: QuadraticIntegrand = q0;
  let extra: { angles: number[]; checked: number } | null = null;
  if (realPartScore(q0) === null) {
    extra = smallLegalRotation(q0);
    if (!extra) {
      return fail('no-contour',
        `No contour within reach makes ${name} absolutely convergent${where}; the numeric check was not attempted.`);
    }
    q = rotateNumbers(q0, extra.angles);
  }
  const closed = result.valueAt(p);
  const quad = integrateGaussian(q, tolerance / 100, VERIFY_BUDGET_MS);
  const value = { re: quad.re, im: quad.im };
  const extraRotation = extra
    ? { vars: g.vars, angles: extra.angles.map(angleFormula), checked: extra.checked }
    : undefined;
  const quadStep = {
    ...base, ...(extraRotation ? { extraRotation } : {}),
    value: quad.timedOut ? null : { re: quad.re, im: quad.im }, errorEstimate: quad.timedOut ? null : quad.error,
    evaluations: quad.evaluations, timeMs: quad.timeMs, tolerance, truncation: quad.truncation, timedOut: quad.timedOut, integrandCheck: worst,
  };
  report.diagram = {
    contours: [
      { label: g.contour ? `Contour of ${name}` : 'Real contour', role: g.contour ? 'rotated' : 'real', points: g.contour ? unitLine(g.contour.angles.find((a) => a !== 0) ?? 0) : unitLine(0) },
      ...(extra ? [{ label: 'Quadrature contour (further legal rotation)', role: 'rotated' as const, points: unitLine(extra.angles[0]! + (g.contour?.angles[0] ?? 0)) }] : []),
    ],
    sectors: [], cuts: [], paths: [], tracks: [], eigenvalues: [],
  } satisfies DiagramData;
  if (quad.timedOut) {
    report.status = 'failed';
    report.agrees = false;
    report.steps.push(quadStep);
    report.error = { message: `The numeric check of ${name} hit its time limit of ${VERIFY_BUDGET_MS / 1000} s.`, line, column: s.span.start.column };
    return report;
  }
  const verdict = closed ? agreesWithClosedForm(value, closed, tolerance) : { agrees: false, relativeDifference: NaN };
  // the printed formula too, evaluated as a reader would (principal roots as printed)
  let printed: { value: { re: number; im: number }; relativeDifference: number; agrees: boolean } | undefined;
  if (result.expr) {
    try {
      const w = evaluate(result.expr, p);
      if (Number.isFinite(w.re) && Number.isFinite(w.im)) {
        const d = agreesWithClosedForm(value, w, tolerance);
        printed = { value: { re: w.re, im: w.im }, relativeDifference: d.relativeDifference, agrees: d.agrees };
      }
    } catch { /* a printed form that cannot be evaluated here is reported as not checked */ }
  }
  const agrees = verdict.agrees && (printed?.agrees ?? true);
  report.agrees = agrees;
  report.status = agrees ? 'ok' : 'failed';
  report.result = { text: complexApprox(value, 15), latex: complexApproxLatex(value, 15), value };
  report.steps.push(quadStep);
  report.steps.push({
    kind: 'numeric-agreement', name, closed: closed ? { re: closed.re, im: closed.im } : null,
    relativeDifference: closed && Number.isFinite(verdict.relativeDifference) ? verdict.relativeDifference : null, tolerance, agrees,
    ...(printed ? { printed } : {}),
  });
  if (!verdict.agrees) report.error = { message: `The numeric check of ${name} disagrees with the closed form${where} (relative difference ${verdict.relativeDifference.toExponential(2)}).`, line, column: s.span.start.column };
  else if (printed && !printed.agrees) report.error = { message: `The printed formula of ${name}, evaluated with principal roots as printed, disagrees with the quadrature${where} (relative difference ${printed.relativeDifference.toExponential(2)}).`, line, column: s.span.start.column };
  return report;
}
