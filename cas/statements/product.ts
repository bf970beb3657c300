/**
 * product NAME = P over n >= 0 | n >= 1 | all n: the zeta-regularised product of the modes
 * lambda_n = P(n), P a polynomial in n with coefficients in the parameters. Degree 1 and 2 have
 * closed forms; degree >= 3 is first factored exactly into such factors (cas/products/factor.ts,
 * `higherDegree` below: the products multiply without anomaly, the leading coefficient entering
 * once as c^zeta_P(0)); a P that does not split so, and odd degree >= 3 over all integers, are refused.
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
import { add, call, div, I, mul, name, neg, num, PI, pow, sub } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames } from '../expr/names.js';
import { formulaOf } from '../expr/print.js';
import { cancelled } from '../expr/atoms.js';
import { factorModes, type ModeFactorisation } from '../products/factor.js';
import { ratExpr, sqrtExpr } from '../expr/fromExact.js';
import { fromExpr, rfAdd, rfConst, rfConstantValue, rfDiv, rfEquals, rfIsZero, rfMul, rfPoly, rfPow, rfSub, rfVar, RF0, RF1, type RatFunc } from '../exact/ratfunc.js';
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

/** Positive on the declared domain by its form: every coefficient a positive rational, every variable a positive parameter or pi. */
function positiveByForm(r: RatFunc, positive: ReadonlySet<string>): boolean {
  const ok = (p: Poly) => [...p.terms.values()].every((t) => t.c.im.n === 0n && t.c.re.n > 0n && t.m.every(([v]) => v === 'pi' || positive.has(v)));
  return ok(r.num) && ok(r.den);
}

/**
 * leading^zeta(0), the power a constant factor of every mode enters with. When zeta(0) is a
 * multiple of 1/2 and the leading coefficient is the square of a rational function that is
 * positive on the domain, that function is its principal root, so the power is written as
 * an integer power of it ((pi^2/L^2)^(-1/2) is L/pi); otherwise as written.
 */
function leadingPower(leading: RatFunc, zeta0: RatFunc, positive: ReadonlySet<string>): Expr {
  const z = rationalOf(zeta0);
  const root = z && z.d <= 2n ? exactSqrt(leading) : null;
  const principal = root && (positiveByForm(root, positive) ? root : positiveByForm(rfSub(RF0, root), positive) ? rfSub(RF0, root) : null);
  if (principal && z) {
    const k = Number(z.n) * (z.d === 1n ? 2 : 1);
    return ratExpr(rfPow(principal, k), true);
  }
  return pow(ratExpr(leading, true), ratExpr(zeta0, true));
}

/** 1/Gamma(a) as a factor: a positive integer k gives 1/(k-1)!. */
function gammaOf(a: RatFunc): Expr {
  const q = rationalOf(a);
  if (q && q.d === 1n && q.n >= 1n && q.n <= 20n) {
    let f = 1n; for (let k = 2n; k < q.n; k++) f *= k;
    return num(f.toString());
  }
  return call('Gamma', ratExpr(a, true));
}

type Anomaly = 'linear' | 'split-polynomial' | 'all-integers' | 'all-integers-quadratic' | 'factored-polynomial' | 'all-integers-even';
type Formula = 'lerch' | 'reflection' | 'all-integers';

const isReal = (r: RatFunc) => [...r.num.terms.values(), ...r.den.terms.values()].every((t) => t.c.im.n === 0n);

/** sqrt(D) for one root of a monic quadratic: exact where it can be, i*sqrt(-D) for a negative monomial, else sqrt(D). */
function rootOf(D: RatFunc, positive: ReadonlySet<string>): { exact: RatFunc | null; expr: Expr; imag: Expr | null } {
  const r = exactSqrt(D);
  if (r) return { exact: r, expr: ratExpr(r, true), imag: null };
  const minus = rfSub(RF0, D);
  const single = D.num.terms.size === 1 && D.den.terms.size === 1;
  const t = single ? [...D.num.terms.values()][0]! : null;
  if (t && t.c.im.n === 0n && t.c.re.n < 0n) { const y = sqrtExpr(minus, positive); return { exact: null, expr: mul(I, y), imag: y }; }
  return { exact: null, expr: sqrtExpr(D, positive), imag: null };
}

