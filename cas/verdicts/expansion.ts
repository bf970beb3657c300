/**
 * Asymptotic expansion of a derived quantity (a `let`) as one real parameter p tends to a
 * point or to infinity, exactly. With u -> 0+ (u = 1/p, -1/p, p - p0 or p0 - p) an
 * expansion is
 *
 *     f = exp(S(u)) * ( sum_j c_j u^(a_j) (log u)^(m_j)  +  O(u^err) )
 *
 * where S is a finite sum of negative powers of u (the exponential scale), the a_j are
 * exact rationals, and each c_j lies in the field of rational functions (over Q(i)) of the
 * other parameters, pi, and "atoms": sqrt, log, exp, sin and cos of such functions, kept as
 * named symbols. Sums, products, quotients, rational powers, exp, log, sqrt, sin, cos, sinh and
 * cosh of expansions are expansions (the leading-term method of a Puiseux/transseries
 * expansion in one variable; for nested exp and log in general see D. Gruntz, "On computing
 * limits in a symbolic manipulation system", ETH Zurich thesis, 1996, from memory). Gaussian
 * results enter as prefactor (2 pi)^(n/2) prod_k d_k^(-1/2) exp(E): pivots d_k and exponent
 * E are rational in p, and each pivot has Re d_k > 0 where the integral converges, so
 * principal roots are the continuous branch.
 *
 * Branches are decided exactly: a rational power or logarithm is taken only where the
 * leading coefficient is provably off the negative real axis and the exponential scale is
 * real, so that the principal branch of the whole equals the branch of its leading part.
 * Anything else (an undecidable sign, a complex atom where a sign is needed, a function
 * outside this list) returns null with a reason, and the caller says "unknown".
 *
 * Atoms are treated as independent symbols. A relation between them that the field does
 * not see (for example sqrt(a)^2 = a is reduced; log(a) + log(b) = log(ab) is not) could
 * make a zero coefficient look nonzero, so the caller also evaluates the leading
 * coefficient numerically and refuses when it vanishes there.
 */
import type { Domain } from '../../shared/evaluation.js';
import type { Expr } from '../lang/ast.js';
import { add, call, div, mul, name as nameExpr, neg, num, pow, sub } from '../expr/build.js';
import { freeNames, substitute } from '../expr/names.js';
import { evaluate } from '../expr/evaluate.js';
import { toText } from '../expr/print.js';
import { Complex } from 'complex.js';
import { qExpr, ratExpr, sqrtExpr } from '../expr/fromExact.js';
import { coefficients, polyVar, variables, type Poly } from '../exact/poly.js';
import { fromExpr, rfAdd, rfConst, rfConstantValue, rfDiv, rfEquals, rfInv, rfIsZero, rfMul, rfNeg, rfPoly, rfPow, RF0, RF1, type RatFunc } from '../exact/ratfunc.js';
import { leadingMinorsRat } from '../exact/matrix.js';
import { q, qadd, qcmp, qdiv, qeq, qint, qIsZero, qmul, qneg, qsign, qsub, qToNumber, Q0, Q1, type Q } from '../exact/q.js';
import { rfIm, rfRe } from './exactGaussian.js';
import { exactFormOf } from './exactForm.js';
import { inU, laurent, type Approach } from './asymptotics.js';
import type { GaussianInfo } from '../statements/context.js';

type K = RatFunc;
export interface Mon { c: K; a: Q; m: number }
/** exp(S) * (terms + O(u^err)); err null: exact (no truncation). */
export interface Ser { S: { c: K; a: Q }[]; terms: Mon[]; err: Q | null }

/** Why the expansion cannot go on; `cancelled`: more terms might decide it. */
export class Refusal extends Error { constructor(message: string, readonly cancelled = false) { super(message); } }
const refuse = (why: string, cancelled = false): never => { throw new Refusal(why, cancelled); };

/** A named symbol of the coefficient field; nonzero: never 0 (exp, and roots of nonzero numbers). */
interface Atom { name: string; expr: Expr; real: boolean; positive: boolean; nonzero?: boolean; square?: K; value?: { re: number; im: number }; phase?: Q }

const qmin = (a: Q | null, b: Q | null): Q | null => (a === null ? b : b === null ? a : qcmp(a, b) <= 0 ? a : b);
const qFromInt = (n: number) => qint(n);
/** Dominance: smaller power first; at equal power, the larger power of log u. */
const monCmp = (x: Mon, y: Mon) => qcmp(x.a, y.a) || y.m - x.m;

export interface ExpansionInput {
  p: string;
  how: Approach;
  domains: ReadonlyMap<string, Domain>;
  /** A name that is neither a parameter: an integral result or a derived quantity. */
  resolve: (name: string) => { gaussian?: GaussianInfo; definition?: Expr } | null;
}

