/**
 * limit NAME : p -> v   and   limit NAME : p -> inf.
 * A finite limit: the closed form with p = v substituted (or the algebra package's limit), checked
 * numerically by approaching v. At infinity: the leading behaviour C p^a (or a log p + b), with the
 * next correction where it can be found; the exponents are read off values at large p and the
 * constants from the algebra package where it gives them, always checked numerically.
 */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Expr, Statement } from '../lang/ast.js';
import { Complex } from 'complex.js';
import { div, mul, name as nameExpr, neg, num, pow, sub, call } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames, substitute } from '../expr/names.js';
import { formulaOf, toText } from '../expr/print.js';
import { tidy, rational } from '../expr/tidy.js';
import { limitOf, rewriteChecked } from '../algebra/adapter.js';
import { sampledBasis, samplePoints, type Point } from '../domains/sample.js';
import { complexText } from '../gaussian/describe.js';
import { complexExpr } from '../expr/numberExpr.js';
import { recognizeConstant } from '../expr/recognize.js';
import { blankReport, domainsOf, StatementFailure, type Context } from './context.js';
import { resultNamed } from './shared.js';
import { exactLimit } from './limitExact.js';
import { generalLimit } from './limitGeneral.js';
import type { Approach } from '../verdicts/asymptotics.js';
import { fromExpr } from '../exact/ratfunc.js';
import { variables } from '../exact/poly.js';
import type { Step } from '../../shared/evaluation.js';

type V = { re: number; im: number };
const rd = (a: V, b: V) => Math.hypot(a.re - b.re, a.im - b.im) / Math.max(Math.hypot(b.re, b.im), 1e-300);

function exprAt(e: Expr, p: Point): V | null {
  try { const z = evaluate(e, p); return Number.isFinite(z.re) && Number.isFinite(z.im) ? { re: z.re, im: z.im } : null; } catch { return null; }
}

