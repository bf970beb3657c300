/**
 * Limits and large-parameter behaviour by exact expansion, against mpmath in a separate
 * process (quadrature and determinants at large and small parameter values) and against
 * the handbook Gaussian (docs/references.md: 1-D Gaussian with source, G&R 3.323.2, from
 * memory). A limit is an exact value, a divergence with its leading behaviour, 0 with its
 * rate, or unknown: never a number read off near the end point.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import * as math from 'mathjs';
import fc from 'fast-check';
import { run } from './support/run.js';
import type { StatementReport, Step } from '../../shared/evaluation.js';
import { renderStep } from '../../shared/record/render.js';

const limitStep = (s: StatementReport) => s.steps.find((x): x is Extract<Step, { kind: 'limit' }> => x.kind === 'limit')!;

/** mpmath, as a separate process: each job is a python expression in mp, evaluated to 20 digits. */
function mp(exprs: string[]): number[] {
  const script = `import json, sys\nimport mpmath as mp\nmp.mp.dps = 30\nprint(json.dumps([float(eval(e)) for e in json.load(sys.stdin)]))`;
  const r = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', script], { input: JSON.stringify(exprs), encoding: 'utf8' });
  if (r.status !== 0) throw new Error(r.stderr);
  return JSON.parse(r.stdout) as number[];
}

const evalAt = (text: string, scope: Record<string, number>) => {
  const v = math.evaluate(text, scope) as number | math.Complex;
  return typeof v === 'number' ? v : v.re;
};

test('log Z for Z = integral of exp(-k x^2/2): as k -> inf, log Z ~ -1/2 log k + 1/2 log(2 pi) exactly — against mpmath quadrature at k = 1e3, 1e6', () => {
  const r = run('param k : positive\nintegral Z = exp(-k*x^2/2) d(x)\nlet F = log(Z)\nlimit F : k -> inf');
  const s = limitStep(r.statements[3]!);
  assert.equal(s.outcome, 'asymptotic');
  assert.equal(s.basis.kind, 'proved');
  assert.match(renderStep(s).text, /F ~ /);
  const ks = [1e3, 1e6];
  const want = mp(ks.map((k) => `mp.log(mp.quad(lambda x: mp.exp(-${k}*x**2/2), [-mp.inf, 0, mp.inf]))`));
  ks.forEach((k, j) => assert.ok(Math.abs(evalAt(s.formula!.text, { k }) - want[j]!) < 1e-9, `k = ${k}`));
  assert.equal(s.formula!.text, '-log(k)/2 + log(2*pi)/2');
});

test('Z as k -> 0 diverges like sqrt(2*pi)/sqrt(k), not a value read off near 0 — mpmath quadrature at k = 1e-3, 1e-6 (ratio 1)', () => {
  const s = limitStep(run('param k : positive\nintegral Z = exp(-k*x^2/2) d(x)\nlimit Z : k -> 0').statements[2]!);
  assert.equal(s.outcome, 'divergent');
  const ks = [1e-3, 1e-6];
  const want = mp(ks.map((k) => `mp.quad(lambda x: mp.exp(-${k}*x**2/2), [-mp.inf, 0, mp.inf])`));
  ks.forEach((k, j) => assert.ok(Math.abs(evalAt(s.formula!.text, { k }) / want[j]! - 1) < 1e-9, `k = ${k}`));
});

test('semiclassical limit: hbar*log Z -> J^2/2 as hbar -> 0 (no overflow) — mpmath at hbar = 1e-2, 1e-3 approaching at rate hbar log hbar', () => {
  const r = run('param hbar, J : positive\nintegral Q = exp(-x^2/(2*hbar) + J*x/hbar) d(x)\nlet W = hbar*log(Q)\nlimit W : hbar -> 0');
  const s = limitStep(r.statements[3]!);
  assert.equal(s.outcome, 'value');
  assert.equal(s.formula!.text, 'J^2/2');
  const J = 1.3;
  const hs = [1e-2, 1e-3];
  // log Q in closed form by mpmath (quadrature of exp(+J^2/(2 hbar)) would overflow double but not mpmath)
  const got = mp(hs.map((h) => `${h}*mp.log(mp.quad(lambda x: mp.exp(-x**2/(2*${h}) + ${J}*x/${h}), [-mp.inf, ${J}, mp.inf]))`));
  hs.forEach((h, j) => assert.ok(Math.abs(got[j]! - J * J / 2) < 5 * h * Math.abs(Math.log(h)), `hbar = ${h}: ${got[j]}`));
});