export class Expander {
  readonly atoms = new Map<string, Atom>();
  private readonly byKey = new Map<string, Atom>();
  private readonly u = '%u';
  constructor(protected readonly input: ExpansionInput, private readonly prec: Q) {}

  // --- the coefficient field ---------------------------------------------------------

  private realName(v: string): boolean {
    if (v === 'pi') return true;
    const atom = this.atoms.get(v);
    if (atom) return atom.real;
    const d = this.input.domains.get(v);
    return d !== undefined && d !== 'complex';
  }
  /** Every symbol in c is real-valued (so Re and Im of c can be read off its coefficients). */
  private realSymbols(c: K): boolean {
    return [...variables(c.num), ...variables(c.den)].every((v) => this.realName(v));
  }
  /** +1 / -1 when c is provably positive / negative for all values of the parameters, else 0. */
  sign(c: K): number {
    if (!this.realSymbols(c)) return 0;
    const single = (p: Poly) => (p.terms.size === 1 ? [...p.terms.values()][0]! : null);
    const a = single(c.num); const b = single(c.den);
    if (!a || !b || a.c.im.n !== 0n || b.c.im.n !== 0n) return 0;
    let s = qsign(a.c.re) * qsign(b.c.re);
    for (const [v, k] of [...a.m, ...b.m]) {
      const atom = this.atoms.get(v);
      const d = this.input.domains.get(v);
      if (v === 'pi' || d === 'positive' || atom?.positive) continue;
      if (k % 2 === 0 && (d === 'negative' || d === 'nonzero')) continue;
      if (d === 'negative') { s = -s; continue; }
      return 0;
    }
    return s;
  }
  /** Provably nonzero for every value of the other parameters. */
  nonzero(c: K): boolean {
    if (rfIsZero(c)) return false;
    if (rfConstantValue(c)) return true;
    // a single product of symbols that never vanish
    if (c.num.terms.size === 1 && c.den.terms.size === 1) {
      const never = (v: string) => v === 'pi' || this.atoms.get(v)?.nonzero || ['positive', 'negative', 'nonzero'].includes(this.input.domains.get(v) ?? '');
      if ([...variables(c.num), ...variables(c.den)].every(never)) return true;
    }
    if (!this.realSymbols(c)) return false;
    return this.sign(rfRe(c)) !== 0 || this.sign(rfIm(c)) !== 0;
  }
  /** Provably off the closed negative real axis (and nonzero): the principal branch is continuous there. */
  private offCut(c: K): boolean {
    const v = rfConstantValue(c);
    if (v) return !(qIsZero(v.im) && qsign(v.re) <= 0);
    const arg = this.constantArg(c);
    if (arg !== null) return Math.abs(arg) < Math.PI - 1e-9;
    if (!this.realSymbols(c)) return false;
    const re = rfRe(c); const im = rfIm(c);
    if (this.sign(re) > 0) return true;
    return rfIsZero(re) && this.sign(im) !== 0;
  }
  /**
   * The argument of a single product of constants (numbers, pi, constant atoms) and positive
   * parameters: the positive factors do not change it, so it is one number, computed in double
   * precision (the caller keeps a margin of 1e-9 from the cut). Null for anything else.
   */
  private constantArg(c: K): number | null {
    if (c.num.terms.size !== 1 || c.den.terms.size !== 1) return null;
    const a = [...c.num.terms.values()][0]!; const b = [...c.den.terms.values()][0]!;
    let z = new Complex(qToNumber(a.c.re), qToNumber(a.c.im)).div(new Complex(qToNumber(b.c.re), qToNumber(b.c.im)));
    for (const [v, k] of [...a.m, ...b.m.map(([w, e]) => [w, -e] as const)]) {
      if (v === 'pi' || this.input.domains.get(v) === 'positive' || this.atoms.get(v)?.positive) continue;
      const val = this.atoms.get(v)?.value;
      if (!val) return null;
      z = z.mul(new Complex(val.re, val.im).pow(k));
    }
    return z.isZero() || !z.isFinite() ? null : z.arg();
  }
  /** Reduces sqrt atoms: a^2 -> its radicand. */
  private reduce(c: K): K {
    const vars = new Set([...variables(c.num), ...variables(c.den)]);
    let r = c;
    for (const v of vars) {
      const sq = this.atoms.get(v)?.square;
      if (!sq) continue;
      const red = (p: Poly): K => {
        const cs = coefficients(p, v);
        if (cs.length <= 2) return rfPoly(p);
        let acc = RF0;
        cs.forEach((cj, j) => { acc = rfAdd(acc, rfMul(rfMul(rfPoly(cj), rfPow(sq, j >> 1)), (j & 1) ? rfPoly(polyVar(v)) : RF1)); });
        return acc;
      };
      r = rfDiv(red(r.num), red(r.den));
    }
    return r;
  }
  private kmul(a: K, b: K): K { return this.reduce(rfMul(a, b)); }

