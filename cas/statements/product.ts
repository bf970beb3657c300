/**
 * product NAME = P over n >= 0 | n >= 1 | all n: the zeta-regularised product of the modes
 * lambda_n = P(n), P a polynomial in n (degree 1 or 2) with coefficients in the parameters.
 *
 * The product is defined as exp(-zeta'(0)) with zeta(s) = sum lambda_n^-s continued to s = 0
 * (a choice, recorded). P(n) = c * prod (n + b_j) over its exact roots; then
 *   prod over n >= n0 of P(n) = c^zeta(0) * prod_j sqrt(2*pi)/Gamma(b_j + n0),
 *   zeta(0) = 1/2 - n0 - (sum_j b_j)/d
 * (Lerch's formula, zeta'(0, a) = log(Gamma(a)/sqrt(2*pi)), zeta(0, a) = 1/2 - a). For a
 * polynomial in n in one dimension the product splits into its linear factors' products with
 * no multiplicative anomaly (checked numerically in the tests against the zeta function of P
 * itself). A pair of roots b = +-x gives, by the reflection formula, 2*sin(pi*x)/x over n >= 1
 * (2*sinh(pi*a)/a for n^2 + a^2). Over all integers (P = +-n + u):
 *   prod (m + u) = 1 - exp(2*pi*i*u) for Im u > 0, 1 - exp(-2*pi*i*u) for Im u < 0.
 * J. R. Quine, S. H. Heydari, R. Y. Song, "Zeta regularized products", Trans. AMS 338 (1993).
 *
 * Example: product P = n over n >= 1 gives sqrt(2*pi).
 */
import { Complex } from 'complex.js';
import type { StatementReport } from '../../shared/evaluation.js';
import type { Expr, Statement } from '../lang/ast.js';
import { add, call, div, I, mul, neg, num, PI, pow, sub } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames } from '../expr/names.js';
import { formulaOf } from '../expr/print.js';
import { ratExpr } from '../expr/fromExact.js';
import { fromExpr, rfAdd, rfConst, rfConstantValue, rfDiv, rfEquals, rfIsZero, rfMul, rfPoly, rfSub, RF0, RF1, type RatFunc } from '../exact/ratfunc.js';
import { coefficients, isZero as polyIsZero, ONE, polyMul, polyPow, polyScale, squareFree, variables, type Poly } from '../exact/poly.js';
import type { GQ, Q } from '../exact/q.js';
import { samplePoints, type Point } from '../domains/sample.js';
import { blankReport, domainsOf, StatementFailure, type Context } from './context.js';

const half = (x: RatFunc) => rfMul(x, rfConst({ re: { n: 1n, d: 2n }, im: { n: 0n, d: 1n } }));

function isqrt(n: bigint): bigint | null {
  if (n < 0n) return null;
  if (n < 2n) return n;
  let x = BigInt(Math.floor(Math.sqrt(Number(n))));
  while (x * x > n) x--;
  while ((x + 1n) * (x + 1n) <= n) x++;
  return x * x === n ? x : null;
}

/** A square root of a Gaussian rational that is a real rational square or minus one. */
function sqrtUnit(u: GQ): GQ | null {
  if (u.im.n !== 0n) return null;
  const neg = u.re.n < 0n;
  const a = isqrt(neg ? -u.re.n : u.re.n); const b = isqrt(u.re.d);
  if (a === null || b === null) return null;
  const r: Q = { n: a, d: b };
  const zero: Q = { n: 0n, d: 1n };
  return neg ? { re: zero, im: r } : { re: r, im: zero };
}

function sqrtPoly(p: Poly): Poly | null {
  if (polyIsZero(p)) return p;
  const sf = squareFree(p);
  if (sf.factors.some((f) => f.k % 2)) return null;
  const u = sqrtUnit(sf.unit);
  if (!u) return null;
  return polyScale(sf.factors.reduce((acc, { f, k }) => polyMul(acc, polyPow(f, k / 2)), ONE), u);
}

/** An exact square root of a rational function (a square times a rational square or -1), or null. */
export function exactSqrt(r: RatFunc): RatFunc | null {
  const a = sqrtPoly(r.num); const b = sqrtPoly(r.den);
  return a && b ? rfDiv(rfPoly(a), rfPoly(b)) : null;
}

const rationalOf = (r: RatFunc): Q | null => {
  const c = rfConstantValue(r);
  return c && c.im.n === 0n ? c.re : null;
};

const sqrt2pi = () => call('sqrt', mul(num(2), PI));

/** 1/Gamma(a) as a factor: a positive integer k gives 1/(k-1)!. */
function gammaOf(a: RatFunc): Expr {
  const q = rationalOf(a);
  if (q && q.d === 1n && q.n >= 1n && q.n <= 20n) {
    let f = 1n; for (let k = 2n; k < q.n; k++) f *= k;
    return num(f.toString());
  }
  return call('Gamma', ratExpr(a, true));
}

