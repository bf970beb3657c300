/**
 * Sparse multivariate polynomials over Q(i) in named variables.
 *
 * A monomial is a list of [variable, exponent > 0] sorted by variable name; its key
 * ("k^2*t") indexes the term map, so equal monomials meet in O(1). The term order is
 * lex with variables in name order (a > b > ... ; "k" before "t"), which fixes what
 * "leading term" and "monic" mean for gcd and for rational-function normalisation.
 *
 *   const k = polyVar('k'), t = polyVar('t');
 *   const p = polyPow(polyAdd(k, polyScale(t, GI)), 4);   // (k + i t)^4
 *   squareFree(p).factors   // [{ f: k + i*t, k: 4 }]
 */
import {
  type GQ, type Q, G0, G1, gadd, gmul, gneg, ginv, gIsZero, gIsOne, geq, gconj, qint, gqToString,
  qToNumber, Q0,
} from './q.js';

export type Mono = readonly (readonly [string, number])[];
export interface Term { readonly m: Mono; readonly c: GQ }
/** Immutable by convention: every operation returns a new polynomial. */
export interface Poly { readonly terms: ReadonlyMap<string, Term> }

export interface Cx { re: number; im: number }

// ---- monomials -------------------------------------------------------------------

export const monoKey = (m: Mono): string => m.map(([v, e]) => (e === 1 ? v : `${v}^${e}`)).join('*');

function monoMul(a: Mono, b: Mono): Mono {
  if (a.length === 0) return b;
  if (b.length === 0) return a;
  const out: [string, number][] = [];
  let i = 0, j = 0;
  while (i < a.length && j < b.length) {
    const x = a[i]!, y = b[j]!;
    if (x[0] === y[0]) { out.push([x[0], x[1] + y[1]]); i++; j++; }
    else if (x[0] < y[0]) { out.push([x[0], x[1]]); i++; }
    else { out.push([y[0], y[1]]); j++; }
  }
  while (i < a.length) { const x = a[i++]!; out.push([x[0], x[1]]); }
  while (j < b.length) { const y = b[j++]!; out.push([y[0], y[1]]); }
  return out;
}

/** a / b when b divides a, else null. */
function monoDiv(a: Mono, b: Mono): Mono | null {
  const out: [string, number][] = [];
  let j = 0;
  for (const [v, e] of a) {
    const y = b[j];
    if (y && y[0] === v) {
      if (y[1] > e) return null;
      if (y[1] < e) out.push([v, e - y[1]]);
      j++;
    } else if (y && y[0] < v) return null;
    else out.push([v, e]);
  }
  return j === b.length ? out : null;
}

/** Lex order, variables in name order: > 0 when a is the larger monomial. */
export function monoCmp(a: Mono, b: Mono): number {
  const n = Math.min(a.length, b.length);
  for (let i = 0; i < n; i++) {
    const x = a[i]!, y = b[i]!;
    if (x[0] !== y[0]) return x[0] < y[0] ? 1 : -1;
    if (x[1] !== y[1]) return x[1] - y[1];
  }
  return a.length - b.length;
}

// ---- construction ----------------------------------------------------------------

const mk = (terms: Map<string, Term>): Poly => ({ terms });
export const ZERO: Poly = mk(new Map());
export const ONE: Poly = polyConst(G1);

function toGQ(c: GQ | Q | number | bigint): GQ {
  if (typeof c === 'number' || typeof c === 'bigint') return { re: qint(c), im: Q0 };
  return 're' in c ? c : { re: c, im: Q0 };
}
export function polyConst(c: GQ | Q | number | bigint): Poly {
  const g = toGQ(c);
  return gIsZero(g) ? ZERO : mk(new Map([['', { m: [], c: g }]]));
}
export function polyVar(name: string): Poly {
  return mk(new Map([[name, { m: [[name, 1]], c: G1 }]]));
}
/** Build from terms, combining equal monomials (exponents 0 are dropped). */
export function polyFromTerms(list: Iterable<{ m: Mono; c: GQ }>): Poly {
  const acc = new Map<string, Term>();
  for (const { m, c } of list) {
    const mm = [...m].filter(([, e]) => e > 0).sort((x, y) => (x[0] < y[0] ? -1 : x[0] > y[0] ? 1 : 0));
    addInto(acc, mm, c);
  }
  return mk(acc);
}

