// The exact identity check behind `expect ... holds, proved` for expressions with exp, sinh,
// cosh, sin and cos (cas/verdicts/identity.ts). Every "same function" it claims is checked
// independently with mathjs at random complex points; the pairs it must not claim are
// identities it cannot see (sinh(2x) = 2 sinh x cosh x, a fact of the trade) or not identities.
import { spawnSync } from 'node:child_process';
import { test } from 'node:test';
import assert from 'node:assert/strict';
import * as math from 'mathjs';
import fc from 'fast-check';
import { parseExpression } from '../../cas/lang/parse.js';
import { constantRatio, sameFunction, sameFunctionHow } from '../../cas/verdicts/identity.js';
import { run } from './support/run.js';

const mathjsValue = (text: string, at: Record<string, math.Complex>) => math.evaluate(text, { ...at }) as math.Complex | number;

function agreeNumerically(a: string, b: string, names: string[]): boolean {
  for (let k = 0; k < 20; k++) {
    const at: Record<string, math.Complex> = {};
    for (const n of names) at[n] = math.complex(Math.sin(7 * k + n.length) * 2, Math.cos(3 * k + 1) * 1.5);
    const va = math.complex(mathjsValue(a, at) as never);
    const vb = math.complex(mathjsValue(b, at) as never);
    if (!(Number(math.abs(math.subtract(va, vb) as never)) <= 1e-9 * Math.max(1, Number(math.abs(va))))) return false;
  }
  return true;
}

test('identical forms are recognised, and each recognised pair agrees in mathjs', () => {
  const pairs: [string, string, string[]][] = [
    ['sinh(w*L)/(w*L)', 'sinh(L*w)/(L*w)', ['w', 'L']],
    ['4*sinh(L*w/2)^2', '4*sinh(w*L/2)*sinh(L*w/2)', ['w', 'L']],
    ['exp(-k*t)*cos(pi*t) + sin(t)^2', 'sin(t)*sin(t) + cos(t*pi)*exp(-(t*k))', ['k', 't']],
    ['cosh(a + b)/(1 + a^2)', 'cosh(b + a)*(1 + a^2)^(-1)', ['a', 'b']],
  ];
  for (const [a, b, names] of pairs) {
    assert.equal(sameFunction(parseExpression(a), parseExpression(b)), true, `${a} against ${b}`);
    assert.ok(agreeNumerically(a, b, names), `mathjs disagrees on ${a} against ${b}`);
  }
});

test('identities it cannot see and non-identities are not claimed', () => {
  for (const [a, b] of [
    ['sinh(2*x)', '2*sinh(x)*cosh(x)'], // true, but the values are treated as independent
    ['sinh(x)', 'sinh(-x)'],
    ['sqrt(x^2)', 'x'], // a branch: refused outright
    ['exp(x)*exp(y)', 'exp(x + y)'],
    ['log(x)', 'log(x)'], // log is not admitted, even for equal forms
  ]) assert.equal(sameFunction(parseExpression(a), parseExpression(b)), false, `${a} against ${b}`);
});

/** Sums of c*p*q over products of two atoms, whole c in -3..3 (the property tests' expressions). */
type Term = [string, string, number];
const sumsOf = (atoms: string[], maxLength: number) => {
  const term = fc.tuple(fc.constantFrom(...atoms), fc.constantFrom(...atoms), fc.integer({ min: -3, max: 3 }));
  return fc.array(term, { minLength: 1, maxLength });
};
const sumText = (ts: Term[]) => ts.map(([p, q, c]) => `(${c})*${p}*${q}`).join(' + ');
/** A claimed identity between the two sums must agree in mathjs. */
function claimedAgrees(a: string, b: string): void {
  if (sameFunction(parseExpression(a), parseExpression(b))) assert.ok(agreeNumerically(a, b, ['x', 'y']), `${a} against ${b}`);
}

