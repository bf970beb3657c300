/**
 * The exact expansion (verdicts/expansion.ts) taught Gaussian sums over the integers and the
 * Dedekind eta function, through their modular transformations:
 *
 *   eta(tau)                       = (-i*tau)^(-1/2) * exp(2*pi*i*w/24) * prod (1 - q'^n),  w = -1/tau, q' = exp(2*pi*i*w)
 *   sum_n exp(-pi*a*n^2 + g)       = exp(g) * a^(-1/2) * (1 + 2 * sum_{m>=1} exp(-pi*m^2/a))
 *
 * When w (or 1/a) is one monomial c1*u^(-k) in the expansion variable u with Im c1 > 0 (Re c1 > 0)
 * proved, the first factors are an ordinary expansion exp(S) * c * u^a and the last is
 * 1 + delta with an explicit bound beyond all orders:
 *   eta:  |log prod| <= |q'|/(1 - |q'|)^2 <= 2|q'| for |q'| <= 1/4, so |delta| <= 4*exp(-2*pi*Im(c1)/u^k);
 *   sum:  |delta| <= 2*e^(-x)/(1 - e^(-2x)) <= 4*e^(-x), x = pi*Re(c1)/u^k, once e^(-2x) <= 1/2
 *         (m^2 - 1 >= 2*(m - 1) for m >= 1, a geometric series).
 *
 * Such remainders ("tails") are carried through the arithmetic as bounds |piece| <= K*u^m*exp(-c/u^a)
 * (c a real coefficient proved positive), relative (a factor 1 + delta) or absolute (an added eps):
 *   product:   (1 + d1)(1 + d2) - 1 <= |d1| + 2|d2|                         (|d1| <= 1/2)
 *   power r:   |(1 + d)^r - 1| <= |r| * 2^|r - 1| * |d|                     (|d| <= 1/2: |1 + w| in [1/2, 3/2])
 *   log:       |log(1 + d)| <= 2|d|,  exp: |exp(e) - 1| <= 2|e|             (|d|, |e| <= 1/2)
 *   sum:       F*(1 + d) = F + F*d, |F| <= 2*|lead of F| for small u
 * each valid once every remainder involved is below 1/2, which the record says. A constant K that
 * needs the size of a symbolic coefficient is unknown (null): the rate is still stated, not the bound.
 * An exponentially smaller piece dropped with no clean rate marks the result `lost`, and then no
 * remainder is claimed at all.
 */
import type { Expr } from '../lang/ast.js';
import type { StepOf } from '../../shared/evaluation.js';
import { add, call, div, I, mul, neg, num, PI, pow } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames } from '../expr/names.js';
import { formulaOf } from '../expr/print.js';
import { ratExpr } from '../expr/fromExact.js';
import { coefficients, polyVar } from '../exact/poly.js';
import { fromExpr, rfConst, rfDiv, rfEquals, rfIsZero, rfMul, rfNeg, rfPoly, rfSub, type RatFunc } from '../exact/ratfunc.js';
import { q, qadd, qcmp, qeq, qIsZero, qmul, qneg, qsub, qToNumber, Q0, type Q } from '../exact/q.js';
import { rfIm, rfRe } from './exactGaussian.js';
import { inU } from './asymptotics.js';
import { Expander, monExpr, Refusal, uPowerExpr, type ExpansionInput, type Ser } from './expansion.js';
import type { LatticeInfo } from '../statements/context.js';

type K = RatFunc;
/** |piece| <= k * u^m * exp(-c/u^a); k null: a constant exists but is not known. */
export interface Tail { c: K; a: Q; m: Q; k: number | null }
/** f = exp(S) * ((terms + O(u^err)) * (1 + delta) + eps), |delta| <= sum rel, |eps| <= sum abs. */
export type TSer = Ser & { rel?: Tail[]; abs?: Tail[]; lost?: boolean };

const U = '%v';
const refuse = (why: string): never => { throw new Refusal(why); };
const kTimes = (k: number | null, f: number | null) => (k === null || f === null ? null : k * f);

export class LatticeExpander extends Expander {
  /** The modular transformations the expansion used, for the record. */
  readonly uses: StepOf<'modular'>[] = [];

  constructor(input: ExpansionInput & { resolve: (name: string) => { lattice?: LatticeInfo } | null }, prec: Q) { super(input, prec); }

