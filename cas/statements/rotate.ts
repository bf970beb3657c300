/**
 * rotate NAME : x -> exp(i*theta)*x, ... as NEW (also t -> -i*t, the Wick rotation, and x -> steepest).
 * Legality: the integrand must not grow on any contour of the swept family x_j -> e^(i t theta_j) x_j,
 * t in [0, 1], i.e. Re(D(t) A D(t)) stays positive semidefinite. One variable: decided exactly from the
 * coupling's argument; several: on a grid of angles with bisection at the first bad one. A legal rotation
 * gives a new result: Jacobian, new coupling, closed form and convergence, through the integral path.
 */
import type { Domain, Step, StatementReport } from '../../shared/evaluation.js';
import type { RatFunc } from '../exact/ratfunc.js';
import type { DiagramData } from '../../shared/diagram.js';
import type { Expr, Statement } from '../lang/ast.js';
import { add, call, div, I, mul, neg, num, PI } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames, substitute } from '../expr/names.js';
import { parseExpression } from '../lang/parse.js';
import { formulaOf, toText } from '../expr/print.js';
import { Complex } from 'complex.js';
import { pointRecord, sampledBasis, samplePoints, type Point } from '../domains/sample.js';
import { numericForm } from '../gaussian/numericModel.js';
import { symEig } from '../numeric/symeig.js';
import { eigenvalues } from '../numeric/eigen.js';
import { polar } from '../gaussian/describe.js';
import { checkDeadline } from '../deadline.js';
import { blankReport, domainsOf, StatementFailure, type Context, type GaussianInfo } from './context.js';
import { endContourCondition, exactAngleOf, angleExpr, type ExactAngle } from '../verdicts/rotationExact.js';
import { fromExpr } from '../exact/ratfunc.js';
import { rfIm } from '../verdicts/exactGaussian.js';
import { cellsOf, signOn } from '../verdicts/line.js';
import { upolyFromPoly } from '../exact/univariate.js';
import { evaluateIntegral } from './integral.js';
import { angleFormula, angleText, PRINCIPAL_CUT, resultNamed, unitLine } from './shared.js';

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
        // Growth that starts at once: Re A is singular at t = 0 and the first derivative of
        // Re(D A D), -(theta_r + theta_c) Im A_rc, is negative along its null direction. Then the
        // first bad angle is t = 0+, not a small number that bisection happens to stop at.
        if (hi < 1e-6 && growsAtOnce(A, angles, tol)) hi = 0;
        const e = symEig(reA(A, angles, Math.min(1, hi + 1e-6)));
        return { legal: false, firstBad: hi, direction: e.vectors[0]!.map((x) => Number(x.toPrecision(6)) + 0), at: p, method: 'grid', count: (k + 1) * points.indexOf(p) + k + 1 };
      }
      prev = t;
    }
  }
  return { legal: true, firstBad: null, direction: null, at: null, method: 'grid', count: (GRID + 1) * points.length };
}

/** Re A has a null direction v at t = 0 along which d/dt v^T Re(D A D) v < 0. */
function growsAtOnce(A: { n: number; re: Float64Array; im: Float64Array }, angles: readonly number[], tol: number): boolean {
  const n = A.n;
  const e = symEig(reA(A, angles, 0));
  return e.values.some((lambda, k) => {
    if (Math.abs(lambda) > tol) return false;
    const v = e.vectors[k]!;
    let d = 0;
    for (let r = 0; r < n; r++) for (let c = 0; c < n; c++) d -= v[r]! * v[c]! * (angles[r]! + angles[c]!) * (A.im[r * n + c]! + A.im[c * n + r]!) / 2;
    return d < -tol;
  });
}