test('a source to infinity: Z diverges like sqrt(2*pi/k) exp(s^2/(2k)) (G&R 3.323.2, from memory), and a limit at an interior point uses the declared domain: 2*pi/k, not 2*pi/abs(k)', () => {
  const r = run('param k : positive\nparam s : real\nintegral R = exp(-k*x^2/2 + s*x) d(x)\nlimit R : s -> inf\nparam lam : real\nintegral Y = exp(-(k*a^2 + 2*i*lam*a*b + k*b^2)/2) d(a, b)\nlimit Y : lam -> 0');
  const d = limitStep(r.statements[3]!);
  assert.equal(d.outcome, 'divergent');
  for (const [k, s] of [[2, 10], [0.5, 7]]) {
    const want = Math.sqrt(2 * Math.PI / k) * Math.exp(s * s / (2 * k));
    assert.ok(Math.abs(evalAt(d.formula!.text, { k, s }) / want - 1) < 1e-12);
  }
  const y = limitStep(r.statements[6]!);
  assert.equal(y.outcome, 'value');
  assert.equal(y.formula!.text, '2*pi/k');
});

test('a form outside the exact route says unknown rather than a fitted power', () => {
  // sqrt of a sum of results: no exact expansion here
  const r = run('param k : positive\nintegral Z = exp(-k*x^2/2) d(x)\nlet S = sqrt(Z + 1/k)\nlimit S : k -> inf');
  const s = limitStep(r.statements[3]!);
  assert.ok(s.outcome === 'unknown' || s.method === 'algebra-limit' || s.method === 'expansion', JSON.stringify(s));
  assert.doesNotMatch(renderStep(s).text, /\^0\.\d|\^\(0\.\d/);
});

test('property: leading behaviour of random two-mode results as k -> inf agrees with mpmath determinants at k = 1e3, 1e6, 1e9 (ratio -> 1 at rate 1/k), or the limit says unknown (100 cases)', () => {
  const cases = fc.sample(fc.record({
    r: fc.array(fc.integer({ min: 1, max: 9 }), { minLength: 3, maxLength: 3 }),
    b: fc.array(fc.integer({ min: 0, max: 5 }), { minLength: 2, maxLength: 2 }),
  }), { numRuns: 100, seed: 77 });
  const jobs: string[] = [];
  const engine: (string | null)[] = [];
  for (const { r, b } of cases) {
    const [r11, r12, r22] = [r[0]! + 10, r[1]! - 5, r[2]! + 10];
    const src = `param k : positive\nintegral Z = exp(-((${r11} + ${b[0]}*k)*x^2 + 2*(${r12})*x*y + (${r22} + ${b[1]}*k)*y^2)/2) d(x, y)\nlimit Z : k -> inf`;
    const s = limitStep(run(src).statements[2]!);
    if (s.outcome === 'unknown') { engine.push(null); continue; }
    engine.push(s.outcome === 'value' ? (s.rate?.text ?? s.formula!.text) : s.formula!.text);
    for (const k of [1e3, 1e6, 1e9]) jobs.push(`2*mp.pi/mp.sqrt(mp.det(mp.matrix([[${r11} + ${b[0]}*${k}, ${r12}], [${r12}, ${r22} + ${b[1]}*${k}]])))`);
  }
  const values = mp(jobs);
  let j = 0;
  engine.forEach((f) => {
    if (f === null) return;
    const errs = [1e3, 1e6, 1e9].map((k) => Math.abs(evalAt(f, { k }) / values[j++]! - 1));
    // the rate: the relative error falls at least like 1/k (or is already at rounding level)
    assert.ok(errs[2]! < 1e-6, `${f}: ${errs}`);
    assert.ok(errs[1]! <= Math.max(errs[0]! * 2e-3, 1e-12), `${f}: ${errs}`);
    assert.ok(errs[2]! <= Math.max(errs[1]! * 2e-3, 1e-12), `${f}: ${errs}`);
  });
});