  // --- tails ------------------------------------------------------------------------------

  private tailsOf(f: TSer) { return { rel: f.rel ?? [], abs: f.abs ?? [], lost: !!f.lost }; }
  private hasTails(f: TSer) { return !!(f.rel?.length || f.abs?.length || f.lost); }
  private withTails(f: Ser, rel: Tail[], abs: Tail[], lost: boolean): TSer {
    return { ...f, rel: this.prune(rel), abs: this.prune(abs), ...(lost ? { lost } : {}) };
  }
  /** Same rate and prefactor power: one tail with the constants added. */
  private prune(ts: Tail[]): Tail[] {
    const out: Tail[] = [];
    for (const t of ts) {
      const same = out.find((o) => qeq(o.a, t.a) && qeq(o.m, t.m) && rfEquals(o.c, t.c));
      if (same) same.k = same.k === null || t.k === null ? null : same.k + t.k;
      else out.push({ ...t });
    }
    return out;
  }
  /** 2*|leading coefficient| (a bound on |terms| / u^lead.a for small u) when it is a number. */
  private leadSize(f: Ser): { a: Q; size: number | null } | null {
    const L = f.terms[0];
    if (!L || L.m !== 0) return null;
    const e = this.exprOf(L.c);
    if (freeNames(e).size) return { a: L.a, size: null };
    try { const z = evaluate(e, new Map()); return { a: L.a, size: Number.isFinite(z.abs()) ? 2 * z.abs() : null }; } catch { return { a: L.a, size: null }; }
  }
  /** terms * delta as an absolute tail. */
  private relToAbs(f: Ser, ts: Tail[]): Tail[] | null {
    if (!ts.length) return [];
    const L = this.leadSize(f);
    return L && ts.map((t) => ({ ...t, m: qadd(t.m, L.a), k: kTimes(t.k, L.size) }));
  }
  /** eps / terms as a relative tail (|terms| >= |lead|/2 for small u). */
  private absToRel(f: Ser, ts: Tail[]): Tail[] | null {
    if (!ts.length) return [];
    const L = this.leadSize(f);
    return L && ts.map((t) => ({ ...t, m: qsub(t.m, L.a), k: kTimes(t.k, L.size === null || L.size === 0 ? null : 4 / L.size) }));
  }
  private scale(ts: Tail[], f: number): Tail[] { return ts.map((t) => ({ ...t, k: kTimes(t.k, f) })); }

  override negS(f: TSer): TSer { const r = super.negS(f); return this.hasTails(f) ? this.withTails(r, f.rel ?? [], f.abs ?? [], !!f.lost) : r; }

  override addS(f: TSer, g: TSer): TSer {
    const r = super.addS(f, g);
    if (!this.hasTails(f) && !this.hasTails(g) && this.sameScale(f, g)) return r;
    const tf = this.tailsOf(f); const tg = this.tailsOf(g);
    const zero = (x: Ser) => !x.terms.length && x.err === null;
    if (zero(f) && !tf.abs.length) return this.withTails(r, tg.rel, tg.abs, tg.lost);
    if (zero(g) && !tg.abs.length) return this.withTails(r, tf.rel, tf.abs, tf.lost);
    if (this.sameScale(f, g)) {
      const af = this.relToAbs(f, tf.rel); const ag = this.relToAbs(g, tg.rel);
      return this.withTails(r, [], [...tf.abs, ...tg.abs, ...(af ?? []), ...(ag ?? [])], tf.lost || tg.lost || !af || !ag);
    }
    // different exponential scales: super kept the larger; the other is exponentially smaller
    const [win, lose] = r.S.length === f.S.length && r.S.every((t, i) => qeq(t.a, f.S[i]!.a) && rfEquals(t.c, f.S[i]!.c)) ? [f, g] : [g, f];
    const tw = this.tailsOf(win);
    const diff = this.scaleDiff(lose.S, win.S);
    const L = this.leadSize(lose);
    const tail: Tail | null = diff.length === 1 && L && !this.hasTails(lose)
      ? { c: rfNeg(rfRe(diff[0]!.c)), a: qneg(diff[0]!.a), m: L.a, k: L.size }
      : null;
    const winAbs = this.relToAbs(win, tw.rel);
    return this.withTails(r, [], [...tw.abs, ...(winAbs ?? []), ...(tail ? [tail] : [])], tw.lost || !tail || !winAbs);
  }
  private sameScale(f: Ser, g: Ser) { return this.scaleDiff(f.S, g.S).length === 0; }
  private scaleDiff(x: Ser['S'], y: Ser['S']): Ser['S'] {
    const m = new Map<string, { c: K; a: Q }>();
    for (const t of x) m.set(`${t.a.n}/${t.a.d}`, { ...t });
    for (const t of y) { const key = `${t.a.n}/${t.a.d}`; const p = m.get(key); m.set(key, p ? { a: t.a, c: rfSub(p.c, t.c) } : { a: t.a, c: rfNeg(t.c) }); }
    return [...m.values()].filter((t) => !rfIsZero(t.c));
  }

