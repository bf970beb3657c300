/**
 * Gaussian sums over the integers (theta functions), the Dedekind eta function, Poisson
 * resummation and the modular transformation, and high-temperature limits read off through them.
 *
 * Sources of the check values:
 *  - issue 18 (the level-k chiral boson): chi_0 = eta(tau)^-1 * sum_n q^(k n^2/2), q = exp(-beta),
 *    tau = i*beta/(2*pi); log chi_0 - pi^2/(6*beta) = -1/2*log(k) + O(exp(-c/beta)), numerically
 *    -0.5493061443 at k = 3 and -0.8047189562 at k = 5 (beta = 0.1);
 *  - eta(-1/tau) = sqrt(-i*tau)*eta(tau) (T. M. Apostol, Modular Functions and Dirichlet Series in
 *    Number Theory, 2nd ed., Theorem 3.1, from memory), at tau = 0.3 + 0.8i;
 *  - Poisson resummation sum_n exp(-pi*a*n^2 + 2*pi*i*b*n) = a^(-1/2) sum_m exp(-pi*(m - b)^2/a)
 *    (the Fourier transform of a Gaussian), at complex a.
 * Independently, every number is recomputed by mpmath in a separate python3 process: eta as
 * exp(2*pi*i*tau/24) * qp(q) (mpmath's q-Pochhammer symbol), sums by jtheta(3, pi*b, exp(-pi*a))
 * and by nsum over the definition.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { Complex } from 'complex.js';
import { run } from './support/run.js';
import type { StatementReport, Step, StepOf } from '../../shared/evaluation.js';
import { renderStep } from '../../shared/record/render.js';
import { parseExpression, parseWorksheet } from '../../cas/lang/parse.js';
import { generalLimit } from '../../cas/statements/limitGeneral.js';
import { statementNames } from '../../cas/lang/statement-names.js';
import { etaByProduct, etaValue, poissonSum, smallAForm, sumByTerms } from '../../cas/numeric/lattice.js';

type C = { re: number; im: number };

const MPMATH = String.raw`
import json, sys
import mpmath as mp
mp.mp.dps = 30
def eta(tau):
    q = mp.exp(2j * mp.pi * tau)
    return mp.exp(2j * mp.pi * tau / 24) * mp.qp(q)
out = []
for c in json.load(sys.stdin):
    if c["kind"] == "chi":
        k, beta = mp.mpf(c["k"]), mp.mpf(c["beta"])
        theta = mp.jtheta(3, 0, mp.exp(-k * beta / 2))
        v = mp.log(theta / eta(1j * beta / (2 * mp.pi))) - mp.pi ** 2 / (6 * beta)
    elif c["kind"] == "eta":
        v = eta(mp.mpc(*c["tau"]))
    elif c["kind"] == "modular":
        tau = mp.mpc(*c["tau"])
        v = eta(-1 / tau) / (mp.sqrt(-1j * tau) * eta(tau))
    elif c["kind"] == "sum":
        a, b = mp.mpc(*c["a"]), mp.mpc(*c["b"])
        v = mp.jtheta(3, mp.pi * b, mp.exp(-mp.pi * a))
        w = mp.nsum(lambda n: mp.exp(-mp.pi * a * n ** 2 + 2j * mp.pi * b * n), [-mp.inf, mp.inf])
        assert abs(v - w) < mp.mpf(10) ** -20 * abs(v)
    v = mp.mpc(v)
    out.append([float(v.real), float(v.imag)])
print(json.dumps(out))
`;

function mpmath(cases: object[]): C[] {
  const r = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', MPMATH], { input: JSON.stringify(cases), encoding: 'utf8' });
  assert.equal(r.status, 0, r.stderr);
  return (JSON.parse(r.stdout) as [number, number][]).map(([re, im]) => ({ re, im }));
}

const rel = (a: C, b: C) => Math.hypot(a.re - b.re, a.im - b.im) / Math.max(Math.hypot(b.re, b.im), 1e-300);
const named = (r: { statements: StatementReport[] }, kind: string, name: string) => {
  const s = r.statements.find((x) => x.kind === kind && x.name === name);
  assert.ok(s, `no ${kind} ${name}`);
  return s!;
};
const stepOf = <K extends Step['kind']>(s: StatementReport, kind: K) => s.steps.find((x): x is StepOf<K> => x.kind === kind);

const chiral = (k: string) => `param beta : positive
sum T = exp(-${k}*beta*n^2/2) over all n
let L = log(T/eta(i*beta/(2*pi))) - pi^2/(6*beta)
verify L at beta = 0.1
limit L : beta -> 0
`;

test('chiral boson, level 3 and 5: log chi_0 - pi^2/(6*beta) at beta = 0.1 (issue 18: -0.5493061443, -0.8047189562), against mpmath', () => {
  const want = { 3: -0.5493061443, 5: -0.8047189562 } as const;
  const ref = mpmath([{ kind: 'chi', k: 3, beta: 0.1 }, { kind: 'chi', k: 5, beta: 0.1 }]);
  for (const [i, k] of ([3, 5] as const).entries()) {
    const r = run(chiral(String(k)));
    const v = named(r, 'verify', 'L');
    assert.equal(v.status, 'ok', JSON.stringify(v.error ?? v.steps));
    const check = stepOf(v, 'series-check')!;
    // the closed-form side (Poisson and the modular transformation) and the partial sums and products agree
    assert.ok(check.relativeDifference < 1e-12, String(check.relativeDifference));
    assert.ok(Math.abs(check.closed.re - want[k]) < 1e-10, `${check.closed.re} vs ${want[k]}`);
    assert.ok(Math.abs(check.closed.re - ref[i]!.re) < 1e-12, `${check.closed.re} vs mpmath ${ref[i]!.re}`);
    // -1/2 log k up to exp(-2*pi^2/(k*beta)): at beta = 0.1 that is below 1e-25
    assert.ok(Math.abs(check.closed.re + Math.log(k) / 2) < 1e-12);
  }
});

test('chiral boson: the exact high-temperature limit is -1/2*log(k) with an exponentially small remainder and its bound', () => {
  const r = run(`param k, beta : positive
sum T = exp(-k*beta*n^2/2) over all n
let L = log(T/eta(i*beta/(2*pi))) - pi^2/(6*beta)
limit L : beta -> 0
`);
  const lim = named(r, 'limit', 'L');
  assert.equal(lim.status, 'ok', JSON.stringify(lim.error));
  const step = stepOf(lim, 'limit')!;
  assert.equal(step.outcome, 'value');
  assert.equal(step.formula?.text, '-log(k)/2');
  assert.deepEqual(step.basis, { kind: 'proved' });
  // the rates: the Poisson dual of the sum (pi*Re(1/a) = 2*pi^2/(k*beta)) and eta's (2*pi*Im(-1/tau) = 4*pi^2/beta);
  // they are not comparable for every k > 0, so both stay in the O-term
  assert.equal(step.remainder?.order.text, 'exp(-2*pi^2/(k*beta)) + exp(-4*pi^2/beta)');
  assert.equal(step.remainder?.bound?.text, '8*exp(-2*pi^2/(k*beta)) + 64*exp(-4*pi^2/beta)');
  const modular = lim.steps.filter((x): x is StepOf<'modular'> => x.kind === 'modular');
  assert.deepEqual(modular.map((m) => m.of).sort(), ['eta', 'sum']);
  assert.ok(renderStep(step).text.includes('-log(k)/2'));
  assert.ok(renderStep(modular.find((m) => m.of === 'eta')!).text.includes('principal root'));

  // the bound holds at moderate beta (where it is below 1/2), against mpmath
  const betas = [0.5, 1, 2];
  const ref = mpmath(betas.map((beta) => ({ kind: 'chi', k: 3, beta })));
  betas.forEach((beta, i) => {
    const err = Math.abs(ref[i]!.re + Math.log(3) / 2);
    const bound = 8 * Math.exp(-2 * Math.PI ** 2 / (3 * beta)) + 64 * Math.exp(-4 * Math.PI ** 2 / beta);
    assert.ok(bound < 0.5 ? err <= bound : true, `beta = ${beta}: ${err} > ${bound}`);
    if (bound < 0.5) assert.ok(err > 0 && err <= bound);
  });
});

test('chiral boson with a number for k: the limit is -log(3)/2 and the O-term keeps the slower rate only', () => {
  const r = run(chiral('3'));
  const step = stepOf(named(r, 'limit', 'L'), 'limit')!;
  assert.equal(step.formula?.text, '-log(3)/2');
  assert.equal(step.remainder?.order.text, 'exp(-2*pi^2/(3*beta))');
});

test('eta(-1/tau) = sqrt(-i*tau)*eta(tau) at tau = 0.3 + 0.8i, and eta itself, against mpmath\'s q-series', () => {
  const tau = new Complex(0.3, 0.8);
  const [etaRef, ratioRef] = mpmath([{ kind: 'eta', tau: [0.3, 0.8] }, { kind: 'modular', tau: [0.3, 0.8] }]);
  const r = run(`let E = eta(0.3 + 0.8*i)
let M = eta(-1/(0.3 + 0.8*i))/(sqrt(-i*(0.3 + 0.8*i))*eta(0.3 + 0.8*i))
verify E
verify M
`);
  const E = named(r, 'let', 'E').result!.value!;
  const M = named(r, 'let', 'M').result!.value!;
  assert.ok(rel(E, etaRef!) < 1e-13, `${JSON.stringify(E)} vs ${JSON.stringify(etaRef)}`);
  assert.ok(rel(M, { re: 1, im: 0 }) < 1e-13 && rel(M, ratioRef!) < 1e-13);
  for (const n of ['E', 'M']) {
    const v = named(r, 'verify', n);
    assert.equal(v.status, 'ok');
    assert.ok(stepOf(v, 'series-check')!.relativeDifference < 1e-12);
  }
  // the closed-form side reduces tau to the fundamental domain; the check multiplies the product out
  assert.ok(rel(etaValue(tau), etaByProduct(tau).value) < 1e-13);
  // deep in the high-temperature region (q = exp(-0.01)): the reduction against 4,000 factors
  const small = new Complex(0, 0.01 / (2 * Math.PI));
  assert.ok(rel(etaValue(small), etaByProduct(small).value) < 1e-10);
});

test('Poisson resummation at complex a: sum_n exp(-pi*a*n^2 + 2*pi*i*b*n), a = 0.7 + 0.4i, b = 0.2 + 0.1i, against mpmath jtheta and nsum', () => {
  const [ref] = mpmath([{ kind: 'sum', a: [0.7, 0.4], b: [0.2, 0.1] }]);
  const r = run(`sum Z = exp(-pi*(0.7 + 0.4*i)*n^2 + 2*pi*i*(0.2 + 0.1*i)*n) over all n
verify Z
`);
  const Z = named(r, 'sum', 'Z');
  assert.equal(Z.proof, 'proved');
  assert.ok(rel(Z.result!.value!, ref!) < 1e-14, `${JSON.stringify(Z.result!.value)} vs ${JSON.stringify(ref)}`);
  const p = stepOf(Z, 'poisson-resummation')!;
  assert.equal(p.a.text, '7/10 + 2*i/5');
  assert.equal(p.b.text, '1/5 + i/10');
  assert.deepEqual(p.realPart, { kind: 'proved' });
  assert.ok(renderStep(p).text.includes('a^(-1/2) is the principal root'));
  assert.equal(named(r, 'verify', 'Z').status, 'ok');
  // both sides of the identity summed term by term agree with each other
  const g = { alpha: new Complex(0.7, 0.4).mul(Math.PI), beta: new Complex(0.2, 0.1).mul(new Complex(0, 2 * Math.PI)), gamma: new Complex(0, 0) };
  const a = new Complex(0.7, 0.4); const b = new Complex(0.2, 0.1);
  const dual = sumByTerms({ alpha: new Complex(Math.PI, 0).div(a), beta: b.div(a).mul(2 * Math.PI), gamma: b.mul(b).div(a).mul(-Math.PI) }).value.div(a.sqrt());
  assert.ok(rel(sumByTerms(g).value, dual) < 1e-14);
  assert.ok(rel(poissonSum(g), ref!) < 1e-14);
});

test('the small-a form: the leading term and the stated bound on the rest hold (numbers against mpmath)', () => {
  // a = 0.08 + 0.05i, b = 0.3 - 0.02i: |sum * a^(1/2) - exp(-pi*(m0 - b)^2/a)| <= bound
  const a = new Complex(0.08, 0.05); const b = new Complex(0.3, -0.02);
  const [ref] = mpmath([{ kind: 'sum', a: [a.re, a.im], b: [b.re, b.im] }]);
  const form = smallAForm(a, b);
  const R = new Complex(ref!.re, ref!.im).mul(a.sqrt()).sub(form.leading);
  assert.ok(R.abs() <= form.bound, `${R.abs()} > ${form.bound}`);
  const r = run(`sum Z = exp(-pi*(0.08 + 0.05*i)*n^2 + 2*pi*i*(0.3 - 0.02*i)*n) over all n\n`);
  const s = stepOf(named(r, 'sum', 'Z'), 'small-parameter-form')!;
  assert.equal(s.nearest, 0);
  // the record's bound (distance 1/2, the worst case) is no smaller than the sharp one
  assert.ok(s.boundValue !== null && s.boundValue >= R.abs());
});

test('a sum that does not converge, or is not a Gaussian, is refused with a reason', () => {
  const r = run(`param x : real
sum A = exp(pi*n^2) over all n
sum B = exp(-n) over all n
sum C = exp(-x*n^2) over all n
sum D = 2^(-n^2) over all n
`);
  const msg = (n: string) => named(r, 'sum', n).error?.message ?? '';
  assert.match(msg('A'), /not positive/);
  assert.match(msg('B'), /degree 1/);
  assert.match(msg('C'), /Re a is not positive everywhere/);
  assert.match(msg('D'), /exp\(E\)/);
});

test('a sum over a positive parameter is proved convergent; the statement names its index as a variable', () => {
  const src = 'param a : positive\nparam b : real\nsum Z = exp(-pi*a*n^2 + 2*pi*i*b*n) over all n\n';
  const r = run(src);
  const Z = named(r, 'sum', 'Z');
  assert.equal(Z.proof, 'proved');
  assert.equal(stepOf(Z, 'small-parameter-form')!.nearest, null);
  const parsed = parseWorksheet(src);
  assert.deepEqual(parsed.errors, []);
  const s = parsed.lines.flatMap((l) => (l.ok ? [l.statement] : [])).find((x) => x.kind === 'sum')!;
  assert.deepEqual(statementNames(s), { defined: ['Z'], used: ['a', 'b'], variables: ['n'] });
});

test('a limit the modular transformation does not reach says unknown with the reason (eta at low temperature, tau -> i*inf)', () => {
  const r = run(`param beta : positive
let F = log(eta(i*beta/(2*pi)))
limit F : beta -> inf
`);
  // the exact route refuses (-1/tau tends to 0, not to i*inf); the numeric fallback then finds eta
  // underflowing at large beta: an error or an unknown limit, never a claimed value
  const lim = named(r, 'limit', 'F');
  const step = stepOf(lim, 'limit');
  assert.ok(lim.status === 'error' || step?.outcome === 'unknown', JSON.stringify(lim));
  const direct = generalLimit(parseExpression('log(eta(i*beta/(2*pi)))'), 'beta', { kind: 'inf' }, new Map([['beta', 'positive']]), () => null,
    { points: [new Map()], valueAt: () => null });
  assert.equal(direct.outcome, 'unknown');
  assert.match((direct as { reason: string }).reason, /-1\/tau is not one power/);
});

test('level 1: the powers cancel to 0 and the remainder is still stated; eta off the upper half plane is refused; Re a of x*(1 + i)/pi is proved', () => {
  const r = run(`param beta, x : positive
sum T = exp(-beta*n^2/2) over all n
let L = log(T/eta(i*beta/(2*pi))) - pi^2/(6*beta)
limit L : beta -> 0
let E = eta(0.5)
sum A = exp(-x*(1 + i)*n^2) over all n
`);
  const step = stepOf(named(r, 'limit', 'L'), 'limit')!;
  assert.equal(step.formula?.text, '0');
  assert.equal(step.remainder?.order.text, 'exp(-2*pi^2/beta)');
  assert.match(named(r, 'let', 'E').error?.message ?? '', /Im tau > 0/);
  assert.equal(named(r, 'sum', 'A').proof, 'proved');
});
