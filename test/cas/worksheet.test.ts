/** Worksheet behaviour: statement kinds, errors and dependencies, time limits, the report's shape. */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import * as math from 'mathjs';
import { evaluateWorksheet } from '../../cas/index.js';
import { worksheetReport } from '../../shared/evaluation.js';
import { relErr } from './support/reference.js';

const CANONICAL = [
  'param k : positive', 'param lam : real',
  'integral Z = exp(-(k*a^2 + 2*i*lam*a*b + k*b^2)/2) d(a, b)',
  'expect Z = 2*pi/sqrt(k^2 + lam^2)',
].join('\n');

test('the report matches the shared schema, and every kind appears in statements', () => {
  const r = evaluateWorksheet(`${CANONICAL}\nnote "hello"\nrotate Z : b -> exp(-i*pi/2)*b as ZL`);
  worksheetReport.parse(r);
  assert.deepEqual(r.statements.map((s) => s.kind), ['param', 'param', 'integral', 'expect', 'note', 'rotate']);
  // rotating b by -pi/2 sweeps through angles where Re(D A D) has a negative eigenvalue: a finding, not an error
  assert.equal(r.statements[5]!.status, 'ok');
  assert.equal(r.statements[5]!.legal, false);
  assert.equal(r.statements[5]!.result, null);
});

test('every issue-4 statement kind is parsed and evaluated (no "not yet supported")', () => {
  for (const [kw, line] of [['continue', 'continue Z : lam along 0 -> 2*i*k/3'], ['verify', 'verify Z at k = 2, lam = 0.7'], ['let', 'let F = -log(Z)'], ['limit', 'limit Z : lam -> 0']] as const) {
    const r = evaluateWorksheet(`${CANONICAL}\n${line}`);
    worksheetReport.parse(r);
    const s = r.statements[4]!;
    assert.equal(s.kind, kw);
    assert.equal(s.status, 'ok', JSON.stringify(s.error));
  }
});

test('a failed expect makes the run not ok, with the point where it fails', () => {
  const r = evaluateWorksheet(`${CANONICAL}\nexpect Z = 2*pi/sqrt(k^2 - lam^2)`);
  const s = r.statements[4]!;
  assert.equal(s.status, 'failed');
  assert.match(s.error!.message, /at k [=≈] .*, lam [=≈] .*/);
  assert.equal(r.ok, false);
});

test('expect is decided on the whole domain: same square and exponent exactly, same sign per cell (2 pi/sqrt(k^2 + lam^2), facts of the trade in docs/references.md)', () => {
  const r = evaluateWorksheet(`${CANONICAL}\nexpect Z = 2*pi*sqrt(1/(k^2 + lam^2))`);
  assert.equal(r.statements[3]!.proof, 'proved');
  assert.equal(r.statements[4]!.status, 'ok');
  assert.equal(r.statements[4]!.proof, 'proved');
  const st = r.statements[4]!.steps[0]!;
  assert.ok(st.kind === 'expect' && st.basis.kind === 'proved' && st.holds);
});

test('unknown names, parameters as variables, degree 3 and non-polynomial exponents are errors at their position', () => {
  const cases: [string, RegExp, number][] = [
    ['integral Z = exp(-q*x^2) d(x)', /Unknown name "q"/, 19],
    ['param x : real\nintegral Z = exp(-x^2) d(x)', /x is declared as a parameter/, 26],
    ['integral Z = exp(-x^2 - x*y*z + y^2 + z^2) d(x, y, z)', /degree 3 in x \(the term x\*y\*z\)/, 19],
    ['integral Z = exp(-x^4) d(x)', /degree 4 in x/, 19],
    ['integral Z = exp(-x^2 + sin(x)) d(x)', /not a polynomial in x: x appears inside sin/, 19],
    ['integral Z = sin(x)*exp(-x^2) d(x)', /depends on the integration variable x/, 14],
    ['integral Z = exp(-x^2/y) d(x, y)', /denominator/, 23],
  ];
  for (const [src, msg, column] of cases) {
    const r = evaluateWorksheet(src);
    const s = r.statements[r.statements.length - 1]!;
    assert.equal(s.status, 'error', src);
    assert.match(s.error!.message, msg);
    assert.equal(s.error!.column, column, `${src}: ${s.error!.message}`);
  }
});

test('a statement that depends on a failed one says which result it depends on', () => {
  const r = evaluateWorksheet('integral Z = exp(-x^3) d(x)\nexpect Z = 1');
  assert.match(r.statements[1]!.error!.message, /depends on Z \(line 1\), which ended with an error/);
});

test('statements stopped at the time limit are not run; dependants name them', () => {
  const seen: number[] = [];
  const r = evaluateWorksheet(`${CANONICAL}\n# c\n\nexpect Z = 1`, {
    stopped: [{ index: 2, reason: 'time' }], timeLimitMsPerStatement: 3000, onStatementStart: (i) => seen.push(i),
  });
  assert.deepEqual(seen, [0, 1, 3, 4]);
  assert.equal(r.statements[2]!.error!.message, 'This statement ran longer than the time limit of 3 s and was stopped. Simplify it or raise the limit.');
  assert.match(r.statements[3]!.error!.message, /depends on Z \(line 3\), which was stopped at the time limit/);
});

