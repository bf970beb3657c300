/**
 * Numerical quadrature of a Gaussian integrand, written for the `verify`
 * statement and sharing no code with the closed-form path: no determinant, no
 * eigenvalues, no square root of det A, no L D L^T. The integrand is a complex
 * quadratic exponent given by numbers (A, J, c and a prefactor) on a real
 * contour; its real part must be negative definite in the variables.
 *
 * Method: one-dimensional rules nested up to three variables, on a box cut from
 * the decay rate of the integrand's modulus (see integrateGaussian). The rule by
 * default is the trapezoidal rule with step halving, which converges like
 * exp(-const/h^2) on an entire integrand with a Gaussian envelope; the
 * double-exponential (sinh-sinh) rule and adaptive Gauss-Kronrod (7-point Gauss,
 * 15-point Kronrod, global bisection of the worst interval) are kept as
 * interchangeable alternatives and cross-checked against it in the tests.
 */

/** Kronrod nodes on [0, 1] of the 15-point rule (the 7-point Gauss nodes are the odd entries), QUADPACK's constants. */
const XGK = [
  0.991455371120812639206854697526329, 0.949107912342758524526189684047851, 0.864864423359769072789712788640926,
  0.741531185599394439863864773280788, 0.586087235467691130294144845693013, 0.405845151377397166906606412076961,
  0.207784955007898467600689403773245, 0,
];
const WGK = [
  0.022935322010529224963732008058970, 0.063092092629978553290700663189204, 0.104790010322250183839876322541518,
  0.140653259715525918745189590510238, 0.169004726639267902826583426598550, 0.190350578064785409913256402421014,
  0.204432940075298892414161999234649, 0.209482141084727828012999174891714,
];
/** Gauss weights for XGK[1], XGK[3], XGK[5], XGK[7]. */
const WG = [0.129484966168869693270611432679082, 0.279705391489276667901467771423780, 0.381830050505118944950369775488975, 0.417959183673469387755102040816327];

/** f(x, out) writes re, im and an error bound of the value into out[0], out[1], out[2]. */
export type Integrand = (x: number, out: Float64Array) => void;

export class QuadratureTimeUp extends Error {
  constructor() { super('The quadrature ran out of time.'); }
}

export interface QuadState { evaluations: number; deadline: number }

interface Piece { a: number; b: number; re: number; im: number; err: number; inner: number }

function gk15(f: Integrand, a: number, b: number, st: QuadState, out: Float64Array, fr: Float64Array, fi: Float64Array): Piece {
  const c = (a + b) / 2; const h = (b - a) / 2;
  let kr = 0; let ki = 0; let gr = 0; let gi = 0; let inner = 0;
  let m = 0;
  for (let k = 0; k < 15; k++) {
    const node = k < 7 ? -XGK[k]! : k === 7 ? 0 : XGK[14 - k]!;
    const w = WGK[k < 8 ? k : 14 - k]!;
    f(c + h * node, out);
    st.evaluations++;
    fr[k] = out[0]!; fi[k] = out[1]!;
    kr += w * out[0]!; ki += w * out[1]!; inner += w * out[2]!;
    const kk = k < 8 ? k : 14 - k;
    if (kk % 2 === 1) { const wg = WG[(kk - 1) / 2]!; gr += wg * out[0]!; gi += wg * out[1]!; }
    m = k;
  }
  void m;
  // QUADPACK's error estimate: the Gauss-Kronrod difference scaled against the integral of |f - mean|.
  const mr = kr / 2; const mi = ki / 2;
  let resasc = 0;
  for (let k = 0; k < 15; k++) resasc += WGK[k < 8 ? k : 14 - k]! * Math.hypot(fr[k]! - mr, fi[k]! - mi);
  resasc *= Math.abs(h);
  let err = Math.hypot(kr - gr, ki - gi) * Math.abs(h);
  if (resasc > 0 && err > 0) err = resasc * Math.min(1, Math.pow(200 * err / resasc, 1.5));
  err = Math.max(err, 50 * 2.2e-16 * Math.hypot(kr, ki) * Math.abs(h));
  return { a, b, re: kr * h, im: ki * h, err, inner: inner * Math.abs(h) };
}

