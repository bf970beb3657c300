// The exact identity check behind `expect ... holds, proved` for expressions with exp, sinh,
// cosh, sin and cos (cas/verdicts/identity.ts). Every "same function" it claims is checked
// independently with mathjs at random complex points; the pairs it must not claim are
// identities it cannot see (sinh(2x) = 2 sinh x cosh x, a fact of the trade) or not identities.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import * as math from 'mathjs';
import fc from 'fast-check';
import { parseExpression } from '../../cas/lang/parse.js';
import { sameFunction } from '../../cas/verdicts/identity.js';
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

test('property: a claimed identity always agrees in mathjs', () => {
  const atoms = ['x', 'y', 'sinh(x)', 'cosh(y)', 'exp(x*y)', 'sin(x + y)', 'pi'];
  const term = fc.tuple(fc.constantFrom(...atoms), fc.constantFrom(...atoms), fc.integer({ min: -3, max: 3 }));
  fc.assert(fc.property(fc.array(term, { minLength: 1, maxLength: 4 }), fc.array(term, { minLength: 1, maxLength: 4 }), (xs, ys) => {
    const text = (ts: [string, string, number][]) => ts.map(([p, q, c]) => `(${c})*${p}*${q}`).join(' + ');
    const a = text(xs);
    const b = text(ys);
    if (sameFunction(parseExpression(a), parseExpression(b))) assert.ok(agreeNumerically(a, b, ['x', 'y']), `${a} against ${b}`);
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
