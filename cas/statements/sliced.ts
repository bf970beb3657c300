/**
 * sliced NAME = V on interval L | on circle BETA periodic | antiperiodic with N slices: the
 * time-sliced (finite-dimensional) Gaussian of -d^2/dt^2 + V, whose N -> inf limit is the
 * functional determinant of statements/determinant.ts.
 *
 * eps = L/N. Interval, Dirichlet ends: the sliced action sum_j (x_{j+1} - x_j)^2/(2 eps) +
 * eps V x_j^2/2 with x_0 = x_N = 0 is x^T M x/(2 eps), M the (N-1)x(N-1) tridiagonal matrix
 * with 2 + eps^2 V on the diagonal and -1 beside it. Its leading minors obey
 * D_n = (2 + eps^2 V) D_{n-1} - D_{n-2} (D_0 = 1, D_{-1} = 0); the characteristic roots are
 * exp(+-theta) with cosh(theta) = 1 + eps^2 V/2, so D_n = sinh((n+1) theta)/sinh(theta), and at
 * V = 0, D_{N-1} = N. The statement gives the ratio D_{N-1}(V)/N, the sliced counterpart of
 * det(-d^2 + V)/det(-d^2) = sinh(w L)/(w L) (Gel'fand-Yaglom; G. V. Dunne, J. Phys. A 41 (2008)
 * 304006). Circle: the N x N circulant (corners -1 periodic, +1 antiperiodic) has eigenvalues
 * 4 sinh(theta/2)^2 + 4 sin(pi k/N)^2 (k integer, or half-integer when antiperiodic), whose
 * product is 2 cosh(N theta) -+ 2 = 4 sinh(N theta/2)^2 or 4 cosh(N theta/2)^2.
 *
 * theta is written 2*asinh(eps*sqrt(V)/2) (the same cosh, and an odd series in 1/N, which
 * the exact expansion engine expands for `limit ... : N -> inf`). Every result is a polynomial
 * in cosh(theta) (Chebyshev polynomials), so no root choice changes it; for V >= 0 theta is
 * real and >= 0. N is a number or a parameter declared `positive integer`. A V that depends on
 * t needs numbers throughout, and the determinant of the matrix with V(t_j) is computed by
 * elimination. Every closed form is checked against the explicit matrix's determinant.
 *
 * Example: sliced S = 0.49 on interval 3 with 6 slices gives ≈ 1.87 (the functional 1.915...).
 */
import { Complex } from 'complex.js';
import type { StatementReport } from '../../shared/evaluation.js';
import type { Expr, Statement } from '../lang/ast.js';
import { complexApprox, complexApproxLatex } from '../../shared/record/numbers.js';
import { call, div, mul, name as nameExpr, num, pow } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames } from '../expr/names.js';
import { formulaOf } from '../expr/print.js';
import { ratExpr } from '../expr/fromExact.js';
import { fromExpr, rfIsZero, type RatFunc } from '../exact/ratfunc.js';
import { variables } from '../exact/poly.js';
import { cmat, luSolveDet, type C } from '../numeric/cmatrix.js';
import { samplePoints, type Point } from '../domains/sample.js';
import { exactSqrt } from './product.js';
import { blankReport, domainsOf, StatementFailure, type Context } from './context.js';

type Conditions = 'dirichlet' | 'periodic' | 'antiperiodic';

/** The largest N whose dense matrix is built for a check (LU is N^3). */
const CHECK_LIMIT = 400;
/** Slice counts a closed form in a symbolic N is checked at. */
const CHECK_SLICES = [1, 2, 3, 4, 7, 12, 25];

/**
 * The determinant of the explicit sliced matrix by LU elimination (cas/numeric/cmatrix.ts),
 * entries added one by one so that N = 1 and 2 (where neighbours and corners coincide) come
 * out right. Interval: divided by det M(0) = N.
 */
export function slicedMatrixDeterminant(conditions: Conditions, N: number, eps2V: (j: number) => C): C {
  const n = conditions === 'dirichlet' ? N - 1 : N;
  if (n === 0) return { re: 1, im: 0 };
  const m = cmat(n);
  const at = (i: number, j: number, re: number) => { m.re[i * n + j]! += re; };
  for (let i = 0; i < n; i++) {
    // Dirichlet rows are x_1..x_{N-1}; circle rows x_0..x_{N-1}
    const v = eps2V(conditions === 'dirichlet' ? i + 1 : i);
    m.re[i * n + i]! += 2 + v.re; m.im[i * n + i]! += v.im;
    if (conditions === 'dirichlet') {
      if (i + 1 < n) { at(i, i + 1, -1); at(i + 1, i, -1); }
    } else {
      // x_{N} = +-x_0: the bond from the last point to the first carries the sign
      const sign = i + 1 < n || conditions === 'periodic' ? -1 : 1;
      at(i, (i + 1) % n, sign); at((i + 1) % n, i, sign);
    }
  }
  const lu = luSolveDet(m, new Array<C>(n).fill({ re: 0, im: 0 }));
  const det = lu ? lu.det : { re: 0, im: 0 };
  return conditions === 'dirichlet' ? { re: det.re / N, im: det.im / N } : det;
}