/**
 * Adaptive GK15 on [a, b]: bisect the interval with the largest error until the
 * total error is below max(epsAbs, epsRel * |I|) or maxPieces is reached.
 * Returns re, im and the error estimate (own error plus the integrated error of f).
 */
export function adaptive(f: Integrand, a: number, b: number, epsRel: number, epsAbs: number, st: QuadState, maxPieces = 200): [number, number, number] {
  const out = new Float64Array(3); const fr = new Float64Array(15); const fi = new Float64Array(15);
  const pieces: Piece[] = [gk15(f, a, b, st, out, fr, fi)];
  for (;;) {
    let re = 0; let im = 0; let err = 0; let worst = 0;
    for (let k = 0; k < pieces.length; k++) {
      const p = pieces[k]!;
      re += p.re; im += p.im; err += p.err;
      if (p.err > pieces[worst]!.err) worst = k;
    }
    if (err <= Math.max(epsAbs, epsRel * Math.hypot(re, im)) || pieces.length >= maxPieces) {
      const inner = pieces.reduce((s, p) => s + p.inner, 0);
      return [re, im, err + inner];
    }
    if (Date.now() > st.deadline) throw new QuadratureTimeUp();
    const p = pieces[worst]!;
    const m = (p.a + p.b) / 2;
    const left = gk15(f, p.a, m, st, out, fr, fi);
    const right = gk15(f, m, p.b, st, out, fr, fi);
    // The parent's rule against the sum of its halves measures the parent's actual error, which bounds
    // the (much smaller) error of the halves: use it when it is below the rule's own, pessimistic, estimate.
    const diff = Math.hypot(left.re + right.re - p.re, left.im + right.im - p.im);
    left.err = Math.min(left.err, Math.max(diff / 2, 50 * 2.2e-16 * Math.hypot(left.re, left.im)));
    right.err = Math.min(right.err, Math.max(diff / 2, 50 * 2.2e-16 * Math.hypot(right.re, right.im)));
    pieces[worst] = left;
    pieces.push(right);
  }
}

/**
 * Double-exponential quadrature for the whole line (the sinh-sinh rule): x = c + s sinh(pi/2 sinh t),
 * trapezoidal in t with the step halved until two successive levels agree to max(epsAbs, epsRel |I|).
 * Nodes beyond |x - c| > reach are skipped (the caller guarantees the integrand is negligible there).
 * Error estimate: the last difference (conservative: the rule roughly doubles its digits per halving)
 * plus the integrated error of f.
 */
export function doubleExponential(f: Integrand, c: number, reach: number, epsRel: number, epsAbs: number, st: QuadState, maxLevel = 7): [number, number, number] {
  const out = new Float64Array(3);
  const s = reach / 8;
  // |x - c| = reach at t = asinh(2/pi asinh(reach/s))
  const tMax = Math.asinh((2 / Math.PI) * Math.asinh(reach / s));
  let sr = 0; let si = 0; let se = 0;
  const add = (t: number) => {
    const u = (Math.PI / 2) * Math.sinh(t);
    const w = s * (Math.PI / 2) * Math.cosh(t) * Math.cosh(u);
    f(c + s * Math.sinh(u), out);
    st.evaluations++;
    sr += w * out[0]!; si += w * out[1]!; se += w * Math.abs(out[2]!);
  };
  let step = 0.25;
  const k0 = Math.floor(tMax / step);
  for (let k = -k0; k <= k0; k++) add(k * step);
  let prevR = sr * step; let prevI = si * step;
  for (let level = 1; level <= maxLevel; level++) {
    if (Date.now() > st.deadline) throw new QuadratureTimeUp();
    step /= 2;
    const k1 = Math.floor(tMax / step);
    for (let k = -k1; k <= k1; k++) if (k % 2 !== 0) add(k * step);
    const re = sr * step; const im = si * step;
    const diff = Math.hypot(re - prevR, im - prevI);
    if (diff <= Math.max(epsAbs, epsRel * Math.hypot(re, im))) return [re, im, diff + se * step];
    prevR = re; prevI = im;
  }
  return [prevR, prevI, Infinity];
}

