/**
 * Exact verdicts for a Gaussian integral whose A, J, c are rational functions of at
 * most one real parameter (after scaling out a positive parameter when A is homogeneous
 * in the parameters): convergence, the branch of sqrt(det A) and the printed form,
 * decided cell by cell on the declared domain (see line.ts), so each holds on the whole
 * domain or is given piecewise with exact boundaries.
 *
 * Convergence, by Sylvester's criterion on Re A: all leading minors > 0 is absolute; one
 * < 0 is divergent; otherwise Re A is checked positive semidefinite through all its
 * principal minors, and a semidefinite Re A with det A != 0 is the i*epsilon integral
 * (oscillatory), whose real-line version grows when Re J has a part along ker Re A.
 * Branch: where Re A > 0 the product of the pivots' principal roots is the continuous
 * branch (Schur complements keep a positive definite real part: Higham, Accuracy and
 * Stability of Numerical Algorithms, 2nd ed., 10.4, from memory); the principal
 * sqrt(det A) can part from it only where det A crosses the negative real axis, so it is
 * compared once per cell.
 *
 * Example: A = (30 + i*t) I_3, t positive: absolute everywhere; principal right for
 * t < 30*sqrt(3), wrong beyond; printed (2*pi)^(3/2)/sqrt(30 + i*t)^3.
 */
import type { Domain, ExactNumber, Formula } from '../../shared/evaluation.js';
import type { Expr } from '../lang/ast.js';
import { RF0 } from '../exact/ratfunc.js';
import { type GQ, gToNumber, qint, type Q } from '../exact/q.js';
import { type Poly, polyMul, polyConj, realPart as polyRe, imagPart as polyIm, isZero, substitute, polyConst, variables } from '../exact/poly.js';
import { ratfunc, rfEvalExact, rfIsZero, type RatFunc } from '../exact/ratfunc.js';
import { detRat, leadingMinorsRat } from '../exact/matrix.js';
import { upolyFromPoly, type RealRoot, type UPoly } from '../exact/univariate.js';
import { cellsOf, rootNumber, signOn, type Cell } from './line.js';
import { checkDeadline } from '../deadline.js';
import { formulaOf } from '../expr/print.js';
import { mul, name as nameExpr, num } from '../expr/build.js';
import { parseExpression } from '../lang/parse.js';

export interface ExactForm { vars: string[]; A: RatFunc[][]; J: RatFunc[]; c: RatFunc }

export type CellConvergence = 'absolute' | 'oscillatory' | 'source-grows' | 'divergent' | 'unknown';

export interface CellVerdict {
  cell: Cell;
  convergence: CellConvergence;
  /** Whether the principal sqrt(det A) is the continuous branch in this cell (null where divergent or on a cut point). */
  principalRight: boolean | null;
}

export interface LineAnalysis {
  param: string | null;
  /** A positive parameter scaled to 1 (A homogeneous), whose multiples the boundaries are. */
  scaledBy: string | null;
  cells: CellVerdict[];
  /** Leading minors of Re A and of A (for the record and the printed form). */
  minorsRe: RatFunc[];
  minorsA: RatFunc[];
  det: RatFunc;
}

/** Re(N/D) = Re(N conj D) / (D conj D) when every variable is real. */
export function rfRe(r: RatFunc): RatFunc {
  const dc = polyConj(r.den);
  return ratfunc(polyRe(polyMul(r.num, dc)), polyRe(polyMul(r.den, dc)));
}
export function rfIm(r: RatFunc): RatFunc {
  const dc = polyConj(r.den);
  return ratfunc(polyIm(polyMul(r.num, dc)), polyRe(polyMul(r.den, dc)));
}

/** The one-variable polynomials whose signs give the sign of a real rational function. */
function signPolys(r: RatFunc): UPoly[] | null {
  const a = upolyFromPoly(r.num); const b = upolyFromPoly(r.den);
  return a && b ? [a, b] : null;
}
function signOfRat(r: RatFunc, cell: Cell): -1 | 0 | 1 {
  const p = signPolys(r);
  if (!p) throw new Error('not a one-variable real rational function');
  return (signOn(p[0]!, cell) * signOn(p[1]!, cell)) as -1 | 0 | 1;
}

