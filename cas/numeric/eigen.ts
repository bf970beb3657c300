/**
 * Eigenvalues of a complex matrix: Householder reduction to Hessenberg form,
 * then shifted QR with Givens rotations and deflation. Small n, typed arrays.
 */
import type { C, CMat } from './cmatrix.js';
import { checkDeadline } from '../deadline.js';

export function eigenvalues(a: CMat): C[] {
  const n = a.n;
  const hr = Float64Array.from(a.re); const hi = Float64Array.from(a.im);
  const R = (i: number, j: number) => i * n + j;
  // Householder: zero column k below the subdiagonal.
  for (let k = 0; k < n - 2; k++) {
    // Work with the column scaled to unit size: the reflector does not depend on the scale, and tiny entries would underflow.
    let amax = 0;
    for (let i = k + 1; i < n; i++) amax = Math.max(amax, Math.abs(hr[R(i, k)]!), Math.abs(hi[R(i, k)]!));
    if (amax === 0) continue;
    let norm = 0;
    for (let i = k + 1; i < n; i++) norm += (hr[R(i, k)]! / amax) ** 2 + (hi[R(i, k)]! / amax) ** 2;
    norm = Math.sqrt(norm);
    const x0r = hr[R(k + 1, k)]! / amax; const x0i = hi[R(k + 1, k)]! / amax;
    const x0 = Math.hypot(x0r, x0i);
    const pr = x0 === 0 ? 1 : x0r / x0; const pi = x0 === 0 ? 0 : x0i / x0;
    const vr = new Float64Array(n); const vi = new Float64Array(n);
    for (let i = k + 1; i < n; i++) { vr[i] = hr[R(i, k)]! / amax; vi[i] = hi[R(i, k)]! / amax; }
    vr[k + 1] = vr[k + 1]! + pr * norm; vi[k + 1] = vi[k + 1]! + pi * norm;
    let vn = 0;
    for (let i = k + 1; i < n; i++) vn += vr[i]! ** 2 + vi[i]! ** 2;
    if (vn === 0) continue;
    // H <- (I - 2 v v^H / vn) H
    for (let j = 0; j < n; j++) {
      let sr = 0; let si = 0; // v^H H[:, j]
      for (let i = k + 1; i < n; i++) { sr += vr[i]! * hr[R(i, j)]! + vi[i]! * hi[R(i, j)]!; si += vr[i]! * hi[R(i, j)]! - vi[i]! * hr[R(i, j)]!; }
      sr *= 2 / vn; si *= 2 / vn;
      for (let i = k + 1; i < n; i++) { hr[R(i, j)] = hr[R(i, j)]! - (vr[i]! * sr - vi[i]! * si); hi[R(i, j)] = hi[R(i, j)]! - (vr[i]! * si + vi[i]! * sr); }
    }
    // H <- H (I - 2 v v^H / vn)
    for (let i = 0; i < n; i++) {
      let sr = 0; let si = 0; // H[i, :] v
      for (let j = k + 1; j < n; j++) { sr += hr[R(i, j)]! * vr[j]! - hi[R(i, j)]! * vi[j]!; si += hr[R(i, j)]! * vi[j]! + hi[R(i, j)]! * vr[j]!; }
      sr *= 2 / vn; si *= 2 / vn;
      for (let j = k + 1; j < n; j++) { hr[R(i, j)] = hr[R(i, j)]! - (sr * vr[j]! + si * vi[j]!); hi[R(i, j)] = hi[R(i, j)]! - (si * vr[j]! - sr * vi[j]!); }
    }
  }
  const out: C[] = [];
  let top = n - 1;
  let iter = 0;
  const cs = new Float64Array(4 * n);
  while (top >= 0) {
    if (top === 0) { out.push({ re: hr[0]!, im: hi[0]! }); break; }
    let lo = top;
    while (lo > 0) {
      const s = Math.hypot(hr[R(lo, lo)]!, hi[R(lo, lo)]!) + Math.hypot(hr[R(lo - 1, lo - 1)]!, hi[R(lo - 1, lo - 1)]!);
      if (Math.hypot(hr[R(lo, lo - 1)]!, hi[R(lo, lo - 1)]!) <= 1e-15 * (s === 0 ? 1 : s)) break;
      lo--;
    }
    if (lo === top) { out.push({ re: hr[R(top, top)]!, im: hi[R(top, top)]! }); top--; iter = 0; continue; }
    if (++iter > 300) throw new Error('The eigenvalue iteration did not converge.');
    if (iter % 50 === 0) checkDeadline();
    // Wilkinson shift: eigenvalue of the trailing 2x2 block closest to its last entry.
    const ar = hr[R(top - 1, top - 1)]!; const ai = hi[R(top - 1, top - 1)]!;
    const br = hr[R(top - 1, top)]!; const bi = hi[R(top - 1, top)]!;
    const cr = hr[R(top, top - 1)]!; const ci = hi[R(top, top - 1)]!;
    const dr = hr[R(top, top)]!; const di = hi[R(top, top)]!;
    const tr = (ar - dr) / 2; const ti = (ai - di) / 2;
    const qr = tr * tr - ti * ti + (br * cr - bi * ci); const qi = 2 * tr * ti + (br * ci + bi * cr);
    const m = Math.hypot(qr, qi);
    let sr = Math.sqrt(Math.max(0, (m + qr) / 2)); let si = Math.sqrt(Math.max(0, (m - qr) / 2));
    if (qi < 0) si = -si;
    if (tr * sr + ti * si < 0) { sr = -sr; si = -si; }
    // mu = d - b c / (t + s)
    const denr = tr + sr; const deni = ti + si;
    let mur = dr; let mui = di;
    const dd = denr * denr + deni * deni;
    if (dd > 0) {
      const bcr = br * cr - bi * ci; const bci = br * ci + bi * cr;
      mur -= (bcr * denr + bci * deni) / dd; mui -= (bci * denr - bcr * deni) / dd;
    }
    if (iter % 11 === 10) { mur += Math.abs(hr[R(top, top - 1)]!); mui += Math.abs(hi[R(top, top - 1)]!); }
    for (let k = lo; k <= top; k++) { hr[R(k, k)] = hr[R(k, k)]! - mur; hi[R(k, k)] = hi[R(k, k)]! - mui; }
    // QR by Givens rotations on rows, then RQ on columns, within the active block.
    for (let k = lo; k < top; k++) {
      const xr = hr[R(k, k)]!; const xi = hi[R(k, k)]!; const yr = hr[R(k + 1, k)]!; const yi = hi[R(k + 1, k)]!;
      const r = Math.hypot(xr, xi, yr, yi);
      const c_r = r === 0 ? 1 : xr / r; const c_i = r === 0 ? 0 : xi / r; const s_r = r === 0 ? 0 : yr / r; const s_i = r === 0 ? 0 : yi / r;
      cs[4 * k] = c_r; cs[4 * k + 1] = c_i; cs[4 * k + 2] = s_r; cs[4 * k + 3] = s_i;
      for (let j = k; j <= top; j++) {
        const ur = hr[R(k, j)]!; const ui = hi[R(k, j)]!; const wr = hr[R(k + 1, j)]!; const wi = hi[R(k + 1, j)]!;
        // row k: conj(c) u + conj(s) w ; row k+1: -s u + c w
        hr[R(k, j)] = c_r * ur + c_i * ui + s_r * wr + s_i * wi; hi[R(k, j)] = c_r * ui - c_i * ur + s_r * wi - s_i * wr;
        hr[R(k + 1, j)] = -(s_r * ur - s_i * ui) + (c_r * wr - c_i * wi); hi[R(k + 1, j)] = -(s_r * ui + s_i * ur) + (c_r * wi + c_i * wr);
      }
    }
    for (let k = lo; k < top; k++) {
      const c_r = cs[4 * k]!; const c_i = cs[4 * k + 1]!; const s_r = cs[4 * k + 2]!; const s_i = cs[4 * k + 3]!;
      for (let i = lo; i <= Math.min(k + 2, top); i++) {
        const ur = hr[R(i, k)]!; const ui = hi[R(i, k)]!; const wr = hr[R(i, k + 1)]!; const wi = hi[R(i, k + 1)]!;
        // col k: u c + w s ; col k+1: -u conj(s) + w conj(c)
        hr[R(i, k)] = ur * c_r - ui * c_i + wr * s_r - wi * s_i; hi[R(i, k)] = ur * c_i + ui * c_r + wr * s_i + wi * s_r;
        hr[R(i, k + 1)] = -(ur * s_r + ui * s_i) + (wr * c_r + wi * c_i); hi[R(i, k + 1)] = -(ui * s_r - ur * s_i) + (wi * c_r - wr * c_i);
      }
    }
    for (let k = lo; k <= top; k++) { hr[R(k, k)] = hr[R(k, k)]! + mur; hi[R(k, k)] = hi[R(k, k)]! + mui; }
  }
  return out.reverse();
}
