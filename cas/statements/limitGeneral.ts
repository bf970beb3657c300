/**
 * The limit of a derived quantity (a `let` built from Gaussian results, parameters and
 * exp, log, roots, sin, cos, sinh, cosh) by the exact expansion of verdicts/expansion.ts.
 * Finite differences of results, ratios of partition functions, free energies and their
 * corrections all take this route. The outcome is an exact value (with the next correction),
 * a divergence with its leading behaviour, 0 with the term it is approached like, no limit
 * (oscillating), or a reason why not.
 *
 * Two numeric guards keep the exact answer honest: the leading coefficient must not vanish
 * at sample points of the other parameters (atoms are treated as independent symbols), and
 * the printed expansion must agree with the quantity's own values near the end point.
 */
import type { Domain, Formula } from '../../shared/evaluation.js';
import type { Expr } from '../lang/ast.js';
import { Complex } from 'complex.js';
import { add, mul, num } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { formulaOf } from '../expr/print.js';
import { qcmp, qmul, qsign, qToNumber, Q0, q, type Q } from '../exact/q.js';
import { rfIm, rfRe } from '../verdicts/exactGaussian.js';
import { ratfunc, rfIsZero } from '../exact/ratfunc.js';
import { polyFromTerms } from '../exact/poly.js';
import { Expander, monExpr, Refusal, scaleExpr, type ExpansionInput, type Mon, type Ser } from '../verdicts/expansion.js';
import { LatticeExpander, usesLattice } from '../verdicts/expansionLattice.js';
import type { StepOf } from '../../shared/evaluation.js';
import type { Approach } from '../verdicts/asymptotics.js';
import type { Point } from '../domains/sample.js';

export type GeneralLimit =
  | {
    outcome: 'value' | 'asymptotic' | 'divergent' | 'oscillating'; formula: Formula; rate?: Formula; correction?: { formula: Formula; power: number };
    /** An exponentially small remainder beyond all orders (Gaussian sums and eta), and the modular transformations behind it. */
    remainder?: { order: Formula; bound: Formula | null }; modular?: StepOf<'modular'>[];
  }
  | { outcome: 'unknown'; reason: string };

const PRECISIONS = [q(4n), q(8n), q(16n)];

/** Expands with growing precision while a cancellation leaves the leading term unknown. */
function expand(def: Expr, input: ExpansionInput): { x: Expander; f: Ser } | { reason: string } {
  let last = '';
  let found: { x: Expander; f: Ser } | null = null;
  for (const prec of PRECISIONS) {
    // eta and Gaussian sums enter through their modular transformations, with bounded remainders
    const x = usesLattice(def, input.resolve) ? new LatticeExpander(input, prec) : new Expander(input, prec);
    try {
      const f = x.expr(def);
      if (!f.terms.length && f.err !== null) { last = 'the expression cancels to every order computed'; continue; }
      found = { x, f };
      // a finite value with no known correction: one more precision finds the next term
      if (f.terms.length === 1 && f.err !== null && !f.S.length && qsign(f.terms[0]!.a) === 0 && f.terms[0]!.m === 0 && prec !== PRECISIONS[PRECISIONS.length - 1]) continue;
      return found;
    } catch (e) {
      if (!(e instanceof Refusal)) throw e;
      if (found) return found;
      last = e.message;
      if (!e.cancelled) break;
    }
  }
  return found ?? { reason: last };
}