export function evaluateProduct(s: Extract<Statement, { kind: 'product' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.name.name;
  const n = s.index.name;
  const fail = (msg: string, column = s.span.start.column): never => { throw new StatementFailure(msg, line, column); };
  const report = blankReport(line, 'product', name);
  if (ctx.params.has(name) || ctx.results.has(name)) fail(`The name ${name} is already in use; give the product a new name.`, s.name.span.start.column);
  if (ctx.params.has(n) || ctx.results.has(n)) fail(`The mode index ${n} is already a parameter or result; use a new name for the index.`, s.index.span.start.column);
  for (const [v, span] of freeNames(s.factor)) {
    if (v !== n && !ctx.params.has(v)) fail(`"${v}" is neither the mode index ${n} nor a declared parameter.`, span?.start.column ?? s.span.start.column);
  }
  const P = fromExpr(s.factor);
  if (!P || variables(P.den).includes(n)) fail(`The factor must be a polynomial in ${n} with coefficients in the parameters.`);
  const cs = coefficients(P!.num, n).map((c) => rfDiv(rfPoly(c), rfPoly(P!.den)));
  while (cs.length && rfIsZero(cs[cs.length - 1]!)) cs.pop();
  const d = cs.length - 1;
  if (d < 1) fail(`The factor does not depend on ${n}; a product of a constant over infinitely many modes is c^zeta(0) and is not a mode product.`);
  if (d > 2) fail(`The factor has degree ${d} in ${n}; products of degree 1 and 2 are computed: write it as a product of such factors and multiply the products (for a polynomial in ${n} this introduces no multiplicative anomaly).`);
  const params = [...ctx.params.keys()].filter((p) => freeNames(s.factor).has(p));

  let result: Expr;
  let shifts: Expr[] = [];
  let zeta0: RatFunc;
  let branch: 'principal' | 'upper' | 'lower' = 'principal';
  let decided: 'exact' | 'sampled' | undefined;
  const formulas: ('lerch' | 'reflection' | 'all-integers')[] = [];
  const leading = cs[d]!;
  let anomaly: 'linear' | 'split-polynomial' | 'all-integers' | 'all-integers-quadratic' = d === 1 ? 'linear' : 'split-polynomial';

  if (s.from === 'all' && d === 2) {
    // c*(m^2 + q) over all integers: zeta(s) = q^-s + 2*zeta_{m>=1}(s), so zeta(0) = 0 and the product is
    // q * (2*sin(pi*x)/x)^2 = -4*sin(pi*x)^2 with x^2 = -q (4*sinh(pi*y)^2 for q = y^2)
    if (!rfIsZero(cs[1]!)) fail(`Over all integers a quadratic factor must be even in ${n} (c*(${n}^2 + q)); complete the square and shift the index.`);
    const q = rfDiv(cs[0]!, cs[2]!);
    if (rfIsZero(q)) fail(`The mode ${n} = 0 vanishes (a zero mode), so the product is 0; remove the mode.`);
    const real = (r: RatFunc) => [...r.num.terms.values(), ...r.den.terms.values()].every((t) => t.c.im.n === 0n);
    const y = exactSqrt(q);
    if (y && real(y)) {
      const ye = ratExpr(y, true);
      shifts = [mul(I, ye), neg(mul(I, ye))];
      result = mul(num(4), pow(call('sinh', mul(PI, ye)), num(2)));
    } else {
      const xr = exactSqrt(rfSub(RF0, q));
      const xe = xr ? ratExpr(xr, true) : call('sqrt', ratExpr(rfSub(RF0, q), true));
      shifts = [xe, neg(xe)];
      result = neg(mul(num(4), pow(call('sin', mul(PI, xe)), num(2))));
    }
    zeta0 = RF0;
    anomaly = 'all-integers-quadratic';
    formulas.push('lerch', 'reflection');
  } else if (s.from === 'all') {
    const c1 = rationalOf(cs[1] ?? RF0);
    if (d !== 1 || !c1 || c1.d !== 1n || (c1.n !== 1n && c1.n !== -1n)) fail(`Over all integers the factor must be ${n} + u or -${n} + u (the modes m + u, m an integer).`);
    const u = cs[0]!;
    shifts = [ratExpr(rfDiv(u, cs[1]!), true)];
    const uExpr = ratExpr(u, true);
    // the sign of Im u decides the branch: exactly without parameters, else at sample points
    let signs: number[];
    if (params.length === 0) { decided = 'exact'; signs = [Math.sign(evaluate(uExpr, new Map()).im)]; }
    else {
      decided = 'sampled';
      signs = samplePoints(domainsOf(ctx, params), params, 24, 1813).map((pt) => Math.sign(evaluate(uExpr, pt).im));
    }
    if (signs.some((x) => x === 0) || new Set(signs).size > 1) {
      fail(`Im u ${signs.some((x) => x === 0) ? 'vanishes' : 'changes sign'} on the declared domain (u = ${formulaOf(uExpr).text}): the modes m + u then meet every cut through 0, and the product differs on the two sides (1 - exp(2*pi*i*u) above, 1 - exp(-2*pi*i*u) below); give u a definite imaginary part.`);
    }
    branch = signs[0]! > 0 ? 'upper' : 'lower';
    const sign = branch === 'upper' ? num(2) : neg(num(2));
    result = sub(num(1), call('exp', mul(mul(mul(sign, PI), I), uExpr)));
    zeta0 = RF0;
    anomaly = 'all-integers';
    formulas.push('all-integers');
  } else {
    const n0 = s.from;
    const n0rf = rfConst(n0);
    let roots: { exact: RatFunc | null; expr: Expr }[];
    let sumRoots: RatFunc;
    if (d === 1) {
      const b = rfDiv(cs[0]!, cs[1]!);
      roots = [{ exact: b, expr: ratExpr(b, true) }];
      sumRoots = b;
    } else {
      const p = rfDiv(cs[1]!, cs[2]!); const q = rfDiv(cs[0]!, cs[2]!);
      const D = rfSub(rfMul(half(p), half(p)), q);
      const r = exactSqrt(D);
      const hp = half(p);
      roots = r
        ? [{ exact: rfAdd(hp, r), expr: ratExpr(rfAdd(hp, r), true) }, { exact: rfSub(hp, r), expr: ratExpr(rfSub(hp, r), true) }]
        : [{ exact: null, expr: add(ratExpr(hp, true), call('sqrt', ratExpr(D, true))) }, { exact: null, expr: sub(ratExpr(hp, true), call('sqrt', ratExpr(D, true))) }];
      sumRoots = p;
    }
    shifts = roots.map((b) => b.expr);
    zeta0 = rfSub(rfSub(rfConst({ re: { n: 1n, d: 2n }, im: { n: 0n, d: 1n } }), n0rf), rfDiv(sumRoots, rfConst(d)));
    // a vanishing mode (b_j + n0 an integer <= 0) makes the product zero: say so instead
    for (const b of roots) {
      const q = b.exact && rationalOf(rfAdd(b.exact, n0rf));
      if (q && q.d === 1n && q.n <= 0n) fail(`The mode ${n} = ${(-q.n + BigInt(n0)).toString()} vanishes (a zero mode), so the product is 0; start the product after it or remove the mode.`);
    }
    const pair = d === 2 && rfIsZero(cs[1]!) && !rfIsZero(cs[0]!);
    if (pair) {
      // roots +-x with x^2 = -q: Gamma(1 + x) Gamma(1 - x) = pi x / sin(pi x)
      formulas.push('lerch', 'reflection');
      const q = rfDiv(cs[0]!, cs[2]!);
      const y = exactSqrt(q);
      const real = (r: RatFunc) => [...r.num.terms.values(), ...r.den.terms.values()].every((t) => t.c.im.n === 0n);
      if (y && real(y)) {
        const ye = ratExpr(y, true);
        const sh = call('sinh', mul(PI, ye));
        result = n0 === 1 ? div(mul(num(2), sh), ye) : mul(mul(num(2), ye), sh);
      } else {
        const xr = exactSqrt(rfSub(RF0, q));
        const xe = xr ? ratExpr(xr, true) : call('sqrt', ratExpr(rfSub(RF0, q), true));
        const sn = call('sin', mul(PI, xe));
        result = n0 === 1 ? div(mul(num(2), sn), xe) : neg(mul(mul(num(2), xe), sn));
      }
    } else {
      formulas.push('lerch');
      const gammas = roots.map((b) => (b.exact ? gammaOf(rfAdd(b.exact, n0rf)) : call('Gamma', add(b.expr, num(n0)))));
      const top = d === 2 ? mul(num(2), PI) : sqrt2pi();
      const den = gammas.reduce((acc, g) => (g.t === 'num' && g.v === '1' ? acc : acc ? mul(acc, g) : g), null as Expr | null);
      result = den ? div(top, den) : top;
    }
    if (!rfEquals(leading, RF1)) result = mul(pow(ratExpr(leading, true), ratExpr(zeta0, true)), result);
  }

  const valueAt = (pt: Point) => {
    try { const z = evaluate(result, new Map(pt)); return Number.isFinite(z.re) && Number.isFinite(z.im) ? { re: z.re, im: z.im } : null; } catch { return null; }
  };
  const value = params.length ? null : valueAt(new Map<string, Complex>());
  report.proof = decided === 'sampled' ? 'sampled' : 'proved';
  report.result = { ...formulaOf(result), value };
  report.steps.push({
    kind: 'regularisation', name, method: 'zeta', from: s.from, index: n, factor: formulaOf(s.factor),
    zetaAtZero: formulaOf(ratExpr(zeta0, true)), branch, ...(decided ? { decided } : {}),
  });
  report.steps.push({
    kind: 'mode-product', name, leading: formulaOf(ratExpr(leading, true)), shifts: shifts.map((b) => formulaOf(b)),
    result: formulaOf(result), value, anomaly, formulas,
  });
  ctx.results.set(name, { line, unavailable: null, expr: result, params, valueAt, definition: result });
  return report;
}
