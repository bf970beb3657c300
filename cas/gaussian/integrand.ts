/** Splits an integrand into exp(S) and a prefactor free of the integration variables. */
import type { Expr, Span } from '../lang/ast.js';
import { add, mul, neg, num, sub } from '../expr/build.js';
import { dependsOn, freeNames } from '../expr/names.js';

export class IntegrandError extends Error {
  constructor(message: string, readonly span: Span | undefined) { super(message); }
}

export interface SplitIntegrand { exponent: Expr; prefactor: Expr }

const isExp = (e: Expr): e is Extract<Expr, { t: 'call' }> => e.t === 'call' && e.fn === 'exp';
const isEPower = (e: Expr): e is Extract<Expr, { t: 'bin' }> => e.t === 'bin' && e.op === '^' && e.a.t === 'const' && e.a.name === 'e';

export function splitIntegrand(integrand: Expr, vars: ReadonlySet<string>): SplitIntegrand {
  let exponent: Expr = num(0);
  let prefactor: Expr = num(1);
  const visit = (e: Expr, inverted: boolean): void => {
    if (e.t === 'bin' && e.op === '*') { visit(e.a, inverted); visit(e.b, inverted); return; }
    if (e.t === 'bin' && e.op === '/') { visit(e.a, inverted); visit(e.b, !inverted); return; }
    if (e.t === 'neg') { prefactor = neg(prefactor); visit(e.a, inverted); return; }
    if (isExp(e) || isEPower(e)) {
      const s = isExp(e) ? e.args[0]! : e.b;
      exponent = inverted ? sub(exponent, s) : add(exponent, s);
      return;
    }
    if (dependsOn(e, vars)) {
      const v = [...freeNames(e).keys()].find((n) => vars.has(n));
      throw new IntegrandError(
        `Only Gaussian integrands are supported: the factor outside exp depends on the integration variable ${v}. Write the integrand as a constant times exp(...).`,
        e.span,
      );
    }
    prefactor = inverted ? { t: 'bin', op: '/', a: prefactor, b: e } : mul(prefactor, e);
  };
  visit(integrand, false);
  return { exponent, prefactor };
}
