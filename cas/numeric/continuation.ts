/**
 * Numeric continuation of det(A)^(1/2) along a piecewise-linear path in parameter space.
 * Small n: eigenvalues at every step (QR), matched to the previous ones by nearest distance, each
 * square root chosen continuous with the last. Large n (or when asked): the L D L^T pivots' product
 * at every step with the sign kept continuous, eigenvalues at sampled steps for the diagram's tracks.
 * Both: det A from the pivots with its phase unwrapped, as a second route.
 */
import { Complex } from 'complex.js';
import { cabs, cmul, csqrt, ldl, luSolveDet, pivots, type C, type CMat } from './cmatrix.js';
import { eigenvalues } from './eigen.js';
import { symEig } from './symeig.js';
import { checkDeadline } from '../deadline.js';

export interface PathSample { t: Complex[]; det: C; sqrtDet: C; eigenvalues: C[]; minRe: number }

export interface FollowResult {
  samples: PathSample[];
  rejected: number;
  eigenRoute: boolean;
  routesAgree: boolean;
  tracks: C[][];
  branchPoints: { at: C; distance: number; side: 'left' | 'right'; simple: boolean; closest: Complex[] }[];
  cuts: { t: Complex[]; fromAbove: boolean }[];
  convergence: { t: Complex[]; after: Complex[]; lost: boolean }[];
}

export interface FollowOptions { minSteps?: number; eigenEvery?: number; maxSteps?: number }

function det(a: CMat): C {
  const f = ldl(a);
  if (f) return pivots(f).reduce<C>((p, z) => cmul(p, z), { re: 1, im: 0 });
  return luSolveDet(a, Array.from({ length: a.n }, () => ({ re: 0, im: 0 })))?.det ?? { re: 0, im: 0 };
}

function minReEig(a: CMat): number {
  const n = a.n;
  const rows = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (a.re[i * n + j]! + a.re[j * n + i]!) / 2));
  return symEig(rows).values[0]!;
}

const near = (a: C, b: C) => Math.hypot(a.re - b.re, a.im - b.im);
const lerp = (a: Complex[], b: Complex[], s: number) => a.map((z, k) => z.add(b[k]!.sub(z).mul(s)));

/** The step size shrank to nothing: det A vanishes on the path itself, so no branch can be followed through. */
export class PathThroughBranchPoint extends Error {
  constructor(readonly at: Complex[]) {
    super('The path passes through a branch point (det A = 0).');
  }
}