export function evaluateLimit(s: Extract<Statement, { kind: 'limit' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.target.name;
  const report = blankReport(line, 'limit', name);
  const r = resultNamed(ctx, s.target, line, 'limit');
  const pn = s.param.name;
  if (!r.params.includes(pn)) throw new StatementFailure(`${name} does not depend on ${pn}.`, line, s.param.span.start.column);
  const others = r.params.filter((x) => x !== pn);
  const pts = others.length ? samplePoints(domainsOf(ctx, others), others, 6, 99) : [new Map()];
  const at = (p: Point, x: Complex) => { const q = new Map(p); q.set(pn, x); return r.valueAt(q); };
  const dom = ctx.params.get(pn)!.domain;
  const exact = exactRoute(s, r, ctx, pn, dom);
  if (exact) { report.steps.push(exact.step); report.result = exact.result; return report; }
  const general = generalRoute(s, ctx, pn, dom, pts, r.valueAt);
  if (general && 'step' in general) { report.steps.push(...(general.extra ?? []), general.step); report.result = general.result; return report; }
  const reason = general?.reason;
  if (s.to !== 'inf' && s.to !== '-inf') {
    const to = s.to;
    if (freeNames(to).size) throw new StatementFailure('The limit point must be a number.', line, s.span.start.column);
    const v = evaluate(to, new Map());
    let candidate: Expr | null = null;
    let how = '';
    if (r.expr) {
      const sub1 = rewriteChecked('simplify', substitute(r.expr, new Map([[pn, to]])), pts);
      if (pts.every((p) => exprAt(sub1.expr, p))) { candidate = tidy(sub1.expr); how = `substituting ${pn} = ${toText(to)} in the closed form`; }
      else if (algebraLimitSafe(r.expr)) { const l = limitOf(r.expr, pn, to); if (l) { candidate = tidy(l); how = 'the algebra package\'s limit'; } }
    }
    // numeric check: approach v along the domain's direction
    const dir = dom === 'negative' ? -1 : 1;
    let worst = 0; let checked = 0;
    for (const p of pts) {
      const target = candidate ? exprAt(candidate, p) : null;
      const near = at(p, new Complex(v.re + dir * 1e-7, v.im));
      if (!near) continue;
      const d = target ? rd(near, target) : NaN;
      if (Number.isFinite(d)) { worst = Math.max(worst, d); checked++; }
    }
    const holds = candidate !== null && checked > 0 && worst < 1e-5;
    const nearby = at(pts[0]!, new Complex(v.re + dir * 1e-7, v.im));
    const numeric = nearby && Number.isFinite(nearby.re) && Number.isFinite(nearby.im) ? nearby : null;
    report.result = holds
      ? { ...formulaOf(candidate!), value: freeNames(candidate!).size ? null : exprAt(candidate!, new Map()) }
      : { text: 'unknown', latex: '\\text{unknown}', value: null };
    report.steps.push({
      kind: 'limit', name, param: pn, to: formulaOf(to),
      outcome: holds ? 'value' : 'unknown',
      formula: holds ? formulaOf(candidate!) : null,
      value: holds ? report.result.value : numeric,
      method: holds ? (how.startsWith('substituting') ? 'substitution' : 'algebra-limit') : 'none',
      ...(!holds && reason ? { reason } : {}),
      basis: others.length ? sampledBasis(domainsOf(ctx, others), others, checked, holds ? checked : 0) : { kind: 'numeric' },
      checks: { count: checked, worst },
    });
    return report;
  }
  // p -> +-inf along the real axis (the param's direction)
  const sign = s.to === 'inf' ? 1 : -1;
  if ((dom === 'positive' && sign < 0) || (dom === 'negative' && sign > 0)) throw new StatementFailure(`${pn} is ${dom}, so it cannot tend to ${s.to}.`, line, s.span.start.column);
  const p0 = pts[0]!;
  const f = (x: number) => at(p0, new Complex(sign * x, 0));
  const xs = [1e4, 1e5, 1e6];
  const vals = xs.map(f);
  if (vals.some((v) => !v)) throw new StatementFailure(`${name} has no value at large ${pn}.`, line, s.span.start.column);
  const mag = vals.map((v) => Math.hypot(v!.re, v!.im));
  const slope = Math.log(mag[2]! / mag[1]!) / Math.log(10);
  const [pq, qq] = rational(slope);
  const alpha = Math.abs(pq / qq - slope) < 1e-3 && qq <= 12 ? pq / qq : slope;
  const x2 = xs[2]!;
  // logarithmic growth: f(10x) - f(x) constant
  const d1 = { re: vals[2]!.re - vals[1]!.re, im: vals[2]!.im - vals[1]!.im };
  const d0 = { re: vals[1]!.re - vals[0]!.re, im: vals[1]!.im - vals[0]!.im };
  const logLike = Math.abs(alpha) < 1e-3 && Math.hypot(d1.re, d1.im) > 1e-9 * mag[2]! && rd(d1, d0) < 1e-3;
  const P = nameExpr(pn);
  let lead: Expr; let leadText: string;
  let method: 'algebra-limit' | 'recognised' | 'read-off' = 'read-off';
  let correctionStep: { formula: { text: string; latex: string } | null; power: number } | null = null;
  let constantTerm: { re: number; im: number } | null = null;
  if (logLike) {
    const a = { re: d1.re / Math.log(10), im: d1.im / Math.log(10) };
    const b = { re: vals[2]!.re - a.re * Math.log(x2), im: vals[2]!.im - a.im * Math.log(x2) };
    lead = tidy(mul(complexExpr(a), call('log', P)));
    leadText = `${toText(lead)} + ${complexText(b, 10)}`;
    constantTerm = b;
  } else {
    const power = alpha === 0 ? num(1) : pow(P, complexExpr({ re: alpha, im: 0 }));
    // C from the algebra package where it gives one, else numerically
    let C: Expr | null = null;
    if (r.expr && algebraLimitSafe(r.expr)) {
      const l = limitOf(div(r.expr, power), pn, 'inf');
      if (l && pts.every((p) => { const c = exprAt(l, p); const q = new Map(p); q.set(pn, new Complex(1e7, 0)); const w = r.valueAt(q); return c && w && rd({ re: w.re / 1e7 ** alpha, im: w.im / 1e7 ** alpha }, c) < 1e-4 * (1 + 0); })) {
        C = tidy(rewriteChecked('simplify', l, pts).expr);
        // The algebra package sometimes returns a pure number as a long fraction
        // approximating, e.g., sqrt(2*pi): write it in its simple form when that matches.
        const cValue = freeNames(C).size === 0 ? exprAt(C, p0) : null;
        const simple = cValue && recognizeConstant(cValue, 1e-12);
        if (simple) C = simple;
        method = 'algebra-limit';
      }
    }
    if (!C) {
      const v = vals[2]!;
      const readOff = { re: v.re / x2 ** alpha, im: v.im / x2 ** alpha };
      // A read-off constant that is a simple multiple of powers of pi and sqrt(2) is
      // written as such once it holds at a larger value and for every sampled point.
      const guess = recognizeConstant(readOff, 1e-7);
      const guessValue = guess && exprAt(guess, p0);
      const holds = guessValue && pts.every((p) => {
        const q = new Map(p); q.set(pn, new Complex(sign * 1e7, 0));
        const w = r.valueAt(q);
        return w && rd({ re: w.re / 1e7 ** alpha, im: w.im / 1e7 ** alpha }, guessValue) < 1e-7;
      });
      if (guess && holds) {
        C = guess;
        method = 'recognised';
      } else {
        C = complexExpr(readOff);
        method = 'read-off';
      }
    }
    lead = tidy(mul(C, power));
    leadText = toText(lead);
    // next correction: f - lead ~ D p^beta
    const rest = xs.map((x, k) => { const L = exprAt(lead, new Map([...p0, [pn, new Complex(sign * x, 0)]])); return L ? { re: vals[k]!.re - L.re, im: vals[k]!.im - L.im } : null; });
    if (rest.every((z) => z && Math.hypot(z.re, z.im) > 0)) {
      const beta = Math.log(Math.hypot(rest[1]!.re, rest[1]!.im) / Math.hypot(rest[0]!.re, rest[0]!.im)) / Math.log(10);
      const [bp, bq] = rational(beta);
      if (Math.abs(bp / bq - beta) < 1e-2 && bq <= 12 && beta < alpha - 0.5 && r.expr && algebraLimitSafe(r.expr)) {
        const b = bp / bq;
        const l2 = limitOf(div(sub(r.expr, lead), pow(P, complexExpr({ re: b, im: 0 }))), pn, 'inf');
        const ok = l2 && pts.every((p) => { const c = exprAt(l2, p); const q = new Map(p); q.set(pn, new Complex(1e3, 0)); const w = r.valueAt(q); const L = exprAt(lead, q); return c && w && L && rd({ re: (w.re - L.re) / 1e3 ** b, im: (w.im - L.im) / 1e3 ** b }, c) < 1e-3; });
        correctionStep = ok
          ? { formula: formulaOf(mul(tidy(rewriteChecked('simplify', l2!, pts).expr), pow(P, complexExpr({ re: b, im: 0 })))), power: b }
          : { formula: null, power: b };
      }
    }
  }
  // A power fitted to values at large p, or a constant read off there, is a guess, not a limit: unknown.
  const guessed = logLike || method === 'read-off' || method === 'recognised';
  report.result = guessed ? { text: 'unknown', latex: '\\text{unknown}', value: null } : { ...formulaOf(lead), value: null };
  report.steps.push({
    kind: 'limit', name, param: pn, to: { text: s.to, latex: s.to === 'inf' ? '\\infty' : '-\\infty' },
    outcome: guessed ? 'unknown' : 'asymptotic', formula: guessed ? null : formulaOf(lead), value: guessed ? vals[2] ?? null : null,
    method: logLike ? 'logarithmic' : method,
    ...(guessed && reason ? { reason } : {}),
    basis: others.length ? sampledBasis(domainsOf(ctx, others), others, pts.length) : { kind: 'numeric' },
    power: alpha,
    ...(correctionStep ? { correction: correctionStep } : {}),
    ...(constantTerm ? { constantTerm } : {}),
  });
  return report;
}

/**
 * The algebra package's limit does not return on asinh of 1/p (a time-sliced determinant whose
 * exact expansion was refused, e.g. V < 0): such an expression keeps to the exact expansion
 * and the values, and an unknown limit says so instead of running out of time.
 */
function algebraLimitSafe(e: Expr): boolean {
  switch (e.t) {
    case 'call': return e.fn !== 'asinh' && e.args.every(algebraLimitSafe);
    case 'neg': return algebraLimitSafe(e.a);
    case 'bin': return algebraLimitSafe(e.a) && algebraLimitSafe(e.b);
    default: return true;
  }
}

/** How p approaches the limit point: one side at a domain end, both sides (which must agree) inside. */
function approachesOf(s: Extract<Statement, { kind: 'limit' }>, dom: string): Approach[] | null {
  if (s.to === 'inf' || s.to === '-inf') {
    if ((dom === 'positive' && s.to === '-inf') || (dom === 'negative' && s.to === 'inf')) return null;
    return [{ kind: s.to }];
  }
  const v = fromExpr(s.to);
  const c = v && variables(v.num).length === 0 && variables(v.den).length === 0 ? [...v.num.terms.values()][0]?.c ?? { re: { n: 0n, d: 1n }, im: { n: 0n, d: 1n } } : null;
  if (!c || c.im.n !== 0n) return null;
  const zero = c.re.n === 0n;
  const sides: (1 | -1)[] = zero && dom === 'positive' ? [1] : zero && dom === 'negative' ? [-1] : [1, -1];
  return sides.map((side) => ({ kind: 'point', at: c.re, side }));
}

/** The general expansion route (statements/limitGeneral.ts) for derived quantities and any result it can read. */
function generalRoute(
  s: Extract<Statement, { kind: 'limit' }>, ctx: Context, pn: string, dom: string, pts: Point[],
  valueAt: (p: Point) => { re: number; im: number } | null,
): { step: Step; result: { text: string; latex: string; value: null }; extra?: Step[] } | { reason: string } | null {
  if (dom === 'complex') return { reason: `${pn} is complex; limits are taken along the real axis of a real parameter` };
  const hows = approachesOf(s, dom);
  if (!hows) return null;
  const domains = domainsOf(ctx, [...ctx.params.keys()]);
  if ([...domains.values()].includes('complex')) return { reason: 'a complex parameter is present; the expansion needs real parameters to decide signs' };
  const resolve = (n: string) => { const r = ctx.results.get(n); return r ? { ...(r.gaussian ? { gaussian: r.gaussian } : {}), ...(r.definition ? { definition: r.definition } : {}), ...(r.lattice ? { lattice: r.lattice } : {}) } : null; };
  const results = hows.map((how) => generalLimit(nameExpr(s.target.name), pn, how, domains, resolve, { points: pts, valueAt }));
  const first = results[0]!;
  if (first.outcome === 'unknown') return { reason: first.reason };
  const other = results.find((x) => x.outcome === 'unknown' || x.outcome !== first.outcome || x.formula.text !== first.formula.text);
  if (other) return { reason: other.outcome === 'unknown' ? other.reason : 'the two sides of the limit point disagree' };
  const step: Step = {
    kind: 'limit', name: s.target.name, param: pn,
    to: s.to === 'inf' || s.to === '-inf' ? { text: s.to, latex: s.to === 'inf' ? '\\infty' : '-\\infty' } : formulaOf(s.to),
    outcome: first.outcome, formula: first.formula, value: null, method: 'expansion', basis: { kind: 'proved' },
    ...(first.rate ? { rate: first.rate } : {}),
    ...(first.correction && hows.length === 1 ? { correction: { formula: first.correction.formula, power: first.correction.power } } : {}),
    ...(first.remainder ? { remainder: first.remainder } : {}),
  };
  return { step, result: { text: first.formula.text, latex: first.formula.latex, value: null }, extra: first.modular ?? [] };
}

/** A let that is c*log(Z) of an integral Z, c a constant or the parameter: its parts. */
function logOfIntegral(def: Expr, pn: string): { target: string; c0: Expr; power: number } | null {
  if (def.t === 'neg') { const m = logOfIntegral(def.a, pn); return m && { ...m, c0: neg(m.c0) }; }
  if (def.t === 'call' && def.fn === 'log' && def.args[0]!.t === 'name') return { target: def.args[0]!.name, c0: num(1), power: 0 };
  if (def.t === 'bin' && def.op === '*') {
    for (const [f, other] of [[def.a, def.b], [def.b, def.a]] as const) {
      const m = logOfIntegral(f, pn);
      if (!m) continue;
      if (other.t === 'name' && other.name === pn) return { ...m, power: m.power + 1 };
      if (freeNames(other).size === 0) return { ...m, c0: mul(m.c0, other) };
    }
  }
  return null;
}

/** The exact expansion route (verdicts/asymptotics.ts) for integral results and c*log of them. */
function exactRoute(s: Extract<Statement, { kind: 'limit' }>, r: ReturnType<typeof resultNamed>, ctx: Context, pn: string, dom: string): { step: Step; result: { text: string; latex: string; value: null } } | null {
  let g = r.gaussian;
  let logFactor: { c0: Expr; power: number } | null = null;
  if (!g && r.definition) {
    const m = logOfIntegral(r.definition, pn);
    const target = m ? ctx.results.get(m.target) : null;
    if (!m || !target?.gaussian) return null;
    g = target.gaussian;
    logFactor = { c0: m.c0, power: m.power };
  }
  if (!g || g.contour) return null;
  const domains = domainsOf(ctx, [...ctx.params.keys()]);
  let how: Approach;
  if (s.to === 'inf' || s.to === '-inf') {
    if ((dom === 'positive' && s.to === '-inf') || (dom === 'negative' && s.to === 'inf')) return null;
    how = { kind: s.to };
  } else {
    const v = fromExpr(s.to);
    const c = v && variables(v.num).length === 0 && variables(v.den).length === 0 ? [...v.num.terms.values()][0]?.c ?? { re: { n: 0n, d: 1n }, im: { n: 0n, d: 1n } } : null;
    if (!c || c.im.n !== 0n) return null;
    const at = c.re;
    const zero = at.n === 0n;
    // a domain end is approached from inside; an interior point from both sides, which must agree
    const sides: (1 | -1)[] = zero && dom === 'positive' ? [1] : zero && dom === 'negative' ? [-1] : [1, -1];
    const results = sides.map((side) => exactLimit(g!, pn, { kind: 'point', at, side }, domains, logFactor));
    if (results.some((x) => !x) || results.some((x) => x!.formula.text !== results[0]!.formula.text || x!.outcome !== results[0]!.outcome)) return null;
    how = { kind: 'point', at, side: sides[0]! };
  }
  const res = exactLimit(g, pn, how, domains, logFactor);
  if (!res) return null;
  const outcome = res.outcome;
  const step: Step = {
    kind: 'limit', name: s.target.name, param: pn,
    to: s.to === 'inf' || s.to === '-inf' ? { text: s.to, latex: s.to === 'inf' ? '\\infty' : '-\\infty' } : formulaOf(s.to),
    outcome, formula: res.formula, value: null, method: 'expansion', basis: { kind: 'proved' },
    ...(res.rate ? { rate: res.rate } : {}),
  };
  return { step, result: { text: res.formula.text, latex: res.formula.latex, value: null } };
}
