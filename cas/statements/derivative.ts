/**
 * derivative NAME = EXPR by p: the exact derivative of a quantity built from results and
 * parameters, by the chain rule. A Gaussian result Z enters through d log Z / dp, which is
 * rational: log Z = log(prefactor) + (n/2) log(2 pi) - 1/2 log det A + J^T A^-1 J / 2 + c, so
 *   d log Z/dp = prefactor'/prefactor - 1/2 (det A)'/det A + (J^T A^-1 J / 2 + c)'
 * whatever branch of sqrt(det A) the result is on (a derivative of log does not see the
 * branch). Hence -d log Z/dbeta (an energy), d^2 log Z/dJ^2 (a connected two-point function)
 * and -2 d log Z/dk (a second moment) come out as exact rational functions. Each answer is
 * checked against central differences of the branch-faithful values.
 *
 * Example: derivative X = -2*log(Z) by k, with Z = integral of exp(-k x^2/2), gives 1/k.
 */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Expr, Statement } from '../lang/ast.js';
import { Complex } from 'complex.js';
import { add, call, div, mul, name as nameExpr, neg, num, pow, sub } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames, substitute } from '../expr/names.js';
import { formulaOf } from '../expr/print.js';
import { ratExpr } from '../expr/fromExact.js';
import { fromExpr, rfAdd, rfConst, rfDiv, rfIsZero, rfMul, rfPoly, rfSub, type RatFunc } from '../exact/ratfunc.js';
import { derivative as polyDerivative, polyMul } from '../exact/poly.js';
import { detRat } from '../exact/matrix.js';
import { inverseRat } from '../exact/inverse.js';
import { exactFormOf } from '../verdicts/exactForm.js';
import { samplePoints, type Point } from '../domains/sample.js';
import { blankReport, domainsOf, StatementFailure, type Context, type ResultInfo } from './context.js';

/** d r / dv for a rational function. */
export function rfDerivative(r: RatFunc, v: string): RatFunc {
  const top = rfSub(rfMul(rfPoly(polyDerivative(r.num, v)), rfPoly(r.den)), rfMul(rfPoly(r.num), rfPoly(polyDerivative(r.den, v))));
  return rfDiv(top, rfPoly(polyMul(r.den, r.den)));
}

/** d log Z / dp of a Gaussian result as a rational function, or null when its form is not rational. */
function gaussianLogDerivative(r: ResultInfo, p: string): RatFunc | null {
  const g = r.gaussian;
  if (!g) return null;
  const form = exactFormOf(g.form);
  const pre = fromExpr(g.prefactor);
  if (!form || !pre || rfIsZero(pre)) return null;
  const det = detRat(form.A);
  if (rfIsZero(det)) return null;
  const C = inverseRat(form.A);
  if (!C) return null;
  let E = form.c;
  form.J.forEach((Ji, i) => form.J.forEach((Jj, j) => { E = rfAdd(E, rfMul(rfConst({ re: { n: 1n, d: 2n }, im: { n: 0n, d: 1n } }), rfMul(Ji, rfMul(C[i]![j]!, Jj)))); }));
  const half = rfConst({ re: { n: -1n, d: 2n }, im: { n: 0n, d: 1n } });
  return rfAdd(rfAdd(rfDiv(rfDerivative(pre, p), pre), rfMul(half, rfDiv(rfDerivative(det, p), det))), rfDerivative(E, p));
}

