/**
 * expect NAME = EXPR. Decided numerically at sampled points of the domains,
 * against the result's continuous branch (never its written form alone); when the
 * algebra package also simplifies the difference to 0, the verdict is "proved".
 */
import type { StatementReport, Step } from '../../shared/evaluation.js';
import { decideExpectExactly } from '../verdicts/expectExact.js';
import { sameFunctionHow } from '../verdicts/identity.js';
import { renderStep } from '../../shared/record/render.js';
import type { Statement } from '../lang/ast.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames } from '../expr/names.js';
import { formulaOf } from '../expr/print.js';
import { pointRecord, sampledBasis, samplePoints } from '../domains/sample.js';
import { complexApprox, pointText } from '../../shared/record/numbers.js';
import { checkDeadline } from '../deadline.js';
import { blankReport, domainsOf, StatementFailure, type Context } from './context.js';

const EXPECT_SAMPLES = 24;
const TOLERANCE = 1e-9;

export function evaluateExpect(s: Extract<Statement, { kind: 'expect' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.name.name;
  const report = blankReport(line, 'expect', name);
  const result = ctx.results.get(name);
  if (!result) throw new StatementFailure(`There is no result named ${name} above this line.`, line, s.name.span.start.column);
  if (result.unavailable || !result.valueAt) {
    throw new StatementFailure(`This expectation depends on ${result.unavailable ?? `${name}, which has no value`}.`, line, s.name.span.start.column);
  }
  const names = new Set(result.params);
  for (const [n, span] of freeNames(s.expr)) {
    if (!ctx.params.has(n)) {
      throw new StatementFailure(`Unknown name "${n}": an expectation may use only declared parameters.`, line, span?.start.column ?? 1);
    }
    names.add(n);
  }
  const ordered = [...ctx.params.keys()].filter((p) => names.has(p));
  // On the whole domain where the forms allow it (rational functions, their roots and exponentials of one parameter).
  const domains = domainsOf(ctx, ordered);
  // Proofs read a let's exact form, not its sampled simplification (ResultInfo.exactForm).
  const proofForm = result.exactForm ?? result.expr;
  const onDomain = proofForm ? decideExpectExactly(proofForm, s.expr, ordered, domains, result.valueAt, samplePoints(domains, ordered, 1)[0] ?? new Map()) : null;
  if (onDomain) {
    const exact = onDomain;
    report.status = exact.holds ? 'ok' : 'failed';
    report.proof = 'proved';
    const step: Step = {
      kind: 'expect', name, expected: formulaOf(s.expr), holds: exact.holds, exact: true, basis: { kind: 'proved' },
      worst: null, regions: exact.regions, how: exact.how,
      ...(exact.counterexample ? { counterexample: exact.counterexample } : {}),
    };
    report.steps.push(step);
    if (!exact.holds) report.error = { message: `Expectation failed: ${renderStep(step).text}`, line, column: s.span.start.column };
    return report;
  }
  // the same function exactly (rational in the parameters and in values of exp, sinh, cosh, sin, cos)
  const identity = proofForm ? sameFunctionHow(proofForm, s.expr) : null;
  if (identity) {
    report.proof = 'proved';
    report.steps.push({ kind: 'expect', name, expected: formulaOf(s.expr), holds: true, exact: true, basis: { kind: 'proved' }, worst: null, regions: [], how: identity === 'values' ? 'identical' : identity });
    return report;
  }
  const points = ordered.length ? samplePoints(domains, ordered, EXPECT_SAMPLES, 777) : [new Map()];
  let compared = 0;
  let worst = 0;
  let failure: string | null = null;
  let failureAt = null;
  let failureValues: { lhs: { re: number; im: number }; rhs: { re: number; im: number } | null } | null = null;
  for (const p of points) {
    checkDeadline();
    const lhs = result.valueAt(p);
    if (!lhs) continue; // the integral diverges here; nothing to compare
    let rhs;
    try { rhs = evaluate(s.expr, p); } catch { continue; }
    // an expected value that is not a finite number fails the expectation there (never a NaN in the record)
    const d = Number.isFinite(rhs.re) && Number.isFinite(rhs.im)
      ? Math.hypot(lhs.re - rhs.re, lhs.im - rhs.im) / Math.max(Math.hypot(lhs.re, lhs.im), rhs.abs(), 1e-300)
      : Infinity;
    compared++;
    worst = Math.max(worst, d);
    if (!(d <= TOLERANCE) && failure === null) {
      failure = `at ${ordered.length ? pointText(pointRecord(p)) : 'the computed value'}, ${name} ${complexApprox(lhs, 12)} but the expected value is ${Number.isFinite(rhs.re) && Number.isFinite(rhs.im) ? complexApprox({ re: rhs.re, im: rhs.im }, 12) : 'not a finite number'}`;
      failureAt = p;
      failureValues = { lhs: { re: lhs.re, im: lhs.im }, rhs: Number.isFinite(rhs.re) && Number.isFinite(rhs.im) ? { re: rhs.re, im: rhs.im } : null };
    }
  }
  if (compared === 0) throw new StatementFailure(`${name} diverges at every sampled point, so there is nothing to compare.`, line, s.name.span.start.column);
  // A general algebra package's "simplifies to 0" ignores branches (sqrt(z^3) = z^(3/2)), so it proves nothing here.
  report.status = failure === null ? 'ok' : 'failed';
  report.proof = 'sampled';
  report.steps.push({
    kind: 'expect', name, expected: formulaOf(s.expr), holds: failure === null, exact: false, regions: [], how: 'sampled',
    basis: ordered.length ? sampledBasis(domainsOf(ctx, ordered), ordered, compared, failure === null ? compared : 0) : { kind: 'numeric' },
    worst: Number.isFinite(worst) ? worst : null,
    ...(failureAt && failureValues ? { counterexample: { at: pointRecord(failureAt), ...failureValues } } : {}),
  });
  if (failure !== null) report.error = { message: `Expectation failed: ${failure}.`, line, column: s.span.start.column };
  return report;
}
