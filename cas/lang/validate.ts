/** Checks the grammar leaves to later: reserved names, known functions. */
import type { Expr, NameRef, Statement } from './ast.js';
import type { ParseError } from './parse.js';

export const FUNCTIONS = ['exp', 'sqrt', 'log', 'sin', 'cos', 'sinh', 'cosh'] as const;
/** Functions the algebra adapter may hand back; never accepted from a worksheet. */
const INTERNAL_FUNCTIONS = ['abs'];

const RESERVED = new Set<string>([
  'i', 'pi', 'e', 'd', ...FUNCTIONS, ...INTERNAL_FUNCTIONS,
  'param', 'integral', 'expect', 'note', 'let', 'rotate', 'continue', 'compare', 'verify', 'limit',
  'positive', 'negative', 'real', 'complex', 'nonzero',
]);

function at(span: { start: { line: number; column: number } }, message: string): ParseError {
  return { message, line: span.start.line, column: span.start.column };
}

function checkName(ref: NameRef): ParseError | null {
  return RESERVED.has(ref.name) ? at(ref.span, `"${ref.name}" is a reserved word and cannot be used as a name.`) : null;
}

export function checkExprNames(expr: Expr, internal = false): ParseError | null {
  switch (expr.t) {
    case 'call': {
      const known = (FUNCTIONS as readonly string[]).includes(expr.fn) || (internal && INTERNAL_FUNCTIONS.includes(expr.fn));
      if (!known) {
        return at(expr.span ?? { start: { line: 1, column: 1 } },
          `"${expr.fn}" is not a known function; the functions are ${FUNCTIONS.join(', ')}.`);
      }
      if (expr.args.length !== 1) {
        return at(expr.span ?? { start: { line: 1, column: 1 } }, `${expr.fn} takes one argument, not ${expr.args.length}.`);
      }
      return checkExprNames(expr.args[0]!, internal);
    }
    case 'neg': return checkExprNames(expr.a, internal);
    case 'bin': return checkExprNames(expr.a, internal) ?? checkExprNames(expr.b, internal);
    case 'name':
      if (RESERVED.has(expr.name)) return at(expr.span ?? { start: { line: 1, column: 1 } }, `"${expr.name}" is a reserved word, not a value.`);
      return null;
    default: return null;
  }
}

export function checkStatementNames(s: Statement): ParseError | null {
  switch (s.kind) {
    case 'param': {
      for (const n of s.names) { const e = checkName(n); if (e) return e; }
      return null;
    }
    case 'integral': {
      const e = checkName(s.name) ?? checkExprNames(s.integrand);
      if (e) return e;
      const seen = new Set<string>();
      for (const v of s.vars) {
        const ve = checkName(v);
        if (ve) return ve;
        if (seen.has(v.name)) return at(v.span, `The integration variable "${v.name}" is listed twice.`);
        seen.add(v.name);
      }
      return null;
    }
    case 'expect': return checkExprNames(s.expr);
    case 'let': return checkName(s.name) ?? checkExprNames(s.expr);
    default: return null;
  }
}
