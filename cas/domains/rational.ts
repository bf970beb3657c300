/** Exact rationals and Gaussian rationals on bigint, for sign proofs. */
export interface Q { n: bigint; d: bigint }

const babs = (x: bigint) => (x < 0n ? -x : x);
function bgcd(a: bigint, b: bigint): bigint { a = babs(a); b = babs(b); while (b) [a, b] = [b, a % b]; return a; }

export function q(n: bigint, d: bigint = 1n): Q {
  if (d === 0n) throw new Error('division by zero');
  if (d < 0n) { n = -n; d = -d; }
  const g = bgcd(n, d) || 1n;
  return { n: n / g, d: d / g };
}
export const qadd = (a: Q, b: Q) => q(a.n * b.d + b.n * a.d, a.d * b.d);
export const qsub = (a: Q, b: Q) => q(a.n * b.d - b.n * a.d, a.d * b.d);
export const qmul = (a: Q, b: Q) => q(a.n * b.n, a.d * b.d);
export const qdiv = (a: Q, b: Q) => q(a.n * b.d, a.d * b.n);
export const qzero = (a: Q) => a.n === 0n;
export const qsign = (a: Q) => (a.n > 0n ? 1 : a.n < 0n ? -1 : 0);

/** A decimal literal such as "0.75" as an exact rational. */
export function qFromDecimal(s: string): Q {
  const [whole = '0', frac = ''] = s.split('.');
  return q(BigInt((whole || '0') + frac), 10n ** BigInt(frac.length));
}

export interface GQ { re: Q; im: Q }
export const gq = (re: Q, im: Q = q(0n)): GQ => ({ re, im });
export const gadd = (a: GQ, b: GQ): GQ => gq(qadd(a.re, b.re), qadd(a.im, b.im));
export const gsub = (a: GQ, b: GQ): GQ => gq(qsub(a.re, b.re), qsub(a.im, b.im));
export const gmul = (a: GQ, b: GQ): GQ => gq(qsub(qmul(a.re, b.re), qmul(a.im, b.im)), qadd(qmul(a.re, b.im), qmul(a.im, b.re)));
export function ginv(a: GQ): GQ {
  const d = qadd(qmul(a.re, a.re), qmul(a.im, a.im));
  return gq(qdiv(a.re, d), qdiv(q(-a.im.n, a.im.d), d));
}
export const gzero = (a: GQ) => qzero(a.re) && qzero(a.im);
