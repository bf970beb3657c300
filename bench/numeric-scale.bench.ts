// Numeric Gaussians with n = 10..400 variables: the closed form with the branch rule
// by the L D L^T pivot route, beside the eigenvalue route on the same matrices.
// Prints a table and a `BENCH_JSON` line for scripts/bench.mjs.
import { cmat, cmul, csqrt, ldl, ldlSolve, pivots, type C, type CMat } from '../cas/numeric/cmatrix.js';
import { eigenvalues } from '../cas/numeric/eigen.js';

const SIZES = (process.env['BENCH_SIZES'] ?? '10,50,100,200,400').split(',').map(Number);

/** A seeded generator, so every run measures the same matrices. */
function random(seed: number) {
  return () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31) * 2 - 1;
}

/** Complex symmetric A with Re A = M M^T / n + I (positive definite) and a random symmetric imaginary part. */
function randomMatrix(n: number, seed: number): CMat {
  const r = random(seed);
  const m = Array.from({ length: n * n }, r);
  const a = cmat(n);
  for (let i = 0; i < n; i++)
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let k = 0; k < n; k++) s += m[i * n + k]! * m[j * n + k]!;
      const re = s / n + (i === j ? 1 : 0);
      const im = r() * 1.5;
      a.re[i * n + j] = a.re[j * n + i] = re;
      a.im[i * n + j] = a.im[j * n + i] = im;
    }
  return a;
}

const prodSqrt = (zs: C[]) => zs.reduce<C>((p, z) => cmul(p, csqrt(z)), { re: 1, im: 0 });

/** log of (2 pi)^(n/2) det(A)^(-1/2) exp(J^T A^-1 J / 2), from a given sqrt(det A). */
function logValue(n: number, sqrtDet: C, quad: C): C {
  const logAbs = (n / 2) * Math.log(2 * Math.PI) - Math.log(Math.hypot(sqrtDet.re, sqrtDet.im)) + quad.re / 2;
  return { re: logAbs, im: -Math.atan2(sqrtDet.im, sqrtDet.re) + quad.im / 2 };
}

function pivotRoute(a: CMat, J: C[]) {
  const f = ldl(a)!;
  const x = ldlSolve(f, J);
  const quad = J.reduce<C>((s, j, k) => ({ re: s.re + j.re * x[k]!.re - j.im * x[k]!.im, im: s.im + j.re * x[k]!.im + j.im * x[k]!.re }), { re: 0, im: 0 });
  return { sqrtDet: prodSqrt(pivots(f)), quad };
}

function eigenRoute(a: CMat) {
  return prodSqrt(eigenvalues(a));
}

function time<T>(fn: () => T, repeats: number): { ms: number; value: T } {
  let value!: T;
  const times: number[] = [];
  for (let k = 0; k < repeats; k++) {
    const t0 = performance.now();
    value = fn();
    times.push(performance.now() - t0);
  }
  times.sort((x, y) => x - y);
  return { ms: times[Math.floor(times.length / 2)]!, value };
}

const rows: { n: number; pivotMs: number; eigenMs: number; agree: boolean; relDiff: number }[] = [];
for (const n of SIZES) {
  const a = randomMatrix(n, 7 + n);
  const r = random(99 + n);
  const J = Array.from({ length: n }, () => ({ re: r(), im: r() }));
  const repeats = n <= 100 ? 15 : n <= 200 ? 7 : 3;
  const pivot = time(() => pivotRoute(a, J), repeats);
  const eigen = time(() => eigenRoute(a), n <= 200 ? 3 : 1);
  const s1 = pivot.value.sqrtDet;
  const s2 = eigen.value;
  const relDiff = Math.hypot(s1.re - s2.re, s1.im - s2.im) / Math.hypot(s2.re, s2.im);
  logValue(n, s1, pivot.value.quad);
  rows.push({ n, pivotMs: pivot.ms, eigenMs: eigen.ms, agree: relDiff < 1e-8, relDiff });
}

// Growth exponent: least-squares slope of log(time) against log(n) over n >= 50.
const fit = rows.filter((r) => r.n >= 50);
const xs = fit.map((r) => Math.log(r.n));
const ys = fit.map((r) => Math.log(r.pivotMs));
const mx = xs.reduce((s, x) => s + x, 0) / xs.length;
const my = ys.reduce((s, y) => s + y, 0) / ys.length;
const exponent = xs.reduce((s, x, k) => s + (x - mx) * (ys[k]! - my), 0) / xs.reduce((s, x) => s + (x - mx) ** 2, 0);

console.log('n      pivot route ms   eigenvalue route ms   same sqrt(det A)');
for (const r of rows) console.log(`${String(r.n).padEnd(6)} ${r.pivotMs.toFixed(2).padStart(14)}   ${r.eigenMs.toFixed(1).padStart(19)}   ${r.agree ? 'yes' : 'NO'} (rel. diff ${r.relDiff.toExponential(1)})`);
console.log(`time grows like n^${exponent.toFixed(2)} (pivot route, n >= 50)`);
console.log(`BENCH_JSON ${JSON.stringify({ numericScale: { rows, exponent } })}`);
