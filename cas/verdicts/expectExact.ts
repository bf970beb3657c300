/**
 * `expect NAME = E` decided on the whole declared domain when the result F and E are
 * made of rational functions of at most one real parameter, their square roots and
 * exponentials (squareForm.ts): E and F differ unless E^2 = F^2 and their exponentials
 * agree exactly; when they do, E/F = ±1 and the sign is read once per cell between the
 * places where a radicand of either crosses the negative real axis, against the
 * result's continuous branch. Anything else returns null, and the caller samples.
 *
 * Example: F = (2*pi)^(3/2)/sqrt(30 + i*t)^3 and E = (2*pi)^(3/2)/sqrt((30 + i*t)^3)
 * agree for t < 30*sqrt(3) and differ in sign for t > 30*sqrt(3).
 */
import type { Domain, Formula, PointValues } from '../../shared/evaluation.js';
import type { Expr } from '../lang/ast.js';
import { Complex } from 'complex.js';
import { evaluate } from '../expr/evaluate.js';
import { rfEquals, rfSub, rfIsZero, type RatFunc } from '../exact/ratfunc.js';
import { variables } from '../exact/poly.js';
import { upolyFromPoly, type UPoly } from '../exact/univariate.js';
import { qToNumber } from '../exact/q.js';
import { cellsOf, type Cell } from './line.js';
import { conditionOf, isHomogeneous, rfIm, rfRe, setTo1 } from './exactGaussian.js';
import { squareForm, type SquareForm } from './squareForm.js';
import { positiveOnDomain } from './positiveOnDomain.js';
import type { Point } from '../domains/sample.js';
import type { C } from '../numeric/cmatrix.js';

export interface ExactExpect {
  holds: boolean;
  /** Where it holds and where not, when that changes inside the domain. */
  regions: { condition: Formula; holds: boolean }[];
  counterexample?: { at: PointValues; lhs: C; rhs: C | null };
  /** differs: E^2 != F^2 or the exponentials differ; sign: equal up to a sign that was read per cell; continuous-sign: read once per connected piece (several parameters). */
  how: 'differs' | 'sign' | 'continuous-sign';
}

const varsOf = (r: RatFunc) => [...variables(r.num), ...variables(r.den)];

export function decideExpectExactly(
  result: Expr, expected: Expr, params: readonly string[], domains: ReadonlyMap<string, Domain>,
  valueAt: (p: Point) => C | null, base: Point,
): ExactExpect | null {
  const f = squareForm(result); const e = squareForm(expected);
  if (!f || !e) return null;
  const all = [f.sq, f.S, e.sq, e.S, ...f.radicands, ...e.radicands];
  const names = [...new Set(all.flatMap(varsOf))].filter((v) => v !== 'pi');
  if (names.some((v) => !params.includes(v))) return null;
  if (names.some((v) => domains.get(v) === 'complex')) return null;
  // two parameters, one positive, every radicand homogeneous: E/F keeps its sign under s -> lambda*s, so set it to 1
  let scaledBy: string | null = null;
  if (names.length === 2) {
    const q = names.find((v) => domains.get(v) === 'positive');
    if (!q || ![...f.radicands, ...e.radicands].every((r) => isHomogeneous(r, names))) return decideBySignOnComponents(f, e, expected, names, domains, valueAt, base);
    scaledBy = q;
  } else if (names.length > 2) return decideBySignOnComponents(f, e, expected, names, domains, valueAt, base);
  const param = names.find((v) => v !== scaledBy) ?? null;
  const pointAt = (cell: Cell): Point => {
    const p = new Map(base);
    if (scaledBy) p.set(scaledBy, new Complex(1, 0));
    if (param && cell.kind === 'interval') p.set(param, new Complex(qToNumber(cell.sample), 0));
    return p;
  };
  const record = (p: Point): PointValues => Object.fromEntries([...p].map(([k, v]) => [k, { re: v.re, im: v.im }]));
  const domain = param ? domains.get(param)! : 'real';
  const exponentsDiffer = !rfEquals(f.S, e.S);
  if (exponentsDiffer && rfIsZero(rfSub(f.S, e.S)) === false && varsOf(rfSub(f.S, e.S)).length === 0) return null; // a constant factor e^c: leave it to sampling
  const differs = exponentsDiffer || !rfEquals(f.sq, e.sq);
  // the cells: radicands' crossings of the negative real axis, their zeros and poles
  const polys: UPoly[] = [];
  if (param) {
    for (const q0 of [...f.radicands, ...e.radicands]) {
      const q = scaledBy ? setTo1(q0, scaledBy) : q0;
      if (varsOf(q).includes('pi') && varsOf(q).length > 1) return null;
      const im = upolyFromPoly(rfIm(q).num); const den = upolyFromPoly(rfIm(q).den);
      if (!im || !den) return null;
      polys.push(im, den);
    }
  }
  const cells: Cell[] = param ? cellsOf(polys, domain) : [{ kind: 'interval', lo: null, hi: null, sample: { n: 0n, d: 1n } }];
  const verdicts: { cell: Cell; holds: boolean | null }[] = [];
  let counterexample: ExactExpect['counterexample'];
  for (const cell of cells) {
    if (cell.kind !== 'interval') { verdicts.push({ cell, holds: null }); continue; }
    const p = pointAt(cell);
    const v = valueAt(p);
    if (!v) { verdicts.push({ cell, holds: null }); continue; }
    let w: Complex;
    try { w = evaluate(expected, p); } catch { return null; }
    const finite = Number.isFinite(w.re) && Number.isFinite(w.im);
    let holds: boolean;
    if (differs) holds = false;
    else holds = finite && w.re * v.re + w.im * v.im > 0;
    // a counterexample where the expected side is a finite number reads best
    if (!holds && (!counterexample || (counterexample.rhs === null && finite))) counterexample = { at: record(p), lhs: v, rhs: finite ? { re: w.re, im: w.im } : null };
    verdicts.push({ cell, holds });
  }
  const decided = verdicts.filter((x) => x.holds !== null);
  if (!decided.length) return null;
  if (differs) return { holds: false, regions: [], how: 'differs', ...(counterexample ? { counterexample } : {}) };
  const holdsEverywhere = decided.every((x) => x.holds);
  const regions: ExactExpect['regions'] = [];
  if (param && !holdsEverywhere) {
    // merge runs; points between equal runs join them
    let run: { holds: boolean; cells: Cell[] } | null = null;
    const runs: { holds: boolean; cells: Cell[] }[] = [];
    verdicts.forEach((x, i) => {
      let h = x.holds;
      if (h === null && x.cell.kind === 'point') {
        const a = verdicts[i - 1]?.holds; const b = verdicts[i + 1]?.holds;
        if (a !== undefined && a !== null && a === b) h = a;
      }
      if (h === null) { run = null; return; }
      if (run && run.holds === h) run.cells.push(x.cell);
      else { run = { holds: h, cells: [x.cell] }; runs.push(run); }
    });
    for (const r of runs) regions.push({ condition: conditionOf(r.cells, param, scaledBy, domain), holds: r.holds });
  }
  return { holds: holdsEverywhere, regions, how: 'sign', ...(counterexample ? { counterexample } : {}) };
}

