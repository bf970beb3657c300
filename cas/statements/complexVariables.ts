/**
 * Complex integration variables, d(z : complex): z = z_re + i*z_im and conj(z) = z_re - i*z_im
 * with the measure d^2z = dz_re dz_im, so an integral over C^n is one over R^(2n) and keeps
 * every verdict of the real route. For exp(-a |z|^2) this gives pi/a (Re a > 0), and for
 * exp(-zbar^T A z + jbar^T z + zbar^T j) the handbook pi^n/det A * exp(jbar^T A^-1 j) (common
 * practice); the record states the measure convention, since dz dzbar differs by -2i per
 * variable.
 */
import type { Expr, NameRef, Statement } from '../lang/ast.js';
import { add, mul, name as nameExpr, sub, I } from '../expr/build.js';
import { StatementFailure } from './context.js';

type IntegralStatement = Extract<Statement, { kind: 'integral' }>;

export interface ComplexRewrite { statement: IntegralStatement; pairs: { name: string; re: string; im: string }[] }

/** The integral over the real and imaginary parts; conj of anything but a complex variable is refused. */
export function realPartsOf(s: IntegralStatement, taken: (n: string) => boolean): ComplexRewrite {
  const line = s.span.start.line;
  const kinds = s.kinds ?? s.vars.map(() => 'real' as const);
  const pairs: ComplexRewrite['pairs'] = [];
  const vars: NameRef[] = [];
  s.vars.forEach((v, k) => {
    if (kinds[k] !== 'complex') { vars.push(v); return; }
    let re = `${v.name}_re`; let im = `${v.name}_im`;
    for (let j = 2; taken(re) || taken(im); j++) { re = `${v.name}_re${j}`; im = `${v.name}_im${j}`; }
    pairs.push({ name: v.name, re, im });
    vars.push({ name: re, span: v.span }, { name: im, span: v.span });
  });
  const byName = new Map(pairs.map((p) => [p.name, p]));
  const rewrite = (e: Expr): Expr => {
    switch (e.t) {
      case 'name': {
        const p = byName.get(e.name);
        return p ? add(nameExpr(p.re), mul(I, nameExpr(p.im))) : e;
      }
      case 'neg': return { ...e, a: rewrite(e.a) };
      case 'bin': return { ...e, a: rewrite(e.a), b: rewrite(e.b) };
      case 'call': {
        if (e.fn === 'conj') {
          const a = e.args[0]!;
          const p = a.t === 'name' ? byName.get(a.name) : undefined;
          if (!p) throw new StatementFailure('conj applies to a complex integration variable, as in conj(z) with d(z : complex).', line, e.span?.start.column ?? 1);
          return sub(nameExpr(p.re), mul(I, nameExpr(p.im)));
        }
        return { ...e, args: e.args.map(rewrite) };
      }
      default: return e;
    }
  };
  return {
    statement: { ...s, integrand: rewrite(s.integrand), vars, kinds: vars.map(() => 'real' as const) },
    pairs,
  };
}
