/**
 * expect NAME = EXPR. Decided numerically at sampled points of the domains,
 * against the result's continuous branch (never its written form alone); when the
 * algebra package also simplifies the difference to 0, the verdict is "proved".
 */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Statement } from '../lang/ast.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames } from '../expr/names.js';
import { toLatex, toText } from '../expr/print.js';
import { simplifiesToZero } from '../algebra/adapter.js';
import { describePoint, pointRecord, samplePoints } from '../domains/sample.js';
import { complexText } from '../gaussian/describe.js';
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
  const points = ordered.length ? samplePoints(domainsOf(ctx, ordered), ordered, EXPECT_SAMPLES, 777) : [new Map()];
  let compared = 0;
  let worst = 0;
  let failure: string | null = null;
  let failureAt = null;
  for (const p of points) {
    checkDeadline();
    const lhs = result.valueAt(p);
    if (!lhs) continue; // the integral diverges here; nothing to compare
    let rhs;
    try { rhs = evaluate(s.expr, p); } catch { continue; }
    const d = Math.hypot(lhs.re - rhs.re, lhs.im - rhs.im) / Math.max(Math.hypot(lhs.re, lhs.im), rhs.abs(), 1e-300);
    compared++;
    worst = Math.max(worst, d);
    if (!(d <= TOLERANCE) && failure === null) {
      failure = `at ${ordered.length ? describePoint(p) : 'the computed value'}, ${name} = ${complexText(lhs, 12)} but the expected value is ${complexText({ re: rhs.re, im: rhs.im }, 12)}`;
      failureAt = p;
    }
  }
  if (compared === 0) throw new StatementFailure(`${name} diverges at every sampled point, so there is nothing to compare.`, line, s.name.span.start.column);
  const exact = failure === null && result.expr !== null && simplifiesToZero(result.expr, s.expr);
  report.status = failure === null ? 'ok' : 'failed';
  report.proof = exact ? 'proved' : 'sampled';
  const where = ordered.length ? `${compared} sampled points` : 'the computed value';
  report.steps.push({
    kind: 'expect',
    text: failure === null
      ? `${name} = ${toText(s.expr)} holds: ${exact ? 'the difference simplifies to 0 exactly, and ' : ''}the values agree at ${where} (largest relative difference ${worst.toExponential(2)}${exact ? '' : '; checked, not proved'}).`
      : `${name} = ${toText(s.expr)} does not hold: ${failure}.`,
    latex: `${toLatex({ t: 'name', name })} ${failure === null ? '=' : '\\neq'} ${toLatex(s.expr)}`,
    samples: { count: compared, agreeing: failure === null ? compared : 0 },
    relativeError: worst,
    ...(failureAt ? { at: pointRecord(failureAt) } : {}),
  });
  if (failure !== null) report.error = { message: `Expectation failed: ${failure}.`, line, column: s.span.start.column };
  return report;
}