  /** An expression for c, atoms written out. */
  exprOf(c: K, factored = false): Expr {
    const e = ratExpr(c, factored);
    const map = new Map<string, Expr>();
    for (const v of [...variables(c.num), ...variables(c.den)]) { const a = this.atoms.get(v); if (a) map.set(v, a.expr); }
    return map.size ? substitute(e, map) : e;
  }
  private atom(kind: string, arg: K, make: () => Omit<Atom, 'name'>): K {
    const key = `${kind}(${this.exprKey(arg)})`;
    let a = this.byKey.get(key);
    if (!a) {
      a = { name: `%a${this.atoms.size}`, ...make() };
      // an atom's form names no other atom: write theirs out
      const inner = new Map<string, Expr>();
      for (const n of freeNames(a.expr).keys()) { const b = this.atoms.get(n); if (b) inner.set(n, b.expr); }
      if (inner.size) a.expr = substitute(a.expr, inner);
      if (freeNames(a.expr).size === 0) { try { const z = evaluate(a.expr, new Map()); if (Number.isFinite(z.re) && Number.isFinite(z.im)) a.value = { re: z.re, im: z.im }; } catch { /* no value */ } }
      this.byKey.set(key, a); this.atoms.set(a.name, a);
    }
    return rfPoly(polyVar(a.name));
  }
  private exprKey(c: K): string { return JSON.stringify(this.exprOf(c)); }
  private positiveNames(): Set<string> {
    return new Set([...this.input.domains].filter(([, d]) => d === 'positive').map(([k]) => k));
  }

  /** Principal c^r for c off the cut; r integer is exact. */
  private cpow(c: K, r: Q): K {
    if (r.d === 1n) {
      const n = Number(r.n);
      if (n < 0 && !this.nonzero(c)) refuse('a power with a negative exponent of a coefficient that may vanish');
      return this.reduce(n >= 0 ? rfPow(c, n) : rfPow(rfInv(c), -n));
    }
    if (!this.offCut(c)) refuse('a root of a coefficient not provably off the negative real axis');
    const polar = this.polar(c);
    if (polar && !qIsZero(polar.theta)) return this.kmul(this.cpow(polar.mod, r), this.phaseK(qmul(polar.theta, r)));
    const whole = r.n / r.d - (r.n < 0n && r.n % r.d !== 0n ? 1n : 0n); // floor
    const frac = qsub(r, qint(whole));
    const base = frac.d === 2n ? this.sqrtAtom(c) : this.powAtom(c, frac);
    return this.kmul(base, this.cpow(c, qint(whole)));
  }
  private sqrtAtom(c: K): K {
    // c = (positive rational) * monomial in positive names: pull squares out exactly
    const v = rfConstantValue(c);
    if (v && qIsZero(v.im) && qsign(v.re) > 0) {
      const e = sqrtExpr(c, new Set());
      const ex = fromExpr(e);
      if (ex) return ex;
    }
    const positive = this.sign(c) > 0;
    return this.atom('sqrt', c, () => ({ expr: sqrtExpr(c, this.positiveNames()), real: positive, positive, nonzero: true, square: c }));
  }
  /**
   * c = modulus * exp(i*pi*theta) exactly, when c is one product of a rational or imaginary
   * number, positive symbols and phases: then c^r = modulus^r * exp(i*pi*theta*r) on the
   * principal branch (|theta| < 1), and roots print as phases, not as roots of i.
   */
  private polar(c: K): { mod: K; theta: Q } | null {
    if (c.num.terms.size !== 1 || c.den.terms.size !== 1) return null;
    const a = [...c.num.terms.values()][0]!; const b = [...c.den.terms.values()][0]!;
    const ratio = (x: { re: Q; im: Q }) => (qIsZero(x.im) ? { r: x.re, t: Q0 } : qIsZero(x.re) ? { r: x.im, t: q(1n, 2n) } : null);
    const ga = ratio(a.c); const gb = ratio(b.c);
    if (!ga || !gb) return null;
    let theta = qsub(ga.t, gb.t);
    let r = qdiv(ga.r, gb.r);
    if (qsign(r) < 0) { r = qneg(r); theta = qadd(theta, Q1); }
    let mod: K = rfConst(r);
    for (const [v, k, side] of [...a.m.map(([w, e]) => [w, e, 1] as const), ...b.m.map(([w, e]) => [w, e, -1] as const)]) {
      const atom = this.atoms.get(v);
      if (atom?.phase) { theta = qadd(theta, qmul(atom.phase, qint(k * side))); continue; }
      if (v === 'pi' || this.input.domains.get(v) === 'positive' || atom?.positive) {
        const f = rfPow(rfPoly(polyVar(v)), k);
        mod = side > 0 ? rfMul(mod, f) : rfDiv(mod, f);
        continue;
      }
      return null;
    }
    // theta in (-1, 1]
    const two = qint(2);
    while (qcmp(theta, Q1) > 0) theta = qsub(theta, two);
    while (qcmp(theta, qneg(Q1)) <= 0) theta = qadd(theta, two);
    return { mod, theta };
  }
  /** exp(i*pi*theta) in the field: 1, i, -1, -i exactly, otherwise a phase atom. */
  private phaseK(theta: Q): K {
    const two = qint(2);
    while (qcmp(theta, Q1) > 0) theta = qsub(theta, two);
    while (qcmp(theta, qneg(Q1)) <= 0) theta = qadd(theta, two);
    if (qIsZero(theta)) return RF1;
    if (qeq(theta, Q1)) return rfConst(-1);
    if (qeq(theta, q(1n, 2n))) return rfConst({ re: Q0, im: Q1 });
    if (qeq(theta, q(-1n, 2n))) return rfConst({ re: Q0, im: qneg(Q1) });
    const t = theta;
    return this.atom(`phase${t.n}/${t.d}`, RF1, () => ({ expr: call('exp', mul(mul(qExpr(t), { t: 'const', name: 'i' }), { t: 'const', name: 'pi' })), real: false, positive: false, nonzero: true, phase: t }));
  }
  private powAtom(c: K, r: Q): K {
    const positive = this.sign(c) > 0;
    return this.atom(`pow${r.n}/${r.d}`, c, () => ({ expr: pow(this.exprOf(c, true), div(num(r.n.toString()), num(r.d.toString()))), real: positive, positive, nonzero: true }));
  }
  private logAtom(c: K): K {
    const v = rfConstantValue(c);
    if (v && qIsZero(v.im) && v.re.n === 1n && v.re.d === 1n) return RF0;
    const positive = this.sign(c) > 0;
    return this.atom('log', c, () => ({ expr: call('log', this.exprOf(c, true)), real: positive, positive: false }));
  }
  private expAtom(c: K): K {
    if (rfIsZero(c)) return RF1;
    const real = this.realSymbols(c) && rfIsZero(rfIm(c));
    return this.atom('exp', c, () => ({ expr: call('exp', this.exprOf(c)), real, positive: real, nonzero: true }));
  }
  private trigAtom(fn: 'sin' | 'cos', c: K): K {
    const real = this.realSymbols(c) && rfIsZero(rfIm(c));
    return this.atom(fn, c, () => ({ expr: call(fn, this.exprOf(c)), real, positive: false }));
  }