test('statements stopped at the memory limit or by a failed worker say so, not "time limit"', () => {
  const memory = evaluateWorksheet(`${CANONICAL}\nexpect Z = 1`, { stopped: [{ index: 2, reason: 'memory', limitMb: 512 }] });
  assert.match(memory.statements[2]!.error!.message, /more memory than the evaluation limit of 512 MB/);
  assert.match(memory.statements[3]!.error!.message, /which was stopped at the memory limit/);
  const crash = evaluateWorksheet(`${CANONICAL}\nexpect Z = 1`, { stopped: [{ index: 2, reason: 'crash', detail: 'the worker exited' }] });
  assert.match(crash.statements[2]!.error!.message, /stopped unexpectedly while running this statement \(the worker exited\)/);
  assert.doesNotMatch(crash.statements[2]!.error!.message, /time limit/);
  assert.match(crash.statements[3]!.error!.message, /which could not be evaluated/);
});

test('the cooperative deadline stops a long statement with the time-limit message', () => {
  // three parameters in four variables: the sampled route, which takes far longer than 1 ms
  const src = 'param a : positive\nparam b, c : real\nintegral W = exp(-(a*x^2 + a*y^2 + a*z^2 + a*w^2)/2 + i*b*(x*y + y*z) + i*c*(z*w + w*x)) d(x, y, z, w)';
  const r = evaluateWorksheet(src, { timeLimitMsPerStatement: 1 });
  assert.equal(r.statements[2]!.status, 'error');
  assert.match(r.statements[2]!.error!.message, /ran longer than the time limit of 0\.001 s/);
});

test('divergent is a result with a growth direction, proved symbolically for a negative diagonal', () => {
  const r = evaluateWorksheet('param m : positive\nintegral D = exp(m*x^2/2 - y^2) d(x, y)');
  const s = r.statements[1]!;
  assert.equal(s.status, 'ok');
  assert.equal(s.convergence, 'divergent');
  assert.equal(s.proof, 'proved');
  assert.deepEqual(s.steps.find((x) => x.kind === 'convergence')!.direction, [1, 0]);
  assert.equal(s.result, null);
});

test('a real coupling that changes sign is piecewise: divergent for g <= 0, absolute for g > 0, with the exact boundary 0 and a diverging point (worked out by hand)', () => {
  const r = evaluateWorksheet('param g : real\nintegral U = exp(-g*x^2) d(x)');
  const s = r.statements[1]!;
  assert.equal(s.convergence, 'piecewise');
  assert.equal(s.proof, 'proved');
  const conv = s.steps.find((x) => x.kind === 'convergence');
  assert.ok(conv?.kind === 'convergence' && conv.at);
  assert.deepEqual(conv.regions.map((x) => [x.verdict, x.condition.text]), [['divergent', 'g <= 0'], ['absolute', 'g > 0']]);
  assert.deepEqual(conv.boundaries.map((b) => b.text), ['0']);
});

test('prefactors and products of exponentials are carried through', () => {
  const r = evaluateWorksheet('param k : positive\nintegral P = 3*exp(-k*x^2/2)*exp(-k*y^2/2)/k d(x, y)\nexpect P = 6*pi/k^2');
  assert.equal(r.statements[2]!.status, 'ok');
});

test('two-variable Fresnel with one sign: the principal root of det A is wrong, the record says so', () => {
  const r = evaluateWorksheet('param w : positive\nintegral F = exp(i*w*(x^2 + y^2)/2) d(x, y)\nexpect F = 2*pi*i/w');
  const s = r.statements[1]!;
  assert.equal(s.convergence, 'oscillatory');
  assert.equal(s.branch!.principalSqrtDetCorrect, false);
  assert.equal(r.statements[2]!.status, 'ok', JSON.stringify(r.statements[2]!.steps));
  assert.ok(s.steps.some((x) => x.kind === 'fresnel-phase' && x.signature?.positive === 2));
});

test('three variables with symbolic couplings: the branch is sampled and the result follows the continuous branch', () => {
  // eigenvalues near the imaginary axis for large g: the principal root fails there
  const src = 'param g : positive\nintegral T = exp(-((1 + 4*i*g)*(x^2 + y^2 + z^2))/2) d(x, y, z)';
  const s = evaluateWorksheet(src).statements[1]!;
  assert.equal(s.status, 'ok');
  assert.equal(s.proof, 'proved');
  const text = s.result!.text;
  for (const g of [0.1, 1, 5]) {
    // independent: each of three identical eigenvalues 1 + 4 i g contributes its principal root
    const lam = math.complex(1, 4 * g);
    const expected = math.divide(Math.pow(2 * Math.PI, 1.5), math.pow(math.sqrt(lam), 3) as math.Complex) as math.Complex;
    const got = math.evaluate(text, { g }) as math.Complex;
    const z = math.complex(got);
    assert.ok(relErr({ re: z.re, im: z.im }, { re: expected.re, im: expected.im }) < 1e-10, `g=${g}: ${text}`);
  }
  assert.notEqual(s.branch!.principal, 'right');
});

test('LaTeX has no ^{1} or 1\\cdot artefacts and the text is plain infix', () => {
  const r = evaluateWorksheet(`${CANONICAL}\nparam p : positive\nintegral G = exp(-p*x^2 + x) d(x)`);
  for (const s of r.statements) if (s.result) {
    assert.doesNotMatch(s.result.latex, /\^\{1\}|(^|[^0-9])1\s*\\cdot|\*\*/);
    assert.doesNotMatch(s.result.text, /\^1\b|\b1\*/);
  }
});
