// verify on a functional determinant: an independent initial-value solve (Runge-Kutta) against
// the closed form, checked at the published values (G. V. Dunne, "Functional determinants in
// quantum field theory", J. Phys. A 41 (2008) 304006; K. Kirsten and A. J. McKane, Ann. Phys.
// 308 (2003) 502): sinh(omega L)/(omega L) = 1.915169877217778 at L = 3, omega = 0.7;
// 4 sinh^2(beta omega/2) = 2.301796930786281 and 4 cosh^2(beta omega/2) = 6.301796930786281 at beta = 2.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { run } from './support/run.js';
import type { StepOf } from '../../shared/evaluation.js';

const odeStep = (source: string, index: number) => {
  const s = run(source).statements[index]!;
  return { s, step: s.steps.find((x) => x.kind === 'ode-check') as StepOf<'ode-check'> | undefined };
};

test('verify recomputes each determinant by the ODE and meets the published values', () => {
  const cases: [string, number][] = [
    ['determinant D = w^2 on interval L\nverify D at w = 0.7, L = 3', 1.915169877217778],
    ['determinant D = w^2 on circle L periodic\nverify D at w = 0.7, L = 2', 2.301796930786281],
    ['determinant D = w^2 on circle L antiperiodic\nverify D at w = 0.7, L = 2', 6.301796930786281],
  ];
  for (const [body, published] of cases) {
    const { s, step } = odeStep(`param w, L : positive\n${body}\n`, 2);
    assert.equal(s.status, 'ok', s.error?.message);
    assert.ok(step, 'an ode-check step');
    assert.ok(step!.agrees);
    assert.ok(Math.abs(step!.value.re - published) < 1e-9 * published, `${step!.value.re} against ${published}`);
    assert.ok(step!.steps >= 128);
  }
});

test('a wrong closed form would be caught: the ODE value is compared, not copied', () => {
  // a complex potential: the ODE and the closed form agree in both parts
  const { s, step } = odeStep('param w : positive\ndeterminant D = (1 + i)*w^2 on interval 2\nverify D at w = 0.6\n', 2);
  assert.equal(s.status, 'ok', s.error?.message);
  assert.ok(Math.abs(step!.value.im) > 0.01, 'a complex value');
  assert.ok(step!.relativeDifference < 1e-9);
});

test('verify refuses what it cannot check independently, saying why', () => {
  const byOde = run('determinant E = 0.49 + 0.1*t on interval 3\nverify E\n').statements[1]!;
  assert.equal(byOde.status, 'error');
  assert.match(byOde.error!.message, /computed by this initial-value problem/);
  const zero = run('param L : positive\ndeterminant Z = 0 on circle L periodic\nverify Z at L = 2\n').statements[2]!;
  assert.equal(zero.status, 'error');
  assert.match(zero.error!.message, /zero mode removed/);
  const product = run('param a : positive\nproduct P = n^2 + a^2 over n >= 1\nverify P at a = 0.3\n').statements[2]!;
  assert.equal(product.status, 'error');
  assert.match(product.error!.message, /defined by continuation/);
});
