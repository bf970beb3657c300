/**
 * The exact route of `integral`: A, J and c are rational in at most one real parameter
 * (after scaling), so convergence, the branch and the printed form are decided on the
 * whole declared domain, cell by cell (verdicts/exactGaussian.ts), and the result is
 * printed in a form that is right wherever the integral is defined: the principal
 * sqrt(det A) where that is right everywhere, else the product of the pivots' roots.
 */
import type { Convergence, ExactNumber, Formula, Step, StatementReport } from '../../shared/evaluation.js';
import type { Expr } from '../lang/ast.js';
import { add, call, div, mul, neg, num, PI, pow } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { formulaOf } from '../expr/print.js';
import { factoredPolyExpr, ratExpr, sqrtExpr } from '../expr/fromExact.js';
import { ratfunc, rfAdd, rfDiv, rfEquals, rfIsZero, rfMul, rfConst, type RatFunc } from '../exact/ratfunc.js';
import { detRat, leadingMinorsRat } from '../exact/matrix.js';
import { isConstant } from '../exact/poly.js';
import { analyzeAt, gaussianValueScaled, numericForm } from '../gaussian/numericModel.js';
import type { QuadraticForm } from '../gaussian/form.js';
import { polar } from '../gaussian/describe.js';
import { symEig } from '../numeric/symeig.js';
import { fresnelPhase } from '../gaussian/closedForm.js';
import { qToNumber } from '../exact/q.js';
import { boundariesOf, conditionOf, rfIm, rfRe, type CellVerdict, type ExactForm, type LineAnalysis } from '../verdicts/exactGaussian.js';
import { rootNumber, type Cell } from '../verdicts/line.js';
import { samplePoints, type Point } from '../domains/sample.js';
import { Complex } from 'complex.js';
import type { Context } from './context.js';
import { integralDiagram } from './shared.js';
import { pointText } from '../../shared/record/numbers.js';
import type { Domain } from '../../shared/evaluation.js';

export interface ExactInput {
  name: string;
  line: number;
  vars: string[];
  params: string[];
  domains: ReadonlyMap<string, Domain>;
  structural: QuadraticForm;
  prefactor: Expr;
  integrand: Expr;
  form: ExactForm;
  analysis: LineAnalysis;
}

const CONV_OF: Record<CellVerdict['convergence'], 'absolute' | 'oscillatory' | 'divergent' | 'unknown'> = {
  absolute: 'absolute', oscillatory: 'oscillatory', 'source-grows': 'oscillatory', divergent: 'divergent', unknown: 'unknown',
};
const convergentCell = (c: CellVerdict) => c.convergence === 'absolute' || c.convergence === 'oscillatory' || c.convergence === 'source-grows';

/** Runs of cells with the same key; a point between two runs of one key joins them. */
function regions<K>(cells: readonly CellVerdict[], key: (c: CellVerdict) => K | null): { key: K; cells: Cell[] }[] {
  const out: { key: K; cells: Cell[] }[] = [];
  for (let i = 0; i < cells.length; i++) {
    const c = cells[i]!;
    let k = key(c);
    if (k === null && c.cell.kind === 'point') {
      const before = i > 0 ? key(cells[i - 1]!) : null; const after = i + 1 < cells.length ? key(cells[i + 1]!) : null;
      if (before !== null && before === after) k = before;
    }
    if (k === null) continue;
    const last = out[out.length - 1];
    const lastCell = last?.cells[last.cells.length - 1];
    const touching = lastCell && i > 0 && cells[i - 1]!.cell === lastCell;
    if (last && last.key === k && touching) last.cells.push(c.cell);
    else out.push({ key: k, cells: [c.cell] });
  }
  return out;
}

function twoPiPower(n: number): Expr {
  if (n % 2 === 0) return n === 2 ? mul(num(2), PI) : pow(mul(num(2), PI), num(n / 2));
  return n === 1 ? call('sqrt', mul(num(2), PI)) : pow(mul(num(2), PI), div(num(n), num(2)));
}

