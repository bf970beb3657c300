/**
 * Dense polynomials in one variable over Q, for exact decisions about real roots.
 *
 * A UPoly is an array of bigint coefficients, lowest degree first, no trailing zeros
 * ([] is the zero polynomial). A rational polynomial is stored times a POSITIVE rational
 * (its denominators cleared), and every operation here that rescales (gcd, quotients,
 * Sturm remainders) uses positive factors only: roots and signs, which are all that the
 * verdicts need, are never changed.
 *
 *   const p = upolyFromCoeffs([0, 8100, 0, -1]);        // 8100 t - t^3
 *   const [r] = isolateRoots(p, 0, Infinity);           // the root in (0, oo)
 *   recognizeRoot(r!).text                              // "90"
 *
 * Root counting uses Sturm sequences of the square-free part (the count V(a) - V(b) of
 * sign variations is the number of distinct roots in (a, b], also when a or b is a
 * root); isolation bisects (-B, B) with B a Cauchy bound.
 */
import type { Poly } from './poly.js';
import { variables } from './poly.js';
import {
  type Q, q, qint, bgcd, qadd, qsub, qmul, qcmp, qsign, qabs, qfloor, qToNumber, qToString, Q0,
} from './q.js';

export type UPoly = bigint[];
/** A point of the extended line: a rational, or a number (±Infinity, or a finite double taken exactly). */
export type Ext = Q | number;

/**
 * A real algebraic number: the unique root of the square-free `poly` in the open interval
 * (lo, hi), whose ends are not roots of poly; or the rational lo when lo equals hi.
 */
export interface RealRoot { readonly poly: UPoly; readonly lo: Q; readonly hi: Q }

const babs = (x: bigint) => (x < 0n ? -x : x);

// ---- construction ----------------------------------------------------------------

export function utrim(p: readonly bigint[]): UPoly {
  let n = p.length;
  while (n > 0 && p[n - 1] === 0n) n--;
  return p.slice(0, n);
}
export const udeg = (p: UPoly) => p.length - 1;
export const uIsZero = (p: UPoly) => p.length === 0;

/** Coefficients (lowest first, rational or integer) times the positive lcm of their denominators. */
export function upolyFromCoeffs(cs: readonly (Q | number | bigint)[]): UPoly {
  const qs = cs.map((c) => (typeof c === 'object' ? c : typeof c === 'bigint' ? qint(c) : qFromFinite(c)));
  let l = 1n;
  for (const c of qs) l = (l / bgcd(l, c.d)) * c.d;
  return utrim(qs.map((c) => c.n * (l / c.d)));
}

/** The one-variable polynomial p (real rational coefficients) times a positive rational; null otherwise. */
export function upolyFromPoly(p: Poly): UPoly | null {
  const vs = variables(p);
  if (vs.length > 1) return null;
  const cs: Q[] = [];
  for (const t of p.terms.values()) {
    if (t.c.im.n !== 0n) return null;
    const e = t.m.length ? t.m[0]![1] : 0;
    while (cs.length <= e) cs.push(Q0);
    cs[e] = t.c.re;
  }
  return upolyFromCoeffs(cs);
}

/** A finite double as the exact rational it is. */
export function qFromFinite(x: number): Q {
  if (!Number.isFinite(x)) throw new Error('a finite number is required');
  if (Number.isInteger(x)) return qint(BigInt(x));
  let d = 1n;
  while (!Number.isInteger(x)) { x *= 2; d *= 2n; }
  return q(BigInt(x), d);
}
const toQ = (x: Ext): Q | null => (typeof x === 'object' ? x : Number.isFinite(x) ? qFromFinite(x) : null);

// ---- arithmetic ------------------------------------------------------------------

export function uadd(a: UPoly, b: UPoly): UPoly {
  const n = Math.max(a.length, b.length), out: bigint[] = [];
  for (let i = 0; i < n; i++) out.push((a[i] ?? 0n) + (b[i] ?? 0n));
  return utrim(out);
}
export const uneg = (a: UPoly): UPoly => a.map((x) => -x);
export const usub = (a: UPoly, b: UPoly): UPoly => uadd(a, uneg(b));
export function umul(a: UPoly, b: UPoly): UPoly {
  if (!a.length || !b.length) return [];
  const out: bigint[] = new Array(a.length + b.length - 1).fill(0n);
  for (let i = 0; i < a.length; i++) { const x = a[i]!; if (x) for (let j = 0; j < b.length; j++) out[i + j] += x * b[j]!; }
  return out;
}
export const uderiv = (a: UPoly): UPoly => utrim(a.slice(1).map((c, i) => c * BigInt(i + 1)));
export function ucontent(a: UPoly): bigint {
  let g = 0n;
  for (const c of a) { g = bgcd(g, c); if (g === 1n) break; }
  return g;
}
/** a divided by its positive content (same signs). */
export function uprimitive(a: UPoly): UPoly {
  const g = ucontent(a);
  return g <= 1n ? a.slice() : a.map((c) => c / g);
}
/** a divided by its content, leading coefficient made positive (a unit: signs may flip). */
const unormal = (a: UPoly): UPoly => { const p = uprimitive(a); return p.length && p[p.length - 1]! < 0n ? uneg(p) : p; };