  override mulS(f: TSer, g: TSer): TSer {
    const r = super.mulS(f, g);
    if (!this.hasTails(f) && !this.hasTails(g)) return r;
    const tf = this.tailsOf(f); const tg = this.tailsOf(g);
    // eps_f * g and eps_g * f: sizes of the other factor (2|lead|, and 1 + delta <= 3/2 < 2)
    const gs = this.relToAbs(g, tf.abs.map((t) => ({ ...t, k: kTimes(t.k, 2) })));
    const fs = this.relToAbs(f, tg.abs.map((t) => ({ ...t, k: kTimes(t.k, 2) })));
    return this.withTails(r, [...tf.rel, ...this.scale(tg.rel, 2)], [...(gs ?? []), ...(fs ?? [])], tf.lost || tg.lost || !gs || !fs);
  }

  override powS(f: TSer, r: Q): TSer {
    const res = super.powS(f, r);
    if (!this.hasTails(f)) return res;
    const t = this.tailsOf(f);
    const fromAbs = this.absToRel(f, t.abs);
    const x = qToNumber(r);
    return this.withTails(res, this.scale([...t.rel, ...(fromAbs ?? [])], Math.abs(x) * 2 ** Math.abs(x - 1)), [], t.lost || !fromAbs);
  }

  override expS(f: TSer): TSer {
    const res = super.expS(f);
    if (!this.hasTails(f)) return res;
    const t = this.tailsOf(f);
    const fromRel = this.relToAbs(f, t.rel);
    return this.withTails(res, this.scale([...t.abs, ...(fromRel ?? [])], 2), [], t.lost || !fromRel);
  }

  override logS(f: TSer): TSer {
    // log of a leading coefficient that is a monomial in positive symbols and their square roots:
    // written as a sum of logarithms of the symbols, so sqrt(k/(2*pi))/(k*sqrt(1/(2*pi))) gives -log(k)/2
    const L = f.terms[0];
    const parts = L && L.m === 0 ? this.logParts(L.c) : null;
    if (parts && parts.size) {
      const rest = this.logPlain(this.mulS(f, this.constant(rfDiv(rfConst(1), L!.c))));
      let sum: TSer = rest;
      for (const [v, e] of parts) {
        if (qIsZero(e)) continue;
        const sym = /^[0-9]+$/.test(v) ? rfConst(BigInt(v)) : rfPoly(polyVar(v));
        sum = this.addS(sum, super.mulS(this.constant(rfConst(e)), super.logS(this.constant(sym))));
      }
      return sum;
    }
    return this.logPlain(f);
  }

  /** Exponents of a monomial in positive symbols (parameters, pi, square roots of such monomials) and positive integers, or null. */
  private logParts(c: K, depth = 0): Map<string, Q> | null {
    if (depth > 8 || c.num.terms.size !== 1 || c.den.terms.size !== 1) return null;
    const out = new Map<string, Q>();
    const put = (v: string, e: Q) => out.set(v, qadd(out.get(v) ?? Q0, e));
    for (const [t, side] of [[[...c.num.terms.values()][0]!, 1], [[...c.den.terms.values()][0]!, -1]] as const) {
      if (t.c.im.n !== 0n || t.c.re.n <= 0n) return null;
      if (t.c.re.n !== 1n) put(t.c.re.n.toString(), q(BigInt(side)));
      if (t.c.re.d !== 1n) put(t.c.re.d.toString(), q(BigInt(-side)));
      for (const [v, k] of t.m) {
        const atom = this.atoms.get(v);
        if (atom?.square) {
          const inner = this.logParts(atom.square, depth + 1);
          if (!inner) return null;
          for (const [w, e] of inner) put(w, qmul(e, q(BigInt(side * k), 2n)));
        } else if (v === 'pi' || this.input.domains.get(v) === 'positive') put(v, q(BigInt(side * k)));
        else return null;
      }
    }
    return out;
  }

