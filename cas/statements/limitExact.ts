/**
 * The exact route of `limit`: the target is a Gaussian result whose A, J, c are rational
 * (or c*log of one, c a constant or the parameter itself), and the parameter is real.
 * The expansion of verdicts/asymptotics.ts gives one of: an exact finite value; divergence
 * with its leading behaviour; 0 with the rate; no limit (oscillating); or null, and the
 * caller says "unknown" with the reason.
 */
import type { Domain, Formula, Step } from '../../shared/evaluation.js';
import type { Expr } from '../lang/ast.js';
import { add, call, div, mul, name as nameExpr, neg, num, PI, pow, sub } from '../expr/build.js';
import { formulaOf } from '../expr/print.js';
import { qExpr, ratExpr, sqrtExpr } from '../expr/fromExact.js';
import { fromExpr, rfEquals, rfIsZero, type RatFunc } from '../exact/ratfunc.js';
import { detRat } from '../exact/matrix.js';
import { qsign, qToNumber } from '../exact/q.js';
import { gaussianAsymptotics, type Approach, type GaussianAsymptotics } from '../verdicts/asymptotics.js';
import { exactFormOf } from '../verdicts/exactForm.js';
import { rfIm, rfRe } from '../verdicts/exactGaussian.js';
import { variables } from '../exact/poly.js';
import type { GaussianInfo } from './context.js';

/** One term of an expansion in u -> 0+: coeff * u^power * (log u)^log. */
interface Term { coeff: Expr; power: number; log: boolean }

export interface ExactLimit {
  outcome: 'value' | 'asymptotic' | 'divergent' | 'oscillating';
  formula: Formula;
  /** For a limit 0: how it is approached (the leading term). */
  rate?: Formula;
}

const isConst = (r: RatFunc) => variables(r.num).length === 0 && variables(r.den).length === 0;

/** +1 / -1 when r is provably positive / negative for every value of the (real) parameters, else 0. */
function provedSign(r: RatFunc, domains: ReadonlyMap<string, Domain>): number {
  const single = (p: RatFunc['num']) => (p.terms.size === 1 ? [...p.terms.values()][0]! : null);
  const a = single(r.num); const b = single(r.den);
  if (!a || !b || a.c.im.n !== 0n || b.c.im.n !== 0n) return 0;
  let sign = qsign(a.c.re) * qsign(b.c.re);
  for (const [v, k] of [...a.m, ...b.m]) {
    const d = domains.get(v);
    if (v === 'pi' || d === 'positive') continue;
    if (k % 2 === 0 && (d === 'negative' || d === 'nonzero')) continue;
    if (d === 'negative') { sign = -sign; continue; }
    return 0;
  }
  return sign;
}

/** u in terms of p: 1/p, -1/p, p - p0 or p0 - p. */
function uOf(p: string, how: Approach): Expr {
  const P = nameExpr(p);
  if (how.kind === 'inf') return div(num(1), P);
  if (how.kind === '-inf') return neg(div(num(1), P));
  const p0 = qExpr(how.at);
  const d = p0.t === 'num' && p0.v === '0' ? P : sub(P, p0);
  return how.side > 0 ? d : neg(d);
}
/** u^a in p, simplified for the common cases: p^-a at infinity. */
function uPower(p: string, how: Approach, a: number): Expr {
  if (a === 0) return num(1);
  const P = nameExpr(p);
  const half = (k: number): Expr => (Number.isInteger(k) ? (k === 1 ? P : pow(P, num(k))) : k === 0.5 ? call('sqrt', P) : pow(P, div(num(2 * k), num(2))));
  if (how.kind === 'inf') return a < 0 ? half(-a) : div(num(1), half(a));
  const u = uOf(p, how);
  const base = u.t === 'name' ? u : u;
  if (a === 0.5) return call('sqrt', base);
  if (a === -0.5) return div(num(1), call('sqrt', base));
  if (Number.isInteger(a)) return a > 0 ? (a === 1 ? base : pow(base, num(a))) : div(num(1), a === -1 ? base : pow(base, num(-a)));
  return pow(base, div(num(2 * a), num(2)));
}