/** V >= 0 for every value of the (real) parameters: a real square, or a monomial with a positive coefficient in positive parameters. */
function provablyNonnegative(V: RatFunc, domainOf: (n: string) => string | undefined): boolean {
  const vars = [...variables(V.num), ...variables(V.den)];
  if (vars.some((v) => { const d = domainOf(v); return d === undefined || d === 'complex'; })) return false;
  const root = exactSqrt(V);
  if (root) {
    const realCoefficients = [...root.num.terms.values(), ...root.den.terms.values()].every((t) => t.c.im.n === 0n);
    if (realCoefficients) return true;
  }
  const single = (p: RatFunc['num']) => (p.terms.size === 1 ? [...p.terms.values()][0]! : null);
  const a = single(V.num); const b = single(V.den);
  if (!a || !b || a.c.im.n !== 0n || b.c.im.n !== 0n) return false;
  if ((a.c.re.n > 0n) !== (b.c.re.n > 0n)) return false;
  return [...a.m, ...b.m].every(([v, k]) => domainOf(v) === 'positive' || k % 2 === 0);
}

export function evaluateSliced(s: Extract<Statement, { kind: 'sliced' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.name.name;
  const fail = (msg: string, column = s.span.start.column): never => { throw new StatementFailure(msg, line, column); };
  const report = blankReport(line, 'sliced', name);
  if (ctx.params.has(name) || ctx.results.has(name)) fail(`The name ${name} is already in use; give the sliced determinant a new name.`, s.name.span.start.column);
  if (ctx.params.has('t')) fail('t is the potential\'s variable here, but it is declared as a parameter; rename the parameter.');
  for (const [v, span] of freeNames(s.potential)) {
    if (v !== 't' && !ctx.params.has(v)) fail(`"${v}" is neither the variable t nor a declared parameter.`, span?.start.column ?? s.span.start.column);
  }
  for (const [v, span] of freeNames(s.length)) {
    if (!ctx.params.has(v)) fail(`The length uses "${v}", which is not a declared parameter.`, span?.start.column ?? s.span.start.column);
  }

  // N: a whole number, or one parameter declared `positive integer`
  const sliceNames = [...freeNames(s.slices).keys()];
  let Nnum: number | null = null;
  let Nname: string | null = null;
  if (!sliceNames.length) {
    const z = evaluate(s.slices, new Map());
    if (z.im !== 0 || !Number.isInteger(z.re) || z.re < 1) fail(`The number of slices must be a whole number >= 1, not ${formulaOf(s.slices).text}.`);
    if (z.re > 100000) fail('At most 100000 slices as a number; for more, use a parameter N and `limit ... : N -> inf`.');
    Nnum = z.re;
  } else {
    if (s.slices.t !== 'name') fail('The number of slices must be a number or a single parameter declared `positive integer`.');
    Nname = sliceNames[0]!;
    const info = ctx.params.get(Nname);
    if (!info) fail(`The number of slices ${Nname} is not a declared parameter.`);
    if (!info!.integer) fail(`${Nname} counts slices, so declare it with \`param ${Nname} : positive integer\`.`);
    if (freeNames(s.potential).has(Nname) || freeNames(s.length).has(Nname)) fail(`The potential and the length must not depend on the number of slices ${Nname}.`);
  }
  const N: Expr = Nname ? nameExpr(Nname) : s.slices;
  const L = s.length;
  const dependsOnT = freeNames(s.potential).has('t');
  const params = [...ctx.params.keys()].filter((p) => freeNames(s.potential).has(p) || freeNames(L).has(p) || p === Nname);
  const domainOf = (n: string) => ctx.params.get(n)?.domain;

  let result: Expr | null = null;
  let theta: Expr | null = null;
  let thetaBranch: 'real' | 'any' | null = null;
  let zeroMode = false;
  let value: C | null = null;
  let checks: { slices: number[]; points: number; worst: number } | null = null;

  if (!dependsOnT) {
    const V = fromExpr(s.potential);
    if (!V) fail('The potential must be a rational expression in the parameters (or depend on t, with numbers throughout).');
    const zero = rfIsZero(V!);
    // sqrt(V) exactly where V is a square (w^2 -> w), else sqrt(V): theta is odd in it, the result even
    const root = exactSqrt(V!);
    const w: Expr = root ? ratExpr(root, true) : call('sqrt', ratExpr(V!, true));
    const half = div(mul(L, w), mul(num(2), N)); // eps*sqrt(V)/2
    theta = mul(num(2), call('asinh', half));
    // theta = 2*asinh(L*sqrt(V)/(2*N)) is real and >= 0 when V >= 0 and L >= 0
    const Lr = fromExpr(L);
    thetaBranch = provablyNonnegative(V!, domainOf) && Lr !== null && provablyNonnegative(Lr, domainOf) ? 'real' : 'any';
    if (s.conditions === 'dirichlet') {
      result = zero ? num(1) : div(call('sinh', mul(N, theta)), mul(N, call('sinh', theta)));
    } else if (s.conditions === 'periodic') {
      if (zero) { result = pow(N, num(2)); zeroMode = true; } else result = mul(num(4), pow(call('sinh', mul(N, call('asinh', half))), num(2)));
    } else {
      result = zero ? num(4) : mul(num(4), pow(call('cosh', mul(N, call('asinh', half))), num(2)));
    }
    if (zero) { theta = null; thetaBranch = null; }

    // the closed form against the explicit matrix, at the given N or at several N
    const others = params.filter((p) => p !== Nname);
    const pts = others.length ? samplePoints(domainsOf(ctx, others), others, 4, 7) : [new Map() as Point];
    const counts = Nnum !== null ? (Nnum <= CHECK_LIMIT ? [Nnum] : []) : CHECK_SLICES;
    let worst = 0; let used = 0;
    for (const pt of pts) {
      const Lz = evaluate(L, pt); const Vz = evaluate(s.potential, pt);
      for (const n of counts) {
        const at = new Map(pt); if (Nname) at.set(Nname, new Complex(n, 0));
        const closed = evaluate(result, at);
        const eps = Lz.div(n);
        const eps2V = eps.mul(eps).mul(Vz);
        const det = zero && s.conditions === 'periodic' ? zeroModeFree(n) : slicedMatrixDeterminant(s.conditions, n, () => ({ re: eps2V.re, im: eps2V.im }));
        const d = Math.hypot(closed.re - det.re, closed.im - det.im) / Math.max(Math.hypot(det.re, det.im), 1e-300);
        if (Number.isFinite(d)) { worst = Math.max(worst, d); used++; }
      }
    }
    if (counts.length && used) {
      checks = { slices: counts, points: pts.length, worst };
      if (worst > 1e-6) fail(`The closed form disagrees with the determinant of the explicit matrix (relative difference ${complexApprox({ re: worst, im: 0 }, 3)}); not reported.`);
    }
    if (!params.length) { const z = evaluate(result, new Map()); value = { re: z.re, im: z.im }; }
  } else {
    // a symbolic N is among params here
    if (params.length) fail(`A potential that depends on t is sliced numerically; give numbers for ${params.join(', ')} (parameters here).`);
    if (Nnum! > CHECK_LIMIT) fail(`At most ${CHECK_LIMIT} slices for a potential that depends on t (a dense determinant).`);
    const Lz = evaluate(L, new Map());
    if (Lz.im !== 0 || !(Lz.re > 0)) fail('The length must be a positive number.');
    const eps = Lz.re / Nnum!;
    const eps2V = (j: number): C => {
      const z = evaluate(s.potential, new Map([['t', new Complex(j * eps, 0)]]));
      return { re: eps * eps * z.re, im: eps * eps * z.im };
    };
    value = slicedMatrixDeterminant(s.conditions, Nnum!, eps2V);
    if (!Number.isFinite(value.re) || !Number.isFinite(value.im)) fail('The potential has no finite value at a slice point.');
  }

  report.proof = dependsOnT ? null : 'proved';
  report.result = result ? { ...formulaOf(result), value } : { text: complexApprox(value!, 15), latex: complexApproxLatex(value!, 15), value };
  report.steps.push({
    kind: 'time-slicing', name, potential: formulaOf(s.potential), shape: s.shape, conditions: s.conditions,
    length: formulaOf(L), slices: formulaOf(N), method: dependsOnT ? 'matrix' : 'exact',
    theta: theta ? formulaOf(theta) : null, thetaBranch, result: result ? formulaOf(result) : null, value, zeroMode, checks,
  });
  const valueAt = (pt: Point) => {
    if (!result) return value;
    try { const z = evaluate(result, new Map(pt)); return Number.isFinite(z.re) && Number.isFinite(z.im) ? { re: z.re, im: z.im } : null; } catch { return null; }
  };
  ctx.results.set(name, { line, unavailable: null, expr: result, params, valueAt, ...(result ? { definition: result } : {}) });
  return report;
}

/**
 * Periodic at V = 0, M is the Laplacian of a ring of N points, and the product of its nonzero
 * eigenvalues is N times any cofactor (matrix-tree theorem). Deleting the last row and column
 * leaves the Dirichlet matrix of N slices, whose determinant (by elimination) is the cofactor.
 */
function zeroModeFree(N: number): C {
  const cofactor = slicedMatrixDeterminant('dirichlet', N, () => ({ re: 0, im: 0 })); // divided by N there
  return { re: N * N * cofactor.re, im: N * N * cofactor.im };
}
