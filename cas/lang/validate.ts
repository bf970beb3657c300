/** Checks the grammar leaves to later: reserved names, known functions. */
import type { Expr, NameRef, Statement } from './ast.js';
import type { ParseError } from './parse.js';
import { FUNCTION_NAMES, RESERVED_NAMES } from '../../shared/language.js';

export const FUNCTIONS = FUNCTION_NAMES;
/** Functions the algebra adapter may hand back; never accepted from a worksheet. */
const INTERNAL_FUNCTIONS = ['abs'];

const RESERVED = new Set<string>([...RESERVED_NAMES, ...INTERNAL_FUNCTIONS]);

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
    case 'rotate': {
      const e = checkName(s.as);
      if (e) return e;
      for (const m of s.moves) { const me = m.to === 'steepest' ? null : checkExprNames(m.to); if (me) return me; }
      const seen = new Set<string>();
      for (const m of s.moves) {
        if (seen.has(m.variable.name)) return at(m.variable.span, `The variable "${m.variable.name}" is rotated twice in one statement.`);
        seen.add(m.variable.name);
      }
      return null;
    }
    case 'continue': {
      for (const p of s.points) for (const e of p) { const pe = checkExprNames(e); if (pe) return pe; }
      for (const b of s.at) { const be = checkExprNames(b.value); if (be) return be; }
      for (const p of s.points) if (p.length !== s.params.length) {
        return at(s.span, `Each point of the path needs ${s.params.length} value${s.params.length > 1 ? 's' : ''}, one for each of ${s.params.map((n) => n.name).join(', ')}.`);
      }
      return null;
    }
    case 'verify': {
      for (const b of s.at) { const be = checkExprNames(b.value); if (be) return be; }
      return s.tolerance ? checkExprNames(s.tolerance) : null;
    }
    case 'limit': return s.to === 'inf' || s.to === '-inf' ? null : checkExprNames(s.to);
    case 'moment': return checkName(s.name) ?? checkExprNames(s.expr);
    case 'derivative': return checkName(s.name) ?? checkExprNames(s.expr);
    case 'product': return checkName(s.name) ?? checkName(s.index) ?? checkExprNames(s.factor);
    case 'determinant': return checkName(s.name) ?? checkExprNames(s.potential) ?? checkExprNames(s.length);
    case 'sum': return checkName(s.name) ?? checkName(s.index) ?? checkExprNames(s.term);
    case 'sliced': return checkName(s.name) ?? checkExprNames(s.potential) ?? checkExprNames(s.length) ?? checkExprNames(s.slices);
    default: return null;
  }
}