/**
 * Any number of real parameters: when both sides have the same square and exponent and
 * every radicand has a positive real part on the whole domain (positiveOnDomain.ts), each
 * principal root is continuous and nonzero there, so E/F is a continuous function whose
 * square is 1 on each connected piece of the domain (a box; a nonzero parameter splits it
 * in two): one point per piece decides its sign. Null when a radicand is not shown off
 * the cut, when the squares differ (left to sampling), or when the pieces disagree.
 */
function decideBySignOnComponents(
  f: SquareForm, e: SquareForm, expected: Expr, names: readonly string[], domains: ReadonlyMap<string, Domain>,
  valueAt: (p: Point) => C | null, base: Point,
): ExactExpect | null {
  if (!rfEquals(f.sq, e.sq) || !rfEquals(f.S, e.S)) return null;
  if (![...f.radicands, ...e.radicands].every((r) => positiveOnDomain(rfRe(r), domains))) return null;
  const split = names.filter((v) => domains.get(v) === 'nonzero');
  if (split.length > 3) return null;
  const inside: Record<string, number> = { positive: 1.3, negative: -1.3, real: 0.7, nonzero: 1.3 };
  let agree = 0;
  let counterexample: ExactExpect['counterexample'];
  for (let mask = 0; mask < 2 ** split.length; mask++) {
    const p = new Map(base);
    for (const v of names) p.set(v, new Complex(inside[domains.get(v)!]! * (split.indexOf(v) >= 0 && mask & (1 << split.indexOf(v)) ? -1 : 1), 0));
    const v = valueAt(p);
    if (!v) return null;
    let w: Complex;
    try { w = evaluate(expected, p); } catch { return null; }
    if (!Number.isFinite(w.re) || !Number.isFinite(w.im)) return null;
    if (w.re * v.re + w.im * v.im > 0) agree++;
    else counterexample ??= { at: Object.fromEntries([...p].map(([k, z]) => [k, { re: z.re, im: z.im }])), lhs: v, rhs: { re: w.re, im: w.im } };
  }
  if (agree === 2 ** split.length) return { holds: true, regions: [], how: 'continuous-sign' };
  if (agree === 0) return { holds: false, regions: [], how: 'continuous-sign', ...(counterexample ? { counterexample } : {}) };
  return null;
}
