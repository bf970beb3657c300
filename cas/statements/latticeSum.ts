/**
 * sum NAME = exp(E) over all n: a Gaussian sum over the integers, E a polynomial of degree 2 in n
 * with coefficients rational in the parameters (and pi). Written as
 *
 *     E = -pi*a*n^2 + 2*pi*i*b*n + g,
 *
 * it converges exactly when Re a > 0, and Poisson resummation gives
 *
 *     sum_n exp(-pi*a*n^2 + 2*pi*i*b*n) = a^(-1/2) * sum_m exp(-pi*(m - b)^2/a)
 *
 * (the Fourier transform of exp(-pi*a*x^2 + 2*pi*i*b*x) at m is a^(-1/2) exp(-pi*(m - b)^2/a)).
 * a^(-1/2) is the principal root: both sides are analytic in a on Re a > 0, which the principal
 * root never leaves the cut of, and they agree for real a > 0. The record carries the decision on
 * Re a > 0 (exact where the sign machinery proves it on the whole domain, else at sample points
 * with the box), the value, and the small-a form with its bound (cas/numeric/lattice.ts,
 * `smallAForm`). Theta functions are such sums: theta_3(z | tau) is a = -i*tau, b = z.
 */
import { Complex } from 'complex.js';
import type { Basis, StatementReport } from '../../shared/evaluation.js';
import type { Expr, Statement } from '../lang/ast.js';
import { call, div, mul, name as nameExpr, neg, num, PI, pow, sub } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames } from '../expr/names.js';
import { formulaOf } from '../expr/print.js';
import { ratExpr } from '../expr/fromExact.js';
import { fromExpr, rfConst, rfDiv, rfIsZero, rfMul, rfPoly, type RatFunc } from '../exact/ratfunc.js';
import { coefficients, variables } from '../exact/poly.js';
import { Q1 } from '../exact/q.js';
import { rfIm, rfRe } from '../verdicts/exactGaussian.js';
import { Expander } from '../verdicts/expansion.js';
import { samplePoints, sampledBasis, type Point } from '../domains/sample.js';
import { poissonSum, smallAForm } from '../numeric/lattice.js';
import { blankReport, domainsOf, StatementFailure, type Context, type LatticeInfo } from './context.js';

const PI_RF = () => fromExpr(PI)!;

/** The numbers alpha = pi*a, beta = 2*pi*i*b, gamma = g of a sum at a parameter point. */
export function latticeNumbers(l: LatticeInfo, pt: Point): { alpha: Complex; beta: Complex; gamma: Complex; a: Complex; b: Complex } {
  const env = new Map(pt);
  const a = evaluate(ratExpr(l.a), env); const b = evaluate(ratExpr(l.b), env); const g = evaluate(ratExpr(l.g), env);
  return { a, b, alpha: a.mul(Math.PI), beta: b.mul(new Complex(0, 2 * Math.PI)), gamma: g };
}

/** The sum's value at a point by Poisson resummation (the closed-form side), null where Re a <= 0. */
export function latticeValue(l: LatticeInfo, pt: Point): { re: number; im: number } | null {
  try {
    const x = latticeNumbers(l, pt);
    if (!(x.a.re > 0)) return null;
    const v = poissonSum(x);
    return Number.isFinite(v.re) && Number.isFinite(v.im) ? { re: v.re, im: v.im } : null;
  } catch { return null; }
}

/** A rational function all of whose symbols are real-valued params (or pi) with real coefficients. */
function provablyReal(r: RatFunc, ctx: Context): boolean {
  const names = [...variables(r.num), ...variables(r.den)];
  return names.every((v) => v === 'pi' || (ctx.params.get(v)?.domain ?? 'complex') !== 'complex') && rfIsZero(rfIm(r));
}