  // --- series arithmetic ----------------------------------------------------------------

  private norm(S: Ser['S'], terms: Mon[], err: Q | null): Ser {
    const merged = new Map<string, Mon>();
    for (const t of terms) {
      if (err && qcmp(t.a, err) >= 0) continue;
      const key = `${t.a.n}/${t.a.d}:${t.m}`;
      const prev = merged.get(key);
      merged.set(key, prev ? { ...prev, c: rfAdd(prev.c, t.c) } : t);
    }
    const out = [...merged.values()].filter((t) => !rfIsZero(t.c)).sort(monCmp);
    const s = new Map<string, { c: K; a: Q }>();
    for (const t of S) { const key = `${t.a.n}/${t.a.d}`; const prev = s.get(key); s.set(key, prev ? { a: t.a, c: rfAdd(prev.c, t.c) } : t); }
    return { S: [...s.values()].filter((t) => !rfIsZero(t.c)).sort((x, y) => qcmp(x.a, y.a)), terms: out, err };
  }
  constant(c: K): Ser { return this.norm([], [{ c, a: Q0, m: 0 }], null); }

  private sameS(x: Ser['S'], y: Ser['S']) { return x.length === y.length && x.every((t, i) => qeq(t.a, y[i]!.a) && rfEquals(t.c, y[i]!.c)); }

  addS(f: Ser, g: Ser): Ser {
    if (!f.terms.length && f.err === null) return g;
    if (!g.terms.length && g.err === null) return f;
    if (this.sameS(f.S, g.S)) return this.norm(f.S, [...f.terms, ...g.terms], qmin(f.err, g.err));
    // different exponential scales: the one whose exponent has the larger real part wins
    const diff = this.norm([...f.S, ...g.S.map((t) => ({ ...t, c: rfNeg(t.c) }))], [], null).S;
    for (const d of diff) {
      if (!this.realSymbols(d.c)) refuse('the exponential scales of two terms cannot be compared (a complex coefficient)');
      const re = rfRe(d.c);
      if (rfIsZero(re)) continue;
      const s = this.sign(re);
      if (s === 0) refuse('the exponential scales of two terms cannot be compared on the whole domain');
      if (!f.terms.length || !g.terms.length) refuse('a sum cancels to all orders computed', true);
      return s > 0 ? f : g;
    }
    refuse('two terms of equal size oscillate against each other');
    return f;
  }
  negS(f: Ser): Ser { return { ...f, terms: f.terms.map((t) => ({ ...t, c: rfNeg(t.c) })) }; }
  mulS(f: Ser, g: Ser): Ser {
    if (!f.terms.length || !g.terms.length) {
      if (f.err === null && !f.terms.length) return f; // exact zero
      if (g.err === null && !g.terms.length) return g;
      refuse('a factor cancels to all orders computed', true);
    }
    const fl = f.terms[0]!.a; const gl = g.terms[0]!.a;
    const err = qmin(f.err && qadd(f.err, gl), g.err && qadd(g.err, fl));
    const terms: Mon[] = [];
    for (const x of f.terms) for (const y of g.terms) {
      const a = qadd(x.a, y.a);
      if (err && qcmp(a, err) >= 0) continue;
      terms.push({ c: this.kmul(x.c, y.c), a, m: x.m + y.m });
    }
    return this.norm([...f.S, ...g.S], terms, err);
  }