/** Pseudo-division with a positive multiplier: m*a = quo*b + rem, m = |lc b|^k for the k steps taken. */
export function upseudoDivide(a: UPoly, b: UPoly): { quo: UPoly; rem: UPoly } {
  if (!b.length) throw new Error('division by the zero polynomial');
  const db = b.length - 1, lb = b[db]!, alb = babs(lb), sg = lb < 0n ? -1n : 1n;
  let r = a.slice();
  const quo: bigint[] = new Array(Math.max(0, a.length - db)).fill(0n);
  while (r.length - 1 >= db && r.length > 0) {
    const dr = r.length - 1, lr = r[dr]!, s = dr - db;
    // r <- |lb| r - sign(lb) lr x^s b cancels the top coefficient
    for (let i = 0; i < quo.length; i++) quo[i]! *= alb;
    quo[s]! += sg * lr;
    const next = r.map((c) => c * alb);
    for (let k = 0; k <= db; k++) next[k + s]! -= sg * lr * b[k]!;
    r = utrim(next);
  }
  return { quo: utrim(quo), rem: r };
}
/** a / b (over Q, up to a positive factor) when b divides a, else null. */
export function udivExact(a: UPoly, b: UPoly): UPoly | null {
  const { quo, rem } = upseudoDivide(a, b);
  return rem.length ? null : uprimitive(quo);
}
/** gcd over Q: primitive, positive leading coefficient; gcd(0, 0) = 0. */
export function ugcd(a: UPoly, b: UPoly): UPoly {
  if (!a.length) return unormal(b);
  if (!b.length) return unormal(a);
  let A = uprimitive(a), B = uprimitive(b);
  if (A.length < B.length) [A, B] = [B, A];
  while (B.length) {
    if (B.length === 1) return [1n];
    const R = upseudoDivide(A, B).rem;
    A = B; B = uprimitive(R);
  }
  return unormal(A);
}
/** The square-free part p / gcd(p, p'), with the sign of p's leading coefficient. */
export function usqfree(p: UPoly): UPoly {
  if (p.length <= 2) return uprimitive(p);
  const g = ugcd(p, uderiv(p));
  return g.length === 1 ? uprimitive(p) : udivExact(p, g)!;
}

// ---- evaluation and signs ----------------------------------------------------------

/** Exact value at a rational. */
export function uevalQ(p: UPoly, x: Q): Q {
  return q(homog(p, x), x.d ** BigInt(Math.max(0, p.length - 1)));
}
/** d^deg p(n/d), an integer with the sign of p(x). */
function homog(p: UPoly, x: Q): bigint {
  let s = 0n, dp = 1n;
  for (let i = p.length - 1; i >= 0; i--) { s = s * x.n + p[i]! * dp; dp *= x.d; }
  // Horner on the homogenised form: s_k = s_{k+1} n + a_k d^(deg-k)
  return s;
}
/** Sign of p at a rational or at ±Infinity (a finite double is taken exactly). */
export function usign(p: UPoly, x: Ext): -1 | 0 | 1 {
  if (!p.length) return 0;
  const v = toQ(x);
  if (!v) {
    const lc = p[p.length - 1]! > 0n ? 1 : -1;
    return ((x as number) > 0 || (p.length - 1) % 2 === 0 ? lc : -lc) as -1 | 1;
  }
  const h = homog(p, v);
  return h > 0n ? 1 : h < 0n ? -1 : 0;
}
/** p at a double, in double arithmetic (for plots and messages, never for decisions). */
export function uevalNumber(p: UPoly, x: number): number {
  let s = 0;
  for (let i = p.length - 1; i >= 0; i--) s = s * x + Number(p[i]!);
  return s;
}

// ---- Sturm sequences and root counting --------------------------------------------

