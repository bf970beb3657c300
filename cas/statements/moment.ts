/**
 * moment NAME = P under Z: the average of a polynomial P in Z's integration variables under
 * Z's Gaussian weight, <P> = integral of P exp(S) / integral of exp(S), exactly.
 *
 * With S = -1/2 x^T A x + J^T x + c, the normalised weight has mean mu = A^-1 J and covariance
 * C = A^-1 (common practice). Shifting x = mu + y, each monomial of P(mu + y) is averaged by
 * Wick's (Isserlis') theorem: <y_i y_rest> = sum over partners l of C_il <y_rest without y_l>.
 * The ratio carries no square root, so there is no branch to choose; the average exists
 * where Z converges (for an oscillatory Z, by the same i*epsilon limit).
 *
 * Example: moment X4 = x^4 under Z with Z = integral of exp(-a x^2/2) gives 3/a^2.
 */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Expr, Statement } from '../lang/ast.js';
import { formulaOf } from '../expr/print.js';
import { ratExpr } from '../expr/fromExact.js';
import { freeNames } from '../expr/names.js';
import { fromExpr, rfAdd, rfConst, rfDiv, rfEvalComplex, rfIsZero, rfMul, rfPoly, rfPow, RF0, RF1, type RatFunc } from '../exact/ratfunc.js';
import { polyFromTerms, variables, type Poly } from '../exact/poly.js';
import { inverseRat } from '../exact/inverse.js';
import { berezin, gAdd, gExpEven, gMul, gScalar, gVariable, quadraticOf, type GElement } from '../exact/grassmann.js';
import { exactFormOf } from '../verdicts/exactForm.js';
import { checkDeadline } from '../deadline.js';
import { blankReport, StatementFailure, type Context, type GaussianInfo } from './context.js';
import type { Point } from '../domains/sample.js';

/** Degree and size limits that keep the number of pairings in reach of the statement time limit. */
const MAX_DEGREE = 16;

/** The Isserlis moment <prod y_i^j_i> for covariance C, memoised on the exponent vector. */
function isserlis(C: RatFunc[][]): (j: number[]) => RatFunc {
  const memo = new Map<string, RatFunc>();
  const go = (j: number[]): RatFunc => {
    const total = j.reduce((a, b) => a + b, 0);
    if (total === 0) return RF1;
    if (total % 2) return RF0;
    const key = j.join(',');
    const hit = memo.get(key);
    if (hit) return hit;
    checkDeadline();
    const i = j.findIndex((x) => x > 0);
    const rest = [...j]; rest[i]!--;
    let acc = RF0;
    rest.forEach((count, l) => {
      if (count === 0 || rfIsZero(C[i]![l]!)) return;
      const next = [...rest]; next[l]!--;
      acc = rfAdd(acc, rfMul(rfMul(rfConst(count), C[i]![l]!), go(next)));
    });
    memo.set(key, acc);
    return acc;
  };
  return go;
}

const binomial = (n: number, k: number) => { let b = 1; for (let i = 1; i <= k; i++) b = (b * (n - k + i)) / i; return b; };
const doubleFactorial = (n: number) => { let f = 1; for (let k = n; k > 1; k -= 2) f *= k; return f; };

/**
 * <P> under the normalised weight of a Gaussian result, exactly: the mean A^-1 J, the
 * covariance A^-1, the pairings summed, and the average as a rational function. `fail`
 * says why not (a weight that is not rational, a P that is not a polynomial, singular A).
 */
