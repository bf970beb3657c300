/** note "..." — kept with the record, evaluates to itself. */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Statement } from '../lang/ast.js';
import { blankReport } from './context.js';

export function evaluateNote(s: Extract<Statement, { kind: 'note' }>): StatementReport {
  const report = blankReport(s.span.start.line, 'note', null);
  report.steps.push({ kind: 'note', text: s.text });
  return report;
}