  private logPlain(f: TSer): TSer {
    const res = super.logS(f);
    if (!this.hasTails(f)) return res;
    const t = this.tailsOf(f);
    const fromAbs = this.absToRel(f, t.abs);
    return this.withTails(res, [], this.scale([...t.rel, ...(fromAbs ?? [])], 2), t.lost || !fromAbs);
  }

  override trigS(fn: 'sin' | 'cos', f: TSer): TSer {
    const res = super.trigS(fn, f);
    return this.hasTails(f) ? { ...res, lost: true } : res;
  }

  /** A rational function whose Laurent series in u is finite comes out exact (no O-term). */
  override rational(r: RatFunc): Ser {
    const res = super.rational(r);
    if (res.err === null) return res;
    const ru = inU(r, this.input.p, this.input.how, U);
    const den = coefficients(ru.den, U);
    if (den.filter((c) => c.terms.size).length !== 1) return res;
    const top = coefficients(ru.num, U).length - 1 - den.findIndex((c) => c.terms.size > 0);
    return top < qToNumber(res.err) ? { ...res, err: null } : res;
  }

  // --- leaves -----------------------------------------------------------------------------

  override expr(e: Expr, depth = 0): TSer {
    if (e.t === 'call' && e.fn === 'eta') return this.eta(e);
    if (e.t === 'name') {
      const res = (this.input.resolve as (n: string) => { lattice?: LatticeInfo } | null)(e.name);
      if (res?.lattice) return this.latticeSum(e.name, res.lattice);
    }
    return super.expr(e, depth);
  }

  /** r = c1 * u^(-k) exactly, k > 0: { c1, k }; else null. */
  private monomialPole(r: RatFunc): { c1: K; k: Q } | null {
    const ru = inU(r, this.input.p, this.input.how, U);
    const nz = (p: RatFunc['num']) => coefficients(p, U).map((c, i) => [c, i] as const).filter(([c]) => c.terms.size > 0);
    const n = nz(ru.num); const d = nz(ru.den);
    if (n.length !== 1 || d.length !== 1 || d[0]![1] <= n[0]![1]) return null;
    return { c1: rfDiv(rfPoly(n[0]![0]), rfPoly(d[0]![0])), k: q(BigInt(d[0]![1] - n[0]![1])) };
  }
  /** exp(-c/u^a) (times u^m) written in the parameter. */
  tailExpr(t: Tail): Expr {
    const up = uPowerExpr(this.input.p, this.input.how, t.a);
    const rate = call('exp', neg(up ? div(this.exprOf(t.c, true), up) : this.exprOf(t.c, true)));
    const pm = qIsZero(t.m) ? null : monExpr(this, { c: rfConst(1), a: t.m, m: 0 }, this.input.p, this.input.how);
    return pm ? mul(pm, rate) : rate;
  }

  private eta(e: Extract<Expr, { t: 'call' }>): TSer {
    const arg = e.args[0]!;
    const tau = [...freeNames(arg).keys()].every((n) => this.input.domains.has(n)) ? fromExpr(arg) : null;
    if (!tau) refuse('eta of an argument that is not a rational function of the parameters');
    const w = rfDiv(rfConst(-1), tau!);
    const pole = this.monomialPole(w);
    if (!pole) refuse('eta(tau) where -1/tau is not one power of the expansion variable times a coefficient (the modular transformation then gives no clean rate)');
    const im = rfIm(pole!.c1);
    if (this.sign(im) <= 0) refuse('eta(tau) where Im(-1/tau) is not proved to grow to +infinity (Im tau > 0 and tau -> 0 along a decided direction)');
    const minusITau = rfMul(rfConst({ re: Q0, im: q(-1n) }), tau!);
    const exponent = rfMul(rfDiv(rfMul(rfConst({ re: Q0, im: q(2n) }), fromExpr(PI)!), rfConst(24)), w);
    const lead = super.mulS(this.powS(this.rational(minusITau), q(-1n, 2n)), this.expS(this.rational(exponent)));
    const tail: Tail = { c: rfMul(rfMul(rfConst(2), fromExpr(PI)!), im), a: pole!.k, m: Q0, k: 4 };
    const tauE = ratExpr(tau!, true);
    this.uses.push({
      kind: 'modular', of: 'eta', label: formulaOf(e).text, argument: formulaOf(tauE), dual: formulaOf(ratExpr(w, true)),
      leading: formulaOf(mul(pow(ratExpr(minusITau, true), div(num(-1), num(2))), call('exp', ratExpr(exponent, true)))),
      bound: formulaOf(mul(num(4), this.tailExpr(tail))),
    });
    return this.withTails(lead, [tail], [], false);
  }