/** p, p', then minus the remainders (positive multiples), up to the last nonzero one. */
export function sturmSequence(p: UPoly): UPoly[] {
  const seq = [uprimitive(p)];
  if (p.length <= 1) return seq;
  seq.push(uprimitive(uderiv(p)));
  for (;;) {
    const r = upseudoDivide(seq[seq.length - 2]!, seq[seq.length - 1]!).rem;
    if (!r.length) return seq;
    seq.push(uprimitive(uneg(r)));
  }
}
export function signVariations(seq: readonly UPoly[], x: Ext): number {
  let n = 0, last = 0;
  for (const p of seq) {
    const s = usign(p, x);
    if (s === 0) continue;
    if (last !== 0 && s !== last) n++;
    last = s;
  }
  return n;
}
/** Distinct real roots of p in (a, b]; a and b may be ±Infinity. */
export function countRoots(p: UPoly, a: Ext = -Infinity, b: Ext = Infinity): number {
  if (!p.length) throw new Error('the zero polynomial has every number as a root');
  if (extCmp(a, b) >= 0) return 0;
  const seq = sturmSequence(usqfree(p));
  return signVariations(seq, a) - signVariations(seq, b);
}
function extCmp(a: Ext, b: Ext): number {
  const x = toQ(a), y = toQ(b);
  if (x && y) return qcmp(x, y);
  const fa = x ? 0 : (a as number), fb = y ? 0 : (b as number);
  return fa === fb ? 0 : fa < fb ? -1 : 1;
}

/** An integer B with every complex root of p of modulus < B (Cauchy). */
export function rootBound(p: UPoly): bigint {
  const lc = babs(p[p.length - 1]!);
  let m = 0n;
  for (let i = 0; i < p.length - 1; i++) { const c = babs(p[i]!); if (c > m) m = c; }
  return 2n + m / lc;
}

const mid = (a: Q, b: Q): Q => q(a.n * b.d + b.n * a.d, 2n * a.d * b.d);

/** Isolating intervals (or exact rational points) of every distinct real root in the open (lo, hi), in order. */
export function isolateRoots(p: UPoly, lo: Ext = -Infinity, hi: Ext = Infinity): RealRoot[] {
  if (!p.length) throw new Error('the zero polynomial has every number as a root');
  if (p.length === 1) return [];
  const s = unormal(usqfree(p));
  const seq = sturmSequence(s);
  const B = qint(rootBound(s));
  if (lo === Infinity || hi === -Infinity) return [];
  let l = toQ(lo) ?? qsub(Q0, B);
  let r = toQ(hi) ?? B;
  if (qcmp(l, qsub(Q0, B)) < 0) l = qsub(Q0, B);
  if (qcmp(r, B) > 0) r = B;
  if (qcmp(l, r) >= 0) return [];
  const out: RealRoot[] = [];
  const V = (x: Q) => signVariations(seq, x);
  // roots in the open (a, b): V(a) - V(b) counts (a, b], less one when b is a root
  const open = (a: Q, b: Q, va: number, vb: number) => va - vb - (usign(s, b) === 0 ? 1 : 0);
  const go = (a: Q, b: Q, va: number, vb: number, n: number) => {
    if (n === 0) return;
    if (n === 1 && usign(s, a) !== 0 && usign(s, b) !== 0) { out.push({ poly: s, lo: a, hi: b }); return; }
    const m = mid(a, b), vm = V(m);
    const left = open(a, m, va, vm);
    go(a, m, va, vm, left);
    if (usign(s, m) === 0) out.push({ poly: s, lo: m, hi: m });
    go(m, b, vm, vb, n - left - (usign(s, m) === 0 ? 1 : 0));
  };
  const vl = V(l), vr = V(r);
  go(l, r, vl, vr, open(l, r, vl, vr));
  return out;
}

export const isExact = (r: RealRoot) => r.lo.n === r.hi.n && r.lo.d === r.hi.d;

/** One bisection step (an exact root when the midpoint is the root). */
export function bisectRoot(r: RealRoot): RealRoot {
  if (isExact(r)) return r;
  const m = mid(r.lo, r.hi), sm = usign(r.poly, m);
  if (sm === 0) return { poly: r.poly, lo: m, hi: m };
  return sm === usign(r.poly, r.lo) ? { poly: r.poly, lo: m, hi: r.hi } : { poly: r.poly, lo: r.lo, hi: m };
}
/** Bisect until hi - lo <= width. */
export function refineRoot(r: RealRoot, width: Ext): RealRoot {
  const w = toQ(width);
  if (!w || qsign(w) <= 0) throw new Error('a positive finite width is required');
  while (!isExact(r) && qcmp(qsub(r.hi, r.lo), w) > 0) r = bisectRoot(r);
  return r;
}
/** The root as a double, correct to about 1e-17 relative. */
export function rootToNumber(r: RealRoot): number {
  if (isExact(r)) return qToNumber(r.lo);
  for (let i = 0; i < 4000 && !isExact(r); i++) {
    const w = qToNumber(qsub(r.hi, r.lo));
    const scale = Math.max(Math.abs(qToNumber(r.lo)), Math.abs(qToNumber(r.hi)));
    if (w <= scale * 2 ** -60 || w < 2 ** -1000) break;
    r = bisectRoot(r);
  }
  return qToNumber(mid(r.lo, r.hi));
}

