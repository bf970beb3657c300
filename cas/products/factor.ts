/**
 * Factors of degree 1 and 2 in n of a polynomial P(n) whose coefficients are rational functions
 * of the parameters (Gaussian rational numbers times monomials; "pi" counts as a parameter, being
 * transcendental). Used by `product` for factors of degree >= 3.
 *
 * The search is numerical, the result exact:
 *  1. square-free decomposition (Yun, gcd of P and dP/dn over the parameters: poly.ts), so each
 *     factor comes with its multiplicity;
 *  2. for a square-free part g of degree d >= 3: with lc its leading coefficient, the roots of
 *     lc^(d-1) * g(m/lc) are integral over Q(i)[parameters], so a root that lies in the field is a
 *     polynomial of total degree at most D = max_j deg(e_j)/j (e_j its coefficients). The roots are
 *     found numerically at one point of parameter space (Aberth's iteration), followed by Newton
 *     continuation to a tensor grid of points on circles, one circle per parameter, and each root
 *     (for a linear factor) and each pair's sum and product (for a quadratic factor) is
 *     interpolated there by the discrete Fourier transform, a polynomial of degree <= 2D in each
 *     parameter; its coefficients are read as Gaussian rationals by continued fractions;
 *  3. every candidate factor is accepted only if it divides exactly (remainder zero in rational
 *     function arithmetic), and at the end c * prod f_j^k_j is compared with P exactly.
 * A numerical slip can only make the search miss a factor (the caller then refuses); it cannot
 * produce a wrong factorisation.
 *
 * Example: n^3 + a^3 -> (n + a) * (n^2 - a*n + a^2).
 */
import type { Q } from '../exact/q.js';
import {
  coefficients, degree, evalComplex, polyFromTerms, primitivePart, squareFree, totalDegree,
  variables, type Cx, type Mono, type Poly,
} from '../exact/poly.js';
import { rfAdd, rfDiv, rfEquals, rfIsZero, rfMul, rfPoly, rfSub, RF0, RF1, type RatFunc } from '../exact/ratfunc.js';

/** A monic factor in n: coeffs[k] is the coefficient of n^k, coeffs[deg] = 1; deg 1 or 2. */
export interface ModeFactor { coeffs: RatFunc[]; k: number }

export type ModeFactorisation =
  | { ok: true; leading: RatFunc; factors: ModeFactor[]; repeated: boolean; searched: boolean }
  | { ok: false; reason: string };

/** Limits of the search: degree of a square-free part, grid points. */
const MAX_DEGREE = 12;
const MAX_POINTS = 729;

// ---- small complex arithmetic -----------------------------------------------------

const cadd = (a: Cx, b: Cx): Cx => ({ re: a.re + b.re, im: a.im + b.im });
const csub = (a: Cx, b: Cx): Cx => ({ re: a.re - b.re, im: a.im - b.im });
const cmul = (a: Cx, b: Cx): Cx => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
const cdiv = (a: Cx, b: Cx): Cx => { const d = b.re * b.re + b.im * b.im; return { re: (a.re * b.re + a.im * b.im) / d, im: (a.im * b.re - a.re * b.im) / d }; };
const cabs = (a: Cx) => Math.hypot(a.re, a.im);
const cexpi = (t: number): Cx => ({ re: Math.cos(t), im: Math.sin(t) });
const cscale = (a: Cx, s: number): Cx => ({ re: a.re * s, im: a.im * s });

/** p(z) and p'(z) for p = sum cs[k] z^k. */
function horner(cs: readonly Cx[], z: Cx): [Cx, Cx] {
  let p: Cx = { re: 0, im: 0 }; let dp: Cx = { re: 0, im: 0 };
  for (let k = cs.length - 1; k >= 0; k--) { dp = cadd(cmul(dp, z), p); p = cadd(cmul(p, z), cs[k]!); }
  return [p, dp];
}

