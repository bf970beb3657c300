/**
 * The time-sliced free particle: N - 1 intermediate positions, N slices of length eps = T/N, the
 * product of N Fresnel factors integrated in closed form by the worksheet, times the usual
 * normalisation (m/(2 pi i hbar eps))^(N/2) = A^-N with A = sqrt(2 pi i hbar eps / m) per slice,
 * against the textbook propagator K = sqrt(m/(2 pi i hbar T)) exp(i m (xb - xa)^2/(2 hbar T)).
 * Source: R. P. Feynman & A. R. Hibbs, Quantum Mechanics and Path Integrals (1965), chapter 3
 * (from memory). Normalisation, propagator and the evaluation of the worksheet's result text are
 * done here with mathjs, never by cas/; phases included (every square root is mathjs' principal one).
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import * as math from 'mathjs';
import { run } from './support/run.js';
import { lit, relErr, type Cx } from './support/reference.js';

interface Physical { m: number; hbar: number; T: number; xa: number; xb: number }

/** Deterministic sample points: masses, times and hbar in [0.4, 2.5], end points in [-2, 2]. */
function samples(count: number, seed: number): Physical[] {
  let s = seed;
  const r = () => { s = (s * 16807) % 2147483647; return s / 2147483647; };
  return Array.from({ length: count }, () => ({
    m: 0.4 + 2.1 * r(), hbar: 0.4 + 2.1 * r(), T: 0.4 + 2.1 * r(), xa: 4 * r() - 2, xb: 4 * r() - 2,
  }));
}

const asComplex = (v: unknown): math.Complex => {
  if (typeof v === 'number') return math.complex(v, 0);
  if (math.isComplex(v)) return v;
  throw new Error(`not a number: ${String(v)}`);
};
const cx = (z: math.Complex): Cx => ({ re: z.re, im: z.im });

/** Feynman & Hibbs ch. 3 (from memory): K = sqrt(m/(2 pi i hbar T)) exp(i m (xb - xa)^2/(2 hbar T)). */
function propagator(p: Physical): Cx {
  const pre = math.sqrt(asComplex(math.divide(math.complex(p.m, 0), math.complex(0, 2 * Math.PI * p.hbar * p.T))));
  const phase = math.exp(math.complex(0, (p.m * (p.xb - p.xa) ** 2) / (2 * p.hbar * p.T)));
  return cx(asComplex(math.multiply(pre, phase)));
}

/** The normalisation A^-N, A = sqrt(2 pi i hbar eps / m) (principal root), one factor 1/A per slice. */
function normalisation(p: Physical, N: number): math.Complex {
  const eps = p.T / N;
  const A = math.sqrt(asComplex(math.divide(math.complex(0, 2 * Math.PI * p.hbar * eps), math.complex(p.m, 0))));
  return asComplex(math.pow(math.divide(math.complex(1, 0), A), N));
}

/** The worksheet line: exp(i m/(2 hbar eps) * sum_j (x_(j+1) - x_j)^2) d(x1..x_(N-1)), x_0 = xa, x_N = xb. */
function slicedLine(N: number, v: { m: string; hbar: string; T: string; xa: string; xb: string }): string {
  const pts = [v.xa, ...Array.from({ length: N - 1 }, (_, j) => `x${j + 1}`), v.xb];
  const action = Array.from({ length: N }, (_, j) => `(${pts[j + 1]} - ${pts[j]})^2`).join(' + ');
  return `integral K${N} = exp(i*${v.m}*(${action})/(2*${v.hbar}*(${v.T}/${N}))) d(${pts.slice(1, -1).join(', ')})`;
}

test('time-sliced free particle, numeric couplings, N = 2..6: A^-N times the product of N Fresnel integrals equals sqrt(m/(2 pi i hbar T)) exp(i m (xb-xa)^2/(2 hbar T)) — Feynman & Hibbs, Quantum Mechanics and Path Integrals (1965), ch. 3 (from memory)', () => {
  for (let N = 2; N <= 6; N++) {
    for (const p of samples(3, 100 + N)) {
      const v = { m: lit({ re: p.m, im: 0 }), hbar: lit({ re: p.hbar, im: 0 }), T: lit({ re: p.T, im: 0 }), xa: lit({ re: p.xa, im: 0 }), xb: lit({ re: p.xb, im: 0 }) };
      const s = run(slicedLine(N, v)).statements[0]!;
      assert.equal(s.status, 'ok', JSON.stringify(s.error));
      assert.equal(s.convergence, 'oscillatory', `N = ${N}`);
      assert.ok(s.result?.value, `N = ${N}: a numeric value`);
      const got = cx(asComplex(math.multiply(normalisation(p, N), math.complex(s.result.value.re, s.result.value.im))));
      const K = propagator(p);
      assert.ok(relErr(got, K) < 1e-10, `N = ${N} at ${JSON.stringify(p)}: ${JSON.stringify(got)} vs K = ${JSON.stringify(K)}`);
      // the Fresnel phase of the N - 1 intermediate integrals is exp(i pi (N-1)/4); with A^-N's exp(-i pi N/4) it leaves K's exp(-i pi/4)
      const signature = s.steps.find((x) => x.kind === 'fresnel-phase')?.signature;
      assert.deepEqual(signature, { positive: N - 1, negative: 0 }, `N = ${N}: signature of B`);
    }
  }
});

test('time-sliced free particle, symbolic m, hbar, T, xa, xb, N = 2..5: the closed form (read by mathjs) times A^-N equals the propagator at sampled points — Feynman & Hibbs, Quantum Mechanics and Path Integrals (1965), ch. 3 (from memory)', () => {
  const names = { m: 'm', hbar: 'hbar', T: 'T', xa: 'xa', xb: 'xb' };
  // five or more integration variables with symbolic parameters are refused by design; N = 6 is covered numerically above
  for (let N = 2; N <= 5; N++) {
    const r = run(`param m, hbar, T : positive\nparam xa, xb : real\n${slicedLine(N, names)}`);
    const s = r.statements[2]!;
    assert.equal(s.status, 'ok', JSON.stringify(s.error));
    assert.equal(s.convergence, 'oscillatory');
    assert.equal(s.proof, 'proved');
    const text = s.result!.text;
    for (const p of samples(6, 200 + N)) {
      const value = asComplex(math.evaluate(text, { ...p }));
      const got = cx(asComplex(math.multiply(normalisation(p, N), value)));
      const K = propagator(p);
      assert.ok(relErr(got, K) < 1e-9, `N = ${N} at ${JSON.stringify(p)}: ${text} gives ${JSON.stringify(got)} vs K = ${JSON.stringify(K)}`);
    }
  }
});