export function evaluateLatticeSum(s: Extract<Statement, { kind: 'sum' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.name.name;
  const n = s.index.name;
  const fail = (msg: string, column = s.span.start.column): never => { throw new StatementFailure(msg, line, column); };
  const report = blankReport(line, 'sum', name);
  if (ctx.params.has(name) || ctx.results.has(name)) fail(`The name ${name} is already in use; give the sum a new name.`, s.name.span.start.column);
  if (ctx.params.has(n) || ctx.results.has(n)) fail(`The summation index ${n} is already a parameter or result; use a new name for the index.`, s.index.span.start.column);
  for (const [v, span] of freeNames(s.term)) {
    if (v !== n && !ctx.params.has(v)) fail(`"${v}" is neither the summation index ${n} nor a declared parameter.`, span?.start.column ?? s.span.start.column);
  }
  if (s.term.t !== 'call' || s.term.fn !== 'exp') fail(`The term must be written exp(E) with E quadratic in ${n}, e.g. exp(-pi*a*${n}^2 + 2*pi*i*b*${n}); write q^(${n}^2) as exp(${n}^2*log(q)).`);
  const E = fromExpr((s.term as Extract<Expr, { t: 'call' }>).args[0]!);
  if (!E || variables(E.den).includes(n)) fail(`The exponent must be a polynomial in ${n} with coefficients rational in the parameters.`);
  const cs = coefficients(E!.num, n).map((c) => rfDiv(rfPoly(c), rfPoly(E!.den)));
  while (cs.length && rfIsZero(cs[cs.length - 1]!)) cs.pop();
  if (cs.length !== 3) fail(`The exponent has degree ${Math.max(cs.length - 1, 0)} in ${n}; a Gaussian sum needs degree 2 (a term exp(-pi*a*${n}^2 + ...) with Re a > 0).`);
  const pi = PI_RF();
  const lattice: LatticeInfo = {
    a: rfDiv(rfMul(cs[2]!, rfConst(-1)), pi),
    b: rfDiv(cs[1]!, rfMul(rfConst({ re: { n: 0n, d: 1n }, im: { n: 2n, d: 1n } }), pi)),
    g: cs[0]!,
  };
  const params = [...ctx.params.keys()].filter((p) => freeNames(s.term).has(p));
  const aExpr = ratExpr(lattice.a, true); const bExpr = ratExpr(lattice.b, true); const gExpr = ratExpr(lattice.g, true);

  // Re a > 0 on the whole declared domain: exactly (a constant, or a sign the exact machinery proves), else sampled
  const domains = domainsOf(ctx, params);
  const signs = new Expander({ p: '%none', how: { kind: 'inf' }, domains, resolve: () => null }, Q1);
  let realPart: Basis;
  // sign() reads Re a off the coefficients only when every symbol is real, and says 0 otherwise
  if (signs.sign(rfRe(lattice.a)) > 0 || (params.length === 0 && evaluate(aExpr, new Map()).re > 0)) realPart = { kind: 'proved' };
  else if (params.length === 0) realPart = fail(`Re a = ${evaluate(aExpr, new Map()).re} is not positive (a = ${formulaOf(aExpr).text}): the terms do not decay and the sum diverges.`);
  else {
    const pts = samplePoints(domains, params, 24, 1879);
    const bad = pts.find((pt) => !(evaluate(aExpr, pt).re > 0));
    if (bad) fail(`Re a is not positive everywhere on the declared domain (a = ${formulaOf(aExpr).text}, e.g. at ${[...bad].map(([k, v]) => `${k} = ${v.toString()}`).join(', ')}), so the sum diverges there; restrict the parameters (declare them positive) or write the sum where it converges.`);
    realPart = sampledBasis(domains, params, pts.length);
  }

  const valueAt = (pt: Point) => latticeValue(lattice, pt);
  const value = params.length ? null : valueAt(new Map());
  report.proof = realPart.kind === 'proved' ? 'proved' : 'sampled';
  report.convergence = 'absolute';

  // the small-a form: leading term and the bound on the rest
  const bZero = rfIsZero(lattice.b);
  const bReal = bZero || provablyReal(lattice.b, ctx);
  const numbers = params.length === 0 ? smallAForm(evaluate(aExpr, new Map()), evaluate(bExpr, new Map())) : null;
  const m0: number | null = bZero ? 0 : numbers ? numbers.m0 : null;
  const eg = rfIsZero(lattice.g) ? null : call('exp', gExpr);
  const withG = (e: Expr) => (eg ? mul(eg, e) : e);
  const shifted = m0 === 0 ? bExpr : sub(m0 === null ? nameExpr('m0') : num(m0), bExpr);
  const lead = bZero ? num(1) : call('exp', div(neg(mul(PI, pow(shifted, num(2)))), aExpr));
  const leading = withG(mul(pow(aExpr, div(num(-1), num(2))), lead));
  // bound in s = Re(1/a) with the distance d of m0 from the peak (0 for b = 0, else at most 1/2)
  const S = nameExpr('s');
  const oneMinusD: Expr = bZero ? num(1) : div(num(1), num(2));
  let bound: Expr = div(mul(num(2), call('exp', neg(mul(mul(PI, S), bZero ? num(1) : pow(oneMinusD, num(2)))))), sub(num(1), call('exp', neg(mul(mul(num(2), mul(PI, S)), oneMinusD)))));
  if (!bReal) bound = mul(bound, call('exp', div(mul(PI, mul(pow(nameExpr('y'), num(2)), pow(nameExpr('r'), num(2)))), S)));
  let boundValue: number | null = null;
  if (params.length === 0) {
    const inv = new Complex(1, 0).div(evaluate(aExpr, new Map()));
    const at = new Map([['s', new Complex(inv.re, 0)], ['y', new Complex(evaluate(bExpr, new Map()).im, 0)], ['r', new Complex(inv.abs(), 0)]]);
    boundValue = evaluate(bound, at).re;
  }

  // the term as read, exactly: a decimal the user typed is printed as the fraction it stands for
  const term = formulaOf(call('exp', ratExpr(E!, true)));
  report.result = { text: `sum over ${n} of ${term.text}`, latex: `\\sum_{${n}\\in\\mathbb{Z}} ${term.latex}`, value };
  report.steps.push({
    kind: 'poisson-resummation', name, index: n, term,
    a: formulaOf(aExpr), b: formulaOf(bExpr), constant: eg ? formulaOf(gExpr) : null, realPart, value,
  });
  report.steps.push({
    kind: 'small-parameter-form', name, leading: formulaOf(leading), nearest: m0,
    bound: formulaOf(bound), boundValue: boundValue !== null && Number.isFinite(boundValue) ? boundValue : null,
  });
  ctx.results.set(name, { line, unavailable: null, expr: null, params, valueAt, lattice });
  return report;
}
