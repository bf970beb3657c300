/** The quadratic form of an exponent, S = -1/2 x^T A x + J^T x + c, read off its expansion. */
import type { Expr } from '../lang/ast.js';
import { mul, neg, num } from '../expr/build.js';
import type { Poly } from './polynomial.js';

export interface QuadraticForm {
  vars: string[];
  A: Expr[][];
  J: Expr[];
  c: Expr;
}

export function formFromPoly(p: Poly, vars: readonly string[]): QuadraticForm {
  const n = vars.length;
  const coeff = (exps: number[]): Expr => p.get(exps.join(','))?.coeff ?? num(0);
  const unit = (j: number, k: number) => vars.map((_, m) => (m === j ? 1 : 0) + (m === k ? 1 : 0));
  const A: Expr[][] = [];
  for (let j = 0; j < n; j++) {
    const row: Expr[] = [];
    for (let k = 0; k < n; k++) {
      const c = coeff(unit(j, k));
      // S contains -1/2 A_jj x_j^2 and -A_jk x_j x_k (j != k)
      row.push(j === k ? neg(mul(num(2), c)) : neg(c));
    }
    A.push(row);
  }
  const J = vars.map((_, j) => coeff(vars.map((__, m) => (m === j ? 1 : 0))));
  return { vars: [...vars], A, J, c: coeff(vars.map(() => 0)) };
}