/**
 * Exact sign of q at the root: 0 when gcd(poly, q) changes sign across the interval
 * (it then vanishes at the root, the only root of poly there); otherwise bisect until q
 * has no root in (lo, hi] and read the sign at hi.
 */
export function signAtRoot(qp: UPoly, r: RealRoot): -1 | 0 | 1 {
  if (!qp.length) return 0;
  if (isExact(r)) return usign(qp, r.lo);
  if (qp.length === 1) return qp[0]! > 0n ? 1 : -1;
  const g = ugcd(r.poly, qp);
  if (g.length > 1 && usign(g, r.lo) * usign(g, r.hi) < 0) return 0;
  const seq = sturmSequence(usqfree(qp));
  for (;;) {
    if (isExact(r)) return usign(qp, r.lo);
    if (signVariations(seq, r.lo) === signVariations(seq, r.hi)) return usign(qp, r.hi);
    r = bisectRoot(r);
  }
}
/** -1, 0, 1 as the root a is below, equal to, above the root b. */
export function compareRoots(a: RealRoot, b: RealRoot): -1 | 0 | 1 {
  if (isExact(a) && isExact(b)) return qcmp(a.lo, b.lo);
  if (isExact(b)) return signAtRootRel(a, b.lo);
  if (isExact(a)) return (0 - signAtRootRel(b, a.lo)) as -1 | 0 | 1;
  if (signAtRoot(b.poly, a) === 0) {
    // a is a root of b.poly; it is b iff it lies in b's interval (b's only root there)
    for (;;) {
      if (qcmp(a.hi, b.lo) <= 0) return -1;
      if (qcmp(a.lo, b.hi) >= 0) return 1;
      if (qcmp(a.lo, b.lo) >= 0 && qcmp(a.hi, b.hi) <= 0) return 0;
      a = bisectRoot(a);
      if (isExact(a)) return compareRoots(a, b);
    }
  }
  for (;;) {
    if (qcmp(a.hi, b.lo) <= 0) return -1;
    if (qcmp(a.lo, b.hi) >= 0) return 1;
    a = bisectRoot(a); b = bisectRoot(b);
    if (isExact(a) || isExact(b)) return compareRoots(a, b);
  }
}
/** Sign of (root - x) for a rational x. */
function signAtRootRel(a: RealRoot, x: Q): -1 | 0 | 1 {
  if (isExact(a)) return qcmp(a.lo, x);
  if (qcmp(x, a.lo) <= 0) return 1;
  if (qcmp(x, a.hi) >= 0) return -1;
  const s = usign(a.poly, x);
  if (s === 0) return 0; // a root of poly inside (lo, hi) is the root
  // poly keeps the sign it has at lo up to the root
  return s === usign(a.poly, a.lo) ? 1 : -1;
}

// ---- naming roots ----------------------------------------------------------------

export type RootName =
  | { kind: 'rational'; value: Q; decimal: number; text: string }
  | { kind: 'quadratic'; a: Q; b: Q; c: bigint; decimal: number; text: string }
  | { kind: 'algebraic'; poly: UPoly; interval: [Q, Q]; decimal: number; text: string };

/** Is the root rational? Any rational root u/v of the primitive poly has v | lc (rational root theorem). */
function rationalValue(r: RealRoot): { value: Q | null; root: RealRoot } {
  if (isExact(r)) return { value: r.lo, root: r };
  const lc = babs(r.poly[r.poly.length - 1]!);
  r = refineRoot(r, q(1n, 2n * lc));
  if (isExact(r)) return { value: r.lo, root: r };
  // the open interval is shorter than 1/lc: at most one k/lc inside
  const k = qfloor(qmul(r.hi, qint(lc)));
  const x = q(k, lc);
  if (qcmp(x, r.lo) > 0 && qcmp(x, r.hi) < 0 && usign(r.poly, x) === 0) return { value: x, root: { poly: r.poly, lo: x, hi: x } };
  return { value: null, root: r };
}

