/** The computation core's public API. Imports nothing from server/ or src/. */
export { evaluateWorksheet, type EvaluateOptions, type StoppedStatement } from './worksheet.js';
export { parseWorksheet, parseExpression, type ParsedWorksheet, type ParsedLine, type ParseError } from './lang/parse.js';
export { timeLimitMessage, type StopReason } from './deadline.js';
export type { Statement, Expr, Span, Pos } from './lang/ast.js';
export type { WorksheetReport, StatementReport, Step, StepKind, Convergence, Proof, ResultRecord, BranchRecord } from '../shared/evaluation.js';
export { statementNames, type StatementNames } from './lang/statement-names.js';
export { ENGINE_VERSION } from './version.js';
