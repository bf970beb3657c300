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