export function evaluateRotate(s: Extract<Statement, { kind: 'rotate' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const report = blankReport(line, 'rotate', s.as.name);
  // A Gaussian that diverges on the real contour can still be rotated: the rotated contour then defines it.
  const entry = ctx.results.get(s.target.name);
  const divergentTarget = !!entry?.gaussian && entry.unavailable !== null && entry.gaussian.convergence === 'divergent';
  const result = divergentTarget ? entry! : resultNamed(ctx, s.target, line, 'rotation');
  const g = result.gaussian;
  if (!g) throw new StatementFailure(`${s.target.name} is a derived quantity, not an integral; only integrals can be rotated.`, line, s.target.span.start.column);
  if (ctx.params.has(s.as.name) || ctx.results.has(s.as.name)) throw new StatementFailure(`The name ${s.as.name} is already in use; give the rotated result a new name.`, line, s.as.span.start.column);
  const params = result.params;
  const points = params.length ? samplePoints(domainsOf(ctx, params), params, SAMPLES) : [new Map()];
  const n = g.vars.length;
  const angles = new Array<number>(n).fill(0);
  const exactAngles: (ExactAngle | null)[] = new Array(n).fill(null);
  const moves: { variable: string; angle: { text: string; latex: string }; radians: number; wick: boolean; steepest: boolean }[] = [];
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
      moves.push({ variable: m.variable.name, angle: angleFormula(angles[j]!), radians: angles[j]!, wick: false, steepest: true });
      continue;
    }
    const other = [...freeNames(m.to).keys()].filter((x) => x !== m.variable.name);
    if (other.length) throw new StatementFailure(`The rotation factor must be a number; it depends on ${other.join(', ')}.`, line, m.variable.span.start.column);
    const at = (x: number) => evaluate(m.to as Expr, new Map([[m.variable.name, new Complex(x, 0)]]));
    const u = at(1);
    if (at(2).sub(u.mul(2)).abs() > 1e-12 || at(0).abs() > 1e-12) throw new StatementFailure(`A rotation is written ${m.variable.name} -> FACTOR*${m.variable.name}, for example ${m.variable.name} -> exp(i*pi/4)*${m.variable.name}.`, line, m.variable.span.start.column);
    if (Math.abs(u.abs() - 1) > 1e-12) throw new StatementFailure(`The factor ${toText(m.to)} has modulus ${Number(u.abs().toPrecision(6))}, not 1: that is not a rotation.`, line, m.variable.span.start.column);
    // the angle as written, kept exact where it is q*pi + r (pi/4 + 0.0005 stays pi/4 + 1/2000)
    const exact = exactAngleOf(m.to, m.variable.name);
    exactAngles[j] = exact;
    angles[j] = exact ? exact.radians : Math.atan2(u.im, u.re);
    const isWick = Math.abs(u.re) < 1e-15 && Math.abs(u.im + 1) < 1e-15;
    wick ||= isWick;
    moves.push({ variable: m.variable.name, angle: exact ? formulaOf(exact.expr) : angleFormula(angles[j]!), radians: angles[j]!, wick: isWick, steepest: false });
  }
  const rotated = angles.map((a, k) => ({ a, v: g.vars[k]!, exact: exactAngles[k] ?? null })).filter((x) => x.a !== 0);
  const primary = rotated[0]?.a ?? 0;
  report.steps.push({ kind: 'rotation', moves });
  /** e^(i theta) of a rotated variable, exact where the angle is. */
  const unitOf = (x: (typeof rotated)[number]): Expr => (x.exact ? unitFromExact(x.exact) : unitExpr(x.a));
  const jacobian = (): Expr => rotated.reduce<Expr>((j, x) => mul(j, unitOf(x)), num(1));
  const totalAngle = () => (rotated.every((x) => x.exact)
    ? formulaOf(rotated.reduce<Expr | null>((t, x) => (t ? add(t, x.exact!.expr) : x.exact!.expr), null) ?? num(0))
    : angleFormula(angles.reduce((a, b) => a + b, 0)));
  /** The integral over real y of the Jacobian times the integrand at x = D y; on a copy of the context when only trying. */
  const rotatedIntegral = (commit: boolean): StatementReport => {
    const map = new Map<string, Expr>();
    for (const x of rotated) map.set(x.v, mul(unitOf(x), { t: 'name', name: x.v }));
    const integrand = mul(jacobian(), substitute(g.integrand, map));
    const into = commit ? ctx : { params: ctx.params, results: new Map(ctx.results) };
    return evaluateIntegral({ kind: 'integral', name: s.as, integrand, vars: g.vars.map((v) => ({ name: v, span: s.span })), span: s.span }, into);
  };
  const domains = domainsOf(ctx, params);
  const sampled = params.length ? sampledBasis(domains, params, points.length) : null;
  const diagram: DiagramData = {
    contours: [{ label: 'Real contour', role: 'real', points: unitLine(0) }],
    sectors: [], cuts: [PRINCIPAL_CUT], paths: [], tracks: [], eigenvalues: [],
  };
  const refuse = () => {
    report.legal = false;
    diagram.sectors = rotated.map((x) => ({ label: `Swept sector of ${x.v}`, from: 0, to: x.a, allowed: false }));
    report.diagram = diagram;
    ctx.results.set(s.as.name, { line, unavailable: `${s.as.name} (line ${line}), whose rotation is not allowed`, expr: null, params, valueAt: null });
    return report;
  };
  const base = { kind: 'legality' as const, count: 0, vars: rotated.map((x) => x.v), regions: [], defines: false };
  // One variable with an exact angle and a coupling of degree <= 1 in its parameter: decided exactly.
  // (without a parameter the argument of the coupling decides exactly in the sweep below, with the first bad angle)
  const oneVar = n === 1 && exactAngles[0] ? oneVariableCoupling(g, params, domains) : null;
  const range = n === 1 ? legalRange(g, params, domains, divergentTarget) : undefined;
  if (divergentTarget) {
    // nothing to sweep from: the rotated contour defines the integral where it converges
    const trial = rotatedIntegral(false);
    const legal = trial.convergence === 'absolute' || trial.convergence === 'oscillatory';
    report.steps.push({ ...base, legal, method: 'exact', basis: trial.proof === 'proved' ? { kind: 'proved' } : sampled ?? { kind: 'numeric' }, defines: true, ...(range ? { range } : {}) });
    if (!legal) return refuse();
  } else if (oneVar?.param && oneVariableConvergentEverywhere(ctx, s.target.name)) {
    const cond = endContourCondition(oneVar.a, exactAngles[0]!, oneVar.param, oneVar.lo, oneVar.hi);
    if (cond?.kind === 'everywhere') {
      report.steps.push({ ...base, legal: true, method: 'exact', basis: { kind: 'proved' }, ...(range ? { range } : {}) });
    } else if (cond?.threshold) {
      const t = cond.threshold;
      const good = { text: `${t.param} ${t.above ? '>=' : '<='} ${t.value.text} (${t.value.text} ≈ ${Number(t.approx.toPrecision(12))})`, latex: `${t.param} ${t.above ? '\\ge' : '\\le'} ${t.value.latex}` };
      const bad = { text: `${t.param} ${t.above ? '<' : '>'} ${t.value.text}`, latex: `${t.param} ${t.above ? '<' : '>'} ${t.value.latex}` };
      report.steps.push({ ...base, legal: false, method: 'exact', basis: { kind: 'proved' }, regions: [{ condition: good, holds: true }, { condition: bad, holds: false }], ...(range ? { range } : {}) });
      return refuse();
    } else {
      const verdict = sweepVerdict();
      if (!verdict) return refuse();
    }
  } else {
    const verdict = sweepVerdict();
    if (!verdict) return refuse();
  }
  report.legal = true;
  diagram.sectors = rotated.map((x) => ({ label: `Swept sector of ${x.v}`, from: 0, to: x.a, allowed: true }));

  /** The swept family checked on a grid (several variables) or exactly from the coupling's argument at sampled points. */
  function sweepVerdict(): boolean {
    const sw = sweep(g!, points, angles);
    const basis = sampled ?? { kind: sw.method === 'exact' ? 'proved' as const : 'numeric' as const };
    if (!sw.legal) {
      report.steps.push({
        ...base, legal: false, method: sw.method, count: sw.count, basis,
        firstBad: n === 1
          ? { angle: angleFormula(sw.firstBad!), perVariable: {} }
          : { t: sw.firstBad!, perVariable: Object.fromEntries(rotated.map((x) => [x.v, angleFormula(sw.firstBad! * x.a)])) },
        ...(sw.direction ? { direction: sw.direction } : {}),
        ...(sw.at && sw.at.size ? { at: pointRecord(sw.at) } : {}),
        ...(range ? { range } : {}),
      });
      return false;
    }
    report.steps.push({ ...base, legal: true, method: sw.method, count: sw.count, basis, ...(range ? { range } : {}) });
    return true;
  }
  // The rotated integral over real y: Jacobian times the integrand at x = D y.
  const jac = jacobian();
  report.steps.push({ kind: 'jacobian', factor: formulaOf(jac), totalAngle: totalAngle() });
  const inner = rotatedIntegral(true);
  const steps: Step[] = inner.steps.map((st) => (st.kind === 'quadratic-form' ? { ...st, rotated: true } : st));
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