export function generalLimit(
  def: Expr, p: string, how: Approach, domains: ReadonlyMap<string, Domain>,
  resolve: ExpansionInput['resolve'],
  samples: { points: Point[]; valueAt: (pt: Point) => { re: number; im: number } | null },
): GeneralLimit {
  const got = expand(def, { p, how, domains, resolve });
  if ('reason' in got) return { outcome: 'unknown', reason: got.reason };
  const { x, f } = got;
  if (!f.terms.length) {
    // every power cancels: 0, exactly up to an exponentially small remainder when one is carried
    const rest = x instanceof LatticeExpander ? x.remainderOf(f) : null;
    return {
      outcome: 'value', formula: formulaOf(num(0)),
      ...(rest ? { remainder: { order: formulaOf(rest.order), bound: rest.bound ? formulaOf(rest.bound) : null } } : {}),
      ...(x instanceof LatticeExpander && x.uses.length ? { modular: x.uses } : {}),
    };
  }
  const lead = f.terms[0]!;
  const term = (t: Mon) => monExpr(x, t, p, how);
  const scale = scaleExpr(x, f.S, p, how);
  const withScale = (e: Expr) => (scale ? mul(e, scale) : e);
  const known = f.terms.reduce<Expr | null>((s, t) => (s ? add(s, term(t)) : term(t)), null)!;

  // guards: the leading coefficient is nonzero at sample points; the expansion matches the values
  const atPoint = (e: Expr, pt: Point) => { try { return evaluate(e, pt); } catch { return null; } };
  // a constant leading term is the limit even where it vanishes (everything after it tends to 0), so
  // a zero there is no missed cancellation: -log(k)/2 at k = 1 is the limit 0
  const constantLead = !f.S.length && qsign(lead.a) === 0 && lead.m === 0;
  for (const pt of samples.points) {
    const c = atPoint(x.exprOf(lead.c), pt);
    // the size of the numerator's terms, against which a vanishing sum is judged
    const parts = [...lead.c.num.terms.values()].map((t) => atPoint(x.exprOf(ratfunc(polyFromTerms([t]), lead.c.den)), pt));
    const size = parts.reduce((s, z) => s + (z ? Math.hypot(z.re, z.im) : Infinity), 0);
    if (!c || !Number.isFinite(c.re) || (!constantLead && !(Math.hypot(c.re, c.im) > 1e-9 * size))) return { outcome: 'unknown', reason: 'the leading coefficient vanishes numerically at a sample point, so the exact expansion may have missed a cancellation' };
  }
  const mismatch = checkAgainstValues(withScale(known), p, how, samples, f, lead);
  if (mismatch) return { outcome: 'unknown', reason: mismatch };
  if (!constantLead && !x.nonzero(lead.c)) return { outcome: 'unknown', reason: 'the leading coefficient may vanish for some values of the other parameters' };

  const leading = withScale(term(lead));
  if (f.S.length) {
    // the exponential scale decides: the first exponent coefficient with a provable real part
    for (const s of f.S) {
      if (!x.nonzero(s.c) && !rfIsZero(s.c)) return { outcome: 'unknown', reason: 'an exponent\'s coefficient may vanish or change sign for some values of the other parameters' };
      const re = rfRe(s.c);
      if (rfIsZero(re)) continue;
      const sign = x.sign(re);
      if (sign > 0) return { outcome: 'divergent', formula: formulaOf(leading) };
      if (sign < 0) return { outcome: 'value', formula: formulaOf(num(0)), rate: formulaOf(leading) };
      return { outcome: 'unknown', reason: 'the sign of the real part of the exponent is not decided on the whole domain' };
    }
    if (f.S.every((s) => !rfIsZero(rfIm(s.c)))) {
      return qsign(lead.a) > 0 ? { outcome: 'value', formula: formulaOf(num(0)), rate: formulaOf(leading) } : { outcome: 'oscillating', formula: formulaOf(leading) };
    }
    return { outcome: 'unknown', reason: 'the exponential scale could not be decided' };
  }
  const powerIn = (a: Q) => qToNumber(how.kind === 'point' ? a : qmul(a, q(-1n)));
  const small = f.terms.filter((t) => qsign(t.a) > 0 || (qsign(t.a) === 0 && t.m < 0));
  const next = (after: Mon) => f.terms.find((t) => monCmpGreater(t, after));
  if (qsign(lead.a) > 0 || (qsign(lead.a) === 0 && lead.m < 0)) return { outcome: 'value', formula: formulaOf(num(0)), rate: formulaOf(leading) };
  if (qsign(lead.a) === 0 && lead.m === 0) {
    const corr = next(lead);
    const rest = x instanceof LatticeExpander ? x.remainderOf(f) : null;
    return {
      outcome: 'value', formula: formulaOf(term(lead)), ...(corr ? { correction: { formula: formulaOf(term(corr)), power: powerIn(corr.a) } } : {}),
      ...(rest && !corr ? { remainder: { order: formulaOf(rest.order), bound: rest.bound ? formulaOf(rest.bound) : null } } : {}),
      ...(x instanceof LatticeExpander && x.uses.length ? { modular: x.uses } : {}),
    };
  }
  // divergent: every term that does not vanish, when all of them are known (err > 0)
  const big = f.terms.filter((t) => !small.includes(t));
  const complete = f.err === null || qsign(f.err) > 0;
  if (big.length === 1 || !complete) {
    const corr = complete ? small[0] : undefined;
    return { outcome: 'divergent', formula: formulaOf(leading), ...(corr ? { correction: { formula: formulaOf(term(corr)), power: powerIn(corr.a) } } : {}) };
  }
  const sum = big.map(term).reduce((a, b) => add(a, b));
  const corr = small[0];
  return { outcome: 'asymptotic', formula: formulaOf(sum), ...(corr ? { correction: { formula: formulaOf(term(corr)), power: powerIn(corr.a) } } : {}) };
}

const monCmpGreater = (t: Mon, after: Mon) => qcmp(t.a, after.a) > 0 || (qcmp(t.a, after.a) === 0 && t.m < after.m);

/**
 * The known terms against the quantity's values at u = 1e-3 and 1e-4 (relative to the
 * scale of the approach): the relative difference must be small and shrink. Points where
 * the values overflow are skipped.
 */
function checkAgainstValues(
  e: Expr, p: string, how: Approach,
  samples: { points: Point[]; valueAt: (pt: Point) => { re: number; im: number } | null },
  f: Ser, lead: Mon,
): string | null {
  const us = [1e-3, 1e-4];
  const pAt = (u: number) => (how.kind === 'inf' ? 1 / u : how.kind === '-inf' ? -1 / u : qToNumber(how.at) + how.side * u);
  const relErr = f.err ? qToNumber(f.err) - qToNumber(lead.a) : Infinity;
  for (const pt of samples.points.slice(0, 3)) {
    const diffs: number[] = [];
    for (const u of us) {
      const at = new Map(pt); at.set(p, new Complex(pAt(u), 0));
      const v = samples.valueAt(at);
      let w: Complex | null = null;
      try { w = evaluate(e, at); } catch { w = null; }
      if (!v || !w || !Number.isFinite(w.re) || !Number.isFinite(w.im) || !Number.isFinite(v.re)) continue;
      const scale = Math.max(Math.hypot(v.re, v.im), 1e-300);
      diffs.push(Math.hypot(w.re - v.re, w.im - v.im) / scale);
    }
    // the neglected terms are O(u^relErr) relative; allow for rounding in the values themselves
    const allowed = (u: number) => Math.max(1e-6, 100 * u ** Math.min(relErr, 2));
    if (diffs.length === 2 && diffs[1]! > allowed(us[1]!) && diffs[0]! > allowed(us[0]!)) {
      return `the expansion does not match the values near the end point (relative difference ≈ ${diffs[1]!.toPrecision(3)}), so it is not reported`;
    }
  }
  return null;
}

export { Q0 };
