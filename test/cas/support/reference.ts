/**
 * Reference routes for the tests, sharing no code with cas/: mathjs for
 * determinants and inverses, the square root of det continued along the straight
 * path from the identity to A with its phase unwrapped, and worksheet text builders.
 */
import * as math from 'mathjs';

export interface Cx { re: number; im: number }
export type CMatrix = Cx[][];

const mc = (z: Cx) => math.complex(z.re, z.im);
const toCx = (z: unknown): Cx => { const c = math.complex(z as math.Complex); return { re: c.re, im: c.im }; };

export function detMathjs(a: CMatrix): Cx { return toCx(math.det(a.map((r) => r.map(mc)))); }

/** sqrt(det((1 - t) I + t A)) followed continuously from t = 0 (value 1) to t = 1. */
export function sqrtDetAlongPath(a: CMatrix): Cx {
  const n = a.length;
  const at = (t: number) => detMathjs(a.map((row, i) => row.map((z, j) => ({ re: t * z.re + (i === j ? 1 - t : 0), im: t * z.im }))));
  let phase = 0;
  let prev = at(0);
  let t = 0;
  let h = 1 / 64;
  while (t < 1) {
    const tn = Math.min(1, t + h);
    const d = at(tn);
    let jump = Math.atan2(d.im, d.re) - Math.atan2(prev.im, prev.re);
    while (jump > Math.PI) jump -= 2 * Math.PI;
    while (jump <= -Math.PI) jump += 2 * Math.PI;
    if (Math.abs(jump) > 0.2 && h > 1e-6) { h /= 2; continue; }
    phase += jump; prev = d; t = tn;
    if (Math.abs(jump) < 0.05) h = Math.min(h * 2, 1 / 16);
  }
  const r = Math.sqrt(Math.hypot(prev.re, prev.im));
  void n;
  return { re: r * Math.cos(phase / 2), im: r * Math.sin(phase / 2) };
}

/** (2 pi)^(n/2) / sqrtDet * exp(J^T A^-1 J / 2 + c), with the inverse from mathjs. */
export function gaussianReference(a: CMatrix, j: Cx[], sqrtDet: Cx, c: Cx = { re: 0, im: 0 }): Cx {
  const n = a.length;
  const inv = math.inv(a.map((r) => r.map(mc))) as unknown as math.Complex[][];
  let q = math.complex(0, 0);
  for (let r = 0; r < n; r++) for (let s = 0; s < n; s++) q = math.add(q, math.multiply(math.multiply(mc(j[r]!), inv[r]![s]!), mc(j[s]!))) as math.Complex;
  const e = math.exp(math.add(math.multiply(q, 0.5), mc(c)) as math.Complex) as math.Complex;
  const v = math.divide(math.multiply(e, Math.pow(2 * Math.PI, n / 2)), mc(sqrtDet)) as math.Complex;
  return toCx(v);
}

export function relErr(a: Cx, b: Cx): number {
  return Math.hypot(a.re - b.re, a.im - b.im) / Math.max(Math.hypot(b.re, b.im), 1e-300);
}

/** A number in worksheet syntax, every digit kept. */
export function lit(z: Cx): string {
  const digits = (x: number) => { const t = x.toPrecision(17); return t.includes('e') ? x.toFixed(40) : t; };
  const r = (x: number) => (x < 0 ? `(-${digits(-x)})` : digits(x));
  if (z.im === 0) return r(z.re);
  return `(${r(z.re)} + ${r(z.im)}*i)`;
}

/** The worksheet line integral NAME = exp(-1/2 x^T A x + J^T x) d(x1..xn). */
export function gaussianLine(name: string, a: CMatrix, j: Cx[]): string {
  const n = a.length;
  const x = (k: number) => `x${k + 1}`;
  const quad: string[] = [];
  for (let r = 0; r < n; r++) for (let s = r; s < n; s++) {
    const coef = r === s ? lit(a[r]![r]!) : `2*${lit(a[r]![s]!)}`;
    quad.push(r === s ? `${coef}*${x(r)}^2` : `${coef}*${x(r)}*${x(s)}`);
  }
  const lin = j.map((z, k) => `${lit(z)}*${x(k)}`);
  return `integral ${name} = exp(-(${quad.join(' + ')})/2 + ${lin.join(' + ')}) d(${Array.from({ length: n }, (_, k) => x(k)).join(', ')})`;
}

/** Q diag(lambda) Q^T for a real orthogonal Q (from mathjs QR of a given real matrix). */
export function withEigenvalues(lambda: Cx[], seedMatrix: number[][]): CMatrix {
  const n = lambda.length;
  const { Q } = math.qr(seedMatrix) as unknown as { Q: number[][] };
  const out: CMatrix = [];
  for (let r = 0; r < n; r++) {
    const row: Cx[] = [];
    for (let s = 0; s < n; s++) {
      let re = 0; let im = 0;
      for (let k = 0; k < n; k++) { const w = Q[r]![k]! * Q[s]![k]!; re += w * lambda[k]!.re; im += w * lambda[k]!.im; }
      row.push({ re, im });
    }
    out.push(row);
  }
  // exact symmetry
  for (let r = 0; r < n; r++) for (let s = 0; s < r; s++) out[r]![s] = out[s]![r]!;
  return out;
}

export function principalSqrt(z: Cx): Cx { return toCx(math.sqrt(mc(z))); }
