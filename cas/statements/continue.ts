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
import { toLatex, toText } from '../expr/print.js';
import { tidy } from '../expr/tidy.js';
import { neg } from '../expr/build.js';
import { rewriteChecked } from '../algebra/adapter.js';
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
  const fmtT = (t: Complex[]) => moving.map((m, k) => `${m} = ${complexText(t[k]!, 6)}`).join(', ');
  const rec = (t: Complex[]) => Object.fromEntries(moving.map((m, k) => [m, { re: t[k]!.re, im: t[k]!.im }]));
  const events: DiagramEvent[] = [];
  const steps: Step[] = [];
  const baseWords = base.size ? ` with ${[...base].map(([k, v]) => `${k} = ${complexText(v, 6)}`).join(', ')}${others.length ? ' (values chosen by the record: the simplest point of their domains)' : ''}` : '';
  steps.push({
    kind: 'continuation',
    text: `Continued ${name} along ${s.points.map((pt) => (pt.length > 1 ? `(${pt.map(toText).join(', ')})` : toText(pt[0]!))).join(' -> ')}${baseWords}: ${samples.length - 1} adaptive steps (${run.rejected} refined), eigenvalues of A ${run.eigenRoute ? 'followed at every step, each square root chosen continuous with the last' : 'followed at sampled steps; the square root of det A followed through the L D L^T pivots at every step'}; det A followed as a second route with its phase unwrapped (${run.routesAgree ? 'the two routes agree' : 'WARNING: the routes disagree'}).`,
    latex: `\\det(A)^{1/2}\\ \\text{followed continuously along the path}`,
  });
  for (const bp of run.branchPoints) {
    const ev: DiagramEvent = { kind: 'branch-point', at: { re: bp.at.re, im: bp.at.im }, text: `Branch point at ${moving[0]} = ${complexText(bp.at, 6)}, passed at distance ${Number(bp.distance.toPrecision(4))} on the ${bp.side} of the path` };
    events.push(ev);
    steps.push({ kind: 'continuation-event', text: `${ev.text} (det A = 0 there, a ${bp.simple ? 'simple' : 'higher-order'} zero, located by Newton's method from the closest approach at ${fmtT(bp.closest)}).`, latex: `\\det A = 0`, event: { kind: 'branch-point', at: { [moving[0]!]: { re: bp.at.re, im: bp.at.im } }, distance: bp.distance } });
  }
  for (const c of run.cuts) {
    const ev: DiagramEvent = { kind: 'cut-crossed', at: { re: c.t[0]!.re, im: c.t[0]!.im }, text: `det A crosses the negative real axis (the principal cut of 1/sqrt(det A)) at ${fmtT(c.t)}, from ${c.fromAbove ? 'above' : 'below'}` };
    events.push(ev);
    steps.push({ kind: 'continuation-event', text: `${ev.text}: the principal root jumps there, the continued one does not.`, latex: '\\arg \\det A = \\pm\\pi', event: { kind: 'cut-crossed', at: rec(c.t) } });
  }
  for (const c of run.convergence) {
    if (c.lost) {
      const rot = commonRotation(Aof(c.after));
      const text = rot
        ? `The real contour stops converging at ${fmtT(c.t)} (Re A loses positive definiteness); the common rotation x -> exp(i*theta)*x with theta = ${Number(rot.theta.toPrecision(6))} (allowed for theta in (${Number(rot.from.toPrecision(4))}, ${Number(rot.to.toPrecision(4))}), on a grid of 721 angles) keeps the integral defined just beyond`
        : `The real contour stops converging at ${fmtT(c.t)}, and no common rotation angle keeps the integral defined just beyond (checked on a grid of 721 angles); the value is continued analytically only`;
      events.push({ kind: 'convergence-lost', at: { re: c.t[0]!.re, im: c.t[0]!.im }, text });
      steps.push({ kind: 'continuation-event', text: `${text}.`, latex: '\\operatorname{Re} A \\not\\succ 0', event: { kind: 'convergence-lost', at: rec(c.t) } });
      if (rot) events.push({ kind: 'contour-rotated', at: { re: c.t[0]!.re, im: c.t[0]!.im }, text: `Contour rotated by theta = ${Number(rot.theta.toPrecision(4))}` });
    } else {
      const text = `The real contour converges again from ${fmtT(c.t)}`;
      events.push({ kind: 'convergence-regained', at: { re: c.t[0]!.re, im: c.t[0]!.im }, text });
      steps.push({ kind: 'continuation-event', text: `${text}.`, latex: '\\operatorname{Re} A \\succ 0', event: { kind: 'convergence-regained', at: rec(c.t) } });
    }
  }
  // closed form at the end, with the sheet sign, where the path ends at an expression
  let closedText = '';
  let closedLatex = '';
  if (r.expr) {
    const last = s.points[s.points.length - 1]!;
    const map = new Map(moving.map((m, k) => [m, last[k]!]));
    const e0 = substitute(r.expr, map);
    const signed = sign > 0 ? e0 : neg(e0);
    const chk = [...samplePoints(domainsOf(ctx, others), others, 6, 5)].map((p) => new Map([...fixed, ...p]));
    const simp = tidy(rewriteChecked('simplify', signed, chk.length ? chk : [new Map()]).expr);
    const at0 = (() => { try { return evaluate(simp, base); } catch { return null; } })();
    if (at0 && Math.hypot(at0.re - value.re, at0.im - value.im) <= 1e-8 * Math.hypot(value.re, value.im)) { closedText = toText(simp); closedLatex = toLatex(simp); }
  }
  const sheetText = sign > 0 ? 'the principal sheet (the end value equals the closed form with the principal 1/sqrt(det A))' : 'minus the principal sheet (the end value is minus the closed form with the principal 1/sqrt(det A))';
  events.push({ kind: 'sheet', at: { re: end.t[0]!.re, im: end.t[0]!.im }, text: `End value on ${sign > 0 ? 'the principal sheet' : 'minus the principal sheet'}` });
  events.push({ kind: 'end', at: { re: end.t[0]!.re, im: end.t[0]!.im }, text: `${name} = ${complexText(value, 10)}` });
  const onCut = Math.abs(end.det.im) <= 1e-12 * Math.hypot(end.det.re, end.det.im) && end.det.re < 0;
  steps.push({
    kind: 'sheet',
    text: `At the end point ${fmtT(end.t)} the continued sqrt(det A) = ${complexText(end.sqrtDet, 10)} and the principal one = ${complexText(principal, 10)}: ${name} ends on ${sheetText}${onCut ? '; the end point lies on the cut itself, where "principal" means arg(det A) = pi' : ''}. ${name} = ${complexText(value, 15)}${closedText ? ` = ${closedText}` : ''}.`,
    latex: `${name} = ${closedLatex || complexText(value, 12)}`,
    eigenvalues: end.eigenvalues.map(polar),
  });
  steps.forEach((st, k) => { const e = events.find((ev) => st.text.startsWith(ev.text)); if (e) e.step = k + 1; });
  report.steps.push(...steps);
  report.result = { text: closedText || complexText(value, 15), latex: closedLatex || complexText(value, 15), value };
  const diagram: DiagramData = {
    contours: [], sectors: [], cuts: [PRINCIPAL_CUT],
    paths: [{ label: `Path of ${moving[0]}`, parameter: moving[0]!, points: thin(samples.map((x) => ({ re: x.t[0]!.re, im: x.t[0]!.im }))), events }],
    tracks: run.tracks.map((tr, k) => ({ label: `Eigenvalue ${k + 1} of A`, points: thin(tr) })),
    eigenvalues: end.eigenvalues.map(polar),
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