/** All roots of a complex polynomial (cs[d] != 0) by Aberth's simultaneous iteration. */
function aberth(cs: readonly Cx[]): Cx[] | null {
  const d = cs.length - 1;
  const lead = cs[d]!;
  const mon = cs.map((c) => cdiv(c, lead));
  const R = 1 + Math.max(...mon.slice(0, d).map(cabs));
  let z = Array.from({ length: d }, (_, j) => cscale(cexpi((2 * Math.PI * j) / d + 0.4), R * 0.7));
  for (let it = 0; it < 500; it++) {
    let worst = 0;
    const next = z.map((zi, i) => {
      const [p, dp] = horner(mon, zi);
      if (cabs(p) === 0) return zi;
      const ratio = cdiv(p, dp);
      let s: Cx = { re: 0, im: 0 };
      for (let j = 0; j < d; j++) if (j !== i) s = cadd(s, cdiv({ re: 1, im: 0 }, csub(zi, z[j]!)));
      const w = cdiv(ratio, csub({ re: 1, im: 0 }, cmul(ratio, s)));
      worst = Math.max(worst, cabs(w) / Math.max(1, cabs(zi)));
      return csub(zi, w);
    });
    z = next;
    if (!z.every((x) => Number.isFinite(x.re) && Number.isFinite(x.im))) return null;
    if (worst < 1e-14) break;
  }
  const polished = z.map((zi) => newton(mon, zi));
  return polished.every((x) => x !== null) ? (polished as Cx[]) : null;
}

/** Newton polish of one root; null when it does not settle. */
function newton(cs: readonly Cx[], z0: Cx): Cx | null {
  let z = z0;
  for (let it = 0; it < 40; it++) {
    const [p, dp] = horner(cs, z);
    if (cabs(dp) === 0) return null;
    const w = cdiv(p, dp);
    z = csub(z, w);
    if (!Number.isFinite(z.re) || !Number.isFinite(z.im)) return null;
    if (cabs(w) <= 1e-13 * Math.max(1, cabs(z))) {
      const [p2, dp2] = horner(cs, z);
      return cabs(dp2) === 0 ? z : csub(z, cdiv(p2, dp2));
    }
  }
  return null;
}

/** Carry the roots from the coefficients at t = 0 to t = 1 along coeffsAt(t), halving steps near collisions. */
function track(coeffsAt: (t: number) => Cx[], roots: Cx[]): Cx[] | null {
  let t = 0; let h = 1 / 8; let z = roots;
  let guard = 0;
  while (t < 1 && guard++ < 20000) {
    const t1 = Math.min(1, t + h);
    const cs = coeffsAt(t1);
    const moved = z.map((zi) => newton(cs, zi));
    let ok = moved.every((x) => x !== null);
    if (ok) {
      // each root must stay well inside its own neighbourhood: moves small against the separation
      for (let i = 0; i < z.length && ok; i++) {
        let sep = Infinity;
        for (let j = 0; j < z.length; j++) if (j !== i) sep = Math.min(sep, cabs(csub(z[i]!, z[j]!)));
        if (cabs(csub(moved[i]!, z[i]!)) > sep / 4) ok = false;
      }
    }
    if (ok) { z = moved as Cx[]; t = t1; h = Math.min(h * 1.5, 1 / 4); } else { h /= 2; if (h < 1e-9) return null; }
  }
  return t >= 1 ? z : null;
}

// ---- exact helpers ---------------------------------------------------------------

/** The closest fraction with denominator <= maxDen, or null when none is within tol. */
function rationalise(x: number, tol: number, maxDen = 100000n): Q | null {
  if (!Number.isFinite(x)) return null;
  if (Math.abs(x) > 1e12) return null;
  let h0 = 0n, h1 = 1n, k0 = 1n, k1 = 0n; let y = x;
  for (let i = 0; i < 40; i++) {
    const a = BigInt(Math.floor(y));
    const h2 = a * h1 + h0; const k2 = a * k1 + k0;
    if (k2 > maxDen) break;
    h0 = h1; h1 = h2; k0 = k1; k1 = k2;
    if (Math.abs(x - Number(h1) / Number(k1)) <= tol) return { n: h1, d: k1 };
    const f = y - Math.floor(y);
    if (f < 1e-300) break;
    y = 1 / f;
  }
  return Math.abs(x - Number(h1) / Number(k1)) <= tol && k1 > 0n ? { n: h1, d: k1 } : null;
}

/** Long division of a (monic or not) by the monic b, coefficients in Q(params); null when the remainder is not zero. */
export function divideMonic(a: readonly RatFunc[], b: readonly RatFunc[]): RatFunc[] | null {
  const r = [...a]; const db = b.length - 1;
  const qs: RatFunc[] = [];
  for (let k = r.length - 1; k >= db; k--) {
    const c = r[k]!;
    qs[k - db] = c;
    if (rfIsZero(c)) continue;
    for (let j = 0; j <= db; j++) r[k - db + j] = rfSub(r[k - db + j]!, rfMul(c, b[j]!));
  }
  for (let k = 0; k < db; k++) if (!rfIsZero(r[k]!)) return null;
  return qs.length ? qs.map((x) => x ?? RF0) : [RF0];
}