function addInto(acc: Map<string, Term>, m: Mono, c: GQ, key = monoKey(m)): void {
  const old = acc.get(key);
  if (!old) { if (!gIsZero(c)) acc.set(key, { m, c }); return; }
  const s = gadd(old.c, c);
  if (gIsZero(s)) acc.delete(key); else acc.set(key, { m, c: s });
}

// ---- arithmetic ------------------------------------------------------------------

export function polyAdd(a: Poly, b: Poly): Poly {
  if (a.terms.size === 0) return b;
  if (b.terms.size === 0) return a;
  const acc = new Map(a.terms);
  for (const [k, t] of b.terms) addInto(acc, t.m, t.c, k);
  return mk(acc);
}
export function polyNeg(a: Poly): Poly {
  const acc = new Map<string, Term>();
  for (const [k, t] of a.terms) acc.set(k, { m: t.m, c: gneg(t.c) });
  return mk(acc);
}
export function polySub(a: Poly, b: Poly): Poly {
  if (b.terms.size === 0) return a;
  const acc = new Map(a.terms);
  for (const [k, t] of b.terms) addInto(acc, t.m, gneg(t.c), k);
  return mk(acc);
}
export function polyScale(a: Poly, c: GQ | Q | number | bigint): Poly {
  const g = toGQ(c);
  if (gIsZero(g)) return ZERO;
  if (gIsOne(g)) return a;
  const acc = new Map<string, Term>();
  for (const [k, t] of a.terms) acc.set(k, { m: t.m, c: gmul(t.c, g) });
  return mk(acc);
}
/** a times the monomial c*m. */
function mulTerm(a: Poly, m: Mono, c: GQ): Poly {
  const acc = new Map<string, Term>();
  for (const t of a.terms.values()) {
    const mm = monoMul(t.m, m);
    acc.set(monoKey(mm), { m: mm, c: gmul(t.c, c) });
  }
  return mk(acc);
}
export function polyMul(a: Poly, b: Poly): Poly {
  if (a.terms.size === 0 || b.terms.size === 0) return ZERO;
  if (a.terms.size > b.terms.size) [a, b] = [b, a];
  if (a.terms.size === 1) { const t = a.terms.values().next().value!; return mulTerm(b, t.m, t.c); }
  const acc = new Map<string, Term>();
  const bs = [...b.terms.values()];
  for (const x of a.terms.values()) {
    for (const y of bs) addInto(acc, monoMul(x.m, y.m), gmul(x.c, y.c));
  }
  return mk(acc);
}
export function polyPow(a: Poly, e: number): Poly {
  if (!Number.isInteger(e) || e < 0) throw new Error('polyPow: exponent must be a nonnegative integer');
  let r = ONE, b = a;
  while (e > 0) { if (e & 1) r = polyMul(r, b); e >>= 1; if (e) b = polyMul(b, b); }
  return r;
}

// ---- inspection ------------------------------------------------------------------

