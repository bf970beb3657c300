/**
 * Exact constants in printed results: phases as exp(i*m*pi/4), normal forms of A, no sqrt(1),
 * angles kept as written — checked against the n-D Fresnel formula (docs/references.md:
 * Hörmander vol. I, Theorem 7.6.1, from memory) and by mathjs reading the printed text.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import * as math from 'mathjs';
import { run } from './support/run.js';

test('compare: a Lorentzian/Euclidean ratio prints its exact phase exp(3*i*pi/4), not a long fraction — n-D Fresnel, sig = 3 (Hörmander 7.6.1, from memory)', () => {
  const r = run('param k : positive\nintegral L = exp(i*k*(x^2 + y^2 + z^2)/2) d(x, y, z)\nintegral E = exp(-k*(x^2 + y^2 + z^2)/2) d(x, y, z)\ncompare L with E');
  const c = r.statements[3]!;
  assert.equal(c.verdict, 'phase');
  assert.equal(c.phaseOverPiQuarter, 3);
  assert.equal(c.result!.text, 'exp(3*i*pi/4)');
  const v = math.evaluate(c.result!.text) as math.Complex;
  assert.ok(Math.abs(v.re + Math.SQRT1_2) < 1e-15 && Math.abs(v.im - Math.SQRT1_2) < 1e-15);
});

test('printed forms a physicist writes: A in normal form (30 + i*t), no sqrt(1), results read back by mathjs (worked out by hand)', () => {
  const r = run('param t : positive\nintegral T = exp(-(30 + i*t)*(x^2 + y^2 + z^2)/2) d(x, y, z)\nintegral P = exp(-x^2 + i*x*y) d(x, y)');
  const form = r.statements[1]!.steps.find((s) => s.kind === 'quadratic-form');
  assert.ok(form?.kind === 'quadratic-form');
  assert.equal(form.A[0]![0]!.text, '30 + i*t');
  assert.equal(r.statements[2]!.result!.text, '2*pi');
  assert.doesNotMatch(JSON.stringify(r), /sqrt\(1\)|i\*i|0\^2|-\(-/);
});
