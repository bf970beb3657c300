/** Free names of an expression, with the span of their first use. */
import type { Expr, Span } from '../lang/ast.js';

export function freeNames(e: Expr, out = new Map<string, Span | undefined>()): Map<string, Span | undefined> {
  switch (e.t) {
    case 'name': if (!out.has(e.name)) out.set(e.name, e.span); break;
    case 'neg': freeNames(e.a, out); break;
    case 'bin': freeNames(e.a, out); freeNames(e.b, out); break;
    case 'call': e.args.forEach((a) => freeNames(a, out)); break;
    default: break;
  }
  return out;
}

export function dependsOn(e: Expr, names: ReadonlySet<string>): boolean {
  for (const n of freeNames(e).keys()) if (names.has(n)) return true;
  return false;
}

export function substitute(e: Expr, map: ReadonlyMap<string, Expr>): Expr {
  switch (e.t) {
    case 'name': return map.get(e.name) ?? e;
    case 'neg': return { t: 'neg', a: substitute(e.a, map) };
    case 'bin': return { t: 'bin', op: e.op, a: substitute(e.a, map), b: substitute(e.b, map) };
    case 'call': return { t: 'call', fn: e.fn, args: e.args.map((a) => substitute(a, map)) };
    default: return e;
  }
}
