import { LIMITS } from '../../shared/api.js';
import { HttpError } from '../middleware/http-error.js';

const kB = (bytes: number) => `${Math.ceil(bytes / 1024)} kB`;

/** 413 when a worksheet source is larger than the limit (UTF-8 bytes). */
export function checkWorksheetSize(source: string): void {
  const bytes = Buffer.byteLength(source, 'utf8');
  if (bytes > LIMITS.worksheetBytes) {
    throw new HttpError(413, 'worksheet_too_large', `The worksheet is ${kB(bytes)}; the limit is ${kB(LIMITS.worksheetBytes)}. Split it into several worksheets.`);
  }
}

const refuse = (code: string, message: string) => new HttpError(422, code, message);

/**
 * The evaluation limits, checked on the text before any computation starts, so that a
 * worksheet that would tie up the workers is refused at once with the limit named.
 * Statement and variable counts follow the language's one-statement-a-line rule.
 */
export function checkEvaluationLimits(source: string): void {
  checkWorksheetSize(source);
  const lines = source.split('\n');
  const statements = lines.filter((l) => l.trim() && !l.trim().startsWith('#'));
  if (statements.length > LIMITS.statementsPerWorksheet) {
    throw refuse('too_many_statements', `The worksheet has ${statements.length} statements; the limit is ${LIMITS.statementsPerWorksheet}. Split it into several worksheets.`);
  }
  const params = new Set<string>();
  for (const line of lines) {
    const m = /^\s*param\s+([A-Za-z_][A-Za-z0-9_]*)/.exec(line);
    if (m) params.add(m[1]);
  }
  lines.forEach((line, index) => {
    const at = `Line ${index + 1}`;
    const code = line.replace(/#.*$/, '').replace(/"[^"]*"/g, '""');
    if (code.length > LIMITS.statementLength) {
      throw refuse('statement_too_long', `${at} is ${code.length} characters long; the limit for one statement is ${LIMITS.statementLength}. Define parts with let.`);
    }
    let depth = 0;
    let deepest = 0;
    for (const ch of code) {
      if (ch === '(') deepest = Math.max(deepest, ++depth);
      else if (ch === ')') depth--;
    }
    if (deepest > LIMITS.expressionDepth) {
      throw refuse('expression_too_deep', `${at} nests parentheses ${deepest} deep; the limit is ${LIMITS.expressionDepth}. Simplify the expression.`);
    }
    const integral = /^\s*integral\b.*\bd\(([^()]*)\)\s*$/.exec(code);
    if (integral) {
      const variables = integral[1].split(',').filter((v) => v.trim()).length;
      const body = code.slice(0, code.lastIndexOf('d('));
      const symbolic = [...params].some((p) => new RegExp(`\\b${p}\\b`).test(body));
      const limit = symbolic ? LIMITS.symbolicVariables : LIMITS.numericVariables;
      if (variables > limit) {
        throw refuse(
          'too_many_variables',
          `${at} integrates over ${variables} variables; the limit is ${limit} for an integral ${symbolic ? 'with symbolic params' : 'with numbers only'}.`,
        );
      }
    }
  });
}