test('property: a claimed identity always agrees in mathjs', () => {
  const atoms = ['x', 'y', 'sinh(x)', 'cosh(y)', 'exp(x*y)', 'sin(x + y)', 'pi'];
  fc.assert(fc.property(sumsOf(atoms, 4), sumsOf(atoms, 4), (xs, ys) => {
    const a = sumText(xs);
    claimedAgrees(a, sumText(ys));
    // a sum and its reversal are always the same function
    assert.equal(sameFunction(parseExpression(a), parseExpression([...xs].reverse().map(([p, q, c]) => `${q}*(${c})*${p}`).join(' + '))), true);
  }), { numRuns: 100, seed: 20261202 });
});

test('expect on a determinant is proved, not sampled, when the forms are the same function', () => {
  const r = run('param w, L : positive\ndeterminant D = w^2 on interval L\nexpect D = sinh(L*w)/(L*w)\nexpect D = sinh(2*L*w)/(2*L*w)\n');
  const [, , same, other] = r.statements;
  assert.equal(same!.status, 'ok');
  assert.equal(same!.proof, 'proved');
  assert.equal(other!.status, 'failed'); // sampled: sinh(2Lw)/(2Lw) differs
  assert.equal(other!.proof, 'sampled');
});

test('the display form cancels common factors and keeps the value (mathjs at random points)', async () => {
  const { cancelled } = await import('../../cas/expr/atoms.js');
  const { formulaOf } = await import('../../cas/expr/print.js');
  const cases: [string, string][] = [
    ['(L/pi)*(2*pi*sinh(L*w)/(L*w))', '2*sinh(L*w)/w'],
    ['pi*pi*L*sinh(L*w)/(pi*pi*L*w*L)', 'sinh(L*w)/(L*w)'],
    ['1 - exp(-2*pi*i*(1/5 - 7*i/20))', '1 - exp(-2*pi*i*(1/5 - 7*i/20))'], // nothing to cancel: as written
  ];
  for (const [input, expected] of cases) {
    const out = formulaOf(cancelled(parseExpression(input))).text;
    assert.equal(out, expected);
    assert.ok(agreeNumerically(input.replace(/\bi\b/g, 'i'), out, ['L', 'w']), `mathjs: ${input} against ${out}`);
  }
});

test('decimals typed by the user are printed as the fractions they stand for', async () => {
  const { exactDecimals } = await import('../../cas/expr/numberExpr.js');
  const { formulaOf } = await import('../../cas/expr/print.js');
  assert.equal(formulaOf(exactDecimals(parseExpression('eta(0.3 + 0.8*i)*2.50'))).text, '5*eta(3/10 + 4*i/5)/2');
});

// The second try (cas/verdicts/expForm.ts): sinh, cosh and whole multiples of asinh written
// as exponentials, each sqrt(y^2 + 1) reduced by its square. Every claimed pair is checked
// with mpmath (Debian's python3-mpmath, its own asinh) in a separate process at complex
// points; the pairs are handbook facts: sinh(n*t)/sinh(t) = U_(n-1)(cosh t), the Chebyshev
// polynomial of the second kind (M. Abramowitz and I. A. Stegun, Handbook of Mathematical
// Functions, 22.3.16, from memory), and the double- and triple-angle formulas.
function mpmathAgree(pairs: [string, string, string[]][]): boolean[] {
  const script = String.raw`
import json, sys
import mpmath as mp
mp.mp.dps = 30
out = []
for a, b, names in json.load(sys.stdin):
    ok = True
    for k in range(12):
        env = {'sinh': mp.sinh, 'cosh': mp.cosh, 'exp': mp.exp, 'asinh': mp.asinh, 'pi': mp.pi, 'i': mp.mpc(0, 1)}
        for j, n in enumerate(names):
            env[n] = mp.mpc(mp.sin(7 * k + j + 1) * 2, mp.cos(3 * k + 2 * j + 1) * 1.5)
        va = eval(a.replace('^', '**'), env)
        vb = eval(b.replace('^', '**'), env)
        ok = ok and abs(va - vb) <= mp.mpf('1e-20') * max(1, abs(va))
    out.append(bool(ok))
print(json.dumps(out))
`;
  const r = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', script], { input: JSON.stringify(pairs), encoding: 'utf8', timeout: 60_000 });
  assert.equal(r.status, 0, r.stderr);
  return JSON.parse(r.stdout) as boolean[];
}