/** The monic polynomial n^k + ... of a factor, as an expression in n. */
function factorExpr(cs: readonly RatFunc[], n: string): Expr {
  const d = cs.length - 1;
  const power = (k: number) => (k === 1 ? name(n) : pow(name(n), num(k)));
  let e = power(d);
  for (let k = d - 1; k >= 0; k--) {
    const c = cs[k]!;
    if (rfIsZero(c)) continue;
    const ce = ratExpr(c, true);
    e = add(e, k === 0 ? ce : rfEquals(c, RF1) ? power(k) : ce.t === 'neg' ? neg(mul(ce.a, power(k))) : mul(ce, power(k)));
  }
  return e;
}

/**
 * Degree >= 3: P = c * prod f_j^k_j exactly (cas/products/factor.ts), each f_j monic of degree 1
 * or 2. Over n >= n0 the product is c^zeta_P(0) * prod_j (prod f_j(n))^k_j with zeta_P(0) =
 * 1/2 - n0 - (sum of the shifts b)/d of the whole sequence: the zeta-regularised product of
 * prod_j (n + b_j) is the product of Lerch's products (no multiplicative anomaly for polynomial
 * sequences, S. Mizuno), and a constant factor c of every mode enters as c^zeta(0) of P itself,
 * not as c^zeta_{f_j}(0) of any one factor. Over all integers (d even) the modes split into
 * m >= 0 and m = -n, n >= 1; each half is such a product and the c-powers cancel (zeta(0) = 0),
 * so the product is prod_j 2*sin(pi*b_j) over the shifts (sqrt(2*pi)/Gamma(b) * sqrt(2*pi)/Gamma(1 - b)).
 */
