/**
 * The fundamental solutions of y'' = V(t) y on [0, T] for complex V, by the classical
 * fourth-order Runge-Kutta method on a fixed grid, halving the step until two successive
 * solves agree to a relative tolerance. Used for functional determinants (Gel'fand-Yaglom).
 *
 * Example: with V = 0.49, fundamentalSolutions(() => ({ re: 0.49, im: 0 }), 3) gives
 * y2(3) = sinh(2.1)/0.7 (y2(0) = 0, y2'(0) = 1).
 */

export interface Cplx { re: number; im: number }

/** y1 (y1(0) = 1, y1'(0) = 0) and y2 (y2(0) = 0, y2'(0) = 1) with their derivatives at T. */
export interface Monodromy { y1: Cplx; dy1: Cplx; y2: Cplx; dy2: Cplx }

function solve(V: (t: number) => Cplx, T: number, steps: number): Monodromy {
  const h = T / steps;
  // state: [y1, y1', y2, y2'] as re/im pairs
  let s = [1, 0, 0, 0, 0, 0, 1, 0];
  const f = (v: Cplx, x: number[]) => {
    // (y, y')' = (y', V y) for each of the two solutions
    const out = new Array<number>(8);
    for (let k = 0; k < 8; k += 4) {
      out[k] = x[k + 2]!; out[k + 1] = x[k + 3]!;
      out[k + 2] = v.re * x[k]! - v.im * x[k + 1]!;
      out[k + 3] = v.re * x[k + 1]! + v.im * x[k]!;
    }
    return out;
  };
  const axpy = (x: number[], a: number, y: number[]) => x.map((xi, i) => xi + a * y[i]!);
  let v0 = V(0);
  for (let i = 0; i < steps; i++) {
    const t = i * h;
    const vm = V(t + h / 2); const v1 = V(t + h);
    const k1 = f(v0, s);
    const k2 = f(vm, axpy(s, h / 2, k1));
    const k3 = f(vm, axpy(s, h / 2, k2));
    const k4 = f(v1, axpy(s, h, k3));
    s = s.map((x, j) => x + (h / 6) * (k1[j]! + 2 * k2[j]! + 2 * k3[j]! + k4[j]!));
    v0 = v1;
  }
  return { y1: { re: s[0]!, im: s[1]! }, dy1: { re: s[2]!, im: s[3]! }, y2: { re: s[4]!, im: s[5]! }, dy2: { re: s[6]!, im: s[7]! } };
}

/**
 * Solves with 64, 128, ... steps until the quantity q of two successive solves agrees to
 * `tolerance` (relative); returns the finer one, its step count and the difference, or null
 * when 2^18 steps do not reach it (or V has no finite value).
 */
export function fundamentalSolutions(V: (t: number) => Cplx, T: number, q: (m: Monodromy) => Cplx, tolerance = 1e-11): { m: Monodromy; value: Cplx; steps: number; difference: number } | null {
  let steps = 64;
  let prev = solve(V, T, steps);
  for (steps = 128; steps <= 1 << 18; steps *= 2) {
    const next = solve(V, T, steps);
    const a = q(prev); const b = q(next);
    if (![b.re, b.im].every(Number.isFinite)) return null;
    const diff = Math.hypot(a.re - b.re, a.im - b.im) / Math.max(Math.hypot(b.re, b.im), 1e-300);
    if (diff <= tolerance) return { m: next, value: b, steps, difference: diff };
    prev = next;
  }
  return null;
}
