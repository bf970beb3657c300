/**
 * rotate NAME : x -> exp(i*theta)*x, ... as NEW (also t -> -i*t, the Wick rotation, and x -> steepest).
 * Legality: the integrand must not grow on any contour of the swept family x_j -> e^(i t theta_j) x_j,
 * t in [0, 1], i.e. Re(D(t) A D(t)) stays positive semidefinite. One variable: decided exactly from the
 * coupling's argument; several: on a grid of angles with bisection at the first bad one. A legal rotation
 * gives a new result: Jacobian, new coupling, closed form and convergence, through the integral path.
 */
import type { Step, StatementReport } from '../../shared/evaluation.js';
import type { DiagramData } from '../../shared/diagram.js';
import type { Expr, Statement } from '../lang/ast.js';
import { call, I, mul, neg, num } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames, substitute } from '../expr/names.js';
import { parseExpression } from '../lang/parse.js';
import { toLatex, toText } from '../expr/print.js';
import { Complex } from 'complex.js';
import { describePoint, pointRecord, samplePoints, type Point } from '../domains/sample.js';
import { numericForm } from '../gaussian/numericModel.js';
import { symEig } from '../numeric/symeig.js';
import { eigenvalues } from '../numeric/eigen.js';
import { polar } from '../gaussian/describe.js';
import { checkDeadline } from '../deadline.js';
import { blankReport, domainsOf, StatementFailure, type Context, type GaussianInfo } from './context.js';
import { evaluateIntegral } from './integral.js';
import { angleText, PRINCIPAL_CUT, resultNamed, unitLine } from './shared.js';

const GRID = 720;
const SAMPLES = 16;

/** The unit factor e^(i theta) as an exact expression where theta is a multiple of pi/2 or pi/4..., else exp(i*theta). */
function unitExpr(theta: number): Expr {
  const quarter = Math.round(theta / (Math.PI / 2));
  if (Math.abs(quarter * (Math.PI / 2) - theta) < 1e-13) return [num(1), I, num(-1), neg(I)][((quarter % 4) + 4) % 4]!;
  const t = angleText(theta);
  const arg = t.endsWith(' rad') ? num(Number(theta.toPrecision(15))) : parseExpression(t);
  return call('exp', mul(I, arg));
}

interface Sweep { legal: boolean; firstBad: number | null; direction: number[] | null; at: Point | null; method: 'exact' | 'grid'; count: number }

function reA(A: { n: number; re: Float64Array; im: Float64Array }, angles: readonly number[], t: number): number[][] {
  const n = A.n;
  return Array.from({ length: n }, (_, r) => Array.from({ length: n }, (_, c) => {
    const ph = t * (angles[r]! + angles[c]!);
    const zr = (A.re[r * n + c]! + A.re[c * n + r]!) / 2; const zi = (A.im[r * n + c]! + A.im[c * n + r]!) / 2;
    return zr * Math.cos(ph) - zi * Math.sin(ph);
  }));
}

function sweep(g: GaussianInfo, points: readonly Point[], angles: readonly number[]): Sweep {
  const n = g.vars.length;
  if (n === 1) {
    // a e^(2 i phi) has real part >= 0 iff arg(a) + 2 phi lies in [-pi/2, pi/2]; linear in phi, so both ends decide.
    const theta = angles[0]!;
    for (const p of points) {
      const a = numericForm(g.form, g.prefactor, p).A;
      const alpha = Math.atan2(a.im[0]!, a.re[0]!);
      const ok = (x: number) => x >= -Math.PI / 2 - 1e-12 && x <= Math.PI / 2 + 1e-12;
      if (!ok(alpha)) return { legal: false, firstBad: 0, direction: [1], at: p, method: 'exact', count: 0 };
      if (!ok(alpha + 2 * theta)) {
        const edge = theta > 0 ? Math.PI / 2 : -Math.PI / 2;
        return { legal: false, firstBad: (edge - alpha) / 2, direction: [1], at: p, method: 'exact', count: 0 };
      }
    }
    return { legal: true, firstBad: null, direction: null, at: null, method: 'exact', count: 0 };
  }
  for (const p of points) {
    checkDeadline();
    const A = numericForm(g.form, g.prefactor, p).A;
    let scale = 0;
    for (let k = 0; k < n * n; k++) scale = Math.max(scale, Math.abs(A.re[k]!), Math.abs(A.im[k]!));
    const tol = 1e-10 * Math.max(scale, 1e-300);
    const bad = (t: number) => symEig(reA(A, angles, t)).values[0]! < -tol;
    let prev = 0;
    for (let k = 0; k <= GRID; k++) {
      const t = k / GRID;
      if (bad(t)) {
        let lo = prev; let hi = t;
        if (k === 0) { lo = 0; hi = 0; }
        for (let it = 0; it < 50 && hi - lo > 1e-13; it++) { const m = (lo + hi) / 2; if (bad(m)) hi = m; else lo = m; }
        const e = symEig(reA(A, angles, Math.min(1, hi + 1e-6)));
        return { legal: false, firstBad: hi, direction: e.vectors[0]!.map((x) => Number(x.toPrecision(6)) + 0), at: p, method: 'grid', count: (k + 1) * points.indexOf(p) + k + 1 };
      }
      prev = t;
    }
  }
  return { legal: true, firstBad: null, direction: null, at: null, method: 'grid', count: (GRID + 1) * points.length };
}

