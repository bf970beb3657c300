/**
 * The closed form (2 pi)^(n/2) det(A)^(-1/2) exp(J^T A^-1 J / 2 + c) as an
 * expression. Several written forms are built (principal root, its negative,
 * the pivot product, the Fresnel form); only those that reproduce the
 * continuous branch at every sample point are kept, and the shortest one wins.
 */
import type { Domain } from '../../shared/evaluation.js';
import type { Expr } from '../lang/ast.js';
import { add, call, div, I, mul, neg, num, PI, pow, sub } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { tidy } from '../expr/tidy.js';
import { complexExpr } from '../expr/numberExpr.js';
import { toLatex, toText } from '../expr/print.js';
import { rewriteChecked } from '../algebra/adapter.js';
import type { Point } from '../domains/sample.js';
import type { C } from '../numeric/cmatrix.js';
import type { QuadraticForm } from './form.js';
import { checkDeadline } from '../deadline.js';

export function cofactorDet(m: readonly (readonly Expr[])[]): Expr {
  const n = m.length;
  if (n === 0) return num(1);
  if (n === 1) return m[0]![0]!;
  if (n === 2) return sub(mul(m[0]![0]!, m[1]![1]!), mul(m[0]![1]!, m[1]![0]!));
  let acc: Expr = num(0);
  for (let j = 0; j < n; j++) {
    const minor = m.slice(1).map((row) => row.filter((_, k) => k !== j));
    const term = mul(m[0]![j]!, cofactorDet(minor));
    acc = j % 2 === 0 ? add(acc, term) : sub(acc, term);
  }
  return acc;
}

function adjugate(m: readonly (readonly Expr[])[]): Expr[][] {
  const n = m.length;
  if (n === 1) return [[num(1)]];
  return Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => {
    const minor = m.filter((_, r) => r !== j).map((row) => row.filter((_, k) => k !== i));
    const d = cofactorDet(minor);
    return (i + j) % 2 === 0 ? d : neg(d);
  }));
}

/** abs(k) -> k for a positive parameter (and -k for a negative one): the adapter does not know our domains. */
function useDomains(e: Expr, domains: ReadonlyMap<string, Domain>): Expr {
  switch (e.t) {
    case 'call': {
      const a = e.args[0]!;
      if (e.fn === 'abs' && a.t === 'name') {
        const d = domains.get(a.name);
        if (d === 'positive') return a;
        if (d === 'negative') return neg(a);
      }
      return { t: 'call', fn: e.fn, args: e.args.map((x) => useDomains(x, domains)) };
    }
    case 'neg': return { t: 'neg', a: useDomains(e.a, domains) };
    case 'bin': return { t: 'bin', op: e.op, a: useDomains(e.a, domains), b: useDomains(e.b, domains) };
    default: return e;
  }
}

function positiveNumber(e: Expr): number | null {
  try {
    const v = evaluate(e, new Map());
    return v.im === 0 && v.re > 0 ? v.re : null;
  } catch { return null; }
}

export type WrittenBranch = 'principal' | 'negated' | 'pivots' | 'fresnel';

export interface ClosedFormInput {
  form: QuadraticForm;
  prefactor: Expr;
  domains: ReadonlyMap<string, Domain>;
  /** Parameter points where the integral converges, with the continuous-branch value there. */
  points: readonly Point[];
  values: readonly C[];
  /** Principal-root sign at each point. */
  signs: readonly (1 | -1)[];
  /** Set when A = -i B with B real and its signature the same at every point. */
  fresnel: { positive: number; negative: number } | null;
}

export interface ClosedForm {
  expr: Expr;
  text: string;
  latex: string;
  written: WrittenBranch;
  /** Written forms tried and rejected because they missed the continuous branch somewhere. */
  rejected: WrittenBranch[];
  det: Expr;
  exponent: Expr;
  /** False when no written form reproduced the continuous branch at every point. */
  verified: boolean;
}

function matches(e: Expr, points: readonly Point[], values: readonly C[]): boolean {
  for (let k = 0; k < points.length; k++) {
    let v;
    try { v = evaluate(e, points[k]!); } catch { return false; }
    const w = values[k]!;
    const d = Math.hypot(v.re - w.re, v.im - w.im);
    if (!(d <= 1e-8 * Math.max(Math.hypot(w.re, w.im), 1e-300))) return false;
  }
  return points.length > 0;
}

function twoPiPower(n: number): Expr {
  if (n % 2 === 0) return pow(mul(num(2), PI), num(n / 2));
  return n === 1 ? call('sqrt', mul(num(2), PI)) : pow(mul(num(2), PI), div(num(n), num(2)));
}

/** exp(i pi s / 4), exact for the eighth roots of unity. */
export function fresnelPhase(s: number): Expr {
  const m = ((s % 8) + 8) % 8;
  const units: Record<number, Expr> = { 0: num(1), 2: I, 4: num(-1), 6: neg(I) };
  if (units[m]) return units[m]!;
  const r = m > 4 ? m - 8 : m;
  return call('exp', div(mul(num(r), mul(I, PI)), num(4)));
}

