import { LIMITS } from '../../shared/api.js';
import { statementNames } from '../../cas/index.js';
import { HttpError } from '../middleware/http-error.js';
import { parseSource } from './parse-source.js';
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

/** What the checks learnt that the evaluation needs: the statement count for progress. */
export interface CheckedWorksheet {
  statements: number;
}

/**
 * The evaluation limits, checked before any computation starts, so that a worksheet
 * that would tie up the workers is refused at once with the limit named. Length and
 * bracket depth are measured on each line first, because they bound the parser's own
 * recursion; the rest is read from the parse: statements (lines that fail to parse
 * count too) and the variables of each integral, symbolic when its integrand uses a
 * declared param or a let that does.
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
  const parsed = parseSource(source);
  if (!parsed) {
    throw refuse('expression_too_deep', `The worksheet chains operators (such as ^ or a leading minus) too deep to read; the limit is ${LIMITS.expressionDepth} levels. Simplify the expression.`);
  }
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
  return { statements: parsed.lines.length };
}