test('sinh, cosh and whole multiples of asinh: identities shown in exponential form, each confirmed by mpmath', () => {
  // U_5(x) = 32x^5 - 32x^3 + 6x with x = cosh(2*asinh(w/4)) = 1 + w^2/8: the sliced ratio of six slices on [0, 3]
  const u5 = '(32*(1 + w^2/8)^5 - 32*(1 + w^2/8)^3 + 6*(1 + w^2/8))';
  const pairs: [string, string, string[]][] = [
    ['sinh(12*asinh(w/4))/(6*sinh(2*asinh(w/4)))', `${u5}/6`, ['w']],
    ['sinh(12*asinh(w/4))/(6*sinh(2*asinh(w/4)))', '((3584*w^2 + 40*w^6 + 576*w^4 + w^8 + 8960)*w^2 + 6144)/6144', ['w']],
    ['cosh(2*asinh(y))', '1 + 2*y^2', ['y']],
    ['sinh(3*asinh(y))', '3*y + 4*y^3', ['y']],
    ['2*exp(x) - 2*exp(-x)', '4*sinh(x)', ['x']],
    ['cosh(x + 2*asinh(L*w))*sinh(asinh(L*w))', '(exp(x)*(L*w + (L^2*w^2 + 1)^(1/2))^2 + exp(-x)*(L*w + (L^2*w^2 + 1)^(1/2))^(-2))*L*w/2', ['x', 'L', 'w']],
  ];
  for (const [a, b] of pairs) {
    if (b.includes('^(1/2)')) continue; // the sqrt on the right is not a value the proof admits; mpmath only
    assert.equal(sameFunction(parseExpression(a), parseExpression(b)), true, `${a} against ${b}`);
    assert.equal(sameFunctionHow(parseExpression(a), parseExpression(b)), 'exponential-form');
  }
  assert.equal(sameFunction(parseExpression(pairs[5]![0]), parseExpression(pairs[5]![0].replace('L*w)', 'w*L)'))), true);
  // with square roots only, the method is named for what it used
  assert.equal(sameFunctionHow(parseExpression('sqrt(2*pi/w)*exp(i*pi/4)*(k^2 + 1)^(3/2)'), parseExpression('exp(i*pi/4)*(k^2 + 1)*sqrt(1 + k^2)*(2*pi/w)^(1/2)')), 'roots');
  assert.deepEqual(mpmathAgree(pairs), pairs.map(() => true));
});

test('exponential form: what it must not claim, and constant ratios', () => {
  for (const [a, b] of [
    ['sinh(asinh(y)/2)', 'y'], // a half multiple: not a rational function of y and sqrt(y^2 + 1)
    ['sinh(N*asinh(y))', 'sinh(N*asinh(y)) + 1'],
    ['cosh(2*asinh(y))', '2 + 2*y^2'],
    ['sinh(3*asinh(y))', '3*y - 4*y^3'],
  ]) assert.equal(sameFunction(parseExpression(a), parseExpression(b)), false, `${a} against ${b}`);
  const ratio = constantRatio(parseExpression('((3584*w^2 + 40*w^6 + 576*w^4 + w^8 + 8960)*w^2 + 6144)/6144'), parseExpression('sinh(12*asinh(w/4))/(5*sinh(2*asinh(w/4)))'));
  assert.deepEqual([ratio?.re.n, ratio?.re.d, ratio?.im.n], [5n, 6n, 0n]);
  assert.equal(constantRatio(parseExpression('w^2'), parseExpression('sinh(2*asinh(w))')), null);
  // the bead worksheet's comparison of the written-out slices with the sliced determinant is now proved
  const r = run('param w : positive\nintegral Z6 = exp(-(x1^2 + (x2 - x1)^2 + (x3 - x2)^2 + (x4 - x3)^2 + (x5 - x4)^2 + x5^2) - w^2*(x1^2 + x2^2 + x3^2 + x4^2 + x5^2)/4) d(x1, x2, x3, x4, x5)\nlet R6 = (2*pi)^5/(192*Z6^2)\nsliced S6 = w^2 on interval 3 with 6 slices\ncompare R6 with S6\n');
  const cmp = r.statements.at(-1)!;
  assert.equal(cmp.verdict, 'equal');
  assert.equal(cmp.proof, 'proved');
  assert.ok(cmp.steps.some((s) => s.kind === 'comparison' && s.how === 'exponential-form'));
});