export function gaussianAverage(g: GaussianInfo, expr: Expr, fail: (message: string) => never): { result: RatFunc; mu: RatFunc[]; C: RatFunc[][]; pairings: number } {
  const vars = g.vars;
  const form = exactFormOf(g.form);
  if (!form) fail('The Gaussian weight is not rational in the parameters, so its moments are not computed exactly; write A, J and c with rational entries.');
  const P = fromExpr(expr);
  if (!P || variables(P.den).some((v) => vars.includes(v))) fail(`The averaged quantity must be a polynomial in ${vars.join(', ')} (with coefficients in the parameters).`);
  const C = inverseRat(form!.A);
  if (!C) fail('A is singular, so the weight has no covariance.');
  const mu = C!.map((row) => row.reduce((acc, x, j) => rfAdd(acc, rfMul(x, form!.J[j]!)), RF0));
  const moment = isserlis(C!);
  let total = RF0;
  let pairings = 0;
  for (const term of P!.num.terms.values()) {
    const k = vars.map((v) => term.m.find(([w]) => w === v)?.[1] ?? 0);
    if (k.reduce((a, b) => a + b, 0) > MAX_DEGREE) fail(`The polynomial has degree above ${MAX_DEGREE} in the variables; split it into smaller moments.`);
    const coeff: Poly = polyFromTerms([{ m: term.m.filter(([w]) => !vars.includes(w)), c: term.c }]);
    const choose = (i: number, j: number[]): void => {
      if (i === vars.length) {
        const deg = j.reduce((a, b) => a + b, 0);
        if (deg % 2) return;
        let f: RatFunc = rfPoly(coeff);
        j.forEach((ji, t) => { f = rfMul(f, rfMul(rfConst(binomial(k[t]!, ji)), rfPow(mu[t]!, k[t]! - ji))); });
        if (rfIsZero(f)) return;
        pairings += doubleFactorial(deg - 1);
        total = rfAdd(total, rfMul(f, moment(j)));
        return;
      }
      for (let ji = 0; ji <= k[i]!; ji++) {
        if (ji < k[i]! && rfIsZero(mu[i]!)) continue; // a zero mean leaves only the full power
        choose(i + 1, [...j, ji]);
      }
    };
    choose(0, []);
  }
  return { result: rfDiv(total, rfPoly(P!.den)), mu, C: C!, pairings };
}

