/**
 * Rational functions num/den over Q(i), kept in lowest terms with a monic denominator
 * (lex-leading coefficient 1, the order of poly.ts), so equal functions have equal parts.
 *
 *   fromExpr(parse('(k + i*t)/(2*k)'))   // num: 1/2*k + 1/2*i*t, den: k
 *
 * `pi` becomes the variable "pi". pi is transcendental, so a polynomial identity in pi
 * with algebraic (here Q(i)) coefficients holds iff it holds identically in a variable:
 * every exact verdict about such a function stays true for the number pi. (It is not
 * declared real by anything here; callers that split Re/Im must treat "pi" as real.)
 */
import type { Expr } from '../lang/ast.js';
import { type GQ, type Q, GI, gIsZero, gdiv, gpow, gFromString, ginv } from './q.js';
import {
  type Poly, type Cx, ZERO, ONE, polyAdd, polyMul, polyNeg, polyPow, polyConst, polyVar, polyScale,
  isZero, isConstant, constantTerm, gcd, divideExact, leadingCoeff, polyEquals, evalExact, evalComplex, polyToString,
  variables,
} from './poly.js';

export interface RatFunc { readonly num: Poly; readonly den: Poly }

/** Refuse results with more terms than this (numerator plus denominator). */
export const MAX_TERMS = 5000;
/** Refuse powers with a larger |exponent|. */
export const MAX_EXPONENT = 64;

/** num/den in lowest terms, den monic; throws on a zero denominator. */
export function ratfunc(num: Poly, den: Poly = ONE): RatFunc {
  if (isZero(den)) throw new Error('division by zero');
  if (isZero(num)) return { num: ZERO, den: ONE };
  if (isConstant(den)) return { num: polyScale(num, ginv(constantTerm(den))), den: ONE };
  const g = gcd(num, den);
  if (!isConstant(g)) {
    num = divideExact(num, g)!;
    den = divideExact(den, g)!;
  }
  const l = ginv(leadingCoeff(den));
  return { num: polyScale(num, l), den: polyScale(den, l) };
}
export const rfPoly = (p: Poly): RatFunc => ({ num: p, den: ONE });
export const rfConst = (c: GQ | Q | number | bigint): RatFunc => rfPoly(polyConst(c));
export const rfVar = (name: string): RatFunc => rfPoly(polyVar(name));
export const RF0: RatFunc = rfPoly(ZERO);
export const RF1: RatFunc = rfPoly(ONE);

export const rfIsZero = (a: RatFunc) => isZero(a.num);
export const rfIsPoly = (a: RatFunc) => isConstant(a.den);
export const rfEquals = (a: RatFunc, b: RatFunc) => polyEquals(a.num, b.num) && polyEquals(a.den, b.den);

export function rfAdd(a: RatFunc, b: RatFunc): RatFunc {
  if (rfIsZero(a)) return b;
  if (rfIsZero(b)) return a;
  // equal denominators (common: both polynomials) need no cross products
  if (polyEquals(a.den, b.den)) return ratfunc(polyAdd(a.num, b.num), a.den);
  return ratfunc(polyAdd(polyMul(a.num, b.den), polyMul(b.num, a.den)), polyMul(a.den, b.den));
}
export const rfNeg = (a: RatFunc): RatFunc => ({ num: polyNeg(a.num), den: a.den });
export const rfSub = (a: RatFunc, b: RatFunc): RatFunc => rfAdd(a, rfNeg(b));
export function rfMul(a: RatFunc, b: RatFunc): RatFunc {
  if (rfIsZero(a) || rfIsZero(b)) return RF0;
  if (isConstant(a.den) && isConstant(b.den)) return rfPoly(polyMul(a.num, b.num));
  return ratfunc(polyMul(a.num, b.num), polyMul(a.den, b.den));
}
export function rfInv(a: RatFunc): RatFunc {
  if (rfIsZero(a)) throw new Error('division by zero');
  return ratfunc(a.den, a.num);
}
export const rfDiv = (a: RatFunc, b: RatFunc): RatFunc => rfMul(a, rfInv(b));
/** Integer powers, negative allowed; lowest terms are preserved so no gcd is needed. */
export function rfPow(a: RatFunc, e: number): RatFunc {
  if (!Number.isInteger(e)) throw new Error('rfPow: integer exponent expected');
  if (e < 0) return rfPow(rfInv(a), -e);
  const num = polyPow(a.num, e), den = polyPow(a.den, e);
  return { num, den };
}

export function rfEvalExact(a: RatFunc, at: ReadonlyMap<string, GQ>): GQ {
  const d = evalExact(a.den, at);
  if (gIsZero(d)) throw new Error('the denominator vanishes at this point');
  return gdiv(evalExact(a.num, at), d);
}
export function rfEvalComplex(a: RatFunc, at: ReadonlyMap<string, Cx>): Cx {
  const n = evalComplex(a.num, at), d = evalComplex(a.den, at);
  const m = d.re * d.re + d.im * d.im;
  return { re: (n.re * d.re + n.im * d.im) / m, im: (n.im * d.re - n.re * d.im) / m };
}
export const rfToString = (a: RatFunc): string =>
  isConstant(a.den) ? polyToString(a.num) : `(${polyToString(a.num)})/(${polyToString(a.den)})`;

const size = (a: RatFunc) => a.num.terms.size + a.den.terms.size;

