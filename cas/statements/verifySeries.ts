/**
 * verify of a Gaussian sum, or of a derived quantity built from sums and eta: the definitions
 * themselves, summed and multiplied term by term (cas/numeric/lattice.ts `sumByTerms`,
 * `etaByProduct`: no Poisson resummation, no modular transformation), until the terms no longer
 * change the result, against the value the closed-form side gives. Each eta call and each sum is
 * replaced by its checked number and the rest of the definition evaluated as written.
 */
import { Complex } from 'complex.js';
import type { StatementReport } from '../../shared/evaluation.js';
import type { Expr } from '../lang/ast.js';
import { name as nameExpr } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { etaByProduct, sumByTerms, type SeriesCheck } from '../numeric/lattice.js';
import type { Point } from '../domains/sample.js';
import { usesLattice } from '../verdicts/expansionLattice.js';
import { StatementFailure, type Context, type ResultInfo } from './context.js';
import { latticeNumbers } from './latticeSum.js';
import { rel } from './shared.js';
import { complexApprox, complexApproxLatex } from '../../shared/record/numbers.js';

/** Whether verify checks this result by series (a sum, or a let that uses sums or eta). */
export function isSeriesTarget(r: ResultInfo, ctx: Context): boolean {
  return !!r.lattice || (!!r.definition && usesLattice(r.definition, (n) => ctx.results.get(n) ?? null));
}

export function verifySeries(
  name: string, r: ResultInfo, p: Point, tolerance: number, line: number, column: number, ctx: Context, report: StatementReport,
): StatementReport {
  const checks: SeriesCheck[] = [];
  const fail = (msg: string): never => { throw new StatementFailure(msg, line, column); };
  const sumAt = (resultName: string): Complex => {
    const l = ctx.results.get(resultName)!.lattice!;
    const x = latticeNumbers(l, p);
    if (!(x.a.re > 0)) fail(`The sum ${resultName} diverges at this point (Re a = ${x.a.re} is not positive).`);
    const c = sumByTerms(x);
    checks.push(c);
    return c.value;
  };
  // the definition with every eta call and every sum replaced by a placeholder holding its checked value
  const env = new Map<string, Complex>(p);
  let fresh = 0;
  const replace = (e: Expr, depth = 0): Expr => {
    if (depth > 40) fail('The definition is nested too deeply to check.');
    switch (e.t) {
      case 'call': {
        const args = e.args.map((a) => replace(a, depth + 1));
        if (e.fn !== 'eta') return { ...e, args };
        const tau = evaluate(args[0]!, env);
        if (!(tau.im > 0)) fail(`eta(${tau.toString()}) is outside the upper half plane, where the product diverges.`);
        const c = etaByProduct(tau);
        checks.push(c);
        const key = `%eta${fresh++}`; env.set(key, c.value);
        return nameExpr(key);
      }
      case 'name': {
        const res = ctx.results.get(e.name);
        if (!res) return e;
        if (res.lattice) { const key = `%sum${fresh++}`; env.set(key, sumAt(e.name)); return nameExpr(key); }
        if (res.definition && usesLattice(res.definition, (n) => ctx.results.get(n) ?? null)) return replace(res.definition, depth + 1);
        const v = res.valueAt?.(p);
        if (!v) fail(`${e.name} has no value at this point.`);
        env.set(e.name, new Complex(v!.re, v!.im));
        return e;
      }
      case 'neg': return { ...e, a: replace(e.a, depth + 1) };
      case 'bin': return { ...e, a: replace(e.a, depth + 1), b: replace(e.b, depth + 1) };
      default: return e;
    }
  };
  const value = r.lattice ? sumAt(name) : evaluate(replace(r.definition!), env);
  const stalled = checks.find((c) => !c.converged);
  if (stalled) fail(`The partial sums or products did not settle within ${stalled.terms} terms (last term ${stalled.lastTerm.toExponential(2)}); the point is too close to the edge of convergence to check this way.`);
  const closed = r.valueAt?.(p);
  if (!closed) fail(`${name} has no closed-form value at this point.`);
  if (!Number.isFinite(value.re) || !Number.isFinite(value.im)) fail(`The partial sums and products overflow at this point.`);
  const d = rel({ re: value.re, im: value.im }, closed!);
  const agrees = Number.isFinite(d) && d <= tolerance;
  report.status = agrees ? 'ok' : 'failed';
  report.result = { text: complexApprox(value, 15), latex: complexApproxLatex(value, 15), value: { re: value.re, im: value.im } };
  report.steps.push({
    kind: 'series-check', name, at: Object.fromEntries([...p].map(([k, v]) => [k, { re: v.re, im: v.im }])),
    value: { re: value.re, im: value.im }, closed: closed!,
    terms: checks.reduce((s, c) => s + c.terms, 0), lastTerm: Math.max(...checks.map((c) => c.lastTerm)),
    relativeDifference: d, tolerance, agrees,
  });
  return report;
}