/** The pivots d_k = M_k / M_{k-1}, with equal ones grouped: the continuous sqrt(det A) is prod sqrt(d_k). */
function pivotGroups(minors: RatFunc[]): { pivot: RatFunc; count: number }[] {
  const groups: { pivot: RatFunc; count: number }[] = [];
  let prev: RatFunc = rfConst(1);
  for (const m of minors) {
    const d = rfDiv(m, prev);
    prev = m;
    const g = groups.find((x) => rfEquals(x.pivot, d));
    if (g) g.count++; else groups.push({ pivot: d, count: 1 });
  }
  return groups;
}

/** 1/2 J^T A^-1 J + c, by Cramer's rule in exact arithmetic. */
function exponentOf(form: ExactForm, det: RatFunc): RatFunc {
  if (form.J.every(rfIsZero)) return form.c;
  let q: RatFunc = rfConst(0);
  const n = form.vars.length;
  for (let i = 0; i < n; i++) {
    if (rfIsZero(form.J[i]!)) continue;
    const Ai = form.A.map((row, r) => row.map((x, c) => (c === i ? form.J[r]! : x)));
    q = rfAdd(q, rfMul(form.J[i]!, detRat(Ai)));
  }
  return rfAdd(rfDiv(q, rfMul(det, rfConst(2))), form.c);
}

const isPositiveConstant = (r: RatFunc) => isConstant(r.num) && isConstant(r.den) && (() => {
  const c = [...r.num.terms.values()][0]?.c;
  return !!c && c.im.n === 0n && c.re.n > 0n;
})();

/** The sample point of a cell; parameters that do not move the verdicts take their domain's simplest value. */
function pointOf(param: string | null, scaledBy: string | null, cell: Cell, base: Point = new Map()): Point {
  const p: Point = new Map(base);
  if (scaledBy) p.set(scaledBy, new Complex(1, 0));
  if (param && cell.kind === 'interval') p.set(param, new Complex(qToNumber(cell.sample), 0));
  return p;
}