const subsets = (n: number) => Array.from({ length: (1 << n) - 1 }, (_, m) => Array.from({ length: n }, (_, k) => k).filter((k) => ((m + 1) >> k) & 1));

/** The exact value at a cell's sample point (intervals only). */
function at(r: RatFunc, param: string | null, cell: Cell): GQ {
  const point = new Map<string, GQ>();
  if (param && cell.kind === 'interval') point.set(param, { re: cell.sample, im: qint(0) });
  return rfEvalExact(r, point);
}

const csqrt = (z: { re: number; im: number }) => { const m = Math.hypot(z.re, z.im); const re = Math.sqrt((m + z.re) / 2); const im = Math.sqrt(Math.max(0, (m - z.re) / 2)); return { re, im: z.im < 0 ? -im : im }; };
const cmul = (a: { re: number; im: number }, b: { re: number; im: number }) => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });

/** Exact rational null space of a real rational matrix, and whether v is orthogonal to it. */
function orthogonalToKernel(m: Q[][], v: Q[]): boolean {
  // Gaussian elimination over Q on m; kernel vectors from the free columns
  const n = m.length;
  const rows = m.map((r) => r.map((x) => ({ ...x })));
  const pivotCols: number[] = [];
  let r = 0;
  const { qsub, qmul, qdiv, qIsZero } = Qops;
  for (let c = 0; c < n && r < n; c++) {
    const p = rows.findIndex((row, i) => i >= r && !qIsZero(row[c]!));
    if (p < 0) continue;
    [rows[r], rows[p]] = [rows[p]!, rows[r]!];
    for (let i = 0; i < n; i++) {
      if (i === r || qIsZero(rows[i]![c]!)) continue;
      const f = qdiv(rows[i]![c]!, rows[r]![c]!);
      rows[i] = rows[i]!.map((x, k) => qsub(x, qmul(f, rows[r]![k]!)));
    }
    pivotCols.push(c); r++;
  }
  const free = Array.from({ length: n }, (_, k) => k).filter((k) => !pivotCols.includes(k));
  for (const f of free) {
    // kernel vector: x_f = 1, pivots solved
    const x: Q[] = Array.from({ length: n }, () => qint(0));
    x[f] = qint(1);
    pivotCols.forEach((c, i) => { x[c] = Qops.qneg(qdiv(rows[i]![f]!, rows[i]![c]!)); });
    let dot = qint(0);
    for (let k = 0; k < n; k++) dot = Qops.qadd(dot, qmul(x[k]!, v[k]!));
    if (!qIsZero(dot)) return false;
  }
  return true;
}
import * as Qops from '../exact/q.js';

/** Convergence and branch in one cell. */
function cellVerdict(form: ExactForm, reA: RatFunc[][], minorsRe: RatFunc[], minorsA: RatFunc[], det: RatFunc, param: string | null, cell: Cell): CellVerdict {
  const n = form.vars.length;
  const signs = minorsRe.map((m) => signOfRat(m, cell));
  let convergence: CellConvergence;
  if (signs.every((s) => s > 0)) convergence = 'absolute';
  else if (signs.some((s) => s < 0)) convergence = 'divergent';
  else {
    // semidefinite or indefinite: every principal minor of Re A must be >= 0
    const psd = subsets(n).every((idx) => signOfRat(detRat(idx.map((i) => idx.map((j) => reA[i]![j]!))), cell) >= 0);
    if (!psd) convergence = 'divergent';
    else {
      const dsign = [rfRe(det), rfIm(det)].map((x) => signOfRat(x, cell));
      if (dsign.every((s) => s === 0)) convergence = 'divergent';
      else if (cell.kind === 'point') convergence = 'unknown';
      else {
        const m = reA.map((row) => row.map((x) => at(x, param, cell).re));
        const reJ = form.J.map((x) => at(rfRe(x), param, cell).re);
        convergence = orthogonalToKernel(m, reJ) ? 'oscillatory' : 'source-grows';
      }
    }
  }
  let principalRight: boolean | null = null;
  const convergent = convergence === 'absolute' || convergence === 'oscillatory' || convergence === 'source-grows';
  if (convergent && cell.kind === 'interval' && minorsA.every((m) => !rfIsZero(m))) {
    // the continuous root: product of the pivots' principal roots, in double precision from exact values
    let prev = { re: 1, im: 0 };
    let root = { re: 1, im: 0 };
    let ok = true;
    for (const mk of minorsA) {
      const v = gToNumber(at(mk, param, cell));
      const d2 = prev.re * prev.re + prev.im * prev.im;
      if (d2 === 0) { ok = false; break; }
      const pivot = { re: (v.re * prev.re + v.im * prev.im) / d2, im: (v.im * prev.re - v.re * prev.im) / d2 };
      root = cmul(root, csqrt(pivot));
      prev = v;
    }
    if (ok) {
      const p = csqrt(gToNumber(at(det, param, cell)));
      principalRight = p.re * root.re + p.im * root.im > 0;
    }
  }
  return { cell, convergence, principalRight };
}