/** A Gaussian integrand pref * exp(-1/2 x^T A x + J^T x + c) with complex numbers in plain arrays (row-major A). */
export interface QuadraticIntegrand {
  n: number;
  are: number[]; aim: number[];
  jre: number[]; jim: number[];
  cre: number; cim: number;
  pre: number; pim: number;
}

/** Cholesky of a real symmetric matrix; null when it is not positive definite. */
function cholesky(m: number[], n: number): number[] | null {
  const l = new Array<number>(n * n).fill(0);
  for (let j = 0; j < n; j++) {
    let d = m[j * n + j]!;
    for (let k = 0; k < j; k++) d -= l[j * n + k]! ** 2;
    if (!(d > 0)) return null;
    l[j * n + j] = Math.sqrt(d);
    for (let i = j + 1; i < n; i++) {
      let s = m[i * n + j]!;
      for (let k = 0; k < j; k++) s -= l[i * n + k]! * l[j * n + k]!;
      l[i * n + j] = s / l[j * n + j]!;
    }
  }
  return l;
}

function choleskySolve(l: number[], n: number, b: number[]): number[] {
  const y = [...b];
  for (let i = 0; i < n; i++) { for (let k = 0; k < i; k++) y[i] = y[i]! - l[i * n + k]! * y[k]!; y[i] = y[i]! / l[i * n + i]!; }
  for (let i = n - 1; i >= 0; i--) { for (let k = i + 1; k < n; k++) y[i] = y[i]! - l[k * n + i]! * y[k]!; y[i] = y[i]! / l[i * n + i]!; }
  return y;
}

/** Whether Re A is positive definite (relative margin), by Cholesky; with the smallest Cholesky pivot ratio as a score. */
export function realPartScore(q: QuadraticIntegrand): number | null {
  const n = q.n;
  const scale = Math.max(...q.are.map(Math.abs), ...q.aim.map(Math.abs), 1e-300);
  const sym = Array.from({ length: n * n }, (_, k) => (q.are[k]! + q.are[(k % n) * n + Math.floor(k / n)]!) / 2);
  const l = cholesky(sym, n);
  if (!l) return null;
  let s = Infinity;
  for (let j = 0; j < n; j++) s = Math.min(s, l[j * n + j]! ** 2 / scale);
  return s > 1e-9 ? s : null;
}

export interface QuadratureResult {
  re: number; im: number; error: number; evaluations: number; timeMs: number; timedOut: boolean;
  /** The half-width of the box in units of each level's standard deviation is sqrt(2 * truncation). */
  truncation: number;
}

/**
 * The trapezoidal rule on [c - half, c + half], starting from at least `intervals` intervals, step halved
 * (every earlier node kept) until two levels agree to max(epsAbs, epsRel |I|). On the integrands here (an
 * entire function under a Gaussian envelope, negligible at both ends of the box) the error of a step h is
 * the aliased part of the integrand's spectrum beyond 2 pi / h, which falls like exp(-const/h^2) once the
 * step resolves the integrand's highest local frequency; the caller passes a starting count that does, so
 * that two levels cannot agree by sharing one alias (the k-th alias of h is the 2k-th of h/2).
 * Error estimate: the last difference (the finer level's own error is far smaller), plus the integrated
 * error of f.
 */