test('square roots reduced by their squares, and proofs that read a let through its exact form', () => {
  // (2*pi)^(5/2)/sqrt(P) squared is (2*pi)^5/P: sqrt(P)^2 = P for the principal root everywhere
  assert.equal(sameFunction(parseExpression('((2*pi)^(5/2)/sqrt(192 + 280*w^2))^2'), parseExpression('(2*pi)^5/(192 + 280*w^2)')), true);
  assert.equal(sameFunction(parseExpression('sqrt(w^2)'), parseExpression('w')), false); // |w| for real w: no property of the root beyond its square
  assert.deepEqual(mpmathAgree([['((2*pi)**(5/2)/(192 + 280*w^2)**(1/2))^2', '(2*pi)^5/(192 + 280*w^2)', ['w']]]), [true]);
  // a let whose displayed form is a sampled simplification: the proof reads the definition with the integral's closed form
  // (Z = sqrt(2*pi/(2 + w^2))*sqrt(pi/(1 + w)), the one-dimensional Gaussian twice: common practice)
  const r = run('param w : positive\nintegral Z = exp(-(2 + w^2)*x^2/2 - (1 + w)*y^2) d(x, y)\nlet R = (2*pi)^2/Z^2\nexpect R = 2*(1 + w)*(2 + w^2)\n');
  const ex = r.statements.at(-1)!;
  assert.equal(ex.status, 'ok');
  assert.equal(ex.proof, 'proved');
});

test('property: identities claimed through exponentials agree in mathjs, and known rewrites are seen', () => {
  // each pair: a value and an equal form of it (double-angle and sinh(asinh(x)) = x: common practice)
  const rewrites: [string, string][] = [
    ['cosh(asinh(x))', 'sqrt(x^2 + 1)'],
    ['sinh(2*asinh(x))', '(2*x*sqrt(x^2 + 1))'],
    ['cosh(2*asinh(x))', '(1 + 2*x^2)'],
    ['sinh(y)', '((exp(y) - exp(-y))/2)'],
    ['exp(3*asinh(x))', '(x + sqrt(x^2 + 1))^3'],
  ];
  const atoms = [...rewrites.map(([a]) => a), 'x', 'y', 'cosh(y)'];
  fc.assert(fc.property(sumsOf(atoms, 3), sumsOf(atoms, 3), (xs, ys) => {
    const a = sumText(xs);
    claimedAgrees(a, sumText(ys));
    // the same sum with every atom rewritten is seen to be the same function, and agrees
    let rewritten = a;
    for (const [from, to] of rewrites) rewritten = rewritten.split(from).join(to);
    assert.equal(sameFunction(parseExpression(a), parseExpression(rewritten)), true, `${a} against ${rewritten}`);
    assert.ok(agreeNumerically(a, rewritten, ['x', 'y']), `mathjs: ${a} against ${rewritten}`);
  }), { numRuns: 60, seed: 20261203 });
});