function constantC(g: GaussianInfo, asy: GaussianAsymptotics, domains: ReadonlyMap<string, Domain>): Expr {
  const n = g.vars.length;
  const head = mul(g.prefactor, n % 2 === 0 ? pow(mul(num(2), PI), num(n / 2)) : n === 1 ? call('sqrt', mul(num(2), PI)) : pow(mul(num(2), PI), div(num(n), num(2))));
  // positive real leads: one root of their product (sqrt(k)*sqrt(1/k) is 1)
  if (asy.pivotLeads.every((l) => rfIsZero(rfIm(l)) && (isConst(l) ? qsign([...l.num.terms.values()][0]!.c.re) > 0 : provedSign(l, domains) > 0))) {
    const prod = asy.pivotLeads.reduce((a, b) => rfMulLocal(a, b), rfConstLocal(1));
    const positive = new Set([...domains].filter(([, d]) => d === 'positive').map(([k]) => k));
    const root = sqrtExpr(prod, positive);
    return root.t === 'num' && root.v === '1' ? head : div(head, root);
  }
  // equal leads grouped: sqrt(l)^2 = l
  const groups: { lead: RatFunc; count: number }[] = [];
  for (const l of asy.pivotLeads) { const gr = groups.find((x) => rfEquals(x.lead, l)); if (gr) gr.count++; else groups.push({ lead: l, count: 1 }); }
  let den: Expr | null = null;
  for (const { lead, count } of groups) {
    if (isConst(lead) && lead.num.terms.size === 1 && [...lead.num.terms.values()][0]!.c.re.n === 1n && [...lead.num.terms.values()][0]!.c.re.d === 1n && [...lead.num.terms.values()][0]!.c.im.n === 0n) continue;
    const e = ratExpr(lead, true);
    const f = count % 2 === 0 ? (count === 2 ? e : pow(e, num(count / 2))) : count === 1 ? call('sqrt', e) : mul(count === 3 ? e : pow(e, num((count - 1) / 2)), call('sqrt', e));
    den = den ? mul(den, f) : f;
  }
  return den ? div(head, den) : head;
}

/**
 * The limit of an integral result, or of c*log of one (c a constant or the parameter),
 * exactly; null when the form is outside this route.
 */