export const isZero = (a: Poly) => a.terms.size === 0;
export const isConstant = (a: Poly) => a.terms.size === 0 || (a.terms.size === 1 && a.terms.has(''));
/** The constant term (the value when a is constant). */
export const constantTerm = (a: Poly): GQ => a.terms.get('')?.c ?? G0;
export function polyEquals(a: Poly, b: Poly): boolean {
  if (a.terms.size !== b.terms.size) return false;
  for (const [k, t] of a.terms) { const u = b.terms.get(k); if (!u || !geq(t.c, u.c)) return false; }
  return true;
}
const expOf = (m: Mono, v: string): number => { for (const [w, e] of m) if (w === v) return e; return 0; };
/** Degree in v (-1 for the zero polynomial). */
export function degree(a: Poly, v: string): number {
  if (a.terms.size === 0) return -1;
  let d = 0;
  for (const t of a.terms.values()) d = Math.max(d, expOf(t.m, v));
  return d;
}
export function totalDegree(a: Poly): number {
  let d = a.terms.size === 0 ? -1 : 0;
  for (const t of a.terms.values()) d = Math.max(d, t.m.reduce((s, [, e]) => s + e, 0));
  return d;
}
/** Variables that occur, sorted by name. */
export function variables(a: Poly): string[] {
  const s = new Set<string>();
  for (const t of a.terms.values()) for (const [v] of t.m) s.add(v);
  return [...s].sort();
}
/** The lex-leading term (null for zero). */
export function leadingTerm(a: Poly): Term | null {
  let best: Term | null = null;
  for (const t of a.terms.values()) if (!best || monoCmp(t.m, best.m) > 0) best = t;
  return best;
}
export const leadingCoeff = (a: Poly): GQ => leadingTerm(a)?.c ?? G0;

/** Coefficients in v: a = sum_k cs[k] v^k, each cs[k] free of v. */
export function coefficients(a: Poly, v: string): Poly[] {
  const accs: Map<string, Term>[] = [];
  for (const t of a.terms.values()) {
    const e = expOf(t.m, v);
    const m = e === 0 ? t.m : t.m.filter(([w]) => w !== v);
    (accs[e] ??= new Map()).set(monoKey(m), { m, c: t.c });
  }
  const out: Poly[] = [];
  for (let k = 0; k < accs.length; k++) out.push(accs[k] ? mk(accs[k]!) : ZERO);
  return out;
}
export function fromCoefficients(cs: readonly Poly[], v: string): Poly {
  const acc = new Map<string, Term>();
  cs.forEach((c, k) => {
    const vm: Mono = k === 0 ? [] : [[v, k]];
    for (const t of c.terms.values()) { const m = monoMul(t.m, vm); acc.set(monoKey(m), { m, c: t.c }); }
  });
  return mk(acc);
}

// ---- calculus and evaluation -----------------------------------------------------

export function substitute(a: Poly, v: string, r: Poly): Poly {
  const cs = coefficients(a, v);
  let out = ZERO;
  for (let k = cs.length - 1; k >= 0; k--) out = polyAdd(polyMul(out, r), cs[k]!); // Horner
  return out;
}
export function derivative(a: Poly, v: string): Poly {
  const acc = new Map<string, Term>();
  for (const t of a.terms.values()) {
    const e = expOf(t.m, v);
    if (e === 0) continue;
    const m: Mono = t.m.flatMap(([w, f]) => (w !== v ? [[w, f] as const] : f > 1 ? [[w, f - 1] as const] : []));
    acc.set(monoKey(m), { m, c: gmul(t.c, { re: qint(e), im: Q0 }) });
  }
  return mk(acc);
}
/** Exact value at a point; every variable of a must be given. */
export function evalExact(a: Poly, at: ReadonlyMap<string, GQ>): GQ {
  const pows = new Map<string, GQ[]>();
  const pw = (v: string, e: number): GQ => {
    let l = pows.get(v);
    if (!l) { const x = at.get(v); if (!x) throw new Error(`no value for ${v}`); l = [G1, x]; pows.set(v, l); }
    while (l.length <= e) l.push(gmul(l[l.length - 1]!, l[1]!));
    return l[e]!;
  };
  let s = G0;
  for (const t of a.terms.values()) {
    let c = t.c;
    for (const [v, e] of t.m) c = gmul(c, pw(v, e));
    s = gadd(s, c);
  }
  return s;
}
/** Value in complex double arithmetic. */
export function evalComplex(a: Poly, at: ReadonlyMap<string, Cx>): Cx {
  let re = 0, im = 0;
  for (const t of a.terms.values()) {
    let xr = qToNumber(t.c.re), xi = qToNumber(t.c.im);
    for (const [v, e] of t.m) {
      const z = at.get(v);
      if (!z) throw new Error(`no value for ${v}`);
      for (let k = 0; k < e; k++) [xr, xi] = [xr * z.re - xi * z.im, xr * z.im + xi * z.re];
    }
    re += xr; im += xi;
  }
  return { re, im };
}
function mapCoeffs(a: Poly, f: (c: GQ) => GQ): Poly {
  const acc = new Map<string, Term>();
  for (const [k, t] of a.terms) { const c = f(t.c); if (!gIsZero(c)) acc.set(k, { m: t.m, c }); }
  return mk(acc);
}
/** Re a, valid when every variable is real: Re(sum c_m m) = sum Re(c_m) m. */
export const realPart = (a: Poly): Poly => mapCoeffs(a, (c) => ({ re: c.re, im: Q0 }));
/** Im a, valid when every variable is real. */
export const imagPart = (a: Poly): Poly => mapCoeffs(a, (c) => ({ re: c.im, im: Q0 }));
/** Coefficient-wise conjugate (the conjugate of a when its variables are real). */
export const polyConj = (a: Poly): Poly => mapCoeffs(a, gconj);

