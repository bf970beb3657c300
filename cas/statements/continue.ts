/**
 * continue NAME : p along P0 -> P1 -> ... [at q = v, ...]: the result continued along the
 * piecewise-linear path. Eigenvalues of A and each square root are followed continuously with adaptive
 * steps (refined where an eigenvalue is small); det A is followed as well, its phase unwrapped, as a
 * second route. Events: branch points passed near, crossings of the principal cut of 1/sqrt(det A),
 * loss of convergence of the real contour (with a common rotation angle that keeps it defined, or none),
 * and the sheet of the end value.
 */
import type { Step, StatementReport } from '../../shared/evaluation.js';
import type { DiagramData, DiagramEvent } from '../../shared/diagram.js';
import type { Statement } from '../lang/ast.js';
import { Complex } from 'complex.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames, substitute } from '../expr/names.js';
import { formulaOf } from '../expr/print.js';
import { renderStep } from '../../shared/record/render.js';
import { complexApprox, complexApproxLatex, pointText } from '../../shared/record/numbers.js';
import { tidy } from '../expr/tidy.js';
import { neg } from '../expr/build.js';
import { rewriteChecked } from '../algebra/adapter.js';
import { rootsReduced } from '../expr/rootsReduced.js';
import { samplePoints, type Point } from '../domains/sample.js';
import { numericForm, gaussianValue } from '../gaussian/numericModel.js';
import { complexText, polar } from '../gaussian/describe.js';
import { csqrt, type C, type CMat } from '../numeric/cmatrix.js';
import { followPath, commonRotation, PathThroughBranchPoint, type PathSample } from '../numeric/continuation.js';
import { blankReport, domainsOf, StatementFailure, type Context } from './context.js';
import { bindPoint, PRINCIPAL_CUT, resultNamed } from './shared.js';

