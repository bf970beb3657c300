/** Dense complex matrices in typed arrays (row-major), and the L D L^T route to det and solves. */
export interface CMat { n: number; re: Float64Array; im: Float64Array }
export interface C { re: number; im: number }

export function cmat(n: number): CMat { return { n, re: new Float64Array(n * n), im: new Float64Array(n * n) }; }

export function fromRows(rows: readonly (readonly C[])[]): CMat {
  const n = rows.length;
  const m = cmat(n);
  rows.forEach((row, i) => row.forEach((z, j) => { m.re[i * n + j] = z.re; m.im[i * n + j] = z.im; }));
  return m;
}

export function toRows(m: CMat): C[][] {
  const out: C[][] = [];
  for (let i = 0; i < m.n; i++) {
    const row: C[] = [];
    for (let j = 0; j < m.n; j++) row.push({ re: m.re[i * m.n + j]!, im: m.im[i * m.n + j]! });
    out.push(row);
  }
  return out;
}

/** Principal square root, cut on the negative real axis (arg in (-pi/2, pi/2]). */
export function csqrt(z: C): C {
  const r = Math.hypot(z.re, z.im);
  if (r === 0) return { re: 0, im: 0 };
  if (z.re >= 0) {
    const t = Math.sqrt((r + z.re) / 2);
    return { re: t, im: z.im / (2 * t) };
  }
  const t = Math.sqrt((r - z.re) / 2);
  const im = z.im < 0 ? -t : t;
  return { re: z.im / (2 * im), im };
}
export const cmul = (a: C, b: C): C => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
export function cdiv(a: C, b: C): C {
  const d = b.re * b.re + b.im * b.im;
  return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d };
}
export const cabs = (z: C) => Math.hypot(z.re, z.im);
export const carg = (z: C) => Math.atan2(z.im, z.re);
export const cexp = (z: C): C => { const m = Math.exp(z.re); return { re: m * Math.cos(z.im), im: m * Math.sin(z.im) }; };

export interface LDL { n: number; lre: Float64Array; lim: Float64Array; dre: Float64Array; dim: Float64Array }

/**
 * A = L D L^T (plain transpose: A is complex symmetric), by symmetric
 * elimination without pivoting. Returns null when a pivot vanishes.
 */
export function ldl(a: CMat): LDL | null {
  const n = a.n;
  const lre = new Float64Array(n * n); const lim = new Float64Array(n * n);
  const dre = new Float64Array(n); const dim = new Float64Array(n);
  let scale = 0;
  for (let k = 0; k < n * n; k++) scale = Math.max(scale, Math.abs(a.re[k]!), Math.abs(a.im[k]!));
  for (let j = 0; j < n; j++) {
    let sr = a.re[j * n + j]!; let si = a.im[j * n + j]!;
    for (let k = 0; k < j; k++) {
      const xr = lre[j * n + k]!; const xi = lim[j * n + k]!;
      const l2r = xr * xr - xi * xi; const l2i = 2 * xr * xi;
      sr -= l2r * dre[k]! - l2i * dim[k]!; si -= l2r * dim[k]! + l2i * dre[k]!;
    }
    if (Math.hypot(sr, si) <= 1e-14 * Math.max(scale, 1e-300)) return null;
    dre[j] = sr; dim[j] = si;
    lre[j * n + j] = 1;
    const dd = sr * sr + si * si;
    for (let i = j + 1; i < n; i++) {
      let tr = a.re[i * n + j]!; let ti = a.im[i * n + j]!;
      for (let k = 0; k < j; k++) {
        // L[i,k] * L[j,k] * D[k]
        const pr = lre[i * n + k]! * lre[j * n + k]! - lim[i * n + k]! * lim[j * n + k]!;
        const pi = lre[i * n + k]! * lim[j * n + k]! + lim[i * n + k]! * lre[j * n + k]!;
        tr -= pr * dre[k]! - pi * dim[k]!; ti -= pr * dim[k]! + pi * dre[k]!;
      }
      lre[i * n + j] = (tr * sr + ti * si) / dd; lim[i * n + j] = (ti * sr - tr * si) / dd;
    }
  }
  return { n, lre, lim, dre, dim };
}

export function pivots(f: LDL): C[] {
  return Array.from({ length: f.n }, (_, k) => ({ re: f.dre[k]!, im: f.dim[k]! }));
}

/** Solve A x = b with the factorization. */
export function ldlSolve(f: LDL, b: readonly C[]): C[] {
  const n = f.n;
  const xr = new Float64Array(n); const xi = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let r = b[i]!.re; let m = b[i]!.im;
    for (let k = 0; k < i; k++) {
      r -= f.lre[i * n + k]! * xr[k]! - f.lim[i * n + k]! * xi[k]!;
      m -= f.lre[i * n + k]! * xi[k]! + f.lim[i * n + k]! * xr[k]!;
    }
    xr[i] = r; xi[i] = m;
  }
  for (let i = 0; i < n; i++) {
    const q = cdiv({ re: xr[i]!, im: xi[i]! }, { re: f.dre[i]!, im: f.dim[i]! });
    xr[i] = q.re; xi[i] = q.im;
  }
  for (let i = n - 1; i >= 0; i--) {
    let r = xr[i]!; let m = xi[i]!;
    for (let k = i + 1; k < n; k++) {
      r -= f.lre[k * n + i]! * xr[k]! - f.lim[k * n + i]! * xi[k]!;
      m -= f.lre[k * n + i]! * xi[k]! + f.lim[k * n + i]! * xr[k]!;
    }
    xr[i] = r; xi[i] = m;
  }
  return Array.from({ length: n }, (_, k) => ({ re: xr[k]!, im: xi[k]! }));
}

/** Gaussian elimination with partial pivoting: det and solve for matrices the L D L^T route cannot take. */
export function luSolveDet(a: CMat, b: readonly C[]): { det: C; x: C[] } | null {
  const n = a.n;
  const m = toRows(a);
  const rhs = b.map((z) => ({ ...z }));
  let det: C = { re: 1, im: 0 };
  for (let k = 0; k < n; k++) {
    let p = k;
    for (let i = k + 1; i < n; i++) if (cabs(m[i]![k]!) > cabs(m[p]![k]!)) p = i;
    if (cabs(m[p]![k]!) === 0) return null;
    if (p !== k) { [m[p], m[k]] = [m[k]!, m[p]!]; [rhs[p], rhs[k]] = [rhs[k]!, rhs[p]!]; det = { re: -det.re, im: -det.im }; }
    const piv = m[k]![k]!;
    det = cmul(det, piv);
    for (let i = k + 1; i < n; i++) {
      const f = cdiv(m[i]![k]!, piv);
      for (let j = k; j < n; j++) { const t = cmul(f, m[k]![j]!); m[i]![j] = { re: m[i]![j]!.re - t.re, im: m[i]![j]!.im - t.im }; }
      const t = cmul(f, rhs[k]!); rhs[i] = { re: rhs[i]!.re - t.re, im: rhs[i]!.im - t.im };
    }
  }
  const x: C[] = new Array<C>(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = rhs[i]!;
    for (let j = i + 1; j < n; j++) { const t = cmul(m[i]![j]!, x[j]!); s = { re: s.re - t.re, im: s.im - t.im }; }
    x[i] = cdiv(s, m[i]![i]!);
  }
  return { det, x };
}