export function exactLimit(g: GaussianInfo, p: string, how: Approach, domains: ReadonlyMap<string, Domain>, logFactor: { c0: Expr; power: number } | null): ExactLimit | null {
  const form = exactFormOf(g.form);
  if (!form) return null;
  if (domains.get(p) === 'complex') return null;
  const names = [...new Set([...form.A.flat(), ...form.J, form.c].flatMap((x) => [...variables(x.num), ...variables(x.den)]))];
  if (names.some((v) => v !== 'pi' && domains.get(v) === 'complex')) return null;
  if (fromExpr(g.prefactor) === null && names.length) { /* a non-rational prefactor is kept as written */ }
  const det = detRat(form.A);
  // exponent 1/2 J^T A^-1 J + c through Cramer's rule
  let q: RatFunc | null = null;
  for (let i = 0; i < form.vars.length; i++) {
    if (rfIsZero(form.J[i]!)) continue;
    const Ai = form.A.map((row, r) => row.map((x, c) => (c === i ? form.J[r]! : x)));
    const t = rfMulLocal(form.J[i]!, detRat(Ai));
    q = q ? rfAddLocal(q, t) : t;
  }
  const exponent = q ? rfAddLocal(rfDivLocal(q, rfMulLocal(det, rfConstLocal(2))), form.c) : form.c;
  const nonzero = (r: RatFunc) => !rfIsZero(r) && (isConst(r) || provedSign(rfRe(r), domains) !== 0 || provedSign(rfIm(r), domains) !== 0);
  const asy = gaussianAsymptotics(form, exponent, p, how, nonzero);
  if (!asy) return null;
  const gamma = qToNumber(asy.gamma);
  const C = constantC(g, asy, domains);
  const exps = asy.exponentTerms;
  const principal = exps.filter((t) => t.power < 0).sort((a, b) => a.power - b.power);
  const e0 = exps.find((t) => t.power === 0)?.coeff;
  const u = (a: number) => uPower(p, how, a);
  const expPart = (terms: { power: number; coeff: RatFunc }[]): Expr | null => {
    const sum = terms.reduce<Expr | null>((acc, t) => { const e = mul(ratExpr(t.coeff), u(t.power)); return acc ? add(acc, e) : e; }, null);
    return sum ? call('exp', sum) : null;
  };
  if (!logFactor) {
    const ep = expPart([...principal, ...(e0 ? [{ power: 0, coeff: e0 }] : [])]);
    const leading = [C, u(gamma), ...(ep ? [ep] : [])].reduce((a, b) => mul(a, b));
    if (principal.length) {
      const top = principal[0]!;
      const s = provedSign(rfRe(top.coeff), domains);
      const im = rfIm(top.coeff);
      if (rfIsZero(rfRe(top.coeff)) && !rfIsZero(im)) return gamma > 0 ? { outcome: 'value', formula: formulaOf(num(0)), rate: formulaOf(leading) } : { outcome: 'oscillating', formula: formulaOf(leading) };
      if (s > 0) return { outcome: 'divergent', formula: formulaOf(leading) };
      if (s < 0) return { outcome: 'value', formula: formulaOf(num(0)), rate: formulaOf(leading) };
      return null;
    }
    if (gamma > 0) return { outcome: 'value', formula: formulaOf(num(0)), rate: formulaOf(leading) };
    if (gamma < 0) return { outcome: 'divergent', formula: formulaOf(leading) };
    return { outcome: 'value', formula: formulaOf(leading) };
  }
  // c * log Z with Z real and positive along the approach: every coefficient real, C > 0
  const realTerms = exps.every((t) => rfIsZero(rfIm(t.coeff)));
  const positiveLeads = asy.pivotLeads.every((l) => rfIsZero(rfIm(l)) && (isConst(l) ? qsign([...l.num.terms.values()][0]!.c.re) > 0 : provedSign(l, domains) > 0));
  const prefactorPositive = (() => { const r = fromExpr(g.prefactor); return !!r && rfIsZero(rfIm(r)) && (isConst(r) ? qsign([...r.num.terms.values()][0]?.c.re ?? { n: 0n, d: 1n }) > 0 : provedSign(r, domains) > 0); })();
  if (!realTerms || !positiveLeads || !prefactorPositive) return null;
  // log Z = log C + gamma log u + sum e_k u^k + e_0 + O(u); the factor c = c0 * u^beta
  if (how.kind === '-inf') return null;
  const beta = how.kind === 'inf' ? -logFactor.power : logFactor.power;
  if (beta < 0 || (how.kind === 'point' && (how.side < 0 || qToNumber(how.at) !== 0) && logFactor.power !== 0)) return null; // c * O(u) would not vanish, or c is not a power of u
  const n = g.vars.length;
  const logC: Expr[] = [];
  const pf = fromExpr(g.prefactor);
  if (pf && !(isConst(pf) && [...pf.num.terms.values()][0]!.c.re.n === 1n && [...pf.num.terms.values()][0]!.c.re.d === 1n)) logC.push(call('log', g.prefactor));
  logC.push(mul(div(num(n), num(2)), call('log', mul(num(2), PI))));
  for (const l of asy.pivotLeads) if (!(isConst(l) && [...l.num.terms.values()][0]!.c.re.n === [...l.num.terms.values()][0]!.c.re.d)) logC.push(neg(mul(div(num(1), num(2)), call('log', ratExpr(l, true)))));
  const terms: Term[] = [
    ...logC.map((c) => ({ coeff: c, power: 0, log: false })),
    ...(e0 ? [{ coeff: ratExpr(e0), power: 0, log: false }] : []),
    ...(gamma !== 0 ? [{ coeff: num(0), power: 0, log: true }] : []),
    ...principal.map((t) => ({ coeff: ratExpr(t.coeff), power: t.power, log: false })),
  ].map((t) => ({ ...t, power: t.power + beta }));
  // the factor c = c0 * p^power is u^beta * c0 (up to the sign of u for p -> -inf, excluded above)
  const c0 = logFactor.c0;
  const inP = (t: Term): Expr => {
    if (t.log) {
      // gamma * log u in p: log u = -log p at infinity, log(p - p0) at a point
      const lu = how.kind === 'inf' ? neg(call('log', nameExpr(p))) : call('log', uOf(p, how));
      return mul(mul(c0, qExpr(asy.gamma)), mul(lu, u(t.power)));
    }
    return mul(c0, mul(t.coeff, u(t.power)));
  };
  const divergent = terms.filter((t) => t.power < 0 || (t.power === 0 && t.log));
  const constant = terms.filter((t) => t.power === 0 && !t.log);
  const sumOf = (ts: Term[]) => ts.reduce<Expr | null>((a, t) => (a ? add(a, inP(t)) : inP(t)), null) ?? num(0);
  if (divergent.length) return { outcome: 'asymptotic', formula: formulaOf(sumOf([...divergent, ...constant])) };
  return { outcome: 'value', formula: formulaOf(sumOf(constant)) };
}

import { rfAdd as rfAddLocal, rfDiv as rfDivLocal, rfMul as rfMulLocal, rfConst as rfConstLocal } from '../exact/ratfunc.js';
export type { Step };
