/** param NAME, ... : DOMAIN */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Statement } from '../lang/ast.js';
import { blankReport, StatementFailure, type Context } from './context.js';

const DOMAIN_WORDS = {
  positive: 'a positive real number', negative: 'a negative real number', real: 'a real number',
  complex: 'a complex number', nonzero: 'a nonzero real number',
} as const;

export function evaluateParam(s: Extract<Statement, { kind: 'param' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  for (const n of s.names) {
    const earlier = ctx.params.get(n.name);
    if (earlier) throw new StatementFailure(`The parameter ${n.name} is already declared on line ${earlier.line}.`, line, n.span.start.column);
    if (ctx.results.has(n.name)) throw new StatementFailure(`${n.name} already names a result; choose another name for the parameter.`, line, n.span.start.column);
  }
  for (const n of s.names) ctx.params.set(n.name, { domain: s.domain, line });
  const names = s.names.map((n) => n.name);
  const report = blankReport(line, 'param', names.join(', '));
  report.steps.push({
    kind: 'param',
    text: `${names.join(', ')} ${names.length > 1 ? 'are' : 'is'} ${DOMAIN_WORDS[s.domain]}.`,
    latex: `${names.join(', ')} \\in ${{ positive: '(0, \\infty)', negative: '(-\\infty, 0)', real: '\\mathbb{R}', complex: '\\mathbb{C}', nonzero: '\\mathbb{R} \\setminus \\{0\\}' }[s.domain]}`,
  });
  return report;
}