/** e^(i theta) for theta = q*pi + r: 1, i, -1, -i exactly, else exp(i*(theta as written)). */
function unitFromExact(a: ExactAngle): Expr {
  if (a.r.n === 0n) {
    const quarter = a.q.d === 1n ? Number(a.q.n) * 2 : a.q.d === 2n ? Number(a.q.n) : null;
    if (quarter !== null) return [num(1), I, num(-1), neg(I)][((quarter % 4) + 4) % 4]!;
  }
  return call('exp', mul(I, a.expr));
}

/** The coupling of the one variable as an exact function of at most one real parameter, with that parameter's open range. */
function oneVariableCoupling(g: GaussianInfo, params: readonly string[], domains: ReadonlyMap<string, Domain>): { a: RatFunc; param: string | null; lo: number; hi: number } | null {
  const a = fromExpr(g.form.A[0]![0]!);
  if (!a) return null;
  const used = [...new Set([...polyVars(a.num), ...polyVars(a.den)])];
  if (used.length > 1 || used.some((v) => v === 'pi' || domains.get(v) === 'complex' || !params.includes(v))) return null;
  const param = used[0] ?? null;
  const d = param ? domains.get(param)! : 'real';
  return { a, param, lo: d === 'positive' ? 0 : -Infinity, hi: d === 'negative' ? 0 : Infinity };
}