  /** f = exp(S) * L * (1 + h): L the leading monomial, h small (every term a > 0). */
  private split(f: Ser): { L: Mon; h: Ser } {
    if (!f.terms.length) refuse('an expression cancels to all orders computed; its leading term is not known', true);
    const L = f.terms[0]!;
    if (!this.nonzero(L.c)) refuse(`the leading coefficient ${this.exprText(L.c)} may vanish for some values of the other parameters`);
    const inv = rfInv(L.c);
    const terms = f.terms.slice(1).map((t) => ({ c: this.kmul(t.c, inv), a: qsub(t.a, L.a), m: t.m - L.m }));
    if (terms.some((t) => qsign(t.a) <= 0)) refuse('a correction is not smaller than the leading term by a power (a logarithmic correction)');
    return { L, h: { S: [], terms, err: f.err && qsub(f.err, L.a) } };
  }
  /** The coefficient as infix text for a refusal (shortened: a reason, not a record). */
  private exprText(c: K): string { const t = toText(this.exprOf(c, true)); return t.length > 80 ? `${t.slice(0, 77)}...` : t; }

  /** sum_j coef(j) h^j up to the working precision; h small. */
  private powerSeries(h: Ser, coef: (j: number) => K): Ser {
    const target = qmin(h.err, this.prec)!;
    if (!h.terms.length) return this.norm([], [{ c: coef(0), a: Q0, m: 0 }], h.err === null ? null : target);
    const low = h.terms[0]!.a;
    const J = Math.ceil(qToNumber(target) / qToNumber(low));
    const trunc = (s: Ser): Ser => this.norm([], s.terms, qmin(s.err, target));
    let hj: Ser = this.norm([], [{ c: RF1, a: Q0, m: 0 }], null);
    let acc: Ser = this.norm([], [{ c: coef(0), a: Q0, m: 0 }], target);
    for (let j = 1; j <= J; j++) {
      hj = trunc(this.mulS(hj, h));
      const cj = coef(j);
      if (!rfIsZero(cj)) acc = this.addS(acc, { S: [], terms: hj.terms.map((t) => ({ ...t, c: this.kmul(t.c, cj) })), err: hj.err });
    }
    return this.norm([], acc.terms, qmin(acc.err, target));
  }

  powS(f: Ser, r: Q): Ser {
    if (r.d === 1n && !f.terms.length && f.err === null) { if (qsign(r) > 0) return f; refuse('a negative power of zero'); }
    const { L, h } = this.split(f);
    const mr = qmul(qint(L.m), r);
    if (mr.d !== 1n) refuse('a fractional power of a logarithm');
    if (r.d !== 1n && f.S.some((t) => !this.realSymbols(t.c) || !rfIsZero(rfIm(t.c)))) refuse('a root of an oscillating exponential');
    const c = this.cpow(L.c, r);
    const binom = (j: number): K => { let b = Q1; for (let i = 0; i < j; i++) b = qdiv(qmul(b, qsub(r, qint(i))), qint(i + 1)); return rfConst(b); };
    const series = this.powerSeries(h, binom);
    const head: Ser = { S: f.S.map((t) => ({ a: t.a, c: rfMul(t.c, rfConst(r)) })), terms: [{ c, a: qmul(L.a, r), m: Number(mr.n) }], err: null };
    return this.mulS(head, series);
  }