/** All entries of A homogeneous of one common degree in the parameters (pi aside). */
function homogeneousDegree(A: RatFunc[][], params: readonly string[]): number | null {
  let deg: number | null = null;
  const degOf = (p: Poly): number | null => {
    let d: number | null = null;
    for (const t of p.terms.values()) {
      const e = t.m.filter(([v]) => params.includes(v)).reduce((s, [, k]) => s + k, 0);
      if (d === null) d = e; else if (d !== e) return null;
    }
    return d ?? 0;
  };
  for (const row of A) for (const x of row) {
    if (rfIsZero(x)) continue;
    const a = degOf(x.num); const b = degOf(x.den);
    if (a === null || b === null) return null;
    if (deg === null) deg = a - b; else if (deg !== a - b) return null;
  }
  return deg;
}

/** Whether r is homogeneous in the parameters (each of its numerator and denominator). */
export function isHomogeneous(r: RatFunc, params: readonly string[]): boolean {
  return homogeneousDegree([[r]], params) !== null;
}

export const setTo1 = (r: RatFunc, v: string): RatFunc => ratfunc(substitute(r.num, v, polyConst(1)), substitute(r.den, v, polyConst(1)));

/**
 * The analysis on the line of the one parameter left, or null when more than one real
 * parameter remains after scaling, a parameter is complex, or an entry is not rational.
 */
export function analyzeOnLine(form: ExactForm, domains: ReadonlyMap<string, Domain>): LineAnalysis | null {
  let params = [...new Set(form.A.flat().flatMap((x) => [...variables(x.num), ...variables(x.den)]))].filter((v) => v !== 'pi');
  if (form.A.flat().some((x) => variables(x.num).includes('pi') || variables(x.den).includes('pi'))) return null;
  if (params.some((p) => domains.get(p) === 'complex' || !domains.has(p))) return null;
  let A = form.A;
  let J = form.J;
  let scaledBy: string | null = null;
  if (params.length > 1) {
    // A(s p) = s^d A(p) for s > 0 leaves every verdict as it is: set a positive parameter to 1
    const q = params.find((p) => domains.get(p) === 'positive');
    if (!q || homogeneousDegree(A, params) === null) return null;
    A = A.map((row) => row.map((x) => setTo1(x, q)));
    J = J.map((x) => setTo1(x, q));
    scaledBy = q;
    params = params.filter((p) => p !== q);
    if (params.length > 1) return null;
  }
  // J may hold parameters A does not: the source check then needs them too
  const jParams = [...new Set(J.flatMap((x) => [...variables(x.num), ...variables(x.den)]))].filter((v) => v !== scaledBy);
  let sourceFree = false;
  if (jParams.some((p) => !params.includes(p))) {
    if (params.length === 0 && jParams.length === 1 && domains.get(jParams[0]!) !== 'complex') params = [jParams[0]!];
    // the source enters a verdict only where Re A is singular; decide A first and refuse if it is needed
    else if (jParams.every((p) => domains.has(p) && domains.get(p) !== 'complex')) sourceFree = true;
    else return null;
  }
  const param = params[0] ?? null;
  checkDeadline();
  const reA = A.map((row) => row.map(rfRe));
  const minorsRe = leadingMinorsRat(reA);
  const minorsA = leadingMinorsRat(A);
  const det = minorsA[minorsA.length - 1]!;
  const polys: UPoly[] = [];
  for (const r of [...minorsRe, rfRe(det), rfIm(det), ...minorsA.map(rfRe), ...minorsA.map(rfIm)]) {
    const p = signPolys(r);
    if (!p) return null;
    polys.push(...p);
  }
  const domain = param ? domains.get(param)! : 'real';
  const cells: Cell[] = param ? cellsOf(polys, domain) : [{ kind: 'interval', lo: null, hi: null, sample: qint(0) }];
  const exactForm = { ...form, A, J: sourceFree ? J.map(() => RF0) : J };
  const verdicts = cells.map((cell) => { checkDeadline(); return cellVerdict(exactForm, reA, minorsRe, minorsA, det, param, cell); });
  if (sourceFree && verdicts.some((v) => v.convergence !== 'absolute' && v.convergence !== 'divergent')) return null;
  return { param, scaledBy, cells: verdicts, minorsRe, minorsA, det };
}