export function evaluateIntegralExactly(input: ExactInput, ctx: Context, report: StatementReport): StatementReport {
  const { name, line, vars, params, domains, structural, prefactor, form, analysis } = input;
  const n = vars.length;
  const { param, scaledBy, cells } = analysis;
  const base = samplePoints(domains, params, 1)[0] ?? new Map();
  const pointOfCell = (cell: Cell) => pointOf(param, scaledBy, cell, base);
  const domain = param ? domains.get(param)! : 'real';
  const cond = (cs: Cell[]): Formula => (param ? conditionOf(cs, param, scaledBy, domain) : { text: 'everywhere', latex: '\\text{everywhere}' });

  report.steps.push({
    kind: 'quadratic-form', vars, source: 'exact', rotated: false,
    A: form.A.map((row) => row.map((x) => formulaOf(ratExpr(x)))), J: form.J.map((x) => formulaOf(ratExpr(x))), c: formulaOf(ratExpr(form.c)),
  });

  // Convergence on the whole domain.
  const convRegions = regions(cells, (c) => (c.convergence === 'unknown' && c.cell.kind === 'point' ? null : c.convergence));
  const kinds = [...new Set(convRegions.map((r) => r.key))];
  const single = kinds.length === 1 ? kinds[0]! : null;
  const verdict: Step & { kind: 'convergence' } = {
    kind: 'convergence',
    verdict: single ? CONV_OF[single] : 'piecewise',
    reason: single === 'absolute' ? 'sylvester' : single === 'oscillatory' ? 'i-epsilon' : single === 'source-grows' ? 'source-grows' : single === 'divergent' ? 'grows' : 'changes',
    basis: { kind: 'proved' },
    // the minors of the declared form (the analysis may have scaled a parameter to 1)
    minors: (analysis.scaledBy ? leadingMinorsRat(form.A.map((row) => row.map(rfRe))) : analysis.minorsRe).map((m) => formulaOf(ratExpr(m, true))),
    realEigenvalues: [],
    regions: single ? [] : convRegions.map((r) => ({ condition: cond(r.cells), holds: r.key === 'absolute' || r.key === 'oscillatory', verdict: CONV_OF[r.key] })),
    boundaries: single || !param ? [] : regionBoundaries(convRegions, param),
    counts: {},
  };
  const convergent = cells.filter(convergentCell);
  // a direction of growth, from the numbers at a divergent cell
  const divergentCell = cells.find((c) => c.convergence === 'divergent' && c.cell.kind === 'interval');
  if (divergentCell) {
    const a = analyzeAt(numericForm(structural, prefactor, pointOfCell(divergentCell.cell)));
    if (a.verdict.kind === 'divergent') {
      verdict.direction = a.verdict.direction;
      if (param) verdict.at = Object.fromEntries([...pointOfCell(divergentCell.cell)].map(([k, v]) => [k, { re: v.re, im: v.im }]));
    }
  }
  report.steps.push(verdict);
  report.diagram = integralDiagram([], undefined);
  const convergence: Convergence = single === 'source-grows' ? 'divergent' : single ? CONV_OF[single] : convergent.length ? 'piecewise' : 'divergent';
  report.convergence = convergence;
  report.proof = 'proved';

  if (convergent.length === 0) {
    report.steps.push({ kind: 'result', name, formula: null, written: 'none', verified: true, basis: { kind: 'proved' }, value: null, pieces: [] });
    ctx.results.set(name, {
      line, unavailable: `${name} (line ${line}) diverges on the real contour and has no value; rotate its contour to define it`, expr: null, params, valueAt: null,
      gaussian: { integrand: input.integrand, vars, form: structural, prefactor, convergence: 'divergent', contour: null },
    });
    return report;
  }

  // Branch where it converges.
  const branchRegions = regions(convergent.length === cells.length ? cells : cells.filter(convergentCell), (c) => c.principalRight);
  const rights = [...new Set(branchRegions.map((r) => r.key))];
  const principal: 'right' | 'wrong' | 'piecewise' = rights.length === 1 ? (rights[0] ? 'right' : 'wrong') : 'piecewise';
  const sample = convergent.find((c) => c.cell.kind === 'interval') ?? convergent[0]!;
  const at = analyzeAt(numericForm(structural, prefactor, pointOfCell(sample.cell)));
  const crossings: ExactNumber[] = principal === 'piecewise' && param ? regionBoundaries(branchRegions, param) : [];
  report.branch = { principalSqrtDetCorrect: principal === 'right', principal };
  const samplePoint = pointOfCell(sample.cell);
  report.diagram = integralDiagram(at.branch?.eigenvalues ?? [], params.length ? pointText(Object.fromEntries([...samplePoint].map(([k, v]) => [k, { re: v.re, im: v.im }]))) : undefined);
  report.steps.push({
    kind: 'branch', principal, rule: param ? 'crossings' : n === 1 ? 'one-variable' : 'eigenvalues',
    basis: { kind: 'proved' },
    eigenvalues: at.branch?.eigenvalues.map(polar) ?? [],
    pivots: at.branch?.pivots?.map(polar) ?? [],
    ...(at.branch ? { argumentSum: at.branch.argumentSum } : {}),
    pivotsAgree: null,
    crossings,
    regions: param ? branchRegions.map((r) => ({ condition: cond(r.cells), holds: !!r.key })) : [],
    ...(param ? { at: Object.fromEntries([...pointOfCell(sample.cell)].map(([k, v]) => [k, { re: v.re, im: v.im }])) } : {}),
  });

  // Fresnel: A = -iB with B real symmetric; the phase exp(i pi sig B / 4) where the signature is one on the whole domain.
  let fresnel: { positive: number; negative: number } | null = null;
  if (form.A.every((row) => row.every((x) => rfIsZero(rfRe(x))))) {
    const sigs = convergent.filter((c) => c.cell.kind === 'interval').map((c) => {
      const A = numericForm(structural, prefactor, pointOfCell(c.cell)).A;
      const B = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => -A.im[i * n + j]!));
      const ev = symEig(B).values;
      return { positive: ev.filter((v) => v > 0).length, negative: ev.filter((v) => v < 0).length, ev };
    });
    const s0 = sigs[0];
    if (s0 && sigs.every((x) => x.positive === s0.positive && x.negative === s0.negative)) {
      fresnel = { positive: s0.positive, negative: s0.negative };
      report.steps.push({ kind: 'fresnel-phase', signature: fresnel, realEigenvalues: s0.ev, basis: { kind: 'proved' } });
    }
  }

  // The printed form.
  const det = analysis.det;
  const exponent = exponentOf({ ...form }, detRat(form.A));
  const tail = (e: Expr) => (rfIsZero(exponent) ? e : mul(e, call('exp', ratExpr(exponent))));
  const head = mul(prefactor, twoPiPower(n));
  const fullDet = detRat(form.A);
  const positive = new Set(params.filter((p) => domains.get(p) === 'positive'));
  const sqrtIsSimple = (r: RatFunc) => sqrtExpr(r, positive).t !== 'call';
  let written: 'principal' | 'negated' | 'pivots' | 'fresnel';
  let expr: Expr;
  if (fresnel) {
    // |det B| = (-1)^negative det B and det B = i^n det A
    written = 'fresnel';
    const unit = [rfConst(1), rfConst({ re: { n: 0n, d: 1n }, im: { n: 1n, d: 1n } }), rfConst(-1), rfConst({ re: { n: 0n, d: 1n }, im: { n: -1n, d: 1n } })][(n + 2 * fresnel.negative) % 4]!;
    const absDetB = rfMul(unit, fullDet);
    const phase = fresnelPhase(fresnel.positive - fresnel.negative);
    const body = n === 1 && !sqrtIsSimple(absDetB) ? mul(prefactor, call('sqrt', div(mul(num(2), PI), ratExpr(absDetB, true)))) : div(head, sqrtExpr(absDetB, positive));
    expr = tail(mul(body, phase));
  } else if (principal !== 'piecewise') {
    written = principal === 'right' ? 'principal' : 'negated';
    const d = factoredPolyExpr(fullDet.num);
    const detExpr = isConstant(fullDet.den) ? d : div(d, factoredPolyExpr(fullDet.den));
    // one variable, a positive coupling: sqrt(2*pi/k) reads as physicists write it
    const body = n === 1 && isPositiveOnDomain(fullDet, param, domains, cells) && !sqrtIsSimple(fullDet)
      ? mul(prefactor, call('sqrt', div(mul(num(2), PI), detExpr)))
      : div(head, sqrtIsSimple(fullDet) ? sqrtExpr(fullDet, positive) : call('sqrt', detExpr));
    expr = tail(written === 'negated' ? neg(body) : body);
  } else {
    written = 'pivots';
    // sqrt(d)^2 = d on every sheet: a pivot's pairs multiply out exactly (cancelling across
    // pivots), so a diagonal or block-diagonal A prints its factors; only a pivot of odd
    // multiplicity keeps one principal root
    const groups = pivotGroups(leadingMinorsRat(form.A));
    let whole: RatFunc = rfConst(1);
    let roots: Expr | null = null;
    for (const g of groups) {
      for (let j = 0; j < Math.floor(g.count / 2); j++) whole = rfMul(whole, g.pivot);
      if (g.count % 2 === 1) { const r = call('sqrt', ratExpr(g.pivot, true)); roots = roots ? mul(roots, r) : r; }
    }
    const top = isConstant(whole.den) ? head : mul(head, factoredPolyExpr(whole.den));
    const bottom = isConstant(whole.den) ? ratExpr(whole, true) : factoredPolyExpr(whole.num);
    const one = isConstant(whole.num) && isConstant(whole.den) && rfEquals(whole, rfConst(1));
    const denom = one ? roots : roots ? mul(bottom, roots) : bottom;
    expr = tail(denom ? div(top, denom) : top);
  }
  void det; void add; void ratfunc; void rfRe; void rfIm; void rootNumber;
  // the printed formula, evaluated as a reader would (principal roots as printed), against the continuous branch
  let verified = true;
  for (const c of convergent) {
    if (c.cell.kind !== 'interval') continue;
    const p = pointOfCell(c.cell);
    const v = analyzeAt(numericForm(structural, prefactor, p)).value;
    let w;
    try { w = evaluate(expr, p); } catch { verified = false; break; }
    // a value beyond double range cannot be compared in double precision; the exact construction stands for it
    if (v && !(Number.isFinite(v.re) && Number.isFinite(v.im) && Math.hypot(v.re, v.im) > 0)) continue;
    if (!v || !(Math.hypot(w.re - v.re, w.im - v.im) <= 1e-8 * Math.max(Math.hypot(v.re, v.im), 1e-300))) { verified = false; break; }
  }
  const shown = formulaOf(expr);
  let value = params.length ? null : analyzeAt(numericForm(structural, prefactor, new Map())).value;
  let scaled: { mantissa: { re: number; im: number }; exponent10: number } | undefined;
  if (value && !(Number.isFinite(value.re) && Number.isFinite(value.im) && Math.hypot(value.re, value.im) > 0)) {
    // outside double range: through the logarithm, printed as mantissa times a power of ten
    const nf = numericForm(structural, prefactor, new Map());
    const b = analyzeAt({ ...nf, J: nf.J.map(() => ({ re: 0, im: 0 })), c: { re: 0, im: 0 } }).branch;
    const s = b ? gaussianValueScaled(nf, b.sqrtDet) : null;
    if (!s) throw new NonFiniteValue(name);
    scaled = s;
    value = null;
  }
  const pieces = convergence === 'piecewise' ? [{ condition: cond(convRegions.filter((r) => r.key !== 'divergent' && r.key !== 'unknown').flatMap((r) => r.cells)), formula: shown }] : [];
  report.result = { ...shown, value: value ? { re: value.re, im: value.im } : null, ...(scaled ? { scaled } : {}) };
  report.steps.push({
    kind: 'result', name, formula: shown, written, verified, basis: { kind: 'proved' },
    value: value ? { re: value.re, im: value.im } : null, ...(scaled ? { scaled } : {}), pieces,
  });
  ctx.results.set(name, {
    line, unavailable: null, expr, params,
    valueAt: (p) => analyzeAt(numericForm(structural, prefactor, p)).value,
    gaussian: { integrand: input.integrand, vars, form: structural, prefactor, convergence, contour: null },
  });
  return report;
}

