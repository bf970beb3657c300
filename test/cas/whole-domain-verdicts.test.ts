/**
 * Verdicts on the whole declared domain: convergence, the branch of det(A)^(-1/2),
 * rotations and expectations decided exactly, with exact boundaries, and checked against
 * sources outside the project: hand calculations named beside each check, mathjs, and an
 * independent mpmath scan of the continuous branch in a separate process.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import * as math from 'mathjs';
import fc from 'fast-check';
import { run } from './support/run.js';
import { scanBranch, type ScanCase } from './support/branch-scan.js';
import { renderStep } from '../../shared/record/render.js';
import type { StatementReport, Step } from '../../shared/evaluation.js';

const stepOf = <K extends Step['kind']>(s: StatementReport, kind: K) => s.steps.find((x): x is Extract<Step, { kind: K }> => x.kind === kind);
const rel = (a: { re: number; im: number }, b: { re: number; im: number }) => Math.hypot(a.re - b.re, a.im - b.im) / Math.hypot(b.re, b.im);

test('example 1: (30 + i t) I_3 crosses the principal cut exactly at t = 30*sqrt(3); the printed form is right everywhere; the stated expect fails beyond — crossing against an mpmath scan, value against mathjs pivots (docs/references.md n-D Gaussian, Folland App. A, from memory)', () => {
  const r = run('param t : positive\nintegral T = exp(-(30 + i*t)*(x^2 + y^2 + z^2)/2) d(x, y, z)\nexpect T = (2*pi)^(3/2)/sqrt((30 + i*t)^3)\nverify T at t = 100');
  const T = r.statements[1]!;
  assert.equal(T.convergence, 'absolute');
  assert.equal(T.proof, 'proved');
  assert.equal(T.branch!.principal, 'piecewise');
  const branch = stepOf(T, 'branch')!;
  assert.deepEqual(branch.crossings.map((c) => c.text), ['30*sqrt(3)']);
  const [scan] = scanBranch([{ coefficients: [diag(3, [30, 0]), diag(3, [0, 1])], from: 1e-6, to: 1e6 }]);
  assert.equal(scan!.flips.length, 1);
  assert.ok(Math.abs(branch.crossings[0]!.approx - scan!.flips[0]!) < 1e-9 * scan!.flips[0]!, `${branch.crossings[0]!.approx} vs ${scan!.flips[0]}`);
  assert.deepEqual(branch.regions.map((x) => [x.holds, x.condition.text]), [[true, 't < 30*sqrt(3)'], [false, 't > 30*sqrt(3)']]);
  // the printed form, read by mathjs with principal roots, equals the product of the pivots' principal roots at t = 100 and t = 10
  for (const t of [10, 100]) {
    const printed = math.evaluate(T.result!.text, { t }) as math.Complex;
    const pivot = math.complex(30, t);
    const expected = math.divide(math.pow(2 * Math.PI, 1.5), math.pow(math.sqrt(pivot) as math.Complex, 3)) as math.Complex;
    assert.ok(rel(printed, expected) < 1e-12, `t = ${t}`);
  }
  const expect = r.statements[2]!;
  assert.equal(expect.status, 'failed');
  assert.equal(expect.proof, 'proved');
  const e = stepOf(expect, 'expect')!;
  assert.deepEqual(e.regions.map((x) => [x.holds, x.condition.text]), [[true, 't < 30*sqrt(3)'], [false, 't > 30*sqrt(3)']]);
  assert.equal(r.statements[3]!.agrees, true);
});

test('example 2: divergent exactly for |g| >= 10 — Sylvester on Re A = [[1, g], [g, 100]], minors 1 and 100 - g^2 (worked out by hand)', () => {
  const s = run('param g : real\nintegral E = exp(-(x^2 + 2*g*x*y + 100*y^2)/2) d(x, y)').statements[1]!;
  assert.equal(s.convergence, 'piecewise');
  assert.equal(s.proof, 'proved');
  const c = stepOf(s, 'convergence')!;
  assert.deepEqual(c.regions.map((x) => [x.verdict, x.condition.text]), [['divergent', 'g <= -10'], ['absolute', '-10 < g < 10'], ['divergent', 'g >= 10']]);
  assert.deepEqual(c.boundaries.map((b) => b.text), ['-10', '10']);
  assert.deepEqual(stepOf(s, 'result')!.pieces.map((p) => p.condition.text), ['-10 < g < 10']);
});

test('example 3: semidefinite Re A with A nonsingular is 2*pi by i*epsilon — iterated Gaussian integrals by hand, G&R 3.323.2 (from memory); a real source along an oscillatory direction diverges on the real line', () => {
  const p = run('integral P = exp(-x^2 + i*x*y) d(x, y)').statements[0]!;
  assert.equal(p.convergence, 'oscillatory');
  assert.equal(p.result!.text, '2*pi');
  assert.ok(Math.abs(p.result!.value!.re - 2 * Math.PI) < 1e-12 && Math.abs(p.result!.value!.im) < 1e-12);
  const f = run('param J : real\nintegral F = exp(i*x^2/2 + J*x) d(x)').statements[1]!;
  assert.equal(f.convergence, 'divergent');
  const c = stepOf(f, 'convergence')!;
  assert.equal(c.reason, 'source-grows');
  assert.match(renderStep(c).text, /grows along the real line; the value below is the i\*epsilon/);
  // the i*epsilon value: sqrt(2 pi) e^(i pi/4) e^(i J^2/2) (Fresnel on the line, docs/references.md, with the source completed)
  for (const J of [0.3, 1.7]) {
    const got = math.evaluate(f.result!.text, { J }) as math.Complex;
    const want = math.multiply(Math.sqrt(2 * Math.PI), math.exp(math.complex(0, Math.PI / 4 + J * J / 2))) as math.Complex;
    assert.ok(rel(got, want) < 1e-12, `J = ${J}`);
  }
});

test('example 4: a wrong-sign mode diverges, and rotating it by +-pi/2 defines it (values +-i sqrt(2 pi/|m|), G&R 3.323.2 with p^2 = -m, from memory); a rotation outside (pi/4, 3pi/4) is refused at once', () => {
  const r = run('param m : negative\nintegral Z = exp(-m*x^2/2) d(x)\nrotate Z : x -> exp(i*pi/2)*x as R1\nrotate Z : x -> -i*x as R2\nrotate Z : x -> exp(i*pi/8)*x as R3');
  assert.equal(r.statements[1]!.convergence, 'divergent');
  const [r1, r2, r3] = [r.statements[2]!, r.statements[3]!, r.statements[4]!];
  assert.equal(r1.legal, true);
  assert.equal(r2.legal, true);
  assert.equal(r3.legal, false);
  for (const m of [-0.5, -3]) {
    const a = math.evaluate(r1.result!.text, { m }) as math.Complex;
    const b = math.evaluate(r2.result!.text, { m }) as math.Complex;
    assert.ok(rel(a, { re: 0, im: Math.sqrt(2 * Math.PI / -m) }) < 1e-12);
    assert.ok(rel(b, { re: 0, im: -Math.sqrt(2 * Math.PI / -m) }) < 1e-12);
  }
  const legality = stepOf(r3, 'legality')!;
  assert.equal(legality.defines, true);
  assert.match(legality.range!.text, /\(pi\/4, 3\*pi\/4\) or \(-3\*pi\/4, -pi\/4\)/);
});

test('example 5: turning 1 + i*k by pi/4 + 0.0005 is allowed exactly for k >= tan(1/1000), the angle kept exact — Re((1 + i k) e^(2 i theta)) >= 0 worked out by hand, tan by the runtime', () => {
  const s = run('param k : positive\nintegral Z = exp(-(1 + i*k)*x^2/2) d(x)\nrotate Z : x -> exp(-i*(pi/4 + 0.0005))*x as ZR').statements[2]!;
  assert.equal(s.legal, false);
  const rotation = stepOf(s, 'rotation')!;
  assert.equal(rotation.moves[0]!.angle.text, '-(pi/4 + 1/2000)');
  const legality = stepOf(s, 'legality')!;
  assert.deepEqual(legality.regions.map((x) => x.holds), [true, false]);
  assert.match(legality.regions[0]!.condition.text, /^k >= tan\(1\/1000\) \(tan\(1\/1000\) ≈ 0\.00100000033333/);
  assert.equal(legality.regions[1]!.condition.text, 'k < tan(1/1000)');
  assert.ok(Math.abs(Number(/≈ ([0-9.e-]+)/.exec(legality.regions[0]!.condition.text)![1]) / Math.tan(0.001) - 1) < 1e-11);
});

test('example 6: three modes with a real mixing g cross the principal cut exactly at g^2 = 3, converge for |g| < 2 — against the mpmath scan and Sylvester by hand', () => {
  const s = run('param g : real\nintegral G = exp(-((2 + 3*i)*(x^2 + y^2 + z^2) + 2*g*x*y)/2) d(x, y, z)').statements[1]!;
  const b = stepOf(s, 'branch')!;
  assert.deepEqual(b.crossings.map((c) => c.text), ['-sqrt(3)', 'sqrt(3)']);
  const c = stepOf(s, 'convergence')!;
  assert.deepEqual(c.boundaries.map((x) => x.text), ['-2', '2']);
  // A(g) = (2 + 3i) I + g (E12 + E21); scan g > 0 with mpmath
  const C1 = [[[0, 0], [1, 0], [0, 0]], [[1, 0], [0, 0], [0, 0]], [[0, 0], [0, 0], [0, 0]]] as [number, number][][];
  const [scan] = scanBranch([{ coefficients: [diag(3, [2, 3]), C1], from: 1e-6, to: 1.999 }]);
  assert.equal(scan!.flips.length, 1);
  assert.ok(Math.abs(scan!.flips[0]! - Math.sqrt(3)) < 1e-9);
});

test('example 7: sqrt(2*pi)*exp(500000) prints finitely, as mantissa and power of ten — against mpmath in a separate process', () => {
  const s = run('integral B = exp(-x^2/2 + 1000*x) d(x)').statements[0]!;
  assert.equal(s.status, 'ok');
  assert.equal(s.result!.text, 'sqrt(2*pi)*exp(500000)');
  assert.equal(s.result!.value, null);
  const scaled = s.result!.scaled!;
  const py = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', 'import mpmath as mp; mp.mp.dps = 30; v = mp.sqrt(2*mp.pi)*mp.exp(500000); e = int(mp.floor(mp.log10(v))); print(e, mp.nstr(v / mp.mpf(10)**e, 20))'], { encoding: 'utf8' });
  const [e, m] = py.stdout.trim().split(' ');
  assert.equal(scaled.exponent10, Number(e));
  assert.ok(Math.abs(scaled.mantissa.re - Number(m)) < 1e-9 * Number(m), `${scaled.mantissa.re} vs ${m}`);
  assert.doesNotMatch(JSON.stringify(s), /NaN|Infinity/);
});

function diag(n: number, z: [number, number]): [number, number][][] {
  return Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? z : [0, 0] as [number, number])));
}

/** A random form A(t) = R + i (B0 + t B1): R integer positive definite (diagonally dominant), B0, B1 integer symmetric, scaled. */
const randomForm = fc.record({
  n: fc.integer({ min: 2, max: 4 }),
  seed: fc.array(fc.integer({ min: -9, max: 9 }), { minLength: 48, maxLength: 48 }),
  scale: fc.integer({ min: -4, max: 4 }),
});

