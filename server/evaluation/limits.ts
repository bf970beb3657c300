import { LIMITS } from '../../shared/api.js';
import { statementNames, type ParsedWorksheet } from '../../cas/index.js';
import { HttpError } from '../middleware/http-error.js';
import { measureLine, sourceLines } from './source-lines.js';

const kB = (bytes: number) => `${Math.ceil(bytes / 1024)} kB`;

/** 413 when a worksheet source is larger than the limit (UTF-8 bytes). */
export function checkWorksheetSize(source: string): void {
  const bytes = Buffer.byteLength(source, 'utf8');
  if (bytes > LIMITS.worksheetBytes) {
    throw new HttpError(413, 'worksheet_too_large', `The worksheet is ${kB(bytes)}; the limit is ${kB(LIMITS.worksheetBytes)}. Split it into several worksheets.`);
  }
}

const refuse = (code: string, message: string) => new HttpError(422, code, message);

/** What the server's own checks learnt: the number of lines (the statement count comes from the worker's parse). */
export interface CheckedWorksheet {
  lines: number;
}

/**
 * The limits the server checks on the text itself, before any work is queued: size,
 * and each line's length and bracket depth. These are single passes over the
 * characters (no parsing), so a request costs the event loop about a millisecond at
 * the size limit. What needs the parse (statement count, variables per integral) is
 * checked in the evaluation worker, under its time limit: see checkParsedLimits.
 */
export function checkEvaluationLimits(source: string): CheckedWorksheet {
  checkWorksheetSize(source);
  const rows = sourceLines(source);
  rows.forEach((row, index) => {
    const { length, depth } = measureLine(row);
    if (length > LIMITS.statementLength) {
      throw refuse('statement_too_long', `Line ${index + 1} is ${length} characters long; the limit for one statement is ${LIMITS.statementLength}. Define parts with let.`);
    }
    if (depth > LIMITS.expressionDepth) {
      throw refuse('expression_too_deep', `Line ${index + 1} nests parentheses ${depth} deep; the limit is ${LIMITS.expressionDepth}. Simplify the expression.`);
    }
  });
  return { lines: rows.length };
}

/** The worker's refusal when the parser ran out of stack (chains of ^ or unary minus thousands deep). */
export const tooDeepToRead = () =>
  refuse('expression_too_deep', `The worksheet chains operators (such as ^ or a leading minus) too deep to read; the limit is ${LIMITS.expressionDepth} levels. Simplify the expression.`);

/**
 * The limits read from the parse, checked in the evaluation worker before the first
 * statement: statements (lines that fail to parse count too) and the variables of each
 * integral, symbolic when its integrand uses a declared param or a let that does.
 */
export function checkParsedLimits(parsed: ParsedWorksheet): void {
  if (parsed.lines.length > LIMITS.statementsPerWorksheet) {
    throw refuse('too_many_statements', `The worksheet has ${parsed.lines.length} statements; the limit is ${LIMITS.statementsPerWorksheet}. Split it into several worksheets.`);
  }
  const symbolic = new Set<string>();
  for (const l of parsed.lines) if (l.ok && l.statement.kind === 'param') for (const n of statementNames(l.statement).defined) symbolic.add(n);
  for (const l of parsed.lines) {
    if (!l.ok) continue;
    const s = l.statement;
    const names = statementNames(s);
    if (s.kind === 'let' && names.used.some((n) => symbolic.has(n))) for (const n of names.defined) symbolic.add(n);
    if (s.kind !== 'integral') continue;
    const isSymbolic = names.used.some((n) => symbolic.has(n));
    const limit = isSymbolic ? LIMITS.symbolicVariables : LIMITS.numericVariables;
    if (names.variables.length > limit) {
      throw refuse(
        'too_many_variables',
        `Line ${l.line} integrates over ${names.variables.length} variables; the limit is ${limit} for an integral ${isSymbolic ? 'with symbolic params' : 'with numbers only'}.`,
      );
    }
  }
}
