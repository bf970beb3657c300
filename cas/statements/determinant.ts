/**
 * determinant NAME = V on interval L | on circle BETA periodic | antiperiodic: the functional
 * determinant of -d^2/dt^2 + V(t), V an expression in the variable t and the parameters.
 *
 * Interval, Dirichlet ends: the ratio det(-d^2 + V)/det(-d^2) = y(L)/L with y'' = V y,
 * y(0) = 0, y'(0) = 1 (Gel'fand-Yaglom). Circle of length beta: the zeta-regularised
 * determinant tr M - 2 (periodic) or tr M + 2 (antiperiodic), M the monodromy matrix of
 * y'' = V y over one turn. For constant V = w^2 these are exact: sinh(w L)/(w L),
 * 4*sinh(beta*w/2)^2 and 4*cosh(beta*w/2)^2, each even in w (no branch of sqrt(V) to choose).
 * At V = 0 the periodic determinant vanishes (the constant is a zero mode); with it removed,
 * det' = beta^2. A V that depends on t is solved numerically (cas/numeric/ode.ts).
 * G. V. Dunne, "Functional determinants in quantum field theory", J. Phys. A 41 (2008) 304006;
 * K. Kirsten and A. J. McKane, Ann. Phys. 308 (2003) 502.
 *
 * Example: determinant D = 0.49 on interval 3 gives sinh(2.1)/2.1 ≈ 1.91517.
 */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Expr, Statement } from '../lang/ast.js';
import { complexApprox, complexApproxLatex } from '../../shared/record/numbers.js';
import { Complex } from 'complex.js';
import { call, div, mul, num, pow } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames } from '../expr/names.js';
import { formulaOf } from '../expr/print.js';
import { ratExpr } from '../expr/fromExact.js';
import { fromExpr, rfIsZero } from '../exact/ratfunc.js';
import { fundamentalSolutions, type Cplx } from '../numeric/ode.js';
import type { Point } from '../domains/sample.js';
import { exactSqrt } from './product.js';
import { blankReport, StatementFailure, type Context } from './context.js';

export function evaluateDeterminant(s: Extract<Statement, { kind: 'determinant' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.name.name;
  const fail = (msg: string, column = s.span.start.column): never => { throw new StatementFailure(msg, line, column); };
  const report = blankReport(line, 'determinant', name);
  if (ctx.params.has(name) || ctx.results.has(name)) fail(`The name ${name} is already in use; give the determinant a new name.`, s.name.span.start.column);
  if (ctx.params.has('t')) fail('t is the potential\'s variable here, but it is declared as a parameter; rename the parameter.');
  for (const [v, span] of freeNames(s.potential)) {
    if (v !== 't' && !ctx.params.has(v)) fail(`"${v}" is neither the variable t nor a declared parameter.`, span?.start.column ?? s.span.start.column);
  }
  for (const [v, span] of freeNames(s.length)) {
    if (!ctx.params.has(v)) fail(`The length uses "${v}", which is not a declared parameter.`, span?.start.column ?? s.span.start.column);
  }
  const L = s.length;
  const params = [...ctx.params.keys()].filter((p) => freeNames(s.potential).has(p) || freeNames(L).has(p));
  const dependsOnT = freeNames(s.potential).has('t');
  let result: Expr | null = null;
  let zeroMode: { reduced: ReturnType<typeof formulaOf> } | null = null;
  let ode: { steps: number; difference: number } | null = null;
  let value: Cplx | null = null;

  if (!dependsOnT) {
    const V = fromExpr(s.potential);
    const zero = V !== null && rfIsZero(V);
    const root = V ? exactSqrt(V) : null;
    const w: Expr = root ? ratExpr(root, true) : call('sqrt', V ? ratExpr(V, true) : s.potential);
    if (s.conditions === 'dirichlet') {
      result = zero ? num(1) : div(call('sinh', mul(w, L)), mul(w, L));
    } else if (s.conditions === 'periodic') {
      if (zero) {
        // the constant solves -y'' = 0 periodically: det = lim 4 sinh(beta w/2)^2 = 0; det' = beta^2
        result = pow(L, num(2));
        zeroMode = { reduced: formulaOf(result) };
      } else result = mul(num(4), pow(call('sinh', div(mul(L, w), num(2))), num(2)));
    } else {
      result = zero ? num(4) : mul(num(4), pow(call('cosh', div(mul(L, w), num(2))), num(2)));
    }
    if (!params.length) {
      const z = evaluate(result, new Map());
      value = { re: z.re, im: z.im };
    }
  } else {
    if (params.length) fail(`A potential that depends on t is solved numerically; give numbers for ${params.join(', ')} (they are parameters here).`);
    const Lz = evaluate(L, new Map());
    const T = Lz.re;
    if (Lz.im !== 0 || !(T > 0)) fail('The length must be a positive number.');
    const Vt = (t: number): Cplx => { const z = evaluate(s.potential, new Map([['t', new Complex(t, 0)]])); return { re: z.re, im: z.im }; };
    const q = s.conditions === 'dirichlet'
      ? (m: { y2: Cplx }) => ({ re: m.y2.re / T, im: m.y2.im / T })
      : (m: { y1: Cplx; dy2: Cplx }) => ({ re: m.y1.re + m.dy2.re + (s.conditions === 'periodic' ? -2 : 2), im: m.y1.im + m.dy2.im });
    const solved = fundamentalSolutions(Vt, T, q);
    if (!solved) fail('The solve of y\'\' = V y did not settle as the step was halved (V too rough or too large on this length, or the determinant is close to 0).');
    value = solved!.value;
    ode = { steps: solved!.steps, difference: solved!.difference };
    const scale = Math.hypot(solved!.m.y1.re, solved!.m.y1.im) + Math.hypot(solved!.m.dy2.re, solved!.m.dy2.im) + 2;
    if (s.conditions !== 'dirichlet' && Math.hypot(value.re, value.im) < 1e-9 * scale) {
      fail(`The determinant vanishes to working precision (${complexApprox(value, 6)}): a ${s.conditions} zero mode. Removing it needs its normalisation, which is not computed for a V that depends on t.`);
    }
  }

  report.proof = dependsOnT ? null : 'proved';
  report.result = result ? { ...formulaOf(result), value } : { text: complexApprox(value!, 15), latex: complexApproxLatex(value!, 15), value };
  report.steps.push({
    kind: 'functional-determinant', name, potential: formulaOf(s.potential), shape: s.shape, conditions: s.conditions,
    length: formulaOf(L), method: dependsOnT ? 'ode' : 'exact', result: result ? formulaOf(result) : null, value, zeroMode, ode,
  });
  const valueAt = (pt: Point) => {
    if (!result) return value;
    try { const z = evaluate(result, new Map(pt)); return Number.isFinite(z.re) && Number.isFinite(z.im) ? { re: z.re, im: z.im } : null; } catch { return null; }
  };
  ctx.results.set(name, {
    line, unavailable: null, expr: result, params, valueAt, ...(result ? { definition: result } : {}),
    determinant: { potential: s.potential, length: L, conditions: s.conditions, zeroMode: zeroMode !== null, byOde: dependsOnT },
  });
  return report;
}