/** A region of cells as a condition: "t < 30*sqrt(3)", "-10 < g < 10", "g = 10", with the scaled parameter put back. */
export function conditionOf(cells: readonly Cell[], param: string, scaledBy: string | null, domain: Domain): Formula {
  const parts: Formula[] = [];
  const bound = (r: RealRoot): Formula => {
    const named = rootNumber(r, param);
    let e: Expr;
    try { e = parseExpression(named.text); } catch { return { text: named.text, latex: named.latex }; }
    return formulaOf(scaledBy ? mul(e, nameExpr(scaledBy)) : e);
  };
  const P = formulaOf(nameExpr(param));
  const isZeroRoot = (r: RealRoot) => rootNumber(r, param).text === '0';
  let k = 0;
  while (k < cells.length) {
    let j = k;
    while (j + 1 < cells.length && adjacent(cells[j]!, cells[j + 1]!)) j++;
    const first = cells[k]!; const last = cells[j]!;
    if (first.kind === 'point' && k === j) {
      const b = bound(first.root);
      parts.push({ text: `${P.text} = ${b.text}`, latex: `${P.latex} = ${b.latex}` });
    } else {
      const lo = first.kind === 'point' ? { r: first.root, strict: false } : first.lo ? { r: first.lo, strict: true } : null;
      const hi = last.kind === 'point' ? { r: last.root, strict: false } : last.hi ? { r: last.hi, strict: true } : null;
      // the domain's own end (0 for a positive parameter) goes without saying
      const showLo = lo && !(domain === 'positive' && lo.strict && isZeroRoot(lo.r));
      const showHi = hi && !(domain === 'negative' && hi.strict && isZeroRoot(hi.r));
      const L = showLo ? bound(lo!.r) : null; const H = showHi ? bound(hi!.r) : null;
      const lt = (strict: boolean, latex: boolean) => (strict ? '<' : latex ? '\\le' : '<=');
      if (!L && !H) parts.push({ text: `every ${P.text}`, latex: `\\text{every } ${P.latex}` });
      else if (L && H) parts.push({ text: `${L.text} ${lt(lo!.strict, false)} ${P.text} ${lt(hi!.strict, false)} ${H.text}`, latex: `${L.latex} ${lt(lo!.strict, true)} ${P.latex} ${lt(hi!.strict, true)} ${H.latex}` });
      else if (L) parts.push({ text: `${P.text} ${lo!.strict ? '>' : '>='} ${L.text}`, latex: `${P.latex} ${lo!.strict ? '>' : '\\ge'} ${L.latex}` });
      else parts.push({ text: `${P.text} ${lt(hi!.strict, false)} ${H!.text}`, latex: `${P.latex} ${lt(hi!.strict, true)} ${H!.latex}` });
    }
    k = j + 1;
  }
  return { text: parts.map((x) => x.text).join(' or '), latex: parts.map((x) => x.latex).join(' \\text{ or } ') };
}

function adjacent(a: Cell, b: Cell): boolean {
  if (a.kind === 'interval' && b.kind === 'point') return !!a.hi && a.hi === b.root;
  if (a.kind === 'point' && b.kind === 'interval') return !!b.lo && b.lo === a.root;
  return false;
}

/** Boundaries between cells of different verdicts, as exact numbers (in units of the scaled parameter). */
export function boundariesOf(cells: readonly Cell[], param: string): ExactNumber[] {
  return cells.filter((c): c is Extract<Cell, { kind: 'point' }> => c.kind === 'point').map((c) => rootNumber(c.root, param));
}

export { formulaOf, mul, nameExpr, num, parseExpression, isZero };
export type { Expr };