/** Points where the key changes between consecutive regions. */
function regionBoundaries<K>(rs: { key: K; cells: Cell[] }[], param: string): ExactNumber[] {
  const out: ExactNumber[] = [];
  for (let k = 0; k + 1 < rs.length; k++) {
    const a = rs[k]!.cells[rs[k]!.cells.length - 1]!; const b = rs[k + 1]!.cells[0]!;
    const root = a.kind === 'point' ? a.root : b.kind === 'point' ? b.root : a.kind === 'interval' ? a.hi : null;
    if (root) out.push(rootNumber(root, param));
  }
  return out;
}

/** det A (one variable: the coupling) real and positive on every convergent cell. */
function isPositiveOnDomain(det: RatFunc, param: string | null, domains: ReadonlyMap<string, Domain>, cells: readonly CellVerdict[]): boolean {
  if (isPositiveConstant(det)) return true;
  if (!param) return false;
  void domains;
  const im = rfIm(det);
  if (!rfIsZero(im)) return false;
  return cells.filter(convergentCell).every((c) => c.cell.kind !== 'interval' || c.convergence === 'absolute');
}

/** A value outside double range: the statement reports it instead of printing NaN. */
export class NonFiniteValue extends Error {
  constructor(readonly result: string) { super(`The value of ${result} is outside the range of double precision.`); }
}
