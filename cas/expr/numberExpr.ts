/** A complex double as a readable expression: small fractions exactly, everything else to 15 digits. */
import type { Expr } from '../lang/ast.js';
import { add, div, I, mul, neg, num } from './build.js';

function realExpr(x: number): Expr {
  if (x < 0) return neg(realExpr(-x));
  for (let q = 1; q <= 10000; q++) {
    const p = Math.round(x * q);
    if (p <= 1e6 && Math.abs(p - x * q) <= 1e-12 * Math.max(1, x * q)) return q === 1 ? num(p) : div(num(p), num(q));
  }
  return num(Number(x.toPrecision(15)).toString());
}

export function complexExpr(z: { re: number; im: number }): Expr {
  const tiny = 1e-14 * Math.max(Math.abs(z.re), Math.abs(z.im));
  const re = Math.abs(z.re) <= tiny ? 0 : z.re;
  const im = Math.abs(z.im) <= tiny ? 0 : z.im;
  if (im === 0) return realExpr(re);
  const imag = Math.abs(im) === 1 ? I : mul(realExpr(Math.abs(im)), I);
  const signed = im < 0 ? neg(imag) : imag;
  return re === 0 ? signed : add(realExpr(re), signed);
}

/**
 * `e` with every decimal the user typed written as the exact fraction it stands for
 * (0.3 is 3/10): a printed result then shows exact constants, never an exact-looking
 * decimal. Whole numbers and the rest of the tree are unchanged.
 */
export function exactDecimals(e: Expr): Expr {
  switch (e.t) {
    case 'num': {
      const m = /^(\d*)\.(\d+)$/.exec(e.v);
      if (!m) return e;
      let n = BigInt((m[1] || '0') + m[2]!);
      let d = 10n ** BigInt(m[2]!.length);
      const gcd = (a: bigint, b: bigint): bigint => (b ? gcd(b, a % b) : a);
      const g = gcd(n, d) || 1n;
      n /= g; d /= g;
      return d === 1n ? num(n.toString()) : div(num(n.toString()), num(d.toString()));
    }
    case 'const': case 'name': return e;
    case 'neg': return neg(exactDecimals(e.a));
    case 'bin': return { ...e, a: exactDecimals(e.a), b: exactDecimals(e.b) };
    case 'call': return { ...e, args: e.args.map(exactDecimals) };
  }
}
