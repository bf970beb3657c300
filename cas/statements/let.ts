/**
 * let NAME = EXPR: a derived quantity of results and parameters. Its value is EXPR applied to the
 * results' continuous-branch values, with principal branches of log and sqrt on top; each such branch
 * is recorded with the arguments it was taken at. The closed form substitutes the results' forms.
 */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Expr, Statement } from '../lang/ast.js';
import { Complex } from 'complex.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames, substitute } from '../expr/names.js';
import { formulaOf } from '../expr/print.js';
import { tidy } from '../expr/tidy.js';
import { exactDecimals } from '../expr/numberExpr.js';
import { rewriteChecked } from '../algebra/adapter.js';
import { rootsReduced } from '../expr/rootsReduced.js';
import { sampledBasis, samplePoints, type Point } from '../domains/sample.js';
import { complexText, piMultiple } from '../gaussian/describe.js';
import { blankReport, domainsOf, StatementFailure, type Context } from './context.js';
import { etaOutsideDomain } from './etaArguments.js';

function calls(e: Expr, out: Extract<Expr, { t: 'call' }>[] = []): Extract<Expr, { t: 'call' }>[] {
  if (e.t === 'call') { if (e.fn === 'log' || e.fn === 'sqrt') out.push(e); e.args.forEach((a) => calls(a, out)); }
  else if (e.t === 'neg') calls(e.a, out);
  else if (e.t === 'bin') { calls(e.a, out); calls(e.b, out); }
  return out;
}

export function evaluateLet(s: Extract<Statement, { kind: 'let' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.name.name;
  const report = blankReport(line, 'let', name);
  if (ctx.params.has(name) || ctx.results.has(name)) throw new StatementFailure(`The name ${name} is already in use; give the derived quantity a new name.`, line, s.name.span.start.column);
  const used = new Set<string>();
  const resultsUsed: string[] = [];
  for (const [n, span] of freeNames(s.expr)) {
    if (ctx.params.has(n)) { used.add(n); continue; }
    const r = ctx.results.get(n);
    if (!r) throw new StatementFailure(`Unknown name "${n}": a derived quantity uses declared parameters and results above it.`, line, span?.start.column ?? 1);
    if (r.unavailable || !r.valueAt) throw new StatementFailure(`This derived quantity depends on ${r.unavailable ?? n}.`, line, span?.start.column ?? 1);
    resultsUsed.push(n);
    r.params.forEach((p) => used.add(p));
  }
  const params = [...ctx.params.keys()].filter((p) => used.has(p));
  const etaOff = etaOutsideDomain(s.expr, ctx);
  if (etaOff) throw new StatementFailure(etaOff, line, s.span.start.column);
  const valueAt = (p: Point) => {
    const env = new Map(p);
    for (const n of resultsUsed) {
      const v = ctx.results.get(n)!.valueAt!(p);
      if (!v) return null;
      env.set(n, new Complex(v.re, v.im));
    }
    const z = evaluate(s.expr, env);
    return Number.isFinite(z.re) && Number.isFinite(z.im) ? { re: z.re, im: z.im } : null;
  };
  const points = params.length ? samplePoints(domainsOf(ctx, params), params, 24, 2718) : [new Map()];
  // closed form: the results' forms substituted
  const subst = new Map<string, Expr>();
  for (const n of resultsUsed) { const r = ctx.results.get(n)!; const e = r.exactForm ?? r.expr; if (e) subst.set(n, e); }
  const full = substitute(s.expr, subst);
  const closedOk = resultsUsed.every((n) => subst.has(n));
  // the roots reduced by their squares in exact arithmetic first (no general algebra package,
  // which takes 100 ms and more on a root squared); the package only when that is out of reach
  const reduced = closedOk ? rootsReduced(full) : null;
  const simplified = reduced ? { expr: reduced, accepted: true } : closedOk ? rewriteChecked('simplify', full, points.slice(0, 8)) : { expr: s.expr, accepted: false };
  const form = tidy(simplified.expr);
  // check the closed form against the branch-faithful values
  let agree = 0; let compared = 0;
  for (const p of points) {
    const v = valueAt(p); if (!v) continue;
    compared++;
    try { const w = evaluate(form, p); if (Math.hypot(w.re - v.re, w.im - v.im) <= 1e-9 * Math.max(1, Math.hypot(v.re, v.im))) agree++; } catch { /* counted as disagreeing */ }
  }
  const formHolds = closedOk && compared > 0 && agree === compared;
  // branch record of every log and sqrt the derived quantity takes
  for (const c of calls(s.expr)) {
    const args = points.map((p) => {
      const env = new Map(p);
      for (const n of resultsUsed) { const v = ctx.results.get(n)!.valueAt!(p); if (v) env.set(n, new Complex(v.re, v.im)); }
      try { return evaluate(c.args[0]!, env); } catch { return null; }
    }).filter((z): z is Complex => z !== null);
    const argsOf = args.map((z) => Math.atan2(z.im, z.re));
    const lo = Math.min(...argsOf); const hi = Math.max(...argsOf);
    const nearCut = argsOf.filter((a) => Math.abs(Math.abs(a) - Math.PI) < 0.1).length;
    report.steps.push({
      kind: 'branch', rule: 'principal-function', principal: nearCut ? 'unknown' : 'right',
      basis: params.length ? sampledBasis(domainsOf(ctx, params), params, args.length, args.length - nearCut) : { kind: 'numeric' },
      fn: c.fn === 'log' ? 'log' : 'sqrt', argument: formulaOf(c.args[0]!), argRange: [lo, hi], nearCut,
      eigenvalues: [], pivots: [], pivotsAgree: null, crossings: [], regions: [],
    });
  }
  const value = params.length ? null : valueAt(new Map());
  // a decimal the user typed is shown as the fraction it stands for
  const shown = formulaOf(exactDecimals(formHolds ? form : s.expr));
  report.result = { ...shown, value };
  report.steps.push({
    kind: 'derived', name, definition: formulaOf(s.expr), closed: formHolds ? formulaOf(exactDecimals(form)) : null,
    compared, agreeing: agree, usesResults: resultsUsed.length > 0, value,
  });
  ctx.results.set(name, { line, unavailable: null, expr: formHolds ? form : null, params, valueAt, definition: s.expr, ...(closedOk ? { exactForm: full } : {}) });
  return report;
}