export function closedForm(input: ClosedFormInput): ClosedForm {
  const { form, prefactor, domains, points, values, signs } = input;
  const n = form.vars.length;
  const checkPoints = points.slice(0, 8);
  // Without parameters every piece is a number: write it exactly where it is a small fraction, skip the algebra package.
  const numeric = points.length > 0 && points.every((p) => p.size === 0);
  const rewrite = (op: 'expand' | 'simplify', e: Expr): Expr =>
    numeric ? complexExpr(evaluate(e, new Map())) : rewriteChecked(op, e, checkPoints).expr;
  const det = rewrite('expand', cofactorDet(form.A));
  checkDeadline();
  let exponent: Expr = form.c;
  if (form.J.some((j) => !(j.t === 'num' && Number(j.v) === 0))) {
    const adj = adjugate(form.A);
    let quad: Expr = num(0);
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) quad = add(quad, mul(mul(form.J[i]!, adj[i]![j]!), form.J[j]!));
    exponent = add(form.c, div(quad, mul(num(2), det)));
  }
  exponent = rewrite('simplify', exponent);
  checkDeadline();
  const zeroExponent = exponent.t === 'num' && Number(exponent.v) === 0;
  const tail = (e: Expr) => (zeroExponent ? e : mul(e, call('exp', exponent)));
  const head = mul(prefactor, twoPiPower(n));

  const candidates: { written: WrittenBranch; expr: Expr }[] = [];
  /** prefactor * (2 pi)^(n/2) / sqrt(d); for one variable and a positive number d, as sqrt(2 pi / d). */
  const overRoot = (d: Expr): Expr => {
    const v = positiveNumber(d);
    if (n === 1 && v !== null) return mul(prefactor, call('sqrt', div(mul(num(2), PI), d)));
    return div(head, call('sqrt', d));
  };
  const allPlus = signs.every((s) => s === 1);
  const allMinus = signs.every((s) => s === -1);
  if (input.fresnel) {
    const { positive, negative } = input.fresnel;
    // |det B| = (-1)^negative det B, and det B = i^n det A
    const unit = [num(1), I, num(-1), neg(I)][(n + 2 * negative) % 4]!;
    const absDetB = rewrite('expand', mul(unit, det));
    candidates.push({ written: 'fresnel', expr: tail(mul(overRoot(absDetB), fresnelPhase(positive - negative))) });
  }
  if (allPlus) candidates.push({ written: 'principal', expr: tail(overRoot(det)) });
  if (allMinus) candidates.push({ written: 'negated', expr: tail(neg(overRoot(det))) });
  // Pivot form: det^(1/2) = prod_k sqrt(M_k / M_{k-1}) with M_k the leading principal minors.
  if (n >= 2 && !allPlus) {
    let prev: Expr = num(1);
    let root: Expr = num(1);
    for (let k = 1; k <= n; k++) {
      const mk = rewrite('expand', cofactorDet(form.A.slice(0, k).map((r) => r.slice(0, k))));
      root = mul(root, call('sqrt', k === 1 ? mk : div(mk, prev)));
      prev = mk;
    }
    candidates.push({ written: 'pivots', expr: tail(div(head, root)) });
  }
  const rejected: WrittenBranch[] = [];
  let best: { written: WrittenBranch; expr: Expr; text: string } | null = null;
  for (const c of candidates) {
    checkDeadline();
    const forms = [tidy(c.expr)];
    // A whole-formula simplification pays off for small n; for n >= 3 its cost outgrows what it tidies.
    if (n <= 2 && !numeric) {
      const simplified = rewriteChecked('simplify', c.expr, checkPoints);
      if (simplified.accepted) forms.push(tidy(useDomains(simplified.expr, domains)));
    }
    let ok = false;
    for (const f of forms) {
      if (!matches(f, points, values)) continue;
      ok = true;
      const text = toText(f);
      // The Fresnel form shows the phase a physicist looks for, so it wins whenever it holds.
      const better = !best || (c.written === 'fresnel' && best.written !== 'fresnel')
        || (best.written !== 'fresnel' || c.written === 'fresnel') && text.length < best.text.length;
      if (better) best = { written: c.written, expr: f, text };
    }
    if (!ok) rejected.push(c.written);
  }
  if (!best) {
    const f = tidy(candidates[candidates.length - 1]?.expr ?? tail(div(head, call('sqrt', det))));
    return { expr: f, text: toText(f), latex: toLatex(f), written: candidates[candidates.length - 1]?.written ?? 'principal', rejected, det, exponent, verified: false };
  }
  return { expr: best.expr, text: best.text, latex: toLatex(best.expr), written: best.written, rejected: rejected.filter((r) => r !== best!.written), det, exponent, verified: true };
}
