/**
 * Exact rationals (Q) and Gaussian rationals (Q(i)) on bigint.
 *
 * Extends cas/domains/rational.ts (same `Q`/`GQ` shapes, so values pass between the two)
 * with parsing, printing and fast paths for integers, which dominate in elimination.
 *
 *   qFromString('0.0005')            // { n: 1n, d: 2000n }
 *   gqToString(gq(q(1n, 2n), q(3n, 4n)))   // "1/2 + 3/4*i"
 */
import type { Q, GQ } from '../domains/rational.js';

export type { Q, GQ } from '../domains/rational.js';

const babs = (x: bigint) => (x < 0n ? -x : x);
export function bgcd(a: bigint, b: bigint): bigint {
  a = babs(a); b = babs(b);
  while (b) [a, b] = [b, a % b];
  return a;
}

/** n/d in lowest terms with d > 0. */
export function q(n: bigint, d: bigint = 1n): Q {
  if (d === 1n) return { n, d };
  if (d === 0n) throw new Error('division by zero');
  if (d < 0n) { n = -n; d = -d; }
  const g = bgcd(n, d);
  return g === 1n || g === 0n ? { n, d } : { n: n / g, d: d / g };
}
export const qint = (n: number | bigint): Q => ({ n: BigInt(n), d: 1n });
export const Q0: Q = { n: 0n, d: 1n };
export const Q1: Q = { n: 1n, d: 1n };