  expS(f: Ser): Ser {
    if (f.S.length) refuse('an exponential of an exponential');
    if (f.err !== null && qsign(f.err) <= 0) refuse('an exponent known only up to a term that does not vanish');
    const S: Ser['S'] = []; let c0 = RF0; let shift = Q0; const small: Mon[] = [];
    for (const t of f.terms) {
      if (qsign(t.a) < 0) { if (t.m !== 0) refuse('an exponent with a logarithmic singular term'); S.push({ c: t.c, a: t.a }); }
      else if (qsign(t.a) === 0) {
        if (t.m === 0) c0 = rfAdd(c0, t.c);
        else if (t.m === 1) { const v = rfConstantValue(t.c); if (!v || !qIsZero(v.im)) refuse('exp of a non-rational multiple of a logarithm'); shift = qadd(shift, v!.re); }
        else refuse('exp of a power of a logarithm');
      } else small.push(t);
    }
    let fact = 1n;
    const series = this.powerSeries({ S: [], terms: small, err: f.err }, (j) => { if (j > 0) fact *= BigInt(j); return rfConst(q(1n, fact)); });
    return this.mulS({ S, terms: [{ c: this.expAtom(c0), a: shift, m: 0 }], err: null }, series);
  }

  logS(f: Ser): Ser {
    const { L, h } = this.split(f);
    if (L.m !== 0) refuse('the logarithm of a logarithm');
    if (f.S.some((t) => !this.realSymbols(t.c) || !rfIsZero(rfIm(t.c)))) refuse('the logarithm of an oscillating exponential');
    if (!this.offCut(L.c)) refuse('the logarithm of a leading coefficient not provably off the negative real axis');
    const terms: Mon[] = [...f.S.map((t) => ({ c: t.c, a: t.a, m: 0 })), { c: this.logAtom(L.c), a: Q0, m: 0 }];
    if (!qIsZero(L.a)) terms.push({ c: rfConst(L.a), a: Q0, m: 1 });
    const series = this.powerSeries(h, (j) => (j === 0 ? RF0 : rfConst(q(j % 2 ? 1n : -1n, BigInt(j)))));
    return this.addS(this.norm([], terms, null), series);
  }

  /** sin or cos of f, f bounded: sin(c0 + h) = sin c0 cos h + cos c0 sin h. */
  trigS(fn: 'sin' | 'cos', f: Ser): Ser {
    if (f.S.length || f.terms.some((t) => qsign(t.a) < 0 || (qsign(t.a) === 0 && t.m !== 0))) refuse(`${fn} of an unbounded argument`);
    if (f.err !== null && qsign(f.err) <= 0) refuse(`${fn} of an argument known only up to a term that does not vanish`);
    const c0 = f.terms.filter((t) => qsign(t.a) === 0).reduce((a, t) => rfAdd(a, t.c), RF0);
    const h: Ser = { S: [], terms: f.terms.filter((t) => qsign(t.a) > 0), err: f.err };
    let fact = 1n;
    const facts: bigint[] = [1n];
    for (let j = 1; j < 200; j++) { fact *= BigInt(j); facts.push(fact); }
    const sinH = this.powerSeries(h, (j) => (j % 2 ? rfConst(q(j % 4 === 1 ? 1n : -1n, facts[j]!)) : RF0));
    const cosH = this.powerSeries(h, (j) => (j % 2 ? RF0 : rfConst(q(j % 4 === 0 ? 1n : -1n, facts[j]!))));
    const s0 = this.constant(rfIsZero(c0) ? RF0 : this.trigAtom('sin', c0));
    const k0 = this.constant(rfIsZero(c0) ? RF1 : this.trigAtom('cos', c0));
    return fn === 'sin' ? this.addS(this.mulS(s0, cosH), this.mulS(k0, sinH)) : this.addS(this.mulS(k0, cosH), this.negS(this.mulS(s0, sinH)));
  }

  /**
   * sinh or cosh of a bounded argument c0 + h (h -> 0), as sinh(c0) cosh(h) + cosh(c0) sinh(h)
   * with sinh(c0) and cosh(c0) kept as atoms: a real c0 makes cosh(c0) positive and sinh(c0)
   * signed like c0, which the exp form (two independent exp atoms) cannot show. Null for an
   * unbounded argument (the exp form then takes it).
   */
  private hypS(fn: 'sinh' | 'cosh', f: Ser): Ser | null {
    if (f.S.length || f.terms.some((t) => qsign(t.a) < 0 || (qsign(t.a) === 0 && t.m !== 0))) return null;
    if (f.err !== null && qsign(f.err) <= 0) return null;
    const c0 = f.terms.filter((t) => qsign(t.a) === 0).reduce((a, t) => rfAdd(a, t.c), RF0);
    const h: Ser = { S: [], terms: f.terms.filter((t) => qsign(t.a) > 0), err: f.err };
    let fact = 1n;
    const facts: bigint[] = [1n];
    for (let j = 1; j < 200; j++) { fact *= BigInt(j); facts.push(fact); }
    const sinhH = this.powerSeries(h, (j) => (j % 2 ? rfConst(q(1n, facts[j]!)) : RF0));
    const coshH = this.powerSeries(h, (j) => (j % 2 ? RF0 : rfConst(q(1n, facts[j]!))));
    const real = this.realSymbols(c0) && rfIsZero(rfIm(c0));
    const sign = real ? this.sign(c0) : 0;
    const s0 = rfIsZero(c0) ? RF0 : this.atom('sinh', c0, () => ({ expr: call('sinh', this.exprOf(c0)), real, positive: sign > 0, nonzero: sign !== 0 }));
    const k0 = rfIsZero(c0) ? RF1 : this.atom('cosh', c0, () => ({ expr: call('cosh', this.exprOf(c0)), real, positive: real, nonzero: real }));
    const S0 = this.constant(s0); const K0 = this.constant(k0);
    return fn === 'sinh' ? this.addS(this.mulS(S0, coshH), this.mulS(K0, sinhH)) : this.addS(this.mulS(K0, coshH), this.mulS(S0, sinhH));
  }

