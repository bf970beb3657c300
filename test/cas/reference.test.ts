/**
 * Reference checks against published formulas (sources named beside each
 * check, as listed in docs/references.md). The expected values are computed here
 * from the published formula, with mathjs, never by cas/. Where a formula needs
 * det(A)^(1/2), it is taken from sqrtDetAlongPath (test/cas/support/reference.ts):
 * sqrt(det((1 - t) I + t A)) followed continuously from 1 at t = 0, with mathjs
 * determinants -- not from eigenvalues and principal roots, the rule cas/ uses.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import * as math from 'mathjs';
import { statement, run } from './support/run.js';
import { gaussianLine, lit, relErr, sqrtDetAlongPath, withEigenvalues, type Cx } from './support/reference.js';

const mc = (z: Cx) => math.complex(z.re, z.im);
const cx = (z: math.Complex): Cx => ({ re: z.re, im: z.im });

/** Evaluate the product's result text with mathjs' own parser (an independent reading of the formula). */
function evalText(text: string, scope: Record<string, number>): Cx {
  const v = math.evaluate(text, { ...scope }) as math.Complex | number;
  return typeof v === 'number' ? { re: v, im: 0 } : cx(v);
}

test('1-D Gaussian with source — Gradshteyn & Ryzhik 3.323.2 (number from memory)', () => {
  for (const [p2, q] of [[{ re: 1.7, im: 0 }, { re: 0.4, im: 0 }], [{ re: 0.8, im: 0.6 }, { re: 0.3, im: -1.1 }], [{ re: 2.5, im: -1.9 }, { re: -0.7, im: 0.2 }]] as [Cx, Cx][]) {
    const s = statement(`integral G = exp(-${lit(p2)}*x^2 + ${lit(q)}*x) d(x)`, 'G');
    assert.equal(s.status, 'ok');
    assert.equal(s.convergence, 'absolute');
    // sqrt(pi)/p * exp(q^2/(4 p^2)), p the root of p^2 with Re p > 0: here sqrt(p^2) continued from 1
    // along (1 - t) + t p^2 (Re > 0 on the whole path), not the principal root cas/ takes
    const p = mc(sqrtDetAlongPath([[p2]]));
    const expected = cx(math.multiply(math.divide(Math.sqrt(Math.PI), p), math.exp(math.divide(math.multiply(mc(q), mc(q)), math.multiply(4, mc(p2))) as math.Complex)) as math.Complex);
    assert.ok(s.result?.value, 'a numeric value');
    assert.ok(relErr(s.result.value, expected) < 1e-12, `relative error ${relErr(s.result.value, expected)}`);
  }
});

test('1-D Gaussian with source, symbolic — Gradshteyn & Ryzhik 3.323.2 (number from memory)', () => {
  const src = 'param p : positive\nparam q : complex\nintegral G = exp(-p^2*x^2 + q*x) d(x)\nexpect G = sqrt(pi)/p*exp(q^2/(4*p^2))';
  const r = run(src);
  const g = r.statements[2]!;
  assert.equal(g.convergence, 'absolute');
  assert.equal(g.proof, 'proved');
  for (const [p, qre, qim] of [[0.7, 0.3, 1.2], [2.2, -1.5, 0.4]] as const) {
    const got = evalText(g.result!.text, { p, q: math.complex(qre, qim) as unknown as number });
    const q = math.complex(qre, qim);
    const expected = cx(math.multiply(Math.sqrt(Math.PI) / p, math.exp(math.divide(math.multiply(q, q), 4 * p * p) as math.Complex)) as math.Complex);
    assert.ok(relErr(got, expected) < 1e-12);
  }
  assert.equal(r.statements[3]!.status, 'ok');
});

test('Fresnel on the line — from the Fresnel limits C(inf) = S(inf) = 1/2, NIST DLMF 7.2 (from memory)', () => {
  for (const a of [1.7, -0.45, 3]) {
    const s = statement(`integral F = exp(i*${lit({ re: a, im: 0 })}*x^2) d(x)`, 'F');
    assert.equal(s.convergence, 'oscillatory');
    const expected = { re: Math.sqrt(Math.PI / Math.abs(a)) * Math.cos(Math.sign(a) * Math.PI / 4), im: Math.sqrt(Math.PI / Math.abs(a)) * Math.sin(Math.sign(a) * Math.PI / 4) };
    assert.ok(relErr(s.result!.value!, expected) < 1e-12);
    assert.ok(s.steps.some((st) => st.kind === 'fresnel-phase' && st.signature?.positive === (a > 0 ? 1 : 0)));
  }
});