/** Largest f with f^2 | n (trial division to 10^5; a larger leftover is kept whole) and the rest. */
function splitSquare(n: bigint): { f: bigint; c: bigint } {
  let f = 1n, c = 1n;
  for (let p = 2n; p * p <= n && p < 100000n; p += p === 2n ? 1n : 2n) {
    let e = 0;
    while (n % p === 0n) { n /= p; e++; }
    f *= p ** BigInt(e >> 1);
    if (e & 1) c *= p;
  }
  const s = isqrt(n);
  if (s * s === n) f *= s; else c *= n;
  return { f, c };
}
function isqrt(n: bigint): bigint {
  if (n < 2n) return n;
  let x = BigInt(Math.floor(Math.sqrt(Number(n))));
  while (x * x > n) x = (x + n / x) >> 1n;
  while ((x + 1n) * (x + 1n) <= n) x++;
  return x;
}
const roundQ = (x: Q): bigint => qfloor(qadd(x, q(1n, 2n)));

/** a + b*sqrt(c) as text: "30*sqrt(3)", "-1/2 + sqrt(5)/2", "1 - 2*sqrt(3)". */
export function quadraticText(a: Q, b: Q, c: bigint): string {
  const B = qabs(b);
  const coef = B.n === 1n ? '' : `${B.n}*`;
  const surd = `${coef}sqrt(${c})${B.d === 1n ? '' : `/${B.d}`}`;
  if (a.n === 0n) return b.n < 0n ? `-${surd}` : surd;
  return `${qToString(a)} ${b.n < 0n ? '-' : '+'} ${surd}`;
}
export function upolyToString(p: UPoly, name = 't'): string {
  if (!p.length) return '0';
  let s = '';
  for (let i = p.length - 1; i >= 0; i--) {
    const c = p[i]!;
    if (c === 0n) continue;
    const a = babs(c);
    const mono = i === 0 ? '' : i === 1 ? name : `${name}^${i}`;
    const body = !mono ? `${a}` : a === 1n ? mono : `${a}*${mono}`;
    s += s === '' ? (c < 0n ? `-${body}` : body) : ` ${c < 0n ? '-' : '+'} ${body}`;
  }
  return s;
}

/**
 * Name a root exactly when it is rational or a quadratic irrational; otherwise as "the
 * root of <poly> near <5 significant digits>" with rational roots divided out of poly.
 * A quadratic irrational a + b*sqrt(c) has its conjugate as another real root: for each
 * other real root beta, lc*(alpha+beta) and lc*alpha*beta are integers when the pair is
 * a quadratic factor (Gauss), so rounding them gives the only candidate, checked by exact division.
 */
export function recognizeRoot(root: RealRoot, name = 't'): RootName {
  const rv = rationalValue(root);
  if (rv.value) return { kind: 'rational', value: rv.value, decimal: qToNumber(rv.value), text: qToString(rv.value) };
  let r = rv.root;
  const s = r.poly, lc = babs(s[s.length - 1]!);
  const B = qint(rootBound(s));
  // widths small enough that rounding lc*(alpha+beta) and lc*alpha*beta is right
  const w = q(1n, 8n * lc * (2n * B.n + 1n));
  r = refineRoot(r, w);
  const others = [...isolateRoots(s, -Infinity, r.lo), ...isolateRoots(s, r.hi, Infinity)];
  const decimal = rootToNumber(r);
  if (s.length - 1 <= 64) {
    for (let beta of others) {
      beta = refineRoot(beta, w);
      const ma = mid(r.lo, r.hi), mb = mid(beta.lo, beta.hi);
      const L = qint(lc);
      const cand = unormal([roundQ(qmul(L, qmul(ma, mb))), -roundQ(qmul(L, qadd(ma, mb))), lc]);
      if (cand.length !== 3 || !udivExact(s, cand)) continue;
      const [C, Bq, A] = cand as [bigint, bigint, bigint];
      const D = Bq * Bq - 4n * A * C;
      if (D <= 0n) continue;
      const { f, c } = splitSquare(D);
      if (c === 1n) continue; // rational roots, handled above
      const larger = compareRoots(r, beta) > 0;
      const a = q(-Bq, 2n * A), b = q(larger ? f : -f, 2n * A);
      return { kind: 'quadratic', a, b, c, decimal, text: quadraticText(a, b, c) };
    }
  }
  // divide out the rational roots so the named polynomial is smaller
  let poly = s;
  for (const o of others) {
    const v = rationalValue(o).value;
    if (v) poly = udivExact(poly, [-v.n, v.d])!;
  }
  const near = Number(decimal.toPrecision(5)).toString();
  return { kind: 'algebraic', poly, interval: [r.lo, r.hi], decimal, text: `the root of ${upolyToString(poly, name)} near ${near}` };
}

