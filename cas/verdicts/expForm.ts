/**
 * The exponential form of hyperbolic functions, for the identity proof (identity.ts):
 *   sinh(u) = (exp(u) - exp(-u))/2,  cosh(u) = (exp(u) + exp(-u))/2,
 *   exp(k*asinh(y)) = (y + sqrt(y^2 + 1))^k   for whole numbers k,
 * the last because the principal asinh is log(y + sqrt(y^2 + 1)) with principal branches
 * on its whole cut plane (DLMF 4.37.16; common practice), and exp(k*log(X)) = X^k. Each
 * sqrt(y^2 + 1) becomes a symbol c with the relation c^2 = y^2 + 1, which the proof
 * reduces by; what remains of an exponent stays one value exp(r), written 1/exp(-r) for
 * one of the two signs of r, so that exp(r) and exp(-r) are one symbol and its inverse.
 * A principal square root sqrt(X) (or X^(k/2), k odd, read as X^((k-1)/2)*sqrt(X)) with
 * X rational in the parameters is a symbol c with c^2 = X as well: that relation holds for
 * every branch, and no other property of the root is used.
 * Every rewrite is an identity of single-valued functions on the whole plane, so an
 * identity shown in this form holds for the expressions as written.
 *
 * Example: sinh(12*asinh(w/4))/sinh(2*asinh(w/4)) becomes
 * ((y + c)^12 - (y + c)^-12)/((y + c)^2 - (y + c)^-2) with y = w/4, c^2 = w^2/16 + 1:
 * a rational function of w and c.
 */
import type { Expr } from '../lang/ast.js';
import { fromExpr, rfConstantValue, rfNeg, rfToString, type RatFunc } from '../exact/ratfunc.js';
import { rebuild } from '../expr/rebuild.js';

/** A symbol standing for sqrt(y^2 + 1): `square` is y^2 + 1 as a rational function. */
export interface RootSymbol {
  readonly name: string;
  readonly square: RatFunc;
}

export interface ExpForms {
  readonly roots: RootSymbol[];
  readonly byArgument: Map<string, string>;
}

export const newExpForms = (): ExpForms => ({ roots: [], byArgument: new Map() });

const num = (v: string): Expr => ({ t: 'num', v });
const bin = (op: '+' | '-' | '*' | '/' | '^', a: Expr, b: Expr): Expr => ({ t: 'bin', op, a, b });

/** The additive terms of e with their signs (a - b is a + (-b)). */
function terms(e: Expr, sign: 1 | -1, out: { sign: 1 | -1; e: Expr }[]): void {
  if (e.t === 'bin' && (e.op === '+' || e.op === '-')) {
    terms(e.a, sign, out);
    terms(e.b, e.op === '+' ? sign : (-sign as 1 | -1), out);
  } else if (e.t === 'neg') terms(e.a, (-sign as 1 | -1), out);
  else out.push({ sign, e });
}

/** The factors of a product (numbers, names, calls; a quotient is not split). */
function factors(e: Expr, out: Expr[]): void {
  if (e.t === 'bin' && e.op === '*') {
    factors(e.a, out);
    factors(e.b, out);
  } else out.push(e);
}

/** k*asinh(y) with k a whole number: [k, y]; otherwise null. */
function asinhMultiple(e: Expr, sign: 1 | -1): [bigint, Expr] | null {
  const fs: Expr[] = [];
  factors(e, fs);
  const calls = fs.filter((f) => f.t === 'call' && f.fn === 'asinh' && f.args.length === 1);
  if (calls.length !== 1) return null;
  const rest = fs.filter((f) => f !== calls[0]);
  const kf = rest.length ? fromExpr(rest.reduce((a, b) => bin('*', a, b))) : fromExpr(num('1'));
  const k = kf && rfConstantValue(kf);
  if (!k || k.im.n !== 0n || k.re.d !== 1n) return null;
  return [BigInt(sign) * k.re.n, (calls[0] as Extract<Expr, { t: 'call' }>).args[0]!];
}

/** e in exponential form (see above), or null when a part is out of reach. */
export function expForm(e: Expr, forms: ExpForms): Expr | null {
  const go = (x: Expr): Expr | null => rebuild(x, {
    // X^(k/2) with k odd: X^((k - 1)/2) * sqrt(X), the root a symbol as below
    bin: (x, a, b) => {
      if (x.op !== '^') return undefined;
      const e = fromExpr(b);
      const k = e && rfConstantValue(e);
      if (!k || k.im.n !== 0n || k.re.d !== 2n) return undefined;
      const root = rootOf(a, 'square');
      return root ? bin('*', bin('^', a, num(((k.re.n - 1n) / 2n).toString())), { t: 'name', name: root }) : null;
    },
    call: (x, walk) => {
      if (x.args.length !== 1) return null;
      const u = x.args[0]!;
      if (x.fn === 'exp') return expOf(u, 1);
      if (x.fn === 'sinh' || x.fn === 'cosh') {
        const plus = expOf(u, 1);
        const minus = plus && expOf(u, -1);
        return plus && minus ? bin('/', bin(x.fn === 'sinh' ? '-' : '+', plus, minus), num('2')) : null;
      }
      const arg = walk(u);
      if (arg && x.fn === 'sqrt') {
        const root = rootOf(arg, 'square');
        return root ? { t: 'name', name: root } : null;
      }
      return arg && { t: 'call', fn: x.fn, args: [arg] };
    },
  });
  /** exp(sign*u) with the whole multiples of asinh taken out of u. */
  const expOf = (u: Expr, sign: 1 | -1): Expr | null => {
    const parts: { sign: 1 | -1; e: Expr }[] = [];
    terms(u, sign, parts);
    const rest: Expr[] = [];
    let out: Expr = num('1');
    for (const part of parts) {
      const m = asinhMultiple(part.e, part.sign);
      if (!m) {
        const t = go(part.e);
        if (!t) return null;
        rest.push(part.sign === 1 ? t : { t: 'neg', a: t });
        continue;
      }
      const [k, y] = m;
      const root = rootOf(y, 'asinh');
      if (!root) return null;
      if (k !== 0n) out = bin('*', out, bin('^', bin('+', y, { t: 'name', name: root }), num(k.toString())));
    }
    if (rest.length) {
      const r = rest.reduce((a, b) => bin('+', a, b));
      const rf = fromExpr(r);
      if (!rf) return null;
      // One of r and -r, the same whichever was written: exp(r) or 1/exp(-r).
      const flipped = rfToString(rfNeg(rf)) < rfToString(rf);
      out = bin('*', out, flipped ? bin('/', num('1'), { t: 'call', fn: 'exp', args: [{ t: 'neg', a: r }] }) : { t: 'call', fn: 'exp', args: [r] });
    }
    return out;
  };
  /** The symbol for sqrt(y^2 + 1) (asinh) or sqrt(y) (square), one per square. */
  const rootOf = (y: Expr, of: 'asinh' | 'square'): string | null => {
    const square = fromExpr(of === 'asinh' ? bin('+', bin('^', y, num('2')), num('1')) : y);
    if (!square) return null;
    const key = rfToString(square);
    let name = forms.byArgument.get(key);
    if (!name) {
      name = `%root${forms.roots.length}`;
      forms.byArgument.set(key, name);
      forms.roots.push({ name, square });
    }
    return name;
  };
  return go(e);
}