export function truncatedTrapezoid(f: Integrand, c: number, half: number, epsRel: number, epsAbs: number, st: QuadState, intervals = 8, maxLevel = 8): [number, number, number] {
  const out = new Float64Array(3);
  const a = c - half;
  let count = Math.max(2, Math.ceil(intervals));
  let h = (2 * half) / count;
  let sr = 0; let si = 0; let se = 0;
  const add = (x: number, w: number) => {
    f(x, out);
    st.evaluations++;
    sr += w * out[0]!; si += w * out[1]!; se += w * Math.abs(out[2]!);
  };
  for (let k = 0; k <= count; k++) add(a + k * h, k === 0 || k === count ? 0.5 : 1);
  let prevRe = sr * h; let prevIm = si * h;
  for (let level = 1; level <= maxLevel; level++) {
    if (Date.now() > st.deadline) throw new QuadratureTimeUp();
    h /= 2; count *= 2;
    for (let k = 1; k < count; k += 2) add(a + k * h, 1);
    const re = sr * h; const im = si * h;
    const diff = Math.hypot(re - prevRe, im - prevIm);
    if (diff <= Math.max(epsAbs, epsRel * Math.hypot(re, im))) return [re, im, diff + se * h];
    prevRe = re; prevIm = im;
  }
  return [prevRe, prevIm, Infinity];
}

export type QuadratureMethod = 'trapezoid' | 'double-exponential' | 'gauss-kronrod';

/**
 * The integral of the Gaussian integrand over R^n (n = 1, 2, 3), Re A positive definite.
 * epsRel is the target relative accuracy of the whole integral.
 *
 * Truncation from the decay rate: |integrand| = |pref| exp(Re S) is a real Gaussian with matrix R = Re A.
 * Level j integrates x_j (x_0..x_(j-1) fixed) over centre +- sqrt(2 T v_j), v_j its conditional variance
 * with the inner variables integrated out, so at every level the part left out is at most
 * erfc(sqrt T) of the integral of |integrand| there; in all at most n erfc(sqrt T) M with
 * M = integral of |integrand| over R^n (from the Cholesky factor of the real matrix R: a bound on the
 * tail, never used for the value). T is chosen so that this is a small part of the tolerance, relative
 * to |I| as a first, coarse, pass measured it (|I| can be far below M when the phase oscillates).
 *
 * Starting step of the trapezoidal rule at level j: the integrand's local frequency in x_j,
 * Im dS/dx_j = Im J_j - (Im A x)_j, is linear, so over the ellipsoid of the remaining variables where
 * |integrand| is within e^-T of its conditional peak its largest size is |value at the centre| +
 * sqrt(2 T u^T R_rr^-1 u) (u the row of Im A); the step must put 2 pi / h beyond that by the spread of
 * the envelope, sqrt(2 T / v_j). The rule then halves the step until two levels agree.
 */
