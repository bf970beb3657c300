/**
 * Exact polynomials and rational functions written as expressions the way a physicist
 * writes them: terms by ascending degree (30 + i*t, 100 - g^2, k^2 + lam^2), each
 * coefficient an exact fraction, a multiple of i or a bracketed complex number,
 * the sign pulled out of the sum when every term is negative, factors with their
 * multiplicities ((k + i*t)^2) when a square-free factorisation finds them.
 *
 * Example: polyExpr of 30 + i*t (as built by fromExpr) prints "30 + i*t".
 */
import type { Expr } from '../lang/ast.js';
import { add, call, div, I, mul, name as nameExpr, neg, num, pow, PI, sub } from './build.js';
import type { GQ, Q } from '../exact/q.js';
import { qIsZero, qsign, qabs, gIsOne, gneg, qToNumber } from '../exact/q.js';
import { squareFree, isConstant, constantTerm, polyScale, type Poly, type Term } from '../exact/poly.js';
import type { RatFunc } from '../exact/ratfunc.js';
import { identifierOrder } from './identifierOrder.js';

/** A rational: 2, -3/4. */
export function qExpr(x: Q): Expr {
  const a = qabs(x);
  const e = a.d === 1n ? num(a.n.toString()) : div(num(a.n.toString()), num(a.d.toString()));
  return qsign(x) < 0 ? neg(e) : e;
}

/** A Gaussian rational: 2, -3/4, i, -2*i, (1 + 2*i). */
export function gqExpr(c: GQ): Expr {
  if (qIsZero(c.im)) return qExpr(c.re);
  const imag = qIsZero(qsub1(c.im)) ? I : qIsZero(qadd1(c.im)) ? neg(I) : mulSigned(qExpr(c.im), I);
  if (qIsZero(c.re)) return imag;
  return add(qExpr(c.re), imag);
}
const qsub1 = (x: Q): Q => ({ n: x.n - x.d, d: x.d });
const qadd1 = (x: Q): Q => ({ n: x.n + x.d, d: x.d });
function mulSigned(a: Expr, b: Expr): Expr { return a.t === 'neg' ? neg(mul(a.a, b)) : mul(a, b); }

const varExpr = (v: string): Expr => (v === 'pi' ? PI : nameExpr(v));

function monoExpr(m: Term['m']): Expr | null {
  let e: Expr | null = null;
  // pi first, as in 2*pi*k
  for (const [v, k] of [...m].sort(([a], [b]) => (a === 'pi' ? -1 : b === 'pi' ? 1 : 0))) {
    const f = k === 1 ? varExpr(v) : pow(varExpr(v), num(k));
    e = e ? mul(e, f) : f;
  }
  return e;
}

const termDegree = (t: Term) => t.m.reduce((s, [, k]) => s + k, 0);

/** One term with its sign outside: [negative?, magnitude expression]. */
function termParts(t: Term): [boolean, Expr] {
  const m = monoExpr(t.m);
  const c = t.c;
  const real = qIsZero(c.im);
  const imag = qIsZero(c.re);
  if (real || imag) {
    const x = real ? c.re : c.im;
    const negative = qsign(x) < 0;
    const mag = qabs(x);
    // p/q * i * m is written p*i*m/q (x^2/2, 3*i*t/4)
    let top: Expr | null = mag.n === 1n ? null : num(mag.n.toString());
    if (imag) top = top ? mul(top, I) : I;
    if (m) top = top ? mul(top, m) : m;
    top ??= num(1);
    return [negative, mag.d === 1n ? top : div(top, num(mag.d.toString()))];
  }
  const g = gqExpr(c);
  return [false, m ? mul(g, m) : g];
}

/** A polynomial as a sum, terms by ascending total degree, ties in the variables' order. */
export function polyExpr(p: Poly): Expr {
  const terms = [...p.terms.values()].sort((a, b) => termDegree(a) - termDegree(b) || identifierOrder(keyOf(a), keyOf(b)));
  if (terms.length === 0) return num(0);
  const parts = terms.map(termParts);
  // -(a + b) reads better than -a - b when every term is negative and there are several
  if (parts.length > 1 && parts.every(([n]) => n)) return neg(sumOf(parts.map(([, e]) => [false, e] as [boolean, Expr])));
  // lead with a positive term where there is one (100 - g^2, not -g^2 + 100 — already by degree)
  return sumOf(parts);
}
const keyOf = (t: Term) => t.m.map(([v, k]) => `${v}${k}`).join('');

function sumOf(parts: [boolean, Expr][]): Expr {
  let acc: Expr | null = null;
  for (const [negative, e] of parts) {
    if (!acc) acc = negative ? neg(e) : e;
    else acc = negative ? sub(acc, e) : add(acc, e);
  }
  return acc ?? num(0);
}