/**
 * Arithmetic for fromExpr. Without lowest terms (for callers that only compare
 * cross products, such as the identity proof's second try) no gcd is taken: a
 * multivariate gcd can take very long, while the quotient stays exact either way
 * (a constant denominator is still divided out).
 */
interface RatOps { add(a: RatFunc, b: RatFunc): RatFunc; mul(a: RatFunc, b: RatFunc): RatFunc; div(a: RatFunc, b: RatFunc): RatFunc; pow(a: RatFunc, e: number): RatFunc }
const REDUCED: RatOps = { add: rfAdd, mul: rfMul, div: rfDiv, pow: rfPow };
const quotient = (num: Poly, den: Poly): RatFunc => (isConstant(den) ? rfPoly(polyScale(num, ginv(constantTerm(den)))) : { num, den });
const UNREDUCED: RatOps = {
  add: (a, b) => (rfIsZero(a) ? b : rfIsZero(b) ? a : polyEquals(a.den, b.den) ? quotient(polyAdd(a.num, b.num), a.den)
    : quotient(polyAdd(polyMul(a.num, b.den), polyMul(b.num, a.den)), polyMul(a.den, b.den))),
  mul: (a, b) => (rfIsZero(a) || rfIsZero(b) ? RF0 : quotient(polyMul(a.num, b.num), polyMul(a.den, b.den))),
  div: (a, b) => quotient(polyMul(a.num, b.den), polyMul(a.den, b.num)),
  pow: (a, e) => (e >= 0 ? quotient(polyPow(a.num, e), polyPow(a.den, e)) : quotient(polyPow(a.den, -e), polyPow(a.num, -e))),
};

/**
 * The expression as a rational function with exact coefficients, or null when it is
 * not one (exp, sqrt, ... ; non-integer or |n| > 64 powers; the constant e; division
 * by zero) or when it would exceed MAX_TERMS terms.
 * realVars: when given, only these names may occur (others give null), so callers that
 * take Re/Im parts can insist on real parameters. lowestTerms = false: an exact quotient
 * not brought to lowest terms (see UNREDUCED), so equal functions may have unequal parts.
 */
export function fromExpr(expr: Expr, realVars?: ReadonlySet<string> | readonly string[], lowestTerms = true): RatFunc | null {
  const allowed = realVars ? new Set(realVars) : null;
  const ops = lowestTerms ? REDUCED : UNREDUCED;
  const guard = (r: RatFunc | null) => (r && size(r) > MAX_TERMS ? null : r);
  const go = (e: Expr): RatFunc | null => {
    switch (e.t) {
      case 'num': {
        try { return rfConst(gFromString(e.v)); } catch { return null; }
      }
      case 'const':
        return e.name === 'i' ? rfConst(GI) : e.name === 'pi' ? rfVar('pi') : null;
      case 'name':
        return allowed && !allowed.has(e.name) ? null : rfVar(e.name);
      case 'neg': {
        const a = go(e.a);
        return a && rfNeg(a);
      }
      case 'call':
        return null;
      case 'bin': {
        if (e.op === '^') {
          const n = integerExponent(e.b);
          if (n === null || Math.abs(n) > MAX_EXPONENT) return null;
          const a = go(e.a);
          if (!a) return null;
          if (rfIsZero(a)) return n > 0 ? RF0 : n === 0 ? RF1 : null;
          // refuse before expanding when the power could not fit
          if (powerTermsBound(a.num, Math.abs(n)) + powerTermsBound(a.den, Math.abs(n)) > MAX_TERMS) return null;
          if (isConstant(a.num) && isConstant(a.den)) return rfConst(gpow(constantTerm(a.num), n));
          return guard(ops.pow(a, n));
        }
        const a = go(e.a);
        if (!a) return null;
        const b = go(e.b);
        if (!b) return null;
        switch (e.op) {
          case '+': return guard(ops.add(a, b));
          case '-': return guard(ops.add(a, rfNeg(b)));
          case '*': return guard(ops.mul(a, b));
          case '/': return rfIsZero(b) ? null : guard(ops.div(a, b));
        }
      }
    }
  };
  return go(expr);
}

/** An upper bound on the terms of p^n: monomials of degree <= n*deg, and multinomial terms. */
function powerTermsBound(p: Poly, n: number): number {
  const T = p.terms.size;
  if (T <= 1) return T;
  const binom = (a: number, b: number) => { let r = 1; for (let i = 1; i <= b; i++) r = (r * (a - b + i)) / i; return r; };
  const nv = variables(p).length;
  let deg = 0;
  for (const t of p.terms.values()) deg = Math.max(deg, t.m.reduce((s, [, e]) => s + e, 0));
  return Math.min(binom(n * deg + nv, nv), binom(n + T - 1, T - 1));
}

/** The exponent as an integer when it is an exact integer expression (2, -3, (4), 6/2), else null. */
function integerExponent(e: Expr): number | null {
  const r = fromExpr(e, []);
  if (!r || !isConstant(r.num) || !isConstant(r.den)) return null;
  const c = constantTerm(r.num);
  if (c.im.n !== 0n || c.re.d !== 1n) return null;
  const n = Number(c.re.n);
  return Number.isSafeInteger(n) ? n : null;
}

/** Exact complex value of a constant rational function (null when it depends on a variable). */
export function rfConstantValue(a: RatFunc): GQ | null {
  return isConstant(a.num) && isConstant(a.den) ? constantTerm(a.num) : null;
}