  /**
   * asinh of an argument that tends to 0 (every term a positive power of u): the odd series
   * asinh h = sum_k (-1)^k (2k)!/(4^k (k!)^2 (2k+1)) h^(2k+1). This is what a time-sliced
   * determinant needs: theta = 2*asinh(eps*sqrt(V)/2) with eps = L/N is x/N - x^3/(24 N^3) + ...
   * An argument with a nonzero limit would need asinh of that limit as an atom and is refused.
   */
  asinhS(f: Ser): Ser {
    if (f.S.length || f.terms.some((t) => qsign(t.a) <= 0)) refuse('asinh of an argument that does not tend to 0');
    const coef = (j: number): K => {
      if (j % 2 === 0) return RF0;
      const k = (j - 1) / 2;
      let c = q(1n, BigInt(2 * k + 1)); // (2k)!/(4^k (k!)^2) built as prod_{i<k} (2i+1)/(2i+2)
      for (let i = 0; i < k; i++) c = qmul(c, q(BigInt(2 * i + 1), BigInt(2 * i + 2)));
      return rfConst(k % 2 ? qneg(c) : c);
    };
    return this.powerSeries(f, coef);
  }

  // --- leaves -----------------------------------------------------------------------------

  /** A rational function of the parameters (p among them) as a Laurent series in u. */
  rational(r: RatFunc): Ser {
    const { p, how } = this.input;
    if (!variables(r.num).includes(p) && !variables(r.den).includes(p)) return this.norm([], [{ c: r, a: Q0, m: 0 }], null);
    const ru = inU(r, p, how, this.u);
    const upTo = Math.ceil(qToNumber(this.prec)) + 2;
    const l0 = laurent(ru, this.u, 0);
    if (!l0) return this.norm([], [], null);
    const l = laurent(ru, this.u, l0.order + upTo);
    if (!l) return this.norm([], [], null);
    const terms = l.coeffs.map((c, k) => ({ c, a: qFromInt(l.order + k), m: 0 }));
    return this.norm([], terms, qFromInt(l.order + upTo + 1));
  }

  gaussian(g: GaussianInfo): Ser {
    if (g.contour) refuse('a rotated result (its contour is not the real one)');
    if (g.convergence !== 'absolute' && g.convergence !== 'oscillatory') refuse('a result that does not converge on the whole domain');
    const form = exactFormOf(g.form);
    if (!form) refuse('a result whose quadratic form is not rational in the parameters');
    const A = form!.A; const n = form!.vars.length;
    const minors = leadingMinorsRat(A);
    let prev = RF1;
    let z = this.expr(g.prefactor);
    const twoPi = rfMul(rfConst(2), fromExpr({ t: 'const', name: 'pi' })!);
    z = this.mulS(z, this.powS(this.constant(twoPi), q(BigInt(n), 2n)));
    for (const m of minors) {
      if (rfIsZero(m)) refuse('a singular leading minor');
      z = this.mulS(z, this.powS(this.rational(rfDiv(m, prev)), q(-1n, 2n)));
      prev = m;
    }
    // exponent E = J^T A^-1 J / 2 + c by Cramer's rule
    const det = prev;
    let E = form!.c;
    for (let i = 0; i < n; i++) {
      if (rfIsZero(form!.J[i]!)) continue;
      const Ai = A.map((row, r) => row.map((x, c) => (c === i ? form!.J[r]! : x)));
      E = rfAdd(E, rfDiv(rfMul(form!.J[i]!, detOf(Ai)), rfMul(det, rfConst(2))));
    }
    return rfIsZero(E) ? z : this.mulS(z, this.expS(this.rational(E)));
  }

