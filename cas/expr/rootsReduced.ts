/**
 * A closed form with its square roots reduced by their squares, for display: each
 * principal root sqrt(X) of a rational expression X (and X^(k/2), read as
 * X^((k-1)/2)*sqrt(X)) becomes a symbol r with r^2 = X, every other function value and
 * fractional power a symbol kept as written, and the whole a rational function of the
 * parameters and these symbols; each r^2 is replaced by X and common factors cancelled,
 * then the symbols are written back. Every step is an identity where both forms are
 * defined (r^2 = X holds for the principal root, as for any root), so no branch is chosen.
 * It needs no general algebra package: for a derived quantity such as (2*pi)^5/(192*Z^2)
 * with Z = (2*pi)^(5/2)/sqrt(P) it gives P/192 in a few milliseconds, where a general
 * simplification took ~100-300 ms.
 *
 * Example: rootsReduced((2*pi)^3/(8*((2*pi)^(3/2)/sqrt(k^2 + g^2))^2)) is (k^2 + g^2)/8,
 * printed with the terms in ascending degree; null when a root's argument is not rational
 * (a root inside a root) or the rational function grows past its size limit.
 */
import type { Expr } from '../lang/ast.js';
import { fromExpr, rfAdd, rfConstantValue, rfDiv, rfMul, rfPoly, rfPow, rfToString, rfVar, RF0, type RatFunc } from '../exact/ratfunc.js';
import { coefficients, ONE, polyScale, variables, type Poly } from '../exact/poly.js';
import { add, call, div, I, mul, name, neg, num, pow } from './build.js';
import { ratExpr } from './fromExact.js';
import { substitute } from './names.js';
import { formulaOf } from './print.js';
import { rebuild } from './rebuild.js';

interface Symbols {
  /** exact key of the value -> symbol */
  readonly byKey: Map<string, string>;
  /** symbol -> the value written back */
  readonly forms: Map<string, Expr>;
  /** root symbol -> its square */
  readonly squares: Map<string, RatFunc>;
}

const isSymbol = (v: string) => v.startsWith('%');

/** e as a rational function of the parameters and symbols, the roots reduced; null when out of reach. */
function reducedRational(e: Expr, valuesAllowed: boolean): { r: RatFunc; s: Symbols } | null {
  const s: Symbols = { byKey: new Map(), forms: new Map(), squares: new Map() };
  let refused = false;
  const symbol = (key: string, form: Expr, square?: RatFunc): Expr => {
    if (!square && !valuesAllowed) refused = true;
    let n = s.byKey.get(key);
    if (!n) {
      n = `%${square ? 'root' : 'value'}${s.byKey.size}`;
      s.byKey.set(key, n);
      s.forms.set(n, form);
      if (square) s.squares.set(n, square);
    }
    return name(n);
  };
  /** The symbol for sqrt(x), x already walked; null when x is not rational in the parameters alone. */
  const rootOf = (x: Expr): Expr | null => {
    const square = fromExpr(x);
    if (!square || [...variables(square.num), ...variables(square.den)].some(isSymbol)) return null;
    return symbol(`sqrt(${rfToString(square)})`, call('sqrt', ratExpr(square, true)), square);
  };
  const go = (x: Expr): Expr | null => rebuild(x, {
    bin: (x, a, b) => {
      if (x.op !== '^') return undefined;
      const k = fromExpr(b);
      const c = k && rfConstantValue(k);
      if (c && c.im.n === 0n && c.re.d === 1n) return undefined;
      if (c && c.im.n === 0n && c.re.d === 2n) {
        const root = rootOf(a);
        return root && mul(pow(a, num(((c.re.n - 1n) / 2n).toString())), root);
      }
      // another power: a value of its own, as written
      return symbol(`^${formulaOf(x).text}`, x);
    },
    call: (x, walk) => {
      if (x.fn === 'sqrt' && x.args.length === 1) {
        const arg = walk(x.args[0]!);
        return arg && rootOf(arg);
      }
      // only for an exact rational form: a display keeps exp(i*pi/4) as written
      if (!valuesAllowed && x.fn === 'exp' && x.args.length === 1) {
        const unit = rootOfUnity(x.args[0]!);
        if (unit) return walk(unit);
      }
      return symbol(`${x.fn}:${formulaOf(x).text}`, x);
    },
  });
  const walked = go(e);
  let r = !refused && walked ? fromExpr(walked) : null;
  if (!r) return null;
  try {
    for (const [root, square] of s.squares) r = rfDiv(reduce(r.num, root, square), reduce(r.den, root, square));
  } catch {
    return null; // a zero denominator after reduction: leave the form as it is
  }
  return { r, s };
}