// ---- division, gcd, square-free factorisation -------------------------------------

/** a with lex-leading coefficient 1 (zero stays zero). */
export function monic(a: Poly): Poly {
  const lt = leadingTerm(a);
  return lt ? polyScale(a, ginv(lt.c)) : a;
}

/**
 * a / b when b divides a exactly, else null. Lex division; a quotient term beyond
 * deg_v a - deg_v b in some v proves b does not divide a, which bounds the work.
 */
export function divideExact(a: Poly, b: Poly): Poly | null {
  if (b.terms.size === 0) throw new Error('division by the zero polynomial');
  if (a.terms.size === 0) return ZERO;
  if (isConstant(b)) return polyScale(a, ginv(constantTerm(b)));
  const vb = variables(b);
  const room = new Map<string, number>();
  for (const v of vb) {
    const r = degree(a, v) - degree(b, v);
    if (r < 0) return null;
    room.set(v, r);
  }
  const lb = leadingTerm(b)!, linv = ginv(lb.c);
  const bs = [...b.terms.values()];
  const r = new Map(a.terms);
  const quo = new Map<string, Term>();
  while (r.size > 0) {
    let lt: Term | null = null;
    for (const t of r.values()) if (!lt || monoCmp(t.m, lt.m) > 0) lt = t;
    const m = monoDiv(lt!.m, lb.m);
    if (!m) return null;
    for (const [v, e] of m) { const rm = room.get(v); if (rm !== undefined && e > rm) return null; }
    const c = gmul(lt!.c, linv);
    quo.set(monoKey(m), { m, c });
    const nc = gneg(c);
    for (const t of bs) addInto(r, monoMul(t.m, m), gmul(t.c, nc));
  }
  return mk(quo);
}
function divOrThrow(a: Poly, b: Poly): Poly {
  const r = divideExact(a, b);
  if (!r) throw new Error('internal: expected an exact division');
  return r;
}

/** gcd of the coefficients of a in v (a polynomial free of v), monic. */
export function content(a: Poly, v: string): Poly {
  let g = ZERO;
  for (const c of coefficients(a, v)) {
    if (c.terms.size === 0) continue;
    g = gcd(g, c);
    if (isConstant(g)) return ONE;
  }
  return g;
}
/** a / content(a, v), monic. */
export function primitivePart(a: Poly, v: string): Poly {
  if (a.terms.size === 0) return a;
  return monic(divOrThrow(a, content(a, v)));
}