  expr(e: Expr, depth = 0): Ser {
    if (depth > 40) refuse('the expression is nested too deeply');
    const r = isRationalLeaf(e, (n) => this.input.domains.has(n)) ? fromExpr(e) : null;
    if (r) return this.rational(r);
    switch (e.t) {
      case 'num': case 'const': {
        if (e.t === 'const' && e.name === 'e') return this.expS(this.constant(RF1));
        return refuse(`the constant ${JSON.stringify(e)}`);
      }
      case 'name': {
        const res = this.input.resolve(e.name);
        if (res?.gaussian) return this.gaussian(res.gaussian);
        if (res?.definition) return this.expr(res.definition, depth + 1);
        return refuse(`${e.name} is not a Gaussian result or a derived quantity of them`);
      }
      case 'neg': return this.negS(this.expr(e.a, depth + 1));
      case 'bin': {
        const a = this.expr(e.a, depth + 1);
        if (e.op === '^') {
          const ex = fromExpr(e.b);
          const v = ex && rfConstantValue(ex);
          if (v && qIsZero(v.im)) return this.powS(a, v.re);
          return this.expS(this.mulS(this.expr(e.b, depth + 1), this.logS(a)));
        }
        const b = this.expr(e.b, depth + 1);
        switch (e.op) {
          case '+': return this.addS(a, b);
          case '-': return this.addS(a, this.negS(b));
          case '*': return this.mulS(a, b);
          case '/': return this.mulS(a, this.powS(b, qint(-1)));
        }
        return refuse('an operator');
      }
      case 'call': {
        const a = this.expr(e.args[0]!, depth + 1);
        switch (e.fn) {
          case 'exp': return this.expS(a);
          case 'log': return this.logS(a);
          case 'sqrt': return this.powS(a, q(1n, 2n));
          case 'sin': case 'cos': return this.trigS(e.fn, a);
          case 'sinh': case 'cosh': {
            const bounded = this.hypS(e.fn, a);
            if (bounded) return bounded;
            const half = this.constant(rfConst(q(1n, 2n)));
            const ep = this.expS(a); const em = this.expS(this.negS(a));
            return this.mulS(half, this.addS(ep, e.fn === 'sinh' ? this.negS(em) : em));
          }
          case 'asinh': return this.asinhS(a);
        }
        return refuse(`the function ${e.fn}`);
      }
    }
  }
}

function detOf(A: RatFunc[][]): RatFunc {
  const m = leadingMinorsRat(A);
  return m[m.length - 1] ?? RF1;
}

/** Parameters and numbers only (no results, no function calls): fromExpr may take it whole. */
function isRationalLeaf(e: Expr, isParam: (n: string) => boolean): boolean {
  switch (e.t) {
    case 'num': return true;
    case 'const': return e.name !== 'e';
    case 'name': return isParam(e.name);
    case 'neg': return isRationalLeaf(e.a, isParam);
    case 'bin': return isRationalLeaf(e.a, isParam) && isRationalLeaf(e.b, isParam);
    case 'call': return false;
  }
}


// --- reading an expansion in the parameter ------------------------------------------------

/** u in terms of p. */
export function uIn(p: string, how: Approach): Expr {
  const P = nameExpr(p);
  if (how.kind === 'inf') return div(num(1), P);
  if (how.kind === '-inf') return neg(div(num(1), P));
  const p0 = qExpr(how.at);
  const d = p0.t === 'num' && p0.v === '0' ? P : sub(P, p0);
  return how.side > 0 ? d : (p0.t === 'num' && p0.v === '0' ? neg(P) : sub(p0, P));
}
/** u^a as a power of p (at infinity) or of p - p0. */
export function uPowerExpr(p: string, how: Approach, a: Q): Expr | null {
  if (qIsZero(a)) return null;
  const root = (base: Expr, k: Q): Expr => (qeq(k, Q1) ? base : k.d === 2n && k.n === 1n ? call('sqrt', base) : pow(base, qExpr(k)));
  if (how.kind === 'inf' || how.kind === '-inf') {
    const base = how.kind === 'inf' ? nameExpr(p) : neg(nameExpr(p));
    return qsign(a) < 0 ? root(base, qneg(a)) : div(num(1), root(base, a));
  }
  const base = uIn(p, how);
  return qsign(a) > 0 ? root(base, a) : div(num(1), root(base, qneg(a)));
}
/** log u in p. */
export function logUExpr(p: string, how: Approach): Expr {
  if (how.kind === 'inf') return neg(call('log', nameExpr(p)));
  if (how.kind === '-inf') return neg(call('log', neg(nameExpr(p))));
  return call('log', uIn(p, how));
}

export function monExpr(x: Expander, t: Mon, p: string, how: Approach): Expr {
  let e: Expr = x.exprOf(t.c, true);
  const up = uPowerExpr(p, how, t.a);
  if (up) e = mul(e, up);
  if (t.m !== 0) {
    const l = logUExpr(p, how);
    e = t.m > 0 ? mul(e, t.m === 1 ? l : pow(l, num(t.m))) : div(e, pow(l, num(-t.m)));
  }
  return e;
}
export function scaleExpr(x: Expander, S: Ser['S'], p: string, how: Approach): Expr | null {
  if (!S.length) return null;
  const sum = S.map((t) => monExpr(x, { c: t.c, a: t.a, m: 0 }, p, how)).reduce((a, b) => add(a, b));
  return call('exp', sum);
}