test('property: the exact crossing set of the principal cut matches a dense mpmath scan of the continuous branch, random 2-4 variable forms, one positive parameter, magnitudes 1e-6 to 1e6 (200 cases)', () => {
  const cases = fc.sample(randomForm, { numRuns: 200, seed: 20261202 });
  const scans: ScanCase[] = [];
  const engine: number[][] = [];
  for (const { n, seed, scale } of cases) {
    let k = 0;
    const next = () => seed[k++ % seed.length]!;
    const R: number[][] = Array.from({ length: n }, () => new Array(n).fill(0));
    const B0: number[][] = Array.from({ length: n }, () => new Array(n).fill(0));
    const B1: number[][] = Array.from({ length: n }, () => new Array(n).fill(0));
    for (let i = 0; i < n; i++) for (let j = i; j < n; j++) {
      const r = i === j ? 0 : next() % 3; R[i]![j] = r; R[j]![i] = r;
      const b0 = next(); B0[i]![j] = b0; B0[j]![i] = b0;
      const b1 = next(); B1[i]![j] = b1; B1[j]![i] = b1;
    }
    for (let i = 0; i < n; i++) R[i]![i] = 3 * n + Math.abs(next());
    const s1 = 10 ** scale;
    const vars = ['x1', 'x2', 'x3', 'x4'].slice(0, n);
    const entry = (i: number, j: number) => `(${R[i]![j]} + i*(${B0[i]![j]} + ${B1[i]![j]! * s1}*t))`;
    const terms: string[] = [];
    for (let i = 0; i < n; i++) for (let j = i; j < n; j++) terms.push(i === j ? `${entry(i, j)}*${vars[i]}^2/2` : `${entry(i, j)}*${vars[i]}*${vars[j]}`);
    const src = `param t : positive\nintegral Z = exp(-(${terms.join(' + ')})) d(${vars.join(', ')})`;
    const s = run(src).statements[1]!;
    assert.equal(s.proof, 'proved', src);
    const b = stepOf(s, 'branch')!;
    engine.push(b.crossings.map((c) => c.approx).filter((x) => x > 1e-6 && x < 1e6));
    scans.push({ coefficients: [R.map((row, i) => row.map((x, j) => [x, B0[i]![j]!] as [number, number])), B1.map((row) => row.map((x) => [0, x * s1] as [number, number]))], from: 1e-6, to: 1e6 });
  }
  const results = scanBranch(scans);
  results.forEach((res, k) => {
    const want = res.flips; const got = engine[k]!;
    assert.equal(got.length, want.length, `case ${k}: engine ${got} vs scan ${want}`);
    got.forEach((x, j) => assert.ok(Math.abs(x - want[j]!) <= 1e-7 * Math.max(1, Math.abs(x)), `case ${k}: ${x} vs ${want[j]}`));
  });
});