export function evaluateContinue(s: Extract<Statement, { kind: 'continue' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.target.name;
  const report = blankReport(line, 'continue', name);
  const r = resultNamed(ctx, s.target, line, 'continuation');
  const g = r.gaussian;
  if (!g) throw new StatementFailure(`${name} is a derived quantity; continue follows integrals and rotated results.`, line, s.target.span.start.column);
  const moving = s.params.map((p) => p.name);
  for (const p of s.params) if (!ctx.params.has(p.name)) throw new StatementFailure(`${p.name} is not a declared parameter.`, line, p.span.start.column);
  const fixed = bindPoint(ctx, s.at, line);
  const others = r.params.filter((x) => !moving.includes(x) && !fixed.has(x));
  const defaults = others.length ? samplePoints(domainsOf(ctx, others), others, 1)[0]! : new Map();
  const base: Point = new Map([...fixed, ...defaults]);
  for (const pt of s.points) for (const e of pt) for (const n of freeNames(e).keys()) {
    if (!base.has(n)) throw new StatementFailure(`The path uses ${n}, which has no value here; give it one with at ${n} = ...`, line, s.span.start.column);
  }
  const nodes = s.points.map((pt) => pt.map((e) => evaluate(e, base)));
  const Aof = (t: Complex[]): CMat => { const p = new Map(base); moving.forEach((m, k) => p.set(m, t[k]!)); return numericForm(g.form, g.prefactor, p).A; };
  const pointOf = (t: Complex[]): Point => { const p = new Map(base); moving.forEach((m, k) => p.set(m, t[k]!)); return p; };
  let run: ReturnType<typeof followPath>;
  try {
    run = followPath(Aof, nodes);
  } catch (e) {
    if (!(e instanceof PathThroughBranchPoint)) throw e;
    const where = moving.map((m, k) => `${m} = ${complexText(e.at[k]!, 6)}`).join(', ');
    throw new StatementFailure(`The path passes through a branch point (det A = 0) near ${where}, where the square root has no continuous choice. Move the path off it: go around the point on the side you mean.`, line, s.span.start.column);
  }
  const samples = run.samples;
  const end = samples[samples.length - 1]!;
  const endPoint = pointOf(end.t);
  const nf = numericForm(g.form, g.prefactor, endPoint);
  const value = gaussianValue(nf, end.sqrtDet);
  const principal = csqrt(end.det);
  const sign = principal.re * end.sqrtDet.re + principal.im * end.sqrtDet.im >= 0 ? 1 : -1;
  report.sheet = sign > 0 ? 'principal' : 'minus-principal';
  const rec = (t: Complex[]) => Object.fromEntries(moving.map((m, k) => [m, { re: t[k]!.re, im: t[k]!.im }]));
  const events: DiagramEvent[] = [];
  const steps: Step[] = [];
  const stepOfEvent: number[] = [];
  const addEvent = (st: Step, ev: DiagramEvent) => { steps.push(st); ev.step = steps.length; events.push(ev); };
  steps.push({
    kind: 'continuation', name,
    path: s.points.map((pt) => pt.map(formulaOf)),
    fixed: Object.fromEntries([...base].map(([k, v]) => [k, { re: v.re, im: v.im }])),
    chosen: others, steps: samples.length - 1, refined: run.rejected,
    eigenRoute: run.eigenRoute, routesAgree: run.routesAgree,
  });
  for (const bp of run.branchPoints) {
    const st: Step = { kind: 'continuation-event', event: 'branch-point', at: { [moving[0]!]: { re: bp.at.re, im: bp.at.im } }, distance: bp.distance, side: bp.side, simple: bp.simple, closest: rec(bp.closest) };
    addEvent(st, { kind: 'branch-point', at: { re: bp.at.re, im: bp.at.im }, text: renderStep(st).text });
  }
  for (const c of run.cuts) {
    const st: Step = { kind: 'continuation-event', event: 'cut-crossed', at: rec(c.t), fromAbove: c.fromAbove };
    addEvent(st, { kind: 'cut-crossed', at: { re: c.t[0]!.re, im: c.t[0]!.im }, text: renderStep(st).text });
  }
  for (const c of run.convergence) {
    const at = { re: c.t[0]!.re, im: c.t[0]!.im };
    if (c.lost) {
      const rot = commonRotation(Aof(c.after));
      const st: Step = { kind: 'continuation-event', event: 'convergence-lost', at: rec(c.t), rotation: rot };
      addEvent(st, { kind: 'convergence-lost', at, text: renderStep(st).text });
      if (rot) events.push({ kind: 'contour-rotated', at, text: `Contour rotated by theta ${complexApprox({ re: rot.theta, im: 0 }, 4)}`, step: steps.length });
    } else {
      const st: Step = { kind: 'continuation-event', event: 'convergence-regained', at: rec(c.t) };
      addEvent(st, { kind: 'convergence-regained', at, text: renderStep(st).text });
    }
  }
  void stepOfEvent;
  // closed form at the end, with the sheet sign, where the path ends at an expression
  let closed: { text: string; latex: string } | null = null;
  if (r.expr) {
    const last = s.points[s.points.length - 1]!;
    const map = new Map(moving.map((m, k) => [m, last[k]!]));
    const e0 = substitute(r.expr, map);
    const signed = sign > 0 ? e0 : neg(e0);
    const chk = [...samplePoints(domainsOf(ctx, others), others, 6, 5)].map((p) => new Map([...fixed, ...p]));
    // roots reduced in exact arithmetic where that reaches; the general algebra package otherwise
    const simp = tidy(rootsReduced(signed) ?? rewriteChecked('simplify', signed, chk.length ? chk : [new Map()]).expr);
    const at0 = (() => { try { return evaluate(simp, base); } catch { return null; } })();
    if (at0 && Math.hypot(at0.re - value.re, at0.im - value.im) <= 1e-8 * Math.hypot(value.re, value.im)) closed = formulaOf(simp);
  }
  // the sheet step is pushed next: its event carries that step's number
  events.push({ kind: 'sheet', at: { re: end.t[0]!.re, im: end.t[0]!.im }, text: `End value on ${sign > 0 ? 'the principal sheet' : 'minus the principal sheet'}`, step: steps.length + 1 });
  events.push({ kind: 'end', at: { re: end.t[0]!.re, im: end.t[0]!.im }, text: `${name} ${complexApprox(value, 10)}` });
  const onCut = Math.abs(end.det.im) <= 1e-12 * Math.hypot(end.det.re, end.det.im) && end.det.re < 0;
  steps.push({
    kind: 'sheet', name, at: rec(end.t), continued: end.sqrtDet, principal, sheet: report.sheet, value, closed, onCut,
    eigenvalues: end.eigenvalues.map(polar),
  });
  report.steps.push(...steps);
  report.result = closed ? { ...closed, value } : { text: complexApprox(value, 15), latex: complexApproxLatex(value, 15), value };
  const diagram: DiagramData = {
    contours: [], sectors: [], cuts: [PRINCIPAL_CUT],
    paths: [{ label: `Path of ${moving[0]}`, parameter: moving[0]!, points: thin(samples.map((x) => ({ re: x.t[0]!.re, im: x.t[0]!.im }))), events }],
    tracks: [
      ...run.tracks.map((tr, k) => ({ label: `Eigenvalue ${k + 1} of A`, of: 'eigenvalue' as const, points: thin(tr) })),
      { label: 'det A', of: 'det' as const, points: thin(samples.map((x) => ({ re: x.det.re, im: x.det.im }))) },
    ],
    eigenvalues: end.eigenvalues.map(polar),
    eigenvaluesAt: `the end point, ${pointText(Object.fromEntries([...endPoint].map(([k, v]) => [k, { re: v.re, im: v.im }])))}`,
  };
  report.diagram = diagram;
  return report;
}

function thin<T>(xs: T[], max = 400): T[] {
  if (xs.length <= max) return xs;
  const out: T[] = [];
  for (let k = 0; k < max; k++) out.push(xs[Math.round((k * (xs.length - 1)) / (max - 1))]!);
  return out;
}
export type { PathSample, C };