export function evaluateDerivative(s: Extract<Statement, { kind: 'derivative' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.name.name;
  const p = s.param.name;
  const report = blankReport(line, 'derivative', name);
  if (ctx.params.has(name) || ctx.results.has(name)) throw new StatementFailure(`The name ${name} is already in use; give the derivative a new name.`, line, s.name.span.start.column);
  const dom = ctx.params.get(p)?.domain;
  if (!dom) throw new StatementFailure(`${p} is not a declared parameter.`, line, s.param.span.start.column);
  const logDerivatives = new Map<string, Expr>();
  const resultsUsed = new Set<string>();
  const used = new Set<string>();

  const logDerivativeOf = (n: string, depth: number): Expr => {
    const hit = logDerivatives.get(n);
    if (hit) return hit;
    const r = ctx.results.get(n)!;
    const exact = gaussianLogDerivative(r, p);
    let e: Expr;
    if (exact) e = ratExpr(exact, true);
    else {
      const def = r.definition ?? r.expr;
      if (!def) throw new StatementFailure(`${n} has no exact form to differentiate.`, line, s.span.start.column);
      e = div(d(def, depth + 1), nameExpr(n));
    }
    logDerivatives.set(n, e);
    return e;
  };

  function d(e: Expr, depth = 0): Expr {
    if (depth > 60) throw new StatementFailure('The expression is nested too deeply to differentiate.', line, s.span.start.column);
    switch (e.t) {
      case 'num': case 'const': return num(0);
      case 'name': {
        if (e.name === p) return num(1);
        if (ctx.params.has(e.name)) { used.add(e.name); return num(0); }
        const r = ctx.results.get(e.name);
        if (!r) throw new StatementFailure(`Unknown name "${e.name}": a derivative uses declared parameters and results above it.`, line, s.span.start.column);
        if (r.unavailable || !r.valueAt) throw new StatementFailure(`This derivative depends on ${r.unavailable ?? e.name}.`, line, s.span.start.column);
        resultsUsed.add(e.name);
        r.params.forEach((q) => used.add(q));
        if (!r.params.includes(p)) return num(0);
        // a derived quantity is differentiated through its definition; a Gaussian result as Z * d log Z
        if (!r.gaussian && r.definition) return d(r.definition, depth + 1);
        return mul(e, logDerivativeOf(e.name, depth));
      }
      case 'neg': return neg(d(e.a, depth + 1));
      case 'bin': {
        const da = d(e.a, depth + 1);
        switch (e.op) {
          case '+': return add(da, d(e.b, depth + 1));
          case '-': return sub(da, d(e.b, depth + 1));
          case '*': return add(mul(da, e.b), mul(e.a, d(e.b, depth + 1)));
          case '/': { const db = d(e.b, depth + 1); return sub(div(da, e.b), div(mul(e.a, db), pow(e.b, num(2)))); }
          case '^': {
            const db = d(e.b, depth + 1);
            if (db.t === 'num' && Number(db.v) === 0) return mul(mul(e.b, pow(e.a, sub(e.b, num(1)))), da);
            return mul(e, add(mul(db, call('log', e.a)), div(mul(e.b, da), e.a)));
          }
        }
        break;
      }
      case 'call': {
        const a = e.args[0]!;
        // log of a result: its log-derivative directly (Z'/Z would need a cancellation)
        if (e.fn === 'log' && a.t === 'name' && ctx.results.has(a.name)) { d(a, depth + 1); return ctx.results.get(a.name)!.params.includes(p) ? logDerivativeOf(a.name, depth) : num(0); }
        const da = d(a, depth + 1);
        switch (e.fn) {
          case 'exp': return mul(e, da);
          case 'log': return div(da, a);
          case 'sqrt': return div(da, mul(num(2), e));
          case 'sin': return mul(call('cos', a), da);
          case 'cos': return neg(mul(call('sin', a), da));
          case 'sinh': return mul(call('cosh', a), da);
          case 'cosh': return mul(call('sinh', a), da);
          case 'asinh': return div(da, call('sqrt', add(num(1), pow(a, num(2)))));
        }
        throw new StatementFailure(`${e.fn} cannot be differentiated here.`, line, s.span.start.column);
      }
    }
    throw new StatementFailure('This expression cannot be differentiated.', line, s.span.start.column);
  }

  const raw = d(s.expr);
  // A derivative free of results that is rational prints as one fraction in lowest terms.
  const rational = [...freeNames(raw).keys()].every((n) => ctx.params.has(n)) ? fromExpr(raw) : null;
  const shown = rational ? ratExpr(rational, true) : raw;

  // values: the results' branch-faithful values, so the check does not depend on a printed form
  const params = [...ctx.params.keys()].filter((q) => q === p || used.has(q) || freeNames(s.expr).has(q));
  const env = (pt: Point): Map<string, Complex> | null => {
    const m = new Map(pt);
    for (const n of resultsUsed) {
      const v = ctx.results.get(n)!.valueAt!(pt);
      if (!v) return null;
      m.set(n, new Complex(v.re, v.im));
    }
    return m;
  };
  const valueOf = (e: Expr, pt: Point) => {
    const m = env(pt);
    if (!m) return null;
    try { const z = evaluate(e, m); return Number.isFinite(z.re) && Number.isFinite(z.im) ? z : null; } catch { return null; }
  };
  const points = samplePoints(domainsOf(ctx, params), params, 12, 4242);
  let worst = 0; let count = 0;
  for (const pt of points) {
    const x = pt.get(p)!;
    const h = 2e-4 * Math.max(x.abs(), 1e-2);
    // central differences at h and h/2, Richardson-extrapolated: error O(h^4)
    const quotient = (step: number) => {
      const plus = new Map(pt); plus.set(p, x.add(step));
      const minus = new Map(pt); minus.set(p, x.sub(step));
      const fp = valueOf(s.expr, plus); const fm = valueOf(s.expr, minus);
      return fp && fm ? { q: fp.sub(fm).div(2 * step), size: fp.abs() } : null;
    };
    const q1 = quotient(h); const q2 = quotient(h / 2); const exact = valueOf(shown, pt);
    if (!q1 || !q2 || !exact) continue;
    const fd = q2.q.mul(4).sub(q1.q).div(3);
    // rounding in the difference quotient is about 1e-16 |F| / h: allow for it beside |F'|
    worst = Math.max(worst, fd.sub(exact).abs() / (exact.abs() + 1e-9 * q1.size / h + 1e-300));
    count++;
  }
  if (count === 0) throw new StatementFailure(`${name} has no value at the sample points, so the derivative could not be checked.`, line, s.span.start.column);
  if (worst > 1e-4) throw new StatementFailure(`The exact derivative disagrees with central differences (relative difference ≈ ${worst.toPrecision(3)}); it is withheld.`, line, s.span.start.column);

  const closedMap = new Map<string, Expr>();
  // a let through its exact form (ResultInfo.exactForm), so later proofs never read a sampled rewrite
  for (const n of resultsUsed) { const r = ctx.results.get(n)!; const e = r.exactForm ?? r.expr; if (e) closedMap.set(n, e); }
  const closed = closedMap.size === resultsUsed.size ? substitute(shown, closedMap) : null;
  const valueAt = (pt: Point) => { const z = valueOf(shown, pt); return z && { re: z.re, im: z.im }; };
  const value = params.length ? null : valueAt(new Map());
  report.proof = 'proved';
  report.result = { ...formulaOf(shown), value };
  report.steps.push({
    kind: 'derivative', name, param: p, of: formulaOf(s.expr), result: formulaOf(shown),
    logDerivatives: [...logDerivatives].map(([n, e]) => ({ name: n, formula: formulaOf(e) })),
    checks: { count, worst },
  });
  ctx.results.set(name, { line, unavailable: null, expr: closed, params, valueAt, definition: shown });
  return report;
}