test('n-D Gaussian, det^(-1/2) by continuation from the identity (expected value from sqrt(det) followed along the straight path, not from eigenvalues) — Folland, Harmonic Analysis in Phase Space, App. A (from memory); Hörmander vol. I, 3.4 (from memory)', () => {
  // A = Q diag(lambda) Q^T with known eigenvalues; their arguments sum beyond pi, so principal sqrt(det A) is wrong.
  const lambda: Cx[] = [{ re: 0.3, im: 1.9 }, { re: 0.5, im: 2.4 }, { re: 0.2, im: 1.1 }];
  const A = withEigenvalues(lambda, [[1, 0.3, -0.2], [0.4, 1, 0.5], [-0.6, 0.1, 1]]);
  const J: Cx[] = [{ re: 0.2, im: 0.1 }, { re: -0.3, im: 0 }, { re: 0.1, im: 0.4 }];
  const s = statement(gaussianLine('Z', A, J), 'Z');
  assert.equal(s.convergence, 'absolute');
  // det(A)^(1/2) continued from the identity along (1 - t) I + t A (Re > 0 on the whole path,
  // so det never vanishes): an independent route, sharing nothing with cas/'s eigenvalue rule
  const root = mc(sqrtDetAlongPath(A));
  // the case is the intended one: the continued root is minus the principal root of det A
  const principal = math.sqrt(math.det(A.map((r) => r.map(mc))) as unknown as math.Complex) as math.Complex;
  assert.ok(relErr(cx(principal), cx(math.multiply(root, -1) as math.Complex)) < 1e-9, 'principal sqrt(det A) is the other branch');
  const inv = math.inv(A.map((r) => r.map(mc))) as unknown as math.Complex[][];
  let q = math.complex(0, 0);
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) q = math.add(q, math.multiply(math.multiply(mc(J[r]!), inv[r]![c]!), mc(J[c]!))) as math.Complex;
  const expected = cx(math.divide(math.multiply(Math.pow(2 * Math.PI, 1.5), math.exp(math.multiply(q, 0.5) as math.Complex)), root) as math.Complex);
  assert.ok(relErr(s.result!.value!, expected) < 1e-11, `relative error ${relErr(s.result!.value!, expected)}`);
  assert.equal(s.branch?.principalSqrtDetCorrect, false);
  const argSum = lambda.reduce((t, l) => t + Math.atan2(l.im, l.re), 0);
  const step = s.steps.find((st) => st.kind === 'branch');
  assert.ok(step?.argumentSum !== undefined && Math.abs(step.argumentSum - argSum) < 1e-9);
});

test('n-D Fresnel with signature — Hörmander vol. I, Theorem 7.6.1 (number from memory)', () => {
  // B real symmetric with eigenvalues of both signs; exponent i x^T B x / 2, so A = -i B.
  for (const beta of [[1.3, -0.7, 2.1], [0.9, 1.4, 0.6], [-1.1, -0.5, 0.8, 1.7]]) {
    const n = beta.length;
    const seed = Array.from({ length: n }, (_, r) => Array.from({ length: n }, (_, c) => (r === c ? 1 : 0.3 * Math.sin(r + 2 * c + 1))));
    const B = withEigenvalues(beta.map((b) => ({ re: b, im: 0 })), seed);
    const A = B.map((row) => row.map((z) => ({ re: 0, im: -z.re })));
    const s = statement(gaussianLine('F', A, A.map(() => ({ re: 0, im: 0 }))), 'F');
    assert.equal(s.convergence, 'oscillatory');
    const sig = beta.filter((b) => b > 0).length - beta.filter((b) => b < 0).length;
    const absDet = Math.abs(beta.reduce((p, b) => p * b, 1));
    const mag = Math.pow(2 * Math.PI, n / 2) / Math.sqrt(absDet);
    const expected = { re: mag * Math.cos(Math.PI * sig / 4), im: mag * Math.sin(Math.PI * sig / 4) };
    assert.ok(relErr(s.result!.value!, expected) < 1e-11, `n=${n}: ${JSON.stringify(s.result)}`);
    const phase = s.steps.find((st) => st.kind === 'fresnel-phase');
    assert.equal(phase?.signature?.positive! - phase?.signature?.negative!, sig);
  }
});

test('two-variable form [[k, i lam], [i lam, k]] gives 2 pi / sqrt(k^2 + lam^2), and 2 pi / k at lam = 0 — common practice (docs/references.md, facts of the trade)', () => {
  const src = [
    'param k : positive', 'param lam : real',
    'integral Z = exp(-(k*a^2 + 2*i*lam*a*b + k*b^2)/2) d(a, b)',
    'expect Z = 2*pi/sqrt(k^2 + lam^2)',
  ].join('\n');
  const r = run(src);
  const z = r.statements[2]!;
  assert.equal(z.status, 'ok');
  assert.equal(z.convergence, 'absolute');
  assert.equal(z.proof, 'proved');
  assert.equal(z.branch?.principalSqrtDetCorrect, true);
  for (const [k, lam] of [[1, 0.5], [2.5, -3.1], [0.3, 7]] as const) {
    const got = evalText(z.result!.text, { k, lam });
    assert.ok(relErr(got, { re: 2 * Math.PI / Math.sqrt(k * k + lam * lam), im: 0 }) < 1e-12);
  }
  // lam = 0: the square of the one-variable result sqrt(2 pi / k)
  for (const k of [0.4, 1, 3.3]) {
    const got = evalText(z.result!.text, { k, lam: 0 });
    assert.ok(relErr(got, { re: Math.sqrt(2 * Math.PI / k) ** 2, im: 0 }) < 1e-12);
  }
  assert.ok(!/\^\{1\}|1\\cdot/.test(z.result!.latex), z.result!.latex);
  assert.equal(r.statements[3]!.status, 'ok');
  assert.equal(r.ok, true);
});

test('Gamma(1/2) = sqrt(pi) as the Gaussian integral of exp(-t^2) — NIST DLMF chapter 5', () => {
  const s = statement('integral G = exp(-t^2) d(t)', 'G');
  assert.ok(relErr(s.result!.value!, { re: Math.sqrt(Math.PI), im: 0 }) < 1e-14);
});