// Polynomials in one variable x with coefficients in the other variables, as arrays.
type UP = Poly[];
const upTrim = (A: UP): UP => { let n = A.length; while (n > 0 && A[n - 1]!.terms.size === 0) n--; return n === A.length ? A : A.slice(0, n); };

/** lc(B)^(degA-degB+1) A mod B, one leading term at a time. */
function prem(A: UP, B: UP): UP {
  let r = A.slice();
  const db = B.length - 1, lb = B[db]!;
  while (r.length - 1 >= db && r.length > 0) {
    const dr = r.length - 1, lr = r[dr]!, s = dr - db;
    const next: UP = r.map((c) => polyMul(c, lb));
    for (let k = 0; k <= db; k++) next[k + s] = polySub(next[k + s]!, polyMul(lr, B[k]!));
    r = upTrim(next);
  }
  return r;
}
function upContent(A: UP): Poly {
  let g = ZERO;
  for (const c of A) { if (c.terms.size) { g = gcd(g, c); if (isConstant(g)) return ONE; } }
  return g;
}
function upPrimitive(A: UP): UP {
  const c = upContent(A);
  const out = isConstant(c) ? A : A.map((x) => divOrThrow(x, c));
  // scale numerically so the leading coefficient's leading term is 1: keeps rationals small
  const lt = leadingTerm(out[out.length - 1]!)!;
  return out.map((x) => polyScale(x, ginv(lt.c)));
}

/** Greatest common divisor over Q(i), monic in the lex order (gcd(0, 0) = 0). */
export function gcd(a: Poly, b: Poly): Poly {
  if (a.terms.size === 0) return monic(b);
  if (b.terms.size === 0) return monic(a);
  if (isConstant(a) || isConstant(b)) return ONE;
  if (polyEquals(a, b)) return monic(a);
  const va = variables(a), vb = variables(b);
  const x = va[0]! < vb[0]! ? va[0]! : vb[0]!;
  // a polynomial free of x shares only divisors of the other's coefficients in x
  if (va[0] !== x) return foldGcd(a, coefficients(b, x));
  if (vb[0] !== x) return foldGcd(b, coefficients(a, x));
  // cheap and common: one divides the other
  if (a.terms.size <= b.terms.size) { if (divideExact(b, a)) return monic(a); }
  else if (divideExact(a, b)) return monic(b);
  let A = coefficients(a, x), B = coefficients(b, x);
  const ca = upContent(A), cb = upContent(B);
  const c = gcd(ca, cb);
  // coprime in x (the usual case when normalising a fraction): detected on an image
  if (coprimeImage(a, b, x, A.length - 1, B.length - 1)) return monic(c);
  A = upPrimitive(A); B = upPrimitive(B);
  if (A.length < B.length) [A, B] = [B, A];
  // primitive PRS: remainders stay small because each one is made primitive
  for (;;) {
    const R = prem(A, B);
    if (R.length === 0) break;
    if (R.length === 1) { B = [ONE]; break; }
    A = B; B = upPrimitive(R);
  }
  return monic(polyMul(c, fromCoefficients(B, x)));
}
/**
 * True when deg_x gcd(a, b) = 0, shown by one image: at a point of the other variables
 * where neither leading coefficient in x vanishes, the image of the gcd divides the gcd
 * of the images, so a constant gcd of the images proves the gcd is free of x.
 * (False means "not shown", never "not coprime".)
 */