export function integrateGaussian(q: QuadraticIntegrand, epsRel: number, budgetMs: number, method: QuadratureMethod = 'trapezoid'): QuadratureResult {
  const n = q.n;
  if (n < 1 || n > 3) throw new Error('integrateGaussian takes one to three variables.');
  const t0 = Date.now();
  const st: QuadState = { evaluations: 0, deadline: t0 + budgetMs };
  const sym = Array.from({ length: n * n }, (_, k) => (q.are[k]! + q.are[(k % n) * n + Math.floor(k / n)]!) / 2);
  const symIm = Array.from({ length: n * n }, (_, k) => (q.aim[k]! + q.aim[(k % n) * n + Math.floor(k / n)]!) / 2);
  const l = cholesky(sym, n);
  if (!l) throw new Error('The real part of the quadratic form is not positive definite.');
  // Peak of |integrand| at x0 = R^-1 Re J. With x_0..x_{j-1} fixed, the remaining variables see the
  // real Gaussian with matrix R_rr (r = j..n-1): conditional centre and variance of x_j.
  const x0 = choleskySolve(l, n, q.jre);
  const levels = Array.from({ length: n }, (_, j) => {
    const m = n - j;
    const rr = Array.from({ length: m * m }, (_, k) => sym[(j + Math.floor(k / m)) * n + j + (k % m)]!);
    const lr = cholesky(rr, m)!;
    const col = choleskySolve(lr, m, Array.from({ length: m }, (_, k) => (k === 0 ? 1 : 0)));
    // row 0 of R_rr^-1 is col (symmetric); shift of x_j's centre = -(R_rr^-1 R_rf (x_f - x0_f))_0
    const gain = Array.from({ length: j }, (_, f) => {
      let s2 = 0;
      for (let k = 0; k < m; k++) s2 += col[k]! * sym[(j + k) * n + f]!;
      return -s2;
    });
    // u^T R_rr^-1 u for u = row j of Im A restricted to r = j..n-1: how far the local frequency can move
    const u = Array.from({ length: m }, (_, k) => symIm[j * n + j + k]!);
    const w = choleskySolve(lr, m, u);
    const chirp = u.reduce((acc, uk, k) => acc + uk * w[k]!, 0);
    return { variance: col[0]!, gain, chirp: Math.max(chirp, 0) };
  });
  const x = new Float64Array(n);
  const S = (xs: Float64Array): [number, number] => {
    let sr = q.cre; let si = q.cim;
    for (let r = 0; r < n; r++) {
      sr += q.jre[r]! * xs[r]!; si += q.jim[r]! * xs[r]!;
      for (let s = 0; s < n; s++) { const w = 0.5 * xs[r]! * xs[s]!; sr -= q.are[r * n + s]! * w; si -= q.aim[r * n + s]! * w; }
    }
    return [sr, si];
  };
  x.set(x0);
  const [peakRe] = S(x);
  const peak = Math.hypot(q.pre, q.pim) * Math.exp(peakRe);
  let pivots = 1;
  for (let j = 0; j < n; j++) pivots *= l[j * n + j]!;
  const modulusIntegral = peak * Math.pow(2 * Math.PI, n / 2) / pivots;
  /** Conditional centres of x_j..x_{n-1} given x_0..x_{j-1} (each later one at the centre of the earlier). */
  const centres = new Float64Array(n);
  const fillCentres = (j: number) => {
    for (let k = 0; k < n; k++) {
      if (k < j) { centres[k] = x[k]!; continue; }
      let c = x0[k]!;
      for (let f = 0; f < k; f++) c += levels[k]!.gain[f]! * (centres[f]! - x0[f]!);
      centres[k] = c;
    }
  };
  /** Largest local frequency in x_j over the conditional ellipsoid, given x_0..x_{j-1}. */
  const frequency = (j: number, T: number) => {
    fillCentres(j);
    let w = q.jim[j]!;
    for (let k = 0; k < n; k++) w -= symIm[j * n + k]! * centres[k]!;
    return Math.abs(w) + Math.sqrt(2 * T * levels[j]!.chirp);
  };
  // level j integrates x_j with x_0..x_{j-1} fixed; the innermost sees S = alpha t^2 + beta t + gamma.
  const last = n - 1;
  const co = new Float64Array(6);
  const prepareInnermost = () => {
    let br = q.jre[last]!; let bi = q.jim[last]!;
    let gr = q.cre; let gi = q.cim;
    for (let f = 0; f < last; f++) {
      br -= q.are[last * n + f]! * x[f]!; bi -= q.aim[last * n + f]! * x[f]!;
      gr += q.jre[f]! * x[f]!; gi += q.jim[f]! * x[f]!;
      for (let g = 0; g < last; g++) { const w = 0.5 * x[f]! * x[g]!; gr -= q.are[f * n + g]! * w; gi -= q.aim[f * n + g]! * w; }
    }
    co[0] = -0.5 * q.are[last * n + last]!; co[1] = -0.5 * q.aim[last * n + last]!;
    co[2] = br; co[3] = bi; co[4] = gr; co[5] = gi;
  };
  const innermost: Integrand = (t, out) => {
    const sr = (co[0]! * t + co[2]!) * t + co[4]!;
    const si = (co[1]! * t + co[3]!) * t + co[5]!;
    const m = Math.exp(sr);
    const cr = m * Math.cos(si); const ci = m * Math.sin(si);
    out[0] = q.pre * cr - q.pim * ci; out[1] = q.pre * ci + q.pim * cr; out[2] = 0;
  };
  /** tail bound n erfc(sqrt T) M, with erfc(s) <= exp(-s^2) / (s sqrt(pi)) */
  const tail = (T: number) => (n * modulusIntegral * Math.exp(-T)) / Math.sqrt(Math.PI * T);
  /** One 1-D rule at level j around c with half-width half. */
  const oneD = (j: number, f: Integrand, c: number, half: number, rel: number, abs: number, T: number): [number, number, number] => {
    if (method === 'gauss-kronrod') return adaptive(f, c - half, c + half, rel, abs, st);
    if (method === 'double-exponential') return doubleExponential(f, c, half, rel, abs, st);
    const band = frequency(j, T) + Math.sqrt((2 * T) / levels[j]!.variance);
    return truncatedTrapezoid(f, c, half, rel, abs, st, Math.max(8, (2 * half * band) / (2 * Math.PI)));
  };
  /**
   * One nested pass with box parameter T, aiming at a total error of max(rel |I|, abs).
   * Inner integrals get a tenth of the relative target and an absolute one scaled by the outer box widths
   * (the error of each inner value is multiplied by at most the outer rules' total weight, the box width).
   */
  const pass = (T: number, rel: number, abs: number): [number, number, number] => {
    const half = levels.map((v) => Math.sqrt(2 * T * v.variance));
    const level = (j: number): Integrand => {
      if (j === last) return innermost;
      const inner = level(j + 1);
      let outerWidth = 1;
      for (let k = 0; k <= j; k++) outerWidth *= 2 * half[k]!;
      const innerAbs = (0.1 * abs) / outerWidth;
      return (t, out) => {
        x[j] = t;
        if (j + 1 === last) prepareInnermost();
        fillCentres(j + 1);
        const [re, im, err] = oneD(j + 1, inner, centres[j + 1]!, half[j + 1]!, rel * 0.1, innerAbs, T);
        out[0] = re; out[1] = im; out[2] = err;
      };
    };
    if (n === 1) prepareInnermost();
    return oneD(0, level(0), x0[0]!, half[0]!, rel, abs, T);
  };
  /** Smallest T (>= 4) with tail(T) <= share. */
  const truncationFor = (share: number) => {
    let T = 4;
    for (let it = 0; it < 50 && tail(T) > share; it++) T = Math.max(T + 0.01, Math.log((n * modulusIntegral) / (share * Math.sqrt(Math.PI * T))));
    return T;
  };
  let re = NaN; let im = NaN; let error = Infinity; let timedOut = false; let T = NaN;
  try {
    // coarse pass: |I| to a few digits, which sets the absolute targets and the box of the fine pass
    const coarse = pass(truncationFor(1e-6 * modulusIntegral), 1e-4, 1e-7 * modulusIntegral);
    let scale = Math.max(Math.hypot(coarse[0], coarse[1]), 1e-12 * modulusIntegral);
    for (let attempt = 0; attempt < 2; attempt++) {
      T = truncationFor(0.05 * epsRel * scale);
      const [fr, fi, fe] = pass(T, epsRel, 0.5 * epsRel * scale);
      re = fr; im = fi; error = fe + tail(T);
      const mag = Math.hypot(re, im);
      // the coarse pass overestimated |I| by much: the box and the absolute targets were too loose
      if (mag >= 0.5 * scale) break;
      scale = Math.max(mag, 1e-12 * modulusIntegral);
    }
  } catch (e) {
    if (!(e instanceof QuadratureTimeUp)) throw e;
    timedOut = true; re = NaN; im = NaN; error = Infinity;
  }
  return { re, im, error, evaluations: st.evaluations, timeMs: Date.now() - t0, timedOut, truncation: T };
}