function mulCoeffs(a: readonly RatFunc[], b: readonly RatFunc[]): RatFunc[] {
  const out: RatFunc[] = Array.from({ length: a.length + b.length - 1 }, () => RF0);
  a.forEach((x, i) => b.forEach((y, j) => { out[i + j] = rfAdd(out[i + j]!, rfMul(x, y)); }));
  return out;
}

const monicOf = (cs: readonly RatFunc[]): RatFunc[] => cs.map((c) => rfDiv(c, cs[cs.length - 1]!));

// ---- the search for one square-free part ------------------------------------------

/** Interpolation on the tensor grid: values at (R_i * exp(i*phi_i) * w^j_i) -> monomial coefficients, degree < N per parameter. */
function interpolate(values: Cx[], radii: number[], phases: number[], N: number): Map<string, Cx> {
  const K = radii.length;
  let cur = values.slice();
  // one axis at a time: the index of a point is sum j_i * N^i
  for (let ax = 0; ax < K; ax++) {
    const stride = N ** ax;
    const next = cur.slice();
    for (let base = 0; base < cur.length; base++) {
      if (Math.floor(base / stride) % N !== 0) continue;
      for (let k = 0; k < N; k++) {
        let s: Cx = { re: 0, im: 0 };
        for (let j = 0; j < N; j++) s = cadd(s, cmul(cur[base + j * stride]!, cexpi((-2 * Math.PI * j * k) / N)));
        next[base + k * stride] = cmul(cscale(s, 1 / (N * radii[ax]! ** k)), cexpi(-phases[ax]! * k));
      }
    }
    cur = next;
  }
  const out = new Map<string, Cx>();
  cur.forEach((c, idx) => out.set(String(idx), c));
  return out;
}

function polyFromInterpolation(coeffs: Map<string, Cx>, params: readonly string[], N: number, scale: number, maxTotal: number): Poly | null {
  const terms: { m: Mono; c: { re: Q; im: Q } }[] = [];
  for (const [key, c] of coeffs) {
    let idx = Number(key);
    const m: [string, number][] = [];
    let total = 0;
    for (const p of params) { const e = idx % N; idx = Math.floor(idx / N); total += e; if (e) m.push([p, e]); }
    const tol = 1e-7 * scale;
    // beyond the degree bound a field element has no terms: a nonzero one means this is no such element
    if (total > maxTotal) { if (cabs(c) > tol) return null; continue; }
    const re = rationalise(c.re, tol); const im = rationalise(c.im, tol);
    if (!re || !im) return null;
    if (re.n !== 0n || im.n !== 0n) terms.push({ m: m.sort((x, y) => (x[0] < y[0] ? -1 : x[0] > y[0] ? 1 : 0)), c: { re, im } });
  }
  return polyFromTerms(terms);
}

