/**
 * An expression X made of rational functions, square roots of them, half-integer powers
 * and exponentials of them, read as X = ±sqrt(sq) * exp(S) with sq and S exact rational
 * functions, together with the radicands whose principal roots it takes. Two such
 * expressions with equal sq and S can differ only by a sign, and that sign can change
 * only where a radicand crosses the negative real axis or passes through 0 or infinity:
 * this is how `expect` is decided on the whole domain.
 *
 * Example: (2*pi)^(3/2)/sqrt((30 + i*t)^3) has sq = (2*pi)^3/(30 + i*t)^3, S = 0 and
 * radicands 2*pi, (30 + i*t)^3.
 */
import type { Expr } from '../lang/ast.js';
import { fromExpr, rfAdd, rfConst, rfDiv, rfMul, rfNeg, rfPow, RF0, RF1, type RatFunc } from '../exact/ratfunc.js';

export interface SquareForm {
  /** X^2 / exp(2 S). */
  sq: RatFunc;
  /** The exponent of the exponential factor. */
  S: RatFunc;
  /** Arguments of the principal square roots taken (sqrt(a), a^(p/2)). */
  radicands: RatFunc[];
}

/** The exponent as p/2 with p an integer, or null. */
function halfInteger(e: Expr): number | null {
  const r = fromExpr(e, []);
  if (!r) return null;
  const two = rfMul(r, rfConst(2));
  const c = [...two.num.terms.values()];
  if (two.den.terms.size !== 1 || c.length > 1) return null;
  if (c.length === 0) return 0;
  const v = c[0]!;
  if (v.m.length || v.c.im.n !== 0n || v.c.re.d !== 1n) return null;
  return Number(v.c.re.n);
}

export function squareForm(x: Expr): SquareForm | null {
  const rational = fromExpr(x);
  if (rational) return { sq: rfMul(rational, rational), S: RF0, radicands: [] };
  switch (x.t) {
    case 'neg': return squareForm(x.a);
    case 'call': {
      const a = fromExpr(x.args[0]!);
      if (!a) return null;
      if (x.fn === 'sqrt') return { sq: a, S: RF0, radicands: [a] };
      if (x.fn === 'exp') return { sq: RF1, S: a, radicands: [] };
      return null;
    }
    case 'bin': {
      if (x.op === '*' || x.op === '/') {
        const a = squareForm(x.a); const b = squareForm(x.b);
        if (!a || !b) return null;
        return x.op === '*'
          ? { sq: rfMul(a.sq, b.sq), S: rfAdd(a.S, b.S), radicands: [...a.radicands, ...b.radicands] }
          : { sq: rfDiv(a.sq, b.sq), S: rfAdd(a.S, rfNeg(b.S)), radicands: [...a.radicands, ...b.radicands] };
      }
      if (x.op === '^') {
        const p = halfInteger(x.b);
        if (p === null || Math.abs(p) > 64) return null;
        if (p % 2 === 0) {
          const a = squareForm(x.a);
          if (!a) return null;
          return { sq: rfPow(a.sq, p / 2), S: rfMul(a.S, rfConst(p / 2)), radicands: a.radicands };
        }
        const base = fromExpr(x.a);
        if (!base) return null;
        return { sq: rfPow(base, p), S: RF0, radicands: [base] };
      }
      return null;
    }
    default: return null;
  }
}
