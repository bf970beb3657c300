/** param NAME, ... : DOMAIN */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Statement } from '../lang/ast.js';
import { blankReport, StatementFailure, type Context } from './context.js';

export function evaluateParam(s: Extract<Statement, { kind: 'param' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  for (const n of s.names) {
    const earlier = ctx.params.get(n.name);
    if (earlier) throw new StatementFailure(`The parameter ${n.name} is already declared on line ${earlier.line}.`, line, n.span.start.column);
    if (ctx.results.has(n.name)) throw new StatementFailure(`${n.name} already names a result; choose another name for the parameter.`, line, n.span.start.column);
  }
  for (const n of s.names) ctx.params.set(n.name, { domain: s.domain, line, ...(s.integer ? { integer: true } : {}) });
  const names = s.names.map((n) => n.name);
  const report = blankReport(line, 'param', names.join(', '));
  report.steps.push({ kind: 'param', names, domain: s.domain, ...(s.integer ? { integer: true } : {}) });
  return report;
}
