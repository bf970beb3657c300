/** Statements the language accepts but this version does not evaluate yet. */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Statement } from '../lang/ast.js';
import { StatementFailure } from './context.js';

export function evaluateLater(s: Extract<Statement, { kind: 'rotate' | 'continue' | 'compare' | 'verify' | 'limit' | 'let' }>): StatementReport {
  throw new StatementFailure(`\`${s.kind}\` is not yet supported in this version.`, s.span.start.line, s.span.start.column);
}