export function evaluateMoment(s: Extract<Statement, { kind: 'moment' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.name.name;
  const report = blankReport(line, 'moment', name);
  if (ctx.params.has(name) || ctx.results.has(name)) throw new StatementFailure(`The name ${name} is already in use; give the moment a new name.`, line, s.name.span.start.column);
  const r = ctx.results.get(s.target.name);
  if (!r) throw new StatementFailure(`There is no result named ${s.target.name} above this line.`, line, s.target.span.start.column);
  if (r.berezin) return grassmannMoment(s, ctx, r.berezin, report);
  const g = r.gaussian;
  if (!g) throw new StatementFailure(`${s.target.name} is not a Gaussian integral (over real or Grassmann variables); a moment is taken under the weight of one.`, line, s.target.span.start.column);
  if (g.convergence === 'divergent') throw new StatementFailure(`${s.target.name} diverges, so averages under its weight do not exist.`, line, s.target.span.start.column);
  const vars = g.vars;
  for (const [n, span] of freeNames(s.expr)) {
    if (!vars.includes(n) && !ctx.params.has(n)) throw new StatementFailure(`"${n}" is neither an integration variable of ${s.target.name} (${vars.join(', ')}) nor a declared parameter.`, line, span?.start.column ?? 1);
  }
  const avg = gaussianAverage(g, s.expr, (msg) => { throw new StatementFailure(msg, line, s.span.start.column); });
  const { result, mu, C, pairings } = avg;
  const expr = ratExpr(result, true);
  const params = [...ctx.params.keys()].filter((p) => variables(result.num).includes(p) || variables(result.den).includes(p));
  const valueAt = (p: Point) => {
    const at = new Map([...p].map(([k2, z]) => [k2, { re: z.re, im: z.im }]));
    const v = rfEvalComplex(result, at);
    return Number.isFinite(v.re) && Number.isFinite(v.im) ? v : null;
  };
  const value = params.length ? null : valueAt(new Map());
  // exact given the weight; where the weight converges is the integral's own verdict (in the step)
  report.proof = 'proved';
  report.result = { ...formulaOf(expr), value };
  report.steps.push({
    kind: 'moment', name, under: s.target.name, polynomial: formulaOf(s.expr),
    mean: mu.map((m) => formulaOf(ratExpr(m, true))),
    covariance: C.map((row) => row.map((x) => formulaOf(ratExpr(x, true)))),
    pairings, result: formulaOf(expr), convergence: g.convergence,
  });
  ctx.results.set(name, { line, unavailable: null, expr, params, valueAt: (p) => { const v = valueAt(p); return v && { re: v.re, im: v.im }; }, definition: expr });
  return report;
}

/**
 * <P> under a Berezin integral: the integral of P exp(-1/2 theta^T A theta) over the same
 * measure divided by the integral of exp(-1/2 theta^T A theta) (= Pf(A)), both by direct
 * expansion in the Grassmann algebra (cas/exact/grassmann.ts), so every sign follows the
 * products as written and the measure's order. The record lists the two-point function
 * <theta_i theta_j> in place of a covariance.
 */
function grassmannMoment(s: Extract<Statement, { kind: 'moment' }>, ctx: Context, b: { vars: string[]; A: RatFunc[][] }, report: StatementReport): StatementReport {
  const line = s.span.start.line;
  const fail = (msg: string): never => { throw new StatementFailure(msg, line, s.span.start.column); };
  const index = new Map(b.vars.map((v, k) => [v, k]));
  const n = b.vars.length;
  for (const [nm, span] of freeNames(s.expr)) {
    if (!index.has(nm) && !ctx.params.has(nm)) throw new StatementFailure(`"${nm}" is neither a Grassmann variable of ${s.target.name} (${b.vars.join(', ')}) nor a declared parameter.`, line, span?.start.column ?? 1);
  }
  const expand = (e: Expr): GElement => {
    switch (e.t) {
      case 'name': if (index.has(e.name)) return gVariable(index.get(e.name)!); break;
      case 'neg': return gAdd(new Map(), expand(e.a), -1);
      case 'bin':
        if (e.op === '+') return gAdd(expand(e.a), expand(e.b));
        if (e.op === '-') return gAdd(expand(e.a), expand(e.b), -1);
        if (e.op === '*') return gMul(expand(e.a), expand(e.b));
        if (e.op === '/' && ![...freeNames(e.b).keys()].some((v) => index.has(v))) {
          const d = fromExpr(e.b);
          if (!d || rfIsZero(d)) fail('A divisor must be a nonzero rational expression in the parameters.');
          return new Map([...expand(e.a)].map(([k, t]) => [k, { idx: t.idx, c: rfDiv(t.c, d!) }]));
        }
        if ([...freeNames(e).keys()].some((v) => index.has(v))) fail('Write products of Grassmann variables as products (t1*t2); powers and quotients of them are not averages of a polynomial.');
        break;
      default: break;
    }
    const c = fromExpr(e);
    if (!c) fail('The averaged quantity must be a polynomial in the Grassmann variables with rational coefficients in the parameters.');
    return gScalar(c!);
  };
  const weight = gExpEven(quadraticOf(b.A), n);
  const z = berezin(weight, n);
  if (rfIsZero(z)) fail(`The Pfaffian of ${s.target.name} vanishes, so averages under it are not defined.`);
  const average = (P: GElement) => rfDiv(berezin(gMul(P, weight), n), z);
  const result = average(expand(s.expr));
  const G = b.vars.map((_, i) => b.vars.map((__, j) => (i === j ? RF0 : average(gMul(gVariable(i), gVariable(j))))));
  const expr = ratExpr(result, true);
  const params = [...ctx.params.keys()].filter((p) => variables(result.num).includes(p) || variables(result.den).includes(p));
  const valueAt = (p: Point) => {
    const v = rfEvalComplex(result, new Map([...p].map(([k2, w]) => [k2, { re: w.re, im: w.im }])));
    return Number.isFinite(v.re) && Number.isFinite(v.im) ? { re: v.re, im: v.im } : null;
  };
  const degree = Math.max(0, ...[...expand(s.expr).values()].map((t) => t.idx.length));
  report.proof = 'proved';
  report.result = { ...formulaOf(expr), value: params.length ? null : valueAt(new Map()) };
  report.steps.push({
    kind: 'moment', name: s.name.name, under: s.target.name, polynomial: formulaOf(s.expr),
    mean: b.vars.map(() => formulaOf(ratExpr(RF0))), covariance: G.map((row) => row.map((x) => formulaOf(ratExpr(x, true)))),
    pairings: doubleFactorial(degree - 1), result: formulaOf(expr), convergence: 'absolute', grassmann: true,
  });
  ctx.results.set(s.name.name, { line, unavailable: null, expr, params, valueAt, definition: expr });
  return report;
}
