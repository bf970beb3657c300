/**
 * eta(tau) is defined on the upper half plane only (the product q^(1/24) prod (1 - q^n) diverges
 * for |q| >= 1). A derived quantity that calls eta where Im tau <= 0 is refused with the point,
 * rather than carried as a quantity without a value: exactly for a number, at sample points of the
 * declared domain when the argument holds parameters (the same points the let checks its branches at).
 */
import type { Expr } from '../lang/ast.js';
import { evaluate } from '../expr/evaluate.js';
import { formulaOf } from '../expr/print.js';
import { freeNames } from '../expr/names.js';
import { samplePoints } from '../domains/sample.js';
import { domainsOf, type Context } from './context.js';

function etaArguments(e: Expr, out: Expr[] = []): Expr[] {
  switch (e.t) {
    case 'call': if (e.fn === 'eta') out.push(e.args[0]!); e.args.forEach((a) => etaArguments(a, out)); break;
    case 'neg': etaArguments(e.a, out); break;
    case 'bin': etaArguments(e.a, out); etaArguments(e.b, out); break;
    default: break;
  }
  return out;
}

/** A sentence saying where an eta argument leaves the upper half plane, or null when it stays there. */
export function etaOutsideDomain(e: Expr, ctx: Context): string | null {
  for (const arg of etaArguments(e)) {
    const params = [...freeNames(arg).keys()].filter((n) => ctx.params.has(n));
    if (params.length !== freeNames(arg).size) continue; // a result inside the argument: left to the values
    const pts = params.length ? samplePoints(domainsOf(ctx, params), params, 24, 2411) : [new Map()];
    for (const pt of pts) {
      let im: number;
      try { im = evaluate(arg, pt).im; } catch { continue; }
      if (!(im > 0)) {
        const where = pt.size ? ` at ${[...pt].map(([k, v]) => `${k} = ${v.toString()}`).join(', ')}` : '';
        return `eta(tau) is defined for Im tau > 0 only; Im(${formulaOf(arg).text}) = ${im}${where}. For q = exp(-beta) write eta(i*beta/(2*pi)).`;
      }
    }
  }
  return null;
}
