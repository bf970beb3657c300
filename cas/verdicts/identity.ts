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
 * When that does not show it, a second try writes sinh, cosh and whole multiples of asinh
 * in exponential form (expForm.ts), with each sqrt(y^2 + 1) a symbol c reduced by
 * c^2 = y^2 + 1: sinh(12*asinh(w/4))/(6*sinh(2*asinh(w/4))) is then a polynomial in w.
 *
 * Example: sameFunction(sinh(w*L)/(w*L), sinh(L*w)/(L*w)) is true; with sqrt it is false.
 */
import type { Expr } from '../lang/ast.js';
import { fromExpr, rfAdd, rfConst, rfConstantValue, rfDiv, rfIsZero, rfMul, rfPoly, rfPow, rfSub, RF0, type RatFunc } from '../exact/ratfunc.js';
import { coefficients, type Poly } from '../exact/poly.js';
import type { GQ } from '../exact/q.js';
import { newValueSymbols, valuesAsSymbols } from '../expr/atoms.js';
import { expForm, newExpForms, type RootSymbol } from './expForm.js';

const ENTIRE = new Set(['exp', 'sinh', 'cosh', 'sin', 'cos']);

/** Both sides as rational functions of the values in them (and of the roots of expForm.ts when `roots` is given). */
function bothSides(a: Expr, b: Expr, roots?: RootSymbol[]): [RatFunc, RatFunc] | null {
  let [xa, xb]: (Expr | null)[] = [a, b];
  if (roots) {
    const forms = newExpForms();
    xa = expForm(a, forms);
    xb = xa && expForm(b, forms);
    roots.push(...forms.roots);
  }
  const symbols = newValueSymbols();
  const admit = (fn: string) => ENTIRE.has(fn);
  const ea = xa && valuesAsSymbols(xa, symbols, admit);
  const eb = ea && xb && valuesAsSymbols(xb, symbols, admit);
  const ra = eb && fromExpr(ea!);
  const rb = ra && fromExpr(eb!);
  return ra && rb ? [ra, rb] : null;
}

/**
 * A polynomial in the roots c_j (c_j^2 = square_j) reduced to degree at most 1 in each:
 * the coefficient of each product of distinct roots, keyed by their names. The sum is
 * zero as a function when every coefficient is (the relations hold for the values).
 */
function reduceByRoots(p: Poly, roots: readonly RootSymbol[]): Map<string, RatFunc> {
  let parts = new Map<string, RatFunc>([['', rfPoly(p)]]);
  for (const root of roots) {
    const next = new Map<string, RatFunc>();
    const add = (key: string, r: RatFunc) => next.set(key, rfAdd(next.get(key) ?? RF0, r));
    for (const [key, r] of parts) {
      // r's denominator is free of the roots (it is made of the squares' denominators).
      coefficients(r.num, root.name).forEach((c, k) => {
        if (c.terms.size === 0) return;
        const term = rfDiv(rfMul(rfPoly(c), rfPow(root.square, Math.floor(k / 2))), rfPoly(r.den));
        add(k % 2 ? `${key}*${root.name}` : key, term);
      });
    }
    parts = next;
  }
  return parts;
}

/** How an identity was shown: the values as symbols, or after the exponential form of expForm.ts. */
export type IdentityMethod = 'values' | 'exponential-form';

/** How `a` and `b` are shown to be the same function (see above); null when not shown. */
export function sameFunctionHow(a: Expr, b: Expr): IdentityMethod | null {
  const plain = bothSides(a, b);
  if (plain && rfIsZero(rfSub(...plain))) return 'values';
  // Second try: hyperbolic functions and asinh in exponential form (expForm.ts).
  const roots: RootSymbol[] = [];
  const formed = bothSides(a, b, roots);
  if (!formed) return null;
  const d = rfSub(...formed);
  return [...reduceByRoots(d.num, roots).values()].every(rfIsZero) ? 'exponential-form' : null;
}

/** True when `a` and `b` are shown to be the same function (see above); false when not shown. */
export const sameFunction = (a: Expr, b: Expr): boolean => sameFunctionHow(a, b) !== null;

/**
 * a/b as an exact constant when the ratio of the two, read as above, is one rational
 * function with no symbol left; null when that is not shown. Proves the ratio constant
 * on the whole declared domain (where both sides are defined and b is not 0).
 */
export const constantRatio = (a: Expr, b: Expr): GQ | null => constantRatioHow(a, b)?.ratio ?? null;

/** constantRatio with how it was shown. */
export function constantRatioHow(a: Expr, b: Expr): { ratio: GQ; how: IdentityMethod } | null {
  const plain = bothSides(a, b);
  if (plain && !rfIsZero(plain[0]) && !rfIsZero(plain[1])) {
    const c = rfConstantValue(rfDiv(...plain));
    if (c) return { ratio: c, how: 'values' };
  }
  // Second try, as in sameFunction: a/b = K exactly when num(a/b) - K*den(a/b) reduces to 0.
  const roots: RootSymbol[] = [];
  const formed = bothSides(a, b, roots);
  if (!formed || rfIsZero(formed[0]) || rfIsZero(formed[1])) return null;
  const q = rfDiv(...formed);
  const top = reduceByRoots(q.num, roots);
  const bottom = reduceByRoots(q.den, roots);
  const pivot = [...bottom].find(([, r]) => !rfIsZero(r));
  if (!pivot) return null;
  const k = rfConstantValue(rfDiv(top.get(pivot[0]) ?? RF0, pivot[1]));
  if (!k) return null;
  const keys = new Set([...top.keys(), ...bottom.keys()]);
  const holds = [...keys].every((key) => rfIsZero(rfSub(top.get(key) ?? RF0, rfMul(rfConst(k), bottom.get(key) ?? RF0))));
  return holds && (k.re.n !== 0n || k.im.n !== 0n) ? { ratio: k, how: 'exponential-form' } : null;
}