  private latticeSum(name: string, l: LatticeInfo): TSer {
    if (!rfIsZero(l.b)) refuse(`the sum ${name} has a linear term in n (b != 0); the expansion covers even sums exp(-pi*a*n^2 + g)`);
    const pole = this.monomialPole(rfDiv(rfConst(1), l.a));
    if (!pole) refuse(`the sum ${name}: 1/a is not one power of the expansion variable times a coefficient`);
    if (this.sign(rfRe(pole!.c1)) <= 0) refuse(`the sum ${name}: Re(1/a) is not proved to grow to +infinity`);
    const lead = super.mulS(this.expS(this.rational(l.g)), this.powS(this.rational(l.a), q(-1n, 2n)));
    const tail: Tail = { c: rfMul(fromExpr(PI)!, rfRe(pole!.c1)), a: pole!.k, m: Q0, k: 4 };
    const aE = ratExpr(l.a, true);
    this.uses.push({
      kind: 'modular', of: 'sum', label: name, argument: formulaOf(aE), dual: formulaOf(ratExpr(rfDiv(rfConst(1), l.a), true)),
      leading: formulaOf(rfIsZero(l.g) ? pow(aE, div(num(-1), num(2))) : mul(call('exp', ratExpr(l.g, true)), pow(aE, div(num(-1), num(2))))),
      bound: formulaOf(mul(num(4), this.tailExpr(tail))),
    });
    return this.withTails(lead, [tail], [], false);
  }

  /**
   * The remainder of an exact expansion (no O(u^err)): its O-term (the slowest rates, those not
   * provably faster than another) and the bound sum k*u^m*exp(-c/u^a) when every k is known.
   */
  remainderOf(f: TSer): { order: Expr; bound: Expr | null } | null {
    if (!this.hasTails(f) || f.lost || f.err !== null) return null;
    const t = this.tailsOf(f);
    const abs = [...t.abs, ...(this.relToAbs(f, t.rel) ?? [])];
    if (t.rel.length && !this.relToAbs(f, t.rel)) return null;
    const all = this.prune(abs);
    // O-term: drop a tail that another one provably dominates (same a and m, larger c)
    const slow = all.filter((x) => !all.some((y) => y !== x && qeq(y.a, x.a) && qcmp(y.m, x.m) <= 0 && this.sign(rfSub(x.c, y.c)) > 0));
    const order = slow.map((x) => this.tailExpr(x)).reduce((s, x) => add(s, x));
    const bound = all.every((x) => x.k !== null)
      ? all.map((x) => mul(num(Number.isInteger(x.k!) ? x.k! : Math.ceil(x.k! * 1000) / 1000), this.tailExpr(x))).reduce((s, x) => add(s, x))
      : null;
    return { order, bound };
  }
}

/** Whether a definition (through the lets it names) uses eta or a Gaussian sum: then the lattice expander runs. */
export function usesLattice(e: Expr, resolve: (n: string) => { definition?: Expr; lattice?: LatticeInfo } | null, depth = 0): boolean {
  if (depth > 40) return false;
  switch (e.t) {
    case 'call': return e.fn === 'eta' || e.args.some((a) => usesLattice(a, resolve, depth + 1));
    case 'name': { const r = resolve(e.name); return !!r?.lattice || (!!r?.definition && usesLattice(r.definition, resolve, depth + 1)); }
    case 'neg': return usesLattice(e.a, resolve, depth + 1);
    case 'bin': return usesLattice(e.a, resolve, depth + 1) || usesLattice(e.b, resolve, depth + 1);
    default: return false;
  }
}