export function evaluateRotate(s: Extract<Statement, { kind: 'rotate' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const report = blankReport(line, 'rotate', s.as.name);
  const result = resultNamed(ctx, s.target, line, 'rotation');
  const g = result.gaussian;
  if (!g) throw new StatementFailure(`${s.target.name} is a derived quantity, not an integral; only integrals can be rotated.`, line, s.target.span.start.column);
  if (ctx.params.has(s.as.name) || ctx.results.has(s.as.name)) throw new StatementFailure(`The name ${s.as.name} is already in use; give the rotated result a new name.`, line, s.as.span.start.column);
  const params = result.params;
  const points = params.length ? samplePoints(domainsOf(ctx, params), params, SAMPLES) : [new Map()];
  const n = g.vars.length;
  const angles = new Array<number>(n).fill(0);
  const words: string[] = [];
  let steepest = false;
  let wick = false;
  for (const m of s.moves) {
    const j = g.vars.indexOf(m.variable.name);
    if (j < 0) throw new StatementFailure(`${m.variable.name} is not an integration variable of ${s.target.name} (its variables are ${g.vars.join(', ')}).`, line, m.variable.span.start.column);
    if (m.to === 'steepest') {
      const thetas = points.map((p) => { const a = numericForm(g.form, g.prefactor, p).A; return -Math.atan2(a.im[j * n + j]!, a.re[j * n + j]!) / 2; });
      if (thetas.some((t) => Math.abs(t - thetas[0]!) > 1e-9)) {
        throw new StatementFailure(`The steepest-descent angle of ${m.variable.name} depends on the parameters (from ${angleText(Math.min(...thetas))} to ${angleText(Math.max(...thetas))} over ${points.length} sampled points); give an explicit angle.`, line, m.variable.span.start.column);
      }
      angles[j] = thetas[0]!;
      steepest = true;
      words.push(`${m.variable.name} -> exp(i*(${angleText(angles[j]!)}))*${m.variable.name}, the steepest-descent direction (where the coupling of ${m.variable.name} becomes real and positive)`);
      continue;
    }
    const other = [...freeNames(m.to).keys()].filter((x) => x !== m.variable.name);
    if (other.length) throw new StatementFailure(`The rotation factor must be a number; it depends on ${other.join(', ')}.`, line, m.variable.span.start.column);
    const at = (x: number) => evaluate(m.to as Expr, new Map([[m.variable.name, new Complex(x, 0)]]));
    const u = at(1);
    if (at(2).sub(u.mul(2)).abs() > 1e-12 || at(0).abs() > 1e-12) throw new StatementFailure(`A rotation is written ${m.variable.name} -> FACTOR*${m.variable.name}, for example ${m.variable.name} -> exp(i*pi/4)*${m.variable.name}.`, line, m.variable.span.start.column);
    if (Math.abs(u.abs() - 1) > 1e-12) throw new StatementFailure(`The factor ${toText(m.to)} has modulus ${Number(u.abs().toPrecision(6))}, not 1: that is not a rotation.`, line, m.variable.span.start.column);
    angles[j] = Math.atan2(u.im, u.re);
    const isWick = Math.abs(u.re) < 1e-15 && Math.abs(u.im + 1) < 1e-15;
    wick ||= isWick;
    words.push(`${m.variable.name} -> exp(i*(${angleText(angles[j]!)}))*${m.variable.name}${isWick ? `, the Wick rotation ${m.variable.name} = -i*tau of a time variable` : ''}`);
  }
  const sw = sweep(g, points, angles);
  const rotated = angles.map((a, k) => ({ a, v: g.vars[k]! })).filter((x) => x.a !== 0);
  const primary = rotated[0]?.a ?? 0;
  report.legal = sw.legal;
  report.steps.push({
    kind: 'rotation',
    text: `${wick ? 'Wick rotation: ' : steepest ? 'Rotation onto the steepest-descent direction: ' : 'Rotation: '}${words.join('; ')}. The swept family is x_j -> exp(i*t*theta_j)*x_j for t from 0 to 1.`,
    latex: rotated.map((x) => `${x.v} \\to e^{i ${toLatex(parseOrNum(angleText(x.a)))}}\\, ${x.v}`).join(',\\ '),
    angles: { method: sw.method, count: sw.count, values: Object.fromEntries(rotated.map((x) => [x.v, x.a])), firstBad: sw.firstBad === null ? null : sw.firstBad },
  });
  const sampledWords = params.length ? ` at each of ${points.length} sampled parameter points (checked at ${points.length} points, not proved for the whole domain)` : '';
  const legalityText = sw.method === 'exact'
    ? `decided exactly from the argument of the coupling${sampledWords}`
    : `checked on a grid of ${GRID + 1} angles of the sweep${sampledWords}${sw.legal ? '' : ', the first bad angle located by bisection'}`;
  const diagram: DiagramData = {
    contours: [{ label: 'Real contour', role: 'real', points: unitLine(0) }],
    sectors: rotated.map((x) => ({ label: `Swept sector of ${x.v}`, from: 0, to: x.a, allowed: sw.legal })),
    cuts: [PRINCIPAL_CUT], paths: [], tracks: [], eigenvalues: [],
  };
  if (!sw.legal) {
    const phi = rotated.map((x) => `${x.v} at ${angleText(sw.firstBad! * (n === 1 ? 1 : x.a))}`).join(', ');
    const atWords = sw.at && sw.at.size ? ` (at ${describePoint(sw.at)})` : '';
    const dirWords = n === 1
      ? `along the rotated contour ${g.vars[0]} = exp(i*phi)*y, y real, for phi just beyond ${angleText(sw.firstBad!)}`
      : `along the real direction y = (${sw.direction!.join(', ')}) of the contour x_j = exp(i*t*theta_j)*y_j just beyond t = ${Number(sw.firstBad!.toPrecision(6))}`;
    const first = n === 1 ? angleText(sw.firstBad!) : `t = ${Number(sw.firstBad!.toPrecision(6))} of the sweep (${phi})`;
    report.steps.push({
      kind: 'legality',
      text: `Not allowed: the integrand grows on the swept family, first at ${first}${atWords}, ${dirWords}; ${legalityText}. No rotated result.`,
      latex: '\\operatorname{Re}\\left(D A D\\right) \\not\\succeq 0',
      ...(sw.direction ? { direction: sw.direction } : {}),
      ...(sw.at && sw.at.size ? { at: pointRecord(sw.at) } : {}),
    });
    report.diagram = diagram;
    ctx.results.set(s.as.name, { line, unavailable: `${s.as.name} (line ${line}), whose rotation is not allowed`, expr: null, params, valueAt: null });
    return report;
  }
  report.steps.push({
    kind: 'legality',
    text: `Allowed: Re(D A D) stays positive semidefinite on every contour of the swept family, so the integrand does not grow and the arcs at infinity do not contribute; ${legalityText}.`,
    latex: '\\operatorname{Re}\\left(D(t) A D(t)\\right) \\succeq 0,\\ t \\in [0, 1]',
  });
  // The rotated integral over real y: Jacobian times the integrand at x = D y.
  const map = new Map<string, Expr>();
  let jac: Expr = num(1);
  for (const x of rotated) { const u = unitExpr(x.a); map.set(x.v, mul(u, { t: 'name', name: x.v })); jac = mul(jac, u); }
  const unit = (angles.reduce((a, b) => a + b, 0));
  report.steps.push({
    kind: 'jacobian',
    text: `Jacobian dx = ${toText(jac)} dy (exp(i*(${angleText(unit)})), the product of the rotation factors).`,
    latex: `dx = ${toLatex(jac)}\\, dy`,
  });
  const integrand = mul(jac, substitute(g.integrand, map));
  const inner = evaluateIntegral({ kind: 'integral', name: s.as, integrand, vars: g.vars.map((v) => ({ name: v, span: s.span })), span: s.span }, ctx);
  const steps: Step[] = inner.steps.map((st) => (st.kind === 'quadratic-form' ? { ...st, text: `New coupling: ${st.text}` } : st));
  report.steps.push(...steps);
  report.convergence = inner.convergence;
  report.proof = inner.proof;
  report.result = inner.result;
  report.branch = inner.branch;
  const info = ctx.results.get(s.as.name);
  if (info?.gaussian) {
    const prev = g.contour?.angles ?? new Array<number>(n).fill(0);
    info.gaussian.contour = {
      of: g.contour?.of ?? s.target.name,
      angles: angles.map((a, k) => a + prev[k]!),
      labels: g.vars.map((v, k) => `${v} = exp(i*(${angleText(angles[k]! + prev[k]!)}))*y`).filter((_, k) => angles[k]! + prev[k]! !== 0),
    };
  }
  const ev = points[0] ? eigenvalues(numericForm(ctx.results.get(s.as.name)!.gaussian!.form, g.prefactor, points[0]).A) : [];
  diagram.contours.push({ label: steepest ? 'Steepest-descent contour' : 'Rotated contour', role: steepest ? 'steepest' : 'rotated', points: unitLine(primary) });
  diagram.eigenvalues = ev.map(polar);
  report.diagram = diagram;
  return report;
}

function parseOrNum(t: string): Expr {
  if (t.endsWith(' rad')) return num(t.slice(0, -4));
  return parseExpression(t);
}