function higherDegree(P: RatFunc, cs: RatFunc[], n: string, from: 0 | 1 | 'all', positive: ReadonlySet<string>, fail: (msg: string) => never) {
  const d = cs.length - 1;
  if (from === 'all' && d % 2 === 1) {
    fail(`Over all integers a factor of odd degree ${d} has modes c*${n}^${d} pointing in opposite directions as ${n} -> +inf and ${n} -> -inf, so the zeta function depends on where the cut of lambda^-s is drawn (for m + u the sign of Im u decides it); this case is not computed: write the product over ${n} >= 0 and ${n} >= 1 with P(-${n}) and choose the branch.`);
  }
  const fz = factorModes(P, n);
  if (!fz.ok) fail(`The factor has degree ${d} in ${n}: ${fz.reason}. Products of factors of degree 1 and 2 are computed; a polynomial that does not split into them exactly has no closed form here.`);
  const ok = fz as Extract<ModeFactorisation, { ok: true }>;
  // linear factors n + b and n - b pair into n^2 - b^2 (the reflection formula instead of two Gammas)
  const pieces: { cs: RatFunc[]; k: number }[] = [];
  const lin = ok.factors.filter((f) => f.coeffs.length === 2);
  const taken = new Set<number>();
  lin.forEach((f, i) => {
    if (taken.has(i)) return;
    const j = lin.findIndex((g, jj) => jj > i && !taken.has(jj) && g.k === f.k && !rfIsZero(f.coeffs[0]!) && rfIsZero(rfAdd(g.coeffs[0]!, f.coeffs[0]!)));
    if (j >= 0) { taken.add(i); taken.add(j); pieces.push({ cs: [rfSub(RF0, rfMul(f.coeffs[0]!, f.coeffs[0]!)), RF0, RF1], k: f.k }); }
  });
  lin.forEach((f, i) => { if (!taken.has(i)) pieces.push({ cs: f.coeffs, k: f.k }); });
  for (const f of ok.factors) if (f.coeffs.length === 3) pieces.push({ cs: f.coeffs, k: f.k });

  const shifts: Expr[] = [];
  const nums: Expr[] = [];
  const gammas: Expr[] = [];
  let intDen = 1n; let lerch = 0;
  const formulas = new Set<Formula>();
  const raise = (e: Expr, k: number) => (k === 1 ? e : pow(e, num(k)));
  const zeroMode = (b: RatFunc, n0: number) => {
    const q = rationalOf(rfAdd(b, rfConst(n0)));
    if (q && q.d === 1n && q.n <= 0n) fail(`The mode ${n} = ${(-q.n + BigInt(n0)).toString()} vanishes (a zero mode), so the product is 0; ${from === 'all' ? 'remove the mode' : 'start the product after it or remove the mode'}.`);
  };
  for (const { cs: f, k } of pieces) {
    const rep = (e: Expr) => { for (let j = 0; j < k; j++) shifts.push(e); };
    if (f.length === 2 || (f.length === 3 && !rfIsZero(f[1]!) && exactSqrt(rfSub(rfMul(half(f[1]!), half(f[1]!)), f[0]!)))) {
      // one or two exact shifts b: Lerch, sqrt(2*pi)/Gamma(b + n0); over all integers 2*sin(pi*b)
      const bs = f.length === 2 ? [f[0]!] : (() => {
        const hp = half(f[1]!); const r = exactSqrt(rfSub(rfMul(hp, hp), f[0]!))!;
        return [rfAdd(hp, r), rfSub(hp, r)];
      })();
      for (const b of bs) {
        rep(ratExpr(b, true));
        if (from === 'all') {
          const q = rationalOf(b);
          if (q && q.d === 1n) fail(`The mode ${n} = ${(-q.n).toString()} vanishes (a zero mode), so the product is 0; remove the mode.`);
          formulas.add('lerch'); formulas.add('reflection');
          nums.push(raise(mul(num(2), call('sin', mul(PI, ratExpr(b, true)))), k));
        } else {
          zeroMode(b, from);
          formulas.add('lerch');
          lerch += k;
          const q = rationalOf(rfAdd(b, rfConst(from)));
          if (q && q.d === 1n && q.n >= 1n && q.n <= 20n) { let fct = 1n; for (let t = 2n; t < q.n; t++) fct *= t; intDen *= fct ** BigInt(k); }
          else gammas.push(raise(call('Gamma', ratExpr(rfAdd(b, rfConst(from)), true)), k));
        }
      }
      continue;
    }
    const p = f[1]!; const q = f[0]!;
    formulas.add('lerch');
    if (rfIsZero(p) || from === 'all') formulas.add('reflection');
    if (rfIsZero(p)) {
      // n^2 + q, shifts +-x with x^2 = -q
      const y = exactSqrt(q);
      const neg_ = y && isReal(y) ? null : rootOf(rfSub(RF0, q), positive);
      if ((y && isReal(y)) || neg_?.imag) {
        // q = y^2 with y exact and real, or a positive monomial (y = sqrt(q)): sinh
        const ye = y && isReal(y) ? ratExpr(y, true) : neg_!.imag!;
        rep(mul(I, ye)); rep(neg(mul(I, ye)));
        const sh = call('sinh', mul(PI, ye));
        nums.push(raise(from === 'all' ? mul(num(4), pow(sh, num(2))) : from === 1 ? div(mul(num(2), sh), ye) : mul(mul(num(2), ye), sh), k));
      } else {
        const xe = neg_!.expr;
        rep(xe); rep(neg(xe));
        const sn = call('sin', mul(PI, xe));
        nums.push(raise(from === 'all' ? neg(mul(num(4), pow(sn, num(2)))) : from === 1 ? div(mul(num(2), sn), xe) : neg(mul(mul(num(2), xe), sn)), k));
      }
      continue;
    }
    // n^2 + p*n + q with shifts p/2 +- r, r^2 = p^2/4 - q not a square
    const hp = half(p);
    const root = rootOf(rfSub(rfMul(hp, hp), q), positive);
    const r = root.expr;
    const hpe = ratExpr(hp, true);
    rep(add(hpe, r)); rep(sub(hpe, r));
    if (from === 'all') {
      // 2*sin(pi*(h + r)) * 2*sin(pi*(h - r)) = 2*(cos(2*pi*r) - cos(2*pi*h)), even in r
      // (cosh(2*pi*y) for r = i*y; cos(pi*p) = +-1 for an integer p)
      const pq = rationalOf(p);
      const cp = pq && pq.d === 1n ? num(pq.n % 2n === 0n ? 1 : -1) : call('cos', mul(PI, ratExpr(p, true)));
      const c2 = root.imag ? call('cosh', mul(mul(num(2), PI), root.imag)) : call('cos', mul(mul(num(2), PI), r));
      nums.push(raise(mul(num(2), sub(c2, cp)), k));
    } else {
      lerch += 2 * k;
      const h0 = ratExpr(rfAdd(hp, rfConst(from)), true);
      gammas.push(raise(call('Gamma', add(h0, r)), k), raise(call('Gamma', sub(h0, r)), k));
    }
  }
  let top: Expr | null = null;
  if (lerch === 1) top = sqrt2pi();
  else if (lerch === 2) top = mul(num(2), PI);
  else if (lerch > 2) top = pow(mul(num(2), PI), lerch % 2 ? ratExpr(rfConst({ re: { n: BigInt(lerch), d: 2n }, im: { n: 0n, d: 1n } })) : num(lerch / 2));
  const numer = [...(top ? [top] : []), ...nums].reduce((acc, e) => mul(acc, e), num(1) as Expr);
  const dens = [...(intDen !== 1n ? [num(intDen.toString())] : []), ...gammas];
  let result = dens.length ? div(numer, dens.reduce((acc, e) => mul(acc, e))) : numer;
  const zeta0 = from === 'all' ? RF0 : rfSub(rfSub(rfConst({ re: { n: 1n, d: 2n }, im: { n: 0n, d: 1n } }), rfConst(from)), rfDiv(rfDiv(cs[d - 1]!, cs[d]!), rfConst(d)));
  if (from !== 'all' && !rfEquals(ok.leading, RF1)) result = mul(leadingPower(ok.leading, zeta0, positive), result);
  const factors = pieces.map((f) => ({ factor: factorExpr(f.cs, n), power: f.k }));
  return {
    result, shifts, zeta0, formulas: [...formulas],
    anomaly: (from === 'all' ? 'all-integers-even' : 'factored-polynomial') as Anomaly,
    factorisation: { factors, repeated: ok.repeated },
  };
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
  const params = [...ctx.params.keys()].filter((p) => freeNames(s.factor).has(p));
  const positive = new Set(params.filter((p) => ctx.params.get(p)!.domain === 'positive'));
  const high = d > 2 ? higherDegree(P!, cs, n, s.from, positive, fail) : null;

  let result: Expr;
  let shifts: Expr[] = [];
  let zeta0: RatFunc;
  let branch: 'principal' | 'upper' | 'lower' = 'principal';
  let decided: 'exact' | 'sampled' | undefined;
  const formulas: Formula[] = [];
  const leading = cs[d]!;
  let anomaly: Anomaly = d === 1 ? 'linear' : 'split-polynomial';

  let factorisation: { factors: { factor: Expr; power: number }[]; repeated: boolean } | undefined;
  if (high) {
    ({ result, shifts, zeta0 } = high);
    formulas.push(...high.formulas);
    anomaly = high.anomaly;
    factorisation = high.factorisation;
  } else if (s.from === 'all' && d === 2) {
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
        // pi*y multiplied out exactly (pi*L*w/pi is L*w)
        const sh = call('sinh', ratExpr(rfMul(rfVar('pi'), y), true));
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
    if (!rfEquals(leading, RF1)) result = mul(leadingPower(leading, zeta0, positive), result);
  }

  // common factors cancelled for display ((L/pi)*2*pi*sinh(L*w)/(L*w) is 2*sinh(L*w)/w)
  result = cancelled(result);
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
    kind: 'mode-product', name, index: n, leading: formulaOf(ratExpr(leading, true)), shifts: shifts.map((b) => formulaOf(b)),
    result: formulaOf(result), value, anomaly, formulas,
    ...(factorisation ? { factorisation: { factors: factorisation.factors.map((f) => ({ factor: formulaOf(f.factor), power: f.power })), repeated: factorisation.repeated } } : {}),
  });
  ctx.results.set(name, { line, unavailable: null, expr: result, params, valueAt, definition: result });
  return report;
}