/** A polynomial as a product of its square-free factors with multiplicities, when that is shorter to read. */
export function factoredPolyExpr(p: Poly): Expr {
  if (isConstant(p)) return gqExpr(constantTerm(p));
  const sf = squareFree(p);
  const nontrivial = sf.factors.filter((f) => !isConstant(f.f));
  if (nontrivial.length === 1 && nontrivial[0]!.k === 1) return polyExpr(p);
  let e: Expr | null = null;
  for (const { f, k } of nontrivial) {
    const base = polyExpr(f);
    const factor = k === 1 ? base : pow(base, num(k));
    e = e ? mul(e, factor) : factor;
  }
  const unit = sf.unit;
  if (!e) return gqExpr(unit);
  if (gIsOne(unit)) return e;
  if (gIsOne(gneg(unit))) return neg(e);
  return mul(gqExpr(unit), e);
}

/** Multiply numerator and denominator by the unit (1, -1, i, -i) that makes the denominator's first term positive: 30 + i*t, not -30*i + t. */
function unitNormal(r: RatFunc): RatFunc {
  const first = [...r.den.terms.values()].sort((a, b) => termDegree(a) - termDegree(b) || identifierOrder(keyOf(a), keyOf(b)))[0];
  if (!first) return r;
  const c = first.c;
  const units: GQ[] = [
    { re: { n: 1n, d: 1n }, im: { n: 0n, d: 1n } }, { re: { n: -1n, d: 1n }, im: { n: 0n, d: 1n } },
    { re: { n: 0n, d: 1n }, im: { n: 1n, d: 1n } }, { re: { n: 0n, d: 1n }, im: { n: -1n, d: 1n } },
  ];
  // Re(u c) for each unit: c.re, -c.re, -c.im, c.im
  const score = [qToNumber(c.re), -qToNumber(c.re), -qToNumber(c.im), qToNumber(c.im)];
  const best = score.indexOf(Math.max(...score));
  if (best === 0) return r;
  const u = units[best]!;
  return { num: polyScale(r.num, u), den: polyScale(r.den, u) };
}

/** A rational function as numerator / denominator, each as a sum. */
export function ratExpr(r: RatFunc, factored = false): Expr {
  r = unitNormal(r);
  const f = factored ? factoredPolyExpr : polyExpr;
  const top = f(r.num);
  if (isConstant(r.den) && r.den.terms.size <= 1) return top;
  return div(top, f(r.den));
}

/** The largest square dividing n, and the rest: n = f^2 * c. */
function squarePart(n: bigint): { f: bigint; c: bigint } {
  let f = 1n; let c = 1n;
  for (let p = 2n; p * p <= n && p < 10000n; p += p === 2n ? 1n : 2n) {
    let e = 0;
    while (n % p === 0n) { n /= p; e++; }
    f *= p ** BigInt(e >> 1);
    if (e & 1) c *= p;
  }
  return { f, c: c * n };
}

/**
 * sqrt(r) written without a needless root where that is exact: a positive rational
 * constant (sqrt(1) = 1, sqrt(12) = 2*sqrt(3)), or a monomial whose square root is a
 * monomial in positive parameters (sqrt(w^2) = w for w > 0). Otherwise sqrt of r's form.
 */
export function sqrtExpr(r: RatFunc, positive: ReadonlySet<string>): Expr {
  const single = (p: Poly) => (p.terms.size === 1 ? [...p.terms.values()][0]! : null);
  const a = single(r.num); const b = single(r.den);
  if (a && b && qIsZero(a.c.im) && qIsZero(b.c.im) && qsign(a.c.re) > 0 && qsign(b.c.re) > 0) {
    const mono = [...a.m.map(([v, k]) => [v, k] as const), ...b.m.map(([v, k]) => [v, -k] as const)];
    if (mono.every(([v, k]) => k % 2 === 0 && (positive.has(v) || v === 'pi'))) {
      // c = (p/q) / (p'/q') as one positive rational
      const n = a.c.re.n * b.c.re.d; const d = a.c.re.d * b.c.re.n;
      const top = squarePart(n); const bottom = squarePart(d);
      let e: Expr = num(1);
      const rootOf = (x: { f: bigint; c: bigint }): Expr => {
        const f: Expr | null = x.f === 1n ? null : num(x.f.toString());
        const s: Expr | null = x.c === 1n ? null : call('sqrt', num(x.c.toString()));
        return f && s ? mul(f, s) : f ?? s ?? num(1);
      };
      e = rootOf(top);
      for (const [v, k] of mono) if (k > 0) e = mul(e, k === 2 ? varExpr(v) : pow(varExpr(v), num(k / 2)));
      let den: Expr = rootOf(bottom);
      for (const [v, k] of mono) if (k < 0) den = mul(den, k === -2 ? varExpr(v) : pow(varExpr(v), num(-k / 2)));
      return den.t === 'num' && den.v === '1' ? e : div(e, den);
    }
  }
  return call('sqrt', ratExpr(r, true));
}
