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
import { fromExpr, rfConstantValue, rfDiv, rfIsZero, rfSub, type RatFunc } from '../exact/ratfunc.js';
import { coefficients, isZero, leadingTerm, monoKey, polyAdd, polyMul, polyPow, polyScale, polySub, ZERO, type Poly } from '../exact/poly.js';
import { ginv, gmul, gzero } from '../domains/rational.js';
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
  // the second try compares cross products only, so its quotients need no gcd (which can take long)
  const lowest = !roots;
  const ra = eb && fromExpr(ea!, undefined, lowest);
  const rb = ra && fromExpr(eb!, undefined, lowest);
  return ra && rb ? [ra, rb] : null;
}

/** The second try works on polynomials only (no multivariate gcd, which can take very long), within this many terms. */
const TERM_BUDGET = 20_000;

class OverBudget extends Error {}
const within = (p: Poly): Poly => {
  if (p.terms.size > TERM_BUDGET) throw new OverBudget();
  return p;
};

/**
 * Polynomials in the roots c_j (c_j^2 = P_j/Q_j) reduced to degree at most 1 in each: the
 * coefficient of each product of distinct roots, keyed by their names, each multiplied by
 * the same power Q_j^M of the square's denominator for all the inputs (so ratios between
 * the inputs are kept). A polynomial is zero as a function when every coefficient is (the
 * relations hold for the values, and Q_j is not the zero polynomial).
 */
function reduceByRoots(ps: readonly Poly[], roots: readonly RootSymbol[]): Map<string, Poly>[] {
  let parts = ps.map((p) => new Map<string, Poly>([['', p]]));
  for (const root of roots) {
    const P = root.square.num;
    const Q = root.square.den;
    let top = 0;
    for (const m of parts) for (const p of m.values()) top = Math.max(top, coefficients(p, root.name).length - 1);
    const M = Math.floor(top / 2);
    parts = parts.map((m) => {
      const next = new Map<string, Poly>();
      for (const [key, p] of m) {
        coefficients(p, root.name).forEach((c, k) => {
          if (c.terms.size === 0) return;
          const half = Math.floor(k / 2);
          const term = within(polyMul(c, within(polyMul(polyPow(P, half), polyPow(Q, M - half)))));
          const to = k % 2 ? `${key}*${root.name}` : key;
          next.set(to, within(polyAdd(next.get(to) ?? ZERO, term)));
        });
      }
      return next;
    });
  }
  return parts;
}

/** Both sides in exponential form as numerator and denominator polynomials, with their roots; null when out of reach. */
function formedSides(a: Expr, b: Expr): { na: Poly; da: Poly; nb: Poly; db: Poly; roots: RootSymbol[] } | null {
  const roots: RootSymbol[] = [];
  const formed = bothSides(a, b, roots);
  if (!formed || !roots.length && !formedDiffers(a, b)) return null;
  return { na: formed[0].num, da: formed[0].den, nb: formed[1].num, db: formed[1].den, roots };
}

/** Whether the exponential form may change anything: sinh, cosh, asinh or sqrt, or any power (a half power among them), is present. */
function formedDiffers(a: Expr, b: Expr): boolean {
  const has = (e: Expr): boolean =>
    e.t === 'call' ? ['sinh', 'cosh', 'asinh', 'sqrt'].includes(e.fn) || e.args.some(has)
      : e.t === 'bin' ? e.op === '^' || has(e.a) || has(e.b)
        : e.t === 'neg' ? has(e.a) : false;
  return has(a) || has(b);
}

/**
 * How an identity was shown: the values as symbols; or after the exponential form of
 * expForm.ts, named `roots` when no sinh, cosh or asinh was rewritten (only square roots
 * reduced by their squares), so the record names only what the proof used.
 */
export type IdentityMethod = 'values' | 'exponential-form' | 'roots';

const HYPERBOLIC = new Set(['sinh', 'cosh', 'asinh']);
function hasHyperbolic(e: Expr): boolean {
  return e.t === 'call' ? HYPERBOLIC.has(e.fn) || e.args.some(hasHyperbolic)
    : e.t === 'bin' ? hasHyperbolic(e.a) || hasHyperbolic(e.b)
      : e.t === 'neg' ? hasHyperbolic(e.a) : false;
}
const formedMethod = (a: Expr, b: Expr): IdentityMethod => (hasHyperbolic(a) || hasHyperbolic(b) ? 'exponential-form' : 'roots');

/** How `a` and `b` are shown to be the same function (see above); null when not shown. */
export function sameFunctionHow(a: Expr, b: Expr): IdentityMethod | null {
  const plain = bothSides(a, b);
  if (plain && rfIsZero(rfSub(...plain))) return 'values';
  // Second try: hyperbolic functions and asinh in exponential form (expForm.ts), a = b as na*db = nb*da.
  try {
    const f = formedSides(a, b);
    if (!f) return null;
    const d = within(polySub(within(polyMul(f.na, f.db)), within(polyMul(f.nb, f.da))));
    return [...reduceByRoots([d], f.roots)[0]!.values()].every(isZero) ? formedMethod(a, b) : null;
  } catch (e) {
    if (e instanceof OverBudget) return null;
    throw e;
  }
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
  // Second try, as in sameFunction: a/b = K exactly when na*db - K*nb*da reduces to 0.
  try {
    const f = formedSides(a, b);
    if (!f || isZero(f.na) || isZero(f.nb)) return null;
    const [top, bottom] = reduceByRoots([within(polyMul(f.na, f.db)), within(polyMul(f.nb, f.da))], f.roots) as [Map<string, Poly>, Map<string, Poly>];
    const pivot = [...bottom].find(([, p]) => !isZero(p));
    if (!pivot) return null;
    // K from the leading terms of one coefficient, then checked on every coefficient
    const lt = leadingTerm(pivot[1])!;
    const mt = top.get(pivot[0]) ? leadingTerm(top.get(pivot[0])!) : null;
    if (!mt || monoKey(mt.m) !== monoKey(lt.m)) return null;
    const k = gmul(mt.c, ginv(lt.c));
    const keys = new Set([...top.keys(), ...bottom.keys()]);
    const holds = [...keys].every((key) => isZero(polySub(top.get(key) ?? ZERO, polyScale(bottom.get(key) ?? ZERO, k))));
    return holds && !gzero(k) ? { ratio: k, how: formedMethod(a, b) } : null;
  } catch (e) {
    if (e instanceof OverBudget) return null;
    throw e;
  }
}