export function followPath(Aof: (t: Complex[]) => CMat, nodes: Complex[][], opts: FollowOptions = {}): FollowResult {
  const n = Aof(nodes[0]!).n;
  const eigenRoute = n <= 8 && !opts.eigenEvery;
  // large n: the square root follows det A through the pivots at every step; eigenvalues (for the tracks and
  // the branch-point search) every fourth step, where the QR iteration would otherwise dominate the cost
  const eigenEvery = opts.eigenEvery ?? (eigenRoute ? 1 : 4);
  const segs = nodes.length - 1;
  const hmax = Math.min(1 / 16, opts.minSteps ? segs / opts.minSteps : 1);
  const maxSteps = opts.maxSteps ?? 200000;
  const A0 = Aof(nodes[0]!);
  let lam = eigenvalues(A0);
  let roots = lam.map(csqrt);
  let d = det(A0);
  let phase = Math.atan2(d.im, d.re);
  let sq: C = roots.reduce<C>((p, z) => cmul(p, z), { re: 1, im: 0 });
  // the square root of det from the eigenvalues must match the unwrapped det route at the start
  const sqFromPhase = () => { const m = Math.sqrt(cabs(d)); return { re: m * Math.cos(phase / 2), im: m * Math.sin(phase / 2) }; };
  if (sq.re * sqFromPhase().re + sq.im * sqFromPhase().im < 0) phase += 2 * Math.PI;
  const samples: PathSample[] = [{ t: nodes[0]!, det: d, sqrtDet: sq, eigenvalues: lam, minRe: minReEig(A0) }];
  const tracks: C[][] = lam.map((z) => [z]);
  let rejected = 0; let steps = 0; let routesAgree = true;
  for (let seg = 0; seg < segs; seg++) {
    let s = 0; let h = hmax;
    while (s < 1 - 1e-15) {
      if (++steps > maxSteps) throw new Error('The continuation needed too many steps.');
      if (steps % 64 === 0) checkDeadline();
      const sn = Math.min(1, s + h);
      const t = lerp(nodes[seg]!, nodes[seg + 1]!, sn);
      const A = Aof(t);
      const dn = det(A);
      let jump = Math.atan2(dn.im, dn.re) - Math.atan2(d.im, d.re);
      while (jump > Math.PI) jump -= 2 * Math.PI;
      while (jump <= -Math.PI) jump += 2 * Math.PI;
      let ok = Math.abs(jump) < 0.3 && cabs(dn) > 0;
      let mu: C[] | null = null;
      const wantEig = eigenRoute || steps % eigenEvery === 0;
      if (ok && wantEig) {
        const ev = eigenvalues(A);
        // match greedily by distance
        const used = new Set<number>();
        mu = lam.map((l) => {
          let best = -1; let bd = Infinity;
          ev.forEach((z, k) => { if (!used.has(k) && near(z, l) < bd) { bd = near(z, l); best = k; } });
          used.add(best);
          return ev[best]!;
        });
        if (eigenRoute && mu.some((z, k) => near(z, lam[k]!) > 0.2 * Math.max(cabs(lam[k]!), 1e-300))) ok = false;
      }
      if (!ok) {
        rejected++;
        h /= 2;
        if (h < 1e-12) throw new PathThroughBranchPoint(t);
        continue;
      }
      phase += jump;
      d = dn;
      if (mu) {
        roots = mu.map((z, k) => { const r = csqrt(z); return r.re * roots[k]!.re + r.im * roots[k]!.im >= 0 ? r : { re: -r.re, im: -r.im }; });
        lam = mu;
        mu.forEach((z, k) => tracks[k]!.push(z));
      }
      const viaPhase = sqFromPhase();
      if (eigenRoute) {
        sq = roots.reduce<C>((p, z) => cmul(p, z), { re: 1, im: 0 });
        if (near(sq, viaPhase) > 1e-6 * cabs(sq)) routesAgree = false;
      } else sq = viaPhase;
      samples.push({ t, det: d, sqrtDet: sq, eigenvalues: lam, minRe: eigenRoute ? minReEig(A) : NaN });
      s = sn;
      const small = Math.min(...lam.map(cabs)) / Math.max(...lam.map(cabs), 1e-300);
      if (Math.abs(jump) < 0.05 && small > 0.05) h = Math.min(h * 1.5, hmax);
    }
  }
  // events
  const cuts: FollowResult['cuts'] = [];
  const convergence: FollowResult['convergence'] = [];
  for (let k = 1; k < samples.length; k++) {
    const a = samples[k - 1]!; const b = samples[k]!;
    if ((a.det.re < 0 || b.det.re < 0) && Math.sign(a.det.im) !== Math.sign(b.det.im) && a.det.im !== 0 && b.det.im !== 0) {
      const w = a.det.im / (a.det.im - b.det.im);
      cuts.push({ t: a.t.map((z, j) => z.add(b.t[j]!.sub(z).mul(w))), fromAbove: a.det.im > 0 });
    }
    if (Number.isFinite(a.minRe) && (a.minRe > 0) !== (b.minRe > 0)) convergence.push({ t: b.t, after: b.t, lost: a.minRe > 0 });
  }
  // branch points: local minima of the smallest |eigenvalue| (relative), refined by Newton on det in the first parameter
  const branchPoints: FollowResult['branchPoints'] = [];
  const smallest = samples.map((x) => Math.min(...x.eigenvalues.map(cabs)));
  const scale = Math.max(...samples.map((x) => Math.max(...x.eigenvalues.map(cabs))));
  for (let k = 1; k < samples.length - 1; k++) {
    if (!(smallest[k]! <= smallest[k - 1]! && smallest[k]! < smallest[k + 1]! && smallest[k]! < 0.5 * scale)) continue;
    const t0 = samples[k]!.t;
    let z = t0[0]!;
    const f = (w: Complex) => { const tt = [w, ...t0.slice(1)]; const dd = det(Aof(tt)); return new Complex(dd.re, dd.im); };
    let okN = false;
    for (let it = 0; it < 60; it++) {
      const fz = f(z); const hh = 1e-6 * Math.max(1, z.abs());
      const df = f(z.add(hh)).sub(f(z.sub(hh))).div(2 * hh);
      if (df.abs() === 0) break;
      const dz = fz.div(df);
      z = z.sub(dz);
      if (dz.abs() < 1e-13 * Math.max(1, z.abs())) { okN = true; break; }
    }
    if (!okN) continue;
    const hh = 1e-5 * Math.max(1, z.abs());
    const simple = f(z.add(hh)).sub(f(z.sub(hh))).div(2 * hh).abs() > 1e-8 * Math.max(1, f(z.add(1)).abs());
    if (branchPoints.some((b) => near(b.at, z) < 1e-8)) continue;
    const dist = z.sub(t0[0]!).abs();
    const dir = samples[k + 1]!.t[0]!.sub(samples[k - 1]!.t[0]!);
    const off = z.sub(t0[0]!);
    const cross = dir.re * off.im - dir.im * off.re;
    branchPoints.push({ at: { re: z.re, im: z.im }, distance: dist, side: cross > 0 ? 'left' : 'right', simple, closest: t0 });
  }
  return { samples, rejected, eigenRoute, routesAgree, tracks, branchPoints, cuts, convergence };
}

/** A common angle theta with Re(e^(2 i theta) A) positive definite, on a grid of 721 angles in (-pi/2, pi/2). */
export function commonRotation(a: CMat): { theta: number; from: number; to: number } | null {
  const n = a.n;
  const ok: number[] = [];
  for (let k = 0; k <= 720; k++) {
    const th = -Math.PI / 2 + (Math.PI * k) / 720;
    const c = Math.cos(2 * th); const s = Math.sin(2 * th);
    const rows = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => {
      const re = (a.re[i * n + j]! + a.re[j * n + i]!) / 2; const im = (a.im[i * n + j]! + a.im[j * n + i]!) / 2;
      return c * re - s * im;
    }));
    if (symEig(rows).values[0]! > 1e-12) ok.push(th);
  }
  if (!ok.length) return null;
  // the interval containing the angle closest to 0
  const best = ok.reduce((b, x) => (Math.abs(x) < Math.abs(b) ? x : b), ok[0]!);
  let lo = best; let hi = best;
  const step = Math.PI / 720;
  while (ok.some((x) => Math.abs(x - (lo - step)) < 1e-12)) lo -= step;
  while (ok.some((x) => Math.abs(x - (hi + step)) < 1e-12)) hi += step;
  return { theta: (lo + hi) / 2, from: lo, to: hi };
}
