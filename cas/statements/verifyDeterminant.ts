/**
 * verify on a functional determinant: the initial-value problem y'' = V(t) y solved by
 * Runge-Kutta (cas/numeric/ode.ts) at the given point, independently of the closed form
 * (which comes from the exponential solutions of a constant V): y2(L)/L on an interval
 * (Gel'fand-Yaglom), tr M -/+ 2 from the monodromy M on a circle.
 *
 * Example: determinant D = 0.49 on interval 3, then verify D: ≈ 1.91516987721778 by the
 * ODE against sinh(2.1)/2.1.
 */
import { Complex } from 'complex.js';
import type { StatementReport } from '../../shared/evaluation.js';
import { complexApprox, complexApproxLatex } from '../../shared/record/numbers.js';
import { evaluate } from '../expr/evaluate.js';
import { fundamentalSolutions, type Cplx } from '../numeric/ode.js';
import type { Point } from '../domains/sample.js';
import { StatementFailure, type ResultInfo } from './context.js';

const rel = (a: Cplx, b: Cplx) => Math.hypot(a.re - b.re, a.im - b.im) / Math.max(Math.hypot(b.re, b.im), 1e-300);

export function verifyDeterminant(
  name: string, r: ResultInfo, p: Point, tolerance: number, line: number, column: number, report: StatementReport,
): StatementReport {
  const d = r.determinant!;
  const fail = (msg: string): never => { throw new StatementFailure(msg, line, column); };
  if (d.byOde) fail(`${name} was itself computed by this initial-value problem (its potential depends on t), so solving it again would check nothing. For an independent value, slice it: sliced NAME = V on ... with N slices, at growing N.`);
  if (d.zeroMode) fail(`${name} is the determinant with its zero mode removed; the initial-value problem gives the full determinant, which is 0 here, so there is nothing to compare.`);
  const Lz = evaluate(d.length, new Map(p));
  if (Lz.im !== 0 || !(Lz.re > 0)) fail(`The length is ${complexApprox({ re: Lz.re, im: Lz.im }, 6)} at this point; the check needs a positive length.`);
  const T = Lz.re;
  const V = (t: number): Cplx => {
    const z = evaluate(d.potential, new Map([...p, ['t', new Complex(t, 0)]]));
    return { re: z.re, im: z.im };
  };
  const q = d.conditions === 'dirichlet'
    ? (m: { y2: Cplx }) => ({ re: m.y2.re / T, im: m.y2.im / T })
    : (m: { y1: Cplx; dy2: Cplx }) => ({ re: m.y1.re + m.dy2.re + (d.conditions === 'periodic' ? -2 : 2), im: m.y1.im + m.dy2.im });
  const solved = fundamentalSolutions(V, T, q);
  if (!solved) fail('The solve of y\'\' = V y did not settle as the step was halved (V too large on this length, or the determinant is close to 0).');
  const closed = r.valueAt?.(p);
  if (!closed) fail(`${name} has no closed-form value at this point.`);
  const value = solved!.value;
  const difference = rel(value, closed!);
  const agrees = Number.isFinite(difference) && difference <= tolerance;
  report.status = agrees ? 'ok' : 'failed';
  report.result = { text: complexApprox(value, 15), latex: complexApproxLatex(value, 15), value };
  report.steps.push({
    kind: 'ode-check', name, at: Object.fromEntries([...p].map(([k, v]) => [k, { re: v.re, im: v.im }])),
    conditions: d.conditions, value, closed: closed!, steps: solved!.steps, stepDifference: solved!.difference,
    relativeDifference: difference, tolerance, agrees,
  });
  if (!agrees) report.error = { message: `The ODE solve gives ${complexApprox(value, 12)}, the closed form ${complexApprox(closed!, 12)}: relative difference ${difference.toExponential(2)}, above the tolerance.`, line, column };
  return report;
}
