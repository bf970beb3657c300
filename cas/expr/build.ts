/** Expression constructors with the obvious foldings (0 + x, 1 * x, x ^ 1), so built formulas stay readable. */
import type { Expr } from '../lang/ast.js';

export const num = (v: number | string): Expr =>
  typeof v === 'number' && v < 0 ? neg(num(-v)) : { t: 'num', v: String(v) };
export const name = (n: string): Expr => ({ t: 'name', name: n });
export const I: Expr = { t: 'const', name: 'i' };
export const PI: Expr = { t: 'const', name: 'pi' };

const isNum = (e: Expr, v: string): boolean => e.t === 'num' && Number(e.v) === Number(v);

export function neg(a: Expr): Expr {
  if (isNum(a, '0')) return a;
  if (a.t === 'neg') return a.a;
  return { t: 'neg', a };
}
export function add(a: Expr, b: Expr): Expr {
  if (isNum(a, '0')) return b;
  if (isNum(b, '0')) return a;
  if (b.t === 'neg') return { t: 'bin', op: '-', a, b: b.a };
  return { t: 'bin', op: '+', a, b };
}
export function sub(a: Expr, b: Expr): Expr {
  if (isNum(b, '0')) return a;
  if (isNum(a, '0')) return neg(b);
  return { t: 'bin', op: '-', a, b };
}
export function mul(a: Expr, b: Expr): Expr {
  if (isNum(a, '0') || isNum(b, '0')) return num(0);
  if (isNum(a, '1')) return b;
  if (isNum(b, '1')) return a;
  if (a.t === 'neg') return neg(mul(a.a, b));
  if (b.t === 'neg') return neg(mul(a, b.a));
  return { t: 'bin', op: '*', a, b };
}
export function div(a: Expr, b: Expr): Expr {
  if (isNum(b, '1')) return a;
  if (isNum(a, '0')) return a;
  if (a.t === 'neg') return neg(div(a.a, b));
  if (b.t === 'neg') return neg(div(a, b.a));
  return { t: 'bin', op: '/', a, b };
}
export function pow(a: Expr, b: Expr): Expr {
  if (isNum(b, '1')) return a;
  if (isNum(b, '0')) return num(1);
  return { t: 'bin', op: '^', a, b };
}
export const call = (fn: string, a: Expr): Expr => ({ t: 'call', fn, args: [a] });
export const sum = (terms: Expr[]): Expr => terms.reduce((s, t) => add(s, t), num(0));
export const product = (factors: Expr[]): Expr => factors.reduce((p, f) => mul(p, f), num(1));
export const isZero = (e: Expr): boolean => isNum(e, '0');
export const isOne = (e: Expr): boolean => isNum(e, '1');
