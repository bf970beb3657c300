// Square roots reduced by their squares in exact arithmetic (cas/expr/rootsReduced.ts), the
// display form of `let` and `continue` and the exact form of rotated integrals. Every form it
// gives is checked against the input with mathjs at random complex points (an independent
// evaluation); the specific values are common practice: (2*pi)^n/Z^2 = det A for
// Z = (2*pi)^(n/2)/sqrt(det A), exp(i*pi/4)^2 = i, exp(i*pi/6)^6 = -1.
import { test } from 'node:test';
import assert from 'node:assert/strict';
import * as math from 'mathjs';
import fc from 'fast-check';
import { parseExpression } from '../../cas/lang/parse.js';
import { formulaOf } from '../../cas/expr/print.js';
import { rationalWithRootsReduced, rootsReduced } from '../../cas/expr/rootsReduced.js';
import { rfToString } from '../../cas/exact/ratfunc.js';
import { evaluateWorksheet } from '../../cas/worksheet.js';

function agreeInMathjs(a: string, b: string, names: string[]): boolean {
  for (let k = 0; k < 16; k++) {
    const at: Record<string, math.Complex> = {};
    for (const n of names) at[n] = math.complex(0.3 + Math.abs(Math.sin(5 * k + n.length)) * 2, Math.cos(3 * k + 1) * 1.5);
    const va = math.complex(math.evaluate(a, { ...at }) as never);
    const vb = math.complex(math.evaluate(b, { ...at }) as never);
    if (!(Number(math.abs(math.subtract(va, vb) as never)) <= 1e-9 * Math.max(1, Number(math.abs(va))))) return false;
  }
  return true;
}
const shown = (text: string) => { const e = rootsReduced(parseExpression(text)); return e ? formulaOf(e).text : null; };

test('a Gaussian result squared gives back its determinant, exactly', () => {
  const z = '(2*pi)^(5/2)/sqrt(192 + 280*w^2 + 112*w^4 + 18*w^6 + 5*w^8/4 + w^10/32)';
  const out = shown(`(2*pi)^5/(192*(${z})^2)`);
  assert.equal(out, '(6144 + 8960*w^2 + 3584*w^4 + 576*w^6 + 40*w^8 + w^10)/6144');
  assert.ok(agreeInMathjs(`(2*pi)^5/(192*(${z})^2)`, out!, ['w']));
  assert.equal(shown('(2*pi)^3/(8*((2*pi)^(3/2)/sqrt(k^2 + g^2))^2)'), '(g^2 + k^2)/8');
});

test('function values and other powers are kept as written, and a root that does not cancel stays', () => {
  assert.equal(shown('(2*sinh(L*w)/w)/(2*L)'), 'sinh(L*w)/(L*w)');
  assert.equal(shown('sqrt(k)*sqrt(k)*x^(1/3)'), 'k*x^(1/3)');
  assert.equal(shown('1/(1 + sqrt(2))'), '1/(1 + sqrt(2))');
  // a display keeps a root of unity as written
  assert.equal(shown('sqrt(2*pi/w)*exp(i*pi/4)'), 'sqrt(2*pi/w)*exp(i*pi/4)');
});

test('exact rational forms: roots of unity of order 8 and 12 with their roots cancelled, or null', () => {
  const rational = (text: string) => { const r = rationalWithRootsReduced(parseExpression(text)); return r ? rfToString(r) : null; };
  assert.equal(rational('-i*w*exp(i*pi/4)^2'), 'w');
  assert.equal(rational('exp(i*pi/6)^6'), '-1');
  assert.equal(rational('exp(i*pi/3)*exp(-i*pi/3)'), '1');
  assert.equal(rational('exp(-i*pi/2)*k'), '-i*k');
  assert.equal(rational('exp(i*pi/4)*w'), null); // (1 + i)/sqrt(2) is not rational
  assert.equal(rational('sinh(w)^2'), null);
  assert.equal(rational('sqrt(sqrt(w))^4'), null); // a root inside a root is out of reach
});

test('property: every reduced form agrees with its input in mathjs', () => {
  const atoms = ['k', 'g', 'sqrt(k)', 'sqrt(k^2 + g^2)', '(2*pi)^(3/2)', 'sqrt(2*pi/k)', 'exp(g/k)', 'k^(1/3)', 'sqrt(3)'];
  const factor = fc.tuple(fc.constantFrom(...atoms), fc.integer({ min: -3, max: 3 }));
  const term = fc.tuple(fc.array(factor, { minLength: 1, maxLength: 3 }), fc.integer({ min: -4, max: 4 }));
  fc.assert(fc.property(fc.array(term, { minLength: 1, maxLength: 3 }), fc.array(term, { minLength: 1, maxLength: 2 }), (top, bottom) => {
    const sum = (ts: [[string, number][], number][]) => ts.map(([fs, c]) => `(${c})*${fs.map(([a, p]) => `(${a})^(${p})`).join('*')}`).join(' + ');
    const text = `(${sum(top)})/(1 + ${sum(bottom).replace(/^\(/, '(')})`;
    const out = shown(text);
    if (out !== null) assert.ok(agreeInMathjs(text, out, ['k', 'g']), `${text} -> ${out}`);
  }), { numRuns: 150, seed: 20261203 });
});

test('rotating exp(i*w*x^2/2) by pi/4 is decided on the whole domain: A = w, and F/FE = 1 proved', () => {
  const report = evaluateWorksheet('param w : positive\nintegral F = exp(i*w*x^2/2) d(x)\nrotate F : x -> exp(i*pi/4)*x as FE\ncompare F with FE\n');
  const fe = report.statements.find((s) => s.kind === 'rotate')!;
  assert.equal(fe.status, 'ok');
  assert.equal(fe.proof, 'proved');
  assert.equal(fe.convergence, 'absolute');
  const form = fe.steps.find((s) => s.kind === 'quadratic-form') as { A: { text: string }[][] } | undefined;
  assert.equal(form?.A[0]![0]!.text, 'w');
  // the Fresnel integral: sqrt(2*pi/w)*exp(i*pi/4) (common practice), as mathjs evaluates the printed result at w = 3
  const value = math.complex(math.evaluate(fe.result!.text.replace(/^FE = /, ''), { w: 3 }) as never);
  const fresnel = math.multiply(Math.sqrt((2 * Math.PI) / 3), math.exp(math.complex(0, Math.PI / 4))) as math.Complex;
  assert.ok(Number(math.abs(math.subtract(value, fresnel) as never)) < 1e-12);
  const cmp = report.statements.find((s) => s.kind === 'compare')!;
  assert.equal(cmp.proof, 'proved');
  // only square roots were reduced (no hyperbolic rewrite), and the record says so
  assert.ok(cmp.steps.some((s) => s.kind === 'comparison' && s.how === 'roots'));
});