/**
 * The allowed angles of a one-variable rotation when the coupling's argument is the same on
 * the whole domain (a real coupling of one sign): |theta| <= pi/4 for a positive one (the
 * sweep), pi/4 < |theta| < 3*pi/4 for a negative one (the rotated contour defines it).
 */
function legalRange(g: GaussianInfo, params: readonly string[], domains: ReadonlyMap<string, Domain>, divergent: boolean): { text: string; latex: string } | undefined {
  const c = oneVariableCoupling(g, params, domains);
  if (!c || !rfIsZeroNum(rfIm(c.a))) return undefined;
  let sign: number;
  if (!c.param) sign = Math.sign(Number([...c.a.num.terms.values()][0]?.c.re.n ?? 0n));
  else {
    const num0 = upolyFromPoly(c.a.num); const den0 = upolyFromPoly(c.a.den);
    if (!num0 || !den0) return undefined;
    const signs = cellsOf([num0, den0], domains.get(c.param)!).filter((x) => x.kind === 'interval').map((x) => signOn(num0, x) * signOn(den0, x));
    if (!signs.length || signs.some((x) => x !== signs[0])) return undefined;
    sign = signs[0]!;
  }
  if (sign > 0 && !divergent) return { text: 'theta in [-pi/4, pi/4] (the swept family meets growth beyond)', latex: '\\theta \\in [-\\pi/4, \\pi/4]' };
  if (sign < 0) return { text: 'theta in (pi/4, 3*pi/4) or (-3*pi/4, -pi/4), where the rotated contour converges', latex: '\\theta \\in (\\pi/4, 3\\pi/4) \\cup (-3\\pi/4, -\\pi/4)' };
  return undefined;
}
const rfIsZeroNum = (r: RatFunc) => r.num.terms.size === 0;
const polyVars = (p: RatFunc['num']) => [...new Set([...p.terms.values()].flatMap((t) => t.m.map(([v]) => v)))];
void div; void PI; void angleExpr;

/** The integral converges on the whole domain (so the sweep starts from a defined integral everywhere). */
function oneVariableConvergentEverywhere(ctx: Context, name: string): boolean {
  const c = ctx.results.get(name)?.gaussian?.convergence;
  return c === 'absolute' || c === 'oscillatory';
}