export function rootsReduced(e: Expr): Expr | null {
  const got = reducedRational(e, true);
  return got && substitute(shorterOverCommonDenominator(got.r), got.s.forms);
}

/**
 * e as an exact rational function of the parameters when its square roots (and the roots
 * of unity exp(i*pi*q) with 4q or 6q whole, written with sqrt(2) or sqrt(3)) cancel out
 * once reduced by their squares: -i*w*exp(i*pi/4)^2 is w. Null when a root or another
 * function value remains.
 */
export function rationalWithRootsReduced(e: Expr): RatFunc | null {
  const got = reducedRational(e, false);
  if (!got) return null;
  const left = [...variables(got.r.num), ...variables(got.r.den)];
  return left.some(isSymbol) ? null : got.r;
}

/** exp(i*pi*q) with 4q or 6q a whole number, written with roots of 2 or 3 (cos and sin of multiples of pi/4 and pi/6); else null. */
function rootOfUnity(arg: Expr): Expr | null {
  const r = fromExpr(arg);
  if (!r || r.den.terms.size !== 1 || [...r.den.terms.keys()][0] !== '' || r.num.terms.size !== 1) return null;
  const [key, term] = [...r.num.terms][0]!;
  if (key !== 'pi' || term.c.re.n !== 0n) return null;
  const q = term.c.im;
  const half = (x: Expr) => div(x, num(2));
  for (const d of [4n, 6n]) {
    if ((q.n * d) % q.d !== 0n) continue;
    const k = Number((((q.n * d) / q.d) % (2n * d) + 2n * d) % (2n * d)); // exp(i*pi*k/d), k in [0, 2d)
    const root = call('sqrt', num(d === 4n ? 2 : 3));
    // (cos, sin) at k*pi/d, each as an expression in the one root
    const quarter: [Expr, Expr][] = [[num(1), num(0)], [half(root), half(root)], [num(0), num(1)], [neg(half(root)), half(root)], [num(-1), num(0)], [neg(half(root)), neg(half(root))], [num(0), num(-1)], [half(root), neg(half(root))]];
    const sixth: [Expr, Expr][] = [[num(1), num(0)], [half(root), div(num(1), num(2))], [div(num(1), num(2)), half(root)], [num(0), num(1)], [div(num(-1), num(2)), half(root)], [neg(half(root)), div(num(1), num(2))], [num(-1), num(0)], [neg(half(root)), div(num(-1), num(2))], [div(num(-1), num(2)), neg(half(root))], [num(0), num(-1)], [div(num(1), num(2)), neg(half(root))], [half(root), div(num(-1), num(2))]];
    const [cos, sin] = (d === 4n ? quarter : sixth)[k]!;
    return add(cos, mul(sin, I));
  }
  return null;
}

/** p with every power r^k of the root written r^(k mod 2) * square^floor(k/2). */
function reduce(p: Poly, root: string, square: RatFunc): RatFunc {
  let out = RF0;
  coefficients(p, root).forEach((c, k) => {
    if (!c.terms.size) return;
    let term = rfMul(rfPoly(c), rfPow(square, Math.floor(k / 2)));
    if (k % 2) term = rfMul(term, rfVar(root));
    out = rfAdd(out, term);
  });
  return out;
}

/** r as printed, or (D*r)/D with D the common denominator of r's coefficients when that reads no longer: (g^2 + k^2)/8, not g^2/8 + k^2/8. */
function shorterOverCommonDenominator(r: RatFunc): Expr {
  const plain = ratExpr(r, true);
  if (r.den.terms.size !== 1 || [...r.den.terms.keys()][0] !== '' || r.num.terms.size < 2) return plain;
  let d = 1n;
  const gcd = (a: bigint, b: bigint): bigint => (b === 0n ? a : gcd(b, a % b));
  for (const t of r.num.terms.values()) for (const x of [t.c.re, t.c.im]) d = (d / gcd(d, x.d)) * x.d;
  if (d === 1n) return plain;
  const over = div(ratExpr({ num: polyScale(r.num, d), den: ONE }, true), num(d.toString()));
  return formulaOf(over).text.length <= formulaOf(plain).text.length ? over : plain;
}
