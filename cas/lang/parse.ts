/** Worksheet parsing: one PEG parse per line, errors as plain sentences with positions. */
import { parse as parseLine } from './line-parser.generated.js';
import type { Expr, Statement } from './ast.js';
import { checkExprNames, checkStatementNames } from './validate.js';
import { STATEMENT_KEYWORDS } from '../../shared/language.js';

// Compiled ahead of time from line.peggy (scripts/build-grammar.mjs).
const lineParser = { parse: parseLine };

export interface ParseError { message: string; line: number; column: number }

/** A source line holding a statement, or an error, in source order. Blank and comment-only lines are left out. */
export type ParsedLine =
  | { ok: true; line: number; statement: Statement }
  | { ok: false; line: number; kind: string; error: ParseError };

export interface ParsedWorksheet { lines: ParsedLine[]; errors: ParseError[] }

interface PeggyLocation { start: { line: number; column: number; offset: number } }
interface PeggySyntaxError {
  message: string;
  location: PeggyLocation;
  expected: { type: string; description?: string; text?: string }[] | null;
  found: string | null;
}

function isPeggyError(e: unknown): e is PeggySyntaxError {
  return typeof e === 'object' && e !== null && 'location' in e && 'expected' in e;
}

/** "a, b or c" with duplicates removed. */
function listWords(words: string[]): string {
  const unique = [...new Set(words)];
  if (unique.length <= 1) return unique[0] ?? 'something else';
  return `${unique.slice(0, -1).join(', ')} or ${unique[unique.length - 1]}`;
}

const LITERAL_WORDS: Record<string, string> = {
  '=': '"="', ':': '":"', ')': 'a closing parenthesis ")"', '(': 'an opening parenthesis "("', ',': 'a comma', 'd': 'the integration variables, written d(x, y, ...)',
};

function describeExpected(e: PeggySyntaxError): string {
  const words: string[] = [];
  let operator = false;
  const expected = e.expected ?? [];
  const operand = expected.some((x) => x.description === 'a number');
  for (const x of expected) {
    if (x.type === 'literal' && x.text !== undefined && ['+', '-'].includes(x.text)) continue;
    if (x.type === 'literal' && x.text !== undefined && ['*', '/', '^'].includes(x.text)) { operator = true; continue; }
    if (operand && (x.description === 'a number' || x.description === 'a name' || x.text === '(')) continue;
    if (x.type === 'class' || x.type === 'any' || x.type === 'end') continue;
    if (x.type === 'other' && x.description === 'a space') continue;
    if (x.type === 'other' && x.description) words.push(x.description);
    else if (x.type === 'literal' && x.text !== undefined) words.push(LITERAL_WORDS[x.text] ?? `"${x.text}"`);
  }
  if (operand) words.unshift('an expression');
  if (operator) words.unshift('an operator (+, -, *, /, ^)');
  return listWords(words.filter((w) => w !== 'a comment'));
}

function foundWords(found: string | null, rest: string): string {
  if (found === null) return 'the end of the line';
  const token = /^[A-Za-z0-9_.]+/.exec(rest)?.[0] ?? found;
  return `"${token}"`;
}

const KEYWORDS: readonly string[] = STATEMENT_KEYWORDS;

function syntaxError(e: PeggySyntaxError, text: string, line: number): ParseError {
  const column = e.location.start.column;
  const head = /^\s*([A-Za-z]+)/.exec(text)?.[1];
  if (column === 1 + (text.length - text.trimStart().length) && head !== undefined && !KEYWORDS.includes(head)) {
    return { message: `A statement starts with one of ${listWords([...KEYWORDS])}, not "${head}".`, line, column };
  }
  const rest = text.slice(e.location.start.offset);
  const before = text.slice(0, e.location.start.offset);
  const hint = /[0-9.]$/.test(before) && /^[A-Za-z(]/.test(rest) ? ' Write a product with "*", for example 2*k.' : '';
  return { message: `Expected ${describeExpected(e)}, but found ${foundWords(e.found, rest)}.${hint}`, line, column };
}

function statementKindOf(text: string): string {
  const head = /^\s*([A-Za-z]+)/.exec(text)?.[1] ?? '';
  return KEYWORDS.includes(head) ? head : 'invalid';
}

export function parseWorksheet(source: string): ParsedWorksheet {
  const lines: ParsedLine[] = [];
  const errors: ParseError[] = [];
  let offset = 0;
  const rows = source.split(/\r?\n/);
  rows.forEach((raw, index) => {
    const line = index + 1;
    const text = raw.replace(/\r$/, '');
    const lineOffset = offset;
    offset += raw.length + 1;
    if (/^\s*(#.*)?$/.test(text)) return;
    let statement: Statement | null;
    try {
      statement = lineParser.parse(text, { startRule: 'Line', line, offset: lineOffset }) as Statement | null;
    } catch (e) {
      if (e instanceof RangeError) {
        // a chain of thousands of ^ or - runs the recursive parser out of stack
        const error = { message: 'This statement nests operators too deeply to read; split it with let.', line, column: 1 };
        errors.push(error);
        lines.push({ ok: false, line, kind: statementKindOf(text), error });
        return;
      }
      if (!isPeggyError(e)) throw e;
      const error = syntaxError(e, text, line);
      errors.push(error);
      lines.push({ ok: false, line, kind: statementKindOf(text), error });
      return;
    }
    if (statement === null) return;
    const nameError = checkStatementNames(statement);
    if (nameError) {
      errors.push(nameError);
      lines.push({ ok: false, line, kind: statement.kind, error: nameError });
      return;
    }
    lines.push({ ok: true, line, statement });
  });
  return { lines, errors };
}

/**
 * Parse a lone expression of the core's own making (the algebra adapter's answers,
 * angles in words): here the name e is Euler's number, as the adapter writes it.
 */
export function parseExpression(text: string): Expr {
  const expr = lineParser.parse(text, { startRule: 'Expr', internal: true }) as Expr;
  const err = checkExprNames(expr, true);
  if (err) throw new Error(err.message);
  return expr;
}