/** A decimal literal ("0.75", "-12", "1e-3", "2.5E4") as an exact rational. */
export function qFromString(s: string): Q {
  const m = /^\s*([+-]?)(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?\s*$/.exec(s);
  if (m) {
    const [, sign = '', whole = '', frac = '', exp] = m;
    if (whole === '' && frac === '') throw new Error(`not a number: ${s}`);
    let n = BigInt((whole || '0') + frac) * (sign === '-' ? -1n : 1n);
    let d = 10n ** BigInt(frac.length);
    const e = exp ? Number(exp) : 0;
    if (e > 0) n *= 10n ** BigInt(e); else if (e < 0) d *= 10n ** BigInt(-e);
    return q(n, d);
  }
  const f = /^\s*([+-]?\d+)\s*\/\s*(\d+)\s*$/.exec(s);
  if (f) return q(BigInt(f[1]!), BigInt(f[2]!));
  throw new Error(`not a number: ${s}`);
}

export function qadd(a: Q, b: Q): Q {
  if (a.d === 1n && b.d === 1n) return { n: a.n + b.n, d: 1n };
  if (a.d === b.d) return q(a.n + b.n, a.d);
  return q(a.n * b.d + b.n * a.d, a.d * b.d);
}
export function qsub(a: Q, b: Q): Q {
  if (a.d === 1n && b.d === 1n) return { n: a.n - b.n, d: 1n };
  if (a.d === b.d) return q(a.n - b.n, a.d);
  return q(a.n * b.d - b.n * a.d, a.d * b.d);
}
export function qmul(a: Q, b: Q): Q {
  if (a.d === 1n && b.d === 1n) return { n: a.n * b.n, d: 1n };
  // cross-cancel first: keeps the gcd on smaller numbers
  const g1 = bgcd(a.n, b.d) || 1n, g2 = bgcd(b.n, a.d) || 1n;
  return { n: (a.n / g1) * (b.n / g2), d: (a.d / g2) * (b.d / g1) };
}
export const qneg = (a: Q): Q => ({ n: -a.n, d: a.d });
export function qinv(a: Q): Q {
  if (a.n === 0n) throw new Error('division by zero');
  return a.n < 0n ? { n: -a.d, d: -a.n } : { n: a.d, d: a.n };
}
export const qdiv = (a: Q, b: Q): Q => qmul(a, qinv(b));
export const qIsZero = (a: Q) => a.n === 0n;
export const qIsOne = (a: Q) => a.n === 1n && a.d === 1n;
export const qeq = (a: Q, b: Q) => a.n === b.n && a.d === b.d;
export const qsign = (a: Q): -1 | 0 | 1 => (a.n > 0n ? 1 : a.n < 0n ? -1 : 0);
export const qcmp = (a: Q, b: Q): -1 | 0 | 1 => qsign(qsub(a, b));
export const qabs = (a: Q): Q => (a.n < 0n ? qneg(a) : a);
export function qpow(a: Q, e: number): Q {
  if (e < 0) return qpow(qinv(a), -e);
  const E = BigInt(e);
  return { n: a.n ** E, d: a.d ** E };
}
/** Largest integer <= a. */
export function qfloor(a: Q): bigint {
  const t = a.n / a.d;
  return a.n < 0n && t * a.d !== a.n ? t - 1n : t;
}

/** Nearest double; exact up to rounding even when n and d overflow a double. */
export function qToNumber(a: Q): number {
  if (a.n === 0n) return 0;
  const nb = babs(a.n).toString(2).length, db = a.d.toString(2).length;
  if (nb < 1000 && db < 1000) return Number(a.n) / Number(a.d);
  // keep ~64 significant bits of the quotient
  const shift = BigInt(nb - db - 64);
  const quo = shift >= 0n ? a.n / (a.d << shift) : (a.n << -shift) / a.d;
  return Number(quo) * 2 ** Number(shift);
}
export const qToString = (a: Q): string => (a.d === 1n ? `${a.n}` : `${a.n}/${a.d}`);

// ---- Gaussian rationals --------------------------------------------------------------

export const gq = (re: Q, im: Q = Q0): GQ => ({ re, im });
export const G0: GQ = { re: Q0, im: Q0 };
export const G1: GQ = { re: Q1, im: Q0 };
export const GI: GQ = { re: Q0, im: Q1 };
export const gint = (re: number | bigint, im: number | bigint = 0): GQ => ({ re: qint(re), im: qint(im) });
export const gFromString = (s: string): GQ => ({ re: qFromString(s), im: Q0 });

export const gadd = (a: GQ, b: GQ): GQ => ({ re: qadd(a.re, b.re), im: qadd(a.im, b.im) });
export const gsub = (a: GQ, b: GQ): GQ => ({ re: qsub(a.re, b.re), im: qsub(a.im, b.im) });
export function gmul(a: GQ, b: GQ): GQ {
  // real operands are the common case: skip the cross terms
  if (a.im.n === 0n) return b.im.n === 0n ? { re: qmul(a.re, b.re), im: Q0 } : { re: qmul(a.re, b.re), im: qmul(a.re, b.im) };
  if (b.im.n === 0n) return { re: qmul(a.re, b.re), im: qmul(a.im, b.re) };
  return { re: qsub(qmul(a.re, b.re), qmul(a.im, b.im)), im: qadd(qmul(a.re, b.im), qmul(a.im, b.re)) };
}
export const gneg = (a: GQ): GQ => ({ re: qneg(a.re), im: qneg(a.im) });
export const gconj = (a: GQ): GQ => ({ re: a.re, im: qneg(a.im) });
export function ginv(a: GQ): GQ {
  if (a.im.n === 0n) return { re: qinv(a.re), im: Q0 };
  const n2 = qadd(qmul(a.re, a.re), qmul(a.im, a.im));
  return { re: qdiv(a.re, n2), im: qneg(qdiv(a.im, n2)) };
}
export const gdiv = (a: GQ, b: GQ): GQ => gmul(a, ginv(b));
export const gIsZero = (a: GQ) => a.re.n === 0n && a.im.n === 0n;
export const gIsOne = (a: GQ) => a.im.n === 0n && qIsOne(a.re);
export const gIsReal = (a: GQ) => a.im.n === 0n;
export const geq = (a: GQ, b: GQ) => qeq(a.re, b.re) && qeq(a.im, b.im);
export function gpow(a: GQ, e: number): GQ {
  if (e < 0) return gpow(ginv(a), -e);
  let r = G1, b = a;
  while (e > 0) { if (e & 1) r = gmul(r, b); b = gmul(b, b); e >>= 1; }
  return r;
}
export const gToNumber = (a: GQ): { re: number; im: number } => ({ re: qToNumber(a.re), im: qToNumber(a.im) });

/** "2", "-3/4*i", "1/2 + 3/4*i", "1 - i". */
export function gqToString(a: GQ): string {
  const imPart = (m: Q) => (qIsOne(qabs(m)) ? 'i' : `${qToString(qabs(m))}*i`);
  if (a.im.n === 0n) return qToString(a.re);
  if (a.re.n === 0n) return (a.im.n < 0n ? '-' : '') + imPart(a.im);
  return `${qToString(a.re)} ${a.im.n < 0n ? '-' : '+'} ${imPart(a.im)}`;
}