function coprimeImage(a: Poly, b: Poly, x: string, da: number, db: number): boolean {
  const others = [...new Set([...variables(a), ...variables(b)])].filter((v) => v !== x);
  if (others.length === 0) return false;
  for (let attempt = 0; attempt < 3; attempt++) {
    const at = new Map<string, GQ>(others.map((v, i) => [v, { re: qint(2 + i + 7 * attempt * (i + 1)), im: Q0 }]));
    const ia = evalPartial(a, at), ib = evalPartial(b, at);
    if (degree(ia, x) !== da || degree(ib, x) !== db) continue;
    return isConstant(gcd(ia, ib));
  }
  return false;
}
/** Substitute values for some variables, keeping the rest symbolic. */
export function evalPartial(a: Poly, at: ReadonlyMap<string, GQ>): Poly {
  const acc = new Map<string, Term>();
  for (const t of a.terms.values()) {
    let c = t.c;
    const m: [string, number][] = [];
    for (const [v, e] of t.m) {
      const x = at.get(v);
      if (x) { for (let i = 0; i < e; i++) c = gmul(c, x); } else m.push([v, e]);
    }
    addInto(acc, m, c);
  }
  return mk(acc);
}
function foldGcd(a: Poly, cs: Poly[]): Poly {
  let g = a;
  for (const c of cs) { if (c.terms.size === 0) continue; g = gcd(g, c); if (isConstant(g)) return ONE; }
  return monic(g);
}

export interface SquareFree { unit: GQ; factors: { f: Poly; k: number }[] }

/**
 * a = unit * prod f^k with each f monic, square-free and the f pairwise coprime
 * (one entry per multiplicity k). Yun's algorithm in the first variable on the
 * primitive part; the content (free of that variable) recursively.
 */
export function squareFree(a: Poly): SquareFree {
  if (a.terms.size === 0) return { unit: G0, factors: [] };
  const byK = new Map<number, Poly>();
  const put = (f: Poly, k: number) => byK.set(k, polyMul(byK.get(k) ?? ONE, f));
  const go = (p: Poly) => {
    if (isConstant(p)) return;
    const x = variables(p)[0]!;
    const c = content(p, x);
    const f = isConstant(c) ? p : divOrThrow(p, c);
    const df = derivative(f, x);
    const a0 = gcd(f, df);
    let b = divOrThrow(f, a0);
    let d = polySub(divOrThrow(df, a0), derivative(b, x));
    for (let i = 1; degree(b, x) > 0; i++) {
      const ai = gcd(b, d);
      b = divOrThrow(b, ai);
      d = polySub(divOrThrow(d, ai), derivative(b, x));
      if (!isConstant(ai)) put(ai, i);
    }
    go(c);
  };
  go(a);
  const factors = [...byK.entries()].sort((x, y) => x[0] - y[0]).map(([k, f]) => ({ f: monic(f), k }));
  // every factor is monic, so the product's leading coefficient is 1 (lex is a monomial order)
  return { unit: leadingCoeff(a), factors };
}

/** The square-free part: prod f over the square-free factorisation, monic. */
export function squareFreePart(a: Poly): Poly {
  return squareFree(a).factors.reduce((s, { f }) => polyMul(s, f), ONE);
}

// ---- debugging text --------------------------------------------------------------

/** "2*k^2*t - (1 + i)*t + 1/2", terms in decreasing lex order. */
export function polyToString(a: Poly): string {
  if (a.terms.size === 0) return '0';
  const ts = [...a.terms.values()].sort((x, y) => monoCmp(y.m, x.m));
  let s = '';
  ts.forEach((t, idx) => {
    let c = t.c, neg = false;
    // pull a sign out of purely real or purely imaginary coefficients
    if ((c.im.n === 0n && c.re.n < 0n) || (c.re.n === 0n && c.im.n < 0n)) { c = gneg(c); neg = true; }
    const cs = gqToString(c);
    const complex = c.re.n !== 0n && c.im.n !== 0n;
    const mono = monoKey(t.m);
    let body: string;
    if (!mono) body = complex ? `(${cs})` : cs;
    else if (gIsOne(c)) body = mono;
    else body = `${complex ? `(${cs})` : cs}*${mono}`;
    s += idx === 0 ? (neg ? `-${body}` : body) : ` ${neg ? '-' : '+'} ${body}`;
  });
  return s;
}

