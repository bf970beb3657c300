/**
 * An exact proof that two expressions are one function on the whole declared domain, for
 * expressions built from the parameters, pi, numbers, + - * /, integer powers and the
 * entire functions exp, sinh, cosh, sin and cos of such expressions. Each distinct value
 * f(r) (its argument r compared exactly) becomes a new independent symbol
 * (expr/atoms.ts), and the difference of the two sides must vanish as a rational function
 * of all the symbols.
 *
 * Treating the values as independent can only hide an identity (sinh(2*x) against
 * 2*sinh(x)*cosh(x) is not seen), never invent one, so `true` is a proof (pi is
 * transcendental, so it may be a symbol too); `false` means "not shown", and the caller
 * samples. No branch enters: these functions are single-valued on the whole plane, and a
 * rational identity holds wherever both sides are defined.
 *
 * Example: sameFunction(sinh(w*L)/(w*L), sinh(L*w)/(L*w)) is true; with sqrt it is false.
 */
import type { Expr } from '../lang/ast.js';
import { fromExpr, rfConstantValue, rfDiv, rfIsZero, rfSub } from '../exact/ratfunc.js';
import type { GQ } from '../exact/q.js';
import { newValueSymbols, valuesAsSymbols } from '../expr/atoms.js';

const ENTIRE = new Set(['exp', 'sinh', 'cosh', 'sin', 'cos']);

/** True when `a` and `b` are shown to be the same function (see above); false when not shown. */
export function sameFunction(a: Expr, b: Expr): boolean {
  const symbols = newValueSymbols();
  const admit = (fn: string) => ENTIRE.has(fn);
  const ea = valuesAsSymbols(a, symbols, admit);
  const eb = ea && valuesAsSymbols(b, symbols, admit);
  if (!ea || !eb) return false;
  const ra = fromExpr(ea);
  const rb = ra && fromExpr(eb);
  return !!(ra && rb && rfIsZero(rfSub(ra, rb)));
}

/**
 * a/b as an exact constant when the ratio of the two, read as above, is one rational
 * function with no symbol left; null when that is not shown. Proves the ratio constant
 * on the whole declared domain (where both sides are defined and b is not 0).
 */
export function constantRatio(a: Expr, b: Expr): GQ | null {
  const symbols = newValueSymbols();
  const admit = (fn: string) => ENTIRE.has(fn);
  const ea = valuesAsSymbols(a, symbols, admit);
  const eb = ea && valuesAsSymbols(b, symbols, admit);
  const ra = eb && fromExpr(ea!);
  const rb = ra && fromExpr(eb!);
  if (!ra || !rb || rfIsZero(rb) || rfIsZero(ra)) return null;
  return rfConstantValue(rfDiv(ra, rb));
}