/** Factors of degree 1 and 2 of the square-free g (degree >= 3 in n), or null. */
function splitSquareFree(g: Poly, n: string): RatFunc[][] | null {
  const cs = coefficients(g, n);
  const d = cs.length - 1;
  if (d > MAX_DEGREE) return null;
  const params = variables(g).filter((v) => v !== n);
  const lc = cs[d]!;
  // degree bound for the integral roots (coefficients e_j = cs[d-j] * lc^(j-1))
  let D = 0;
  for (let j = 1; j <= d; j++) {
    const c = cs[d - j]!;
    if (c.terms.size === 0) continue;
    D = Math.max(D, Math.ceil((totalDegree(c) + (j - 1) * totalDegree(lc)) / j));
  }
  const N = 2 * D + 1;
  const K = params.length;
  if (N ** K > MAX_POINTS) return null;
  const radii = params.map((_, i) => 0.83 + 0.377 * i);
  const phases = params.map((_, i) => 0.29 + 0.61 * i);
  const pointAt = (idx: number) => {
    const at = new Map<string, Cx>();
    params.forEach((p, i) => { const j = Math.floor(idx / N ** i) % N; at.set(p, cscale(cexpi(phases[i]! + (2 * Math.PI * j) / N), radii[i]!)); });
    return at;
  };
  const count = N ** K;
  const coeffsAtPoint = (at: Map<string, Cx>) => cs.map((c) => evalComplex(c, at));
  // roots of lc^(d-1) g(m/lc): lc(p) times the roots of g
  const values: Cx[][] = [];
  let prev = pointAt(0);
  let roots = aberth(coeffsAtPoint(prev));
  if (!roots) return null;
  for (let idx = 0; idx < count; idx++) {
    const target = pointAt(idx);
    if (idx > 0) {
      const from = prev;
      // a bend through a point off the straight line keeps the path away from real coincidences
      const mid = new Map<string, Cx>();
      for (const p of params) mid.set(p, cadd(cscale(cadd(from.get(p)!, target.get(p)!), 0.5), cscale(cexpi(1.1), 0.13)));
      const along = (a: Map<string, Cx>, b: Map<string, Cx>) => (t: number) => {
        const at = new Map<string, Cx>();
        for (const p of params) at.set(p, cadd(cscale(a.get(p)!, 1 - t), cscale(b.get(p)!, t)));
        return coeffsAtPoint(at);
      };
      roots = track(along(from, mid), roots);
      if (roots) roots = track(along(mid, target), roots);
      if (!roots) return null;
    }
    const l = evalComplex(lc, target);
    values.push(roots.map((z) => cmul(z, l)));
    prev = target;
  }
  const magnitude = Math.max(1, ...values.flat().map(cabs));
  const fieldValue = (f: (vs: Cx[]) => Cx, maxTotal: number): Poly | null => {
    const vals = values.map(f);
    const scale = Math.max(1, ...vals.map(cabs));
    return polyFromInterpolation(interpolate(vals, radii, phases, N), params, N, Math.max(scale, magnitude), maxTotal);
  };
  const lcRF = rfPoly(lc);
  let rest: RatFunc[] = monicOf(cs.map(rfPoly));
  const used = new Set<number>();
  const found: RatFunc[][] = [];
  // linear factors n - r/lc
  for (let i = 0; i < d && rest.length - 1 >= 2; i++) {
    const r = fieldValue((vs) => vs[i]!, D);
    if (!r) continue;
    const lin = [rfDiv(rfSub(RF0, rfPoly(r)), lcRF), RF1];
    const q = divideMonic(rest, lin);
    if (q) { found.push(lin); rest = q; used.add(i); }
  }
  // quadratic factors n^2 - (s/lc) n + p/lc^2
  for (let i = 0; i < d && rest.length - 1 > 2; i++) {
    if (used.has(i)) continue;
    for (let j = i + 1; j < d && rest.length - 1 > 2; j++) {
      if (used.has(j) || used.has(i)) continue;
      const s = fieldValue((vs) => cadd(vs[i]!, vs[j]!), D);
      const p = s && fieldValue((vs) => cmul(vs[i]!, vs[j]!), 2 * D);
      if (!s || !p) continue;
      const quad = [rfDiv(rfPoly(p), rfMul(lcRF, lcRF)), rfDiv(rfSub(RF0, rfPoly(s)), lcRF), RF1];
      const q = divideMonic(rest, quad);
      if (q) { found.push(quad); rest = q; used.add(i); used.add(j); }
    }
  }
  if (rest.length - 1 > 2) return null;
  if (rest.length - 1 >= 1) found.push(rest);
  return found;
}

/**
 * P = leading * prod f_j^k_j with each f_j monic in n of degree 1 or 2 over the rational functions
 * of the other variables, checked exactly; or the reason it was not found.
 */
export function factorModes(P: RatFunc, n: string): ModeFactorisation {
  const all = coefficients(P.num, n).map((c) => rfDiv(rfPoly(c), rfPoly(P.den)));
  const d = all.length - 1;
  const leading = all[d]!;
  const sf = squareFree(P.num);
  const factors: ModeFactor[] = [];
  let searched = false;
  for (const { f, k } of sf.factors) {
    if (degree(f, n) === 0) continue;
    const g = primitivePart(f, n);
    const gd = degree(g, n);
    if (gd <= 2) { factors.push({ coeffs: monicOf(coefficients(g, n).map(rfPoly)), k }); continue; }
    searched = true;
    const parts = splitSquareFree(g, n);
    if (!parts) {
      return { ok: false, reason: `the square-free factor ${k > 1 ? `(of multiplicity ${k}) ` : ''}of degree ${gd} in ${n} was not found to split into factors of degree 1 and 2 with coefficients rational in the parameters (Gaussian rationals times the parameters), and no closed form is known for an irreducible factor of higher degree` };
    }
    for (const c of parts) factors.push({ coeffs: c, k });
  }
  // the exact check of the whole factorisation
  let prod: RatFunc[] = [leading];
  for (const { coeffs, k } of factors) for (let j = 0; j < k; j++) prod = mulCoeffs(prod, coeffs);
  if (prod.length !== all.length || !prod.every((c, i) => rfEquals(c, all[i]!))) {
    return { ok: false, reason: `the factorisation found did not reproduce the polynomial exactly` };
  }
  const repeated = factors.some((f) => f.k > 1);
  return { ok: true, leading, factors, repeated, searched };
}
