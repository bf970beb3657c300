// Constants read off numerically are written in closed form only when the closed form
// is right: every form the recognizer returns is evaluated back by mathjs (an independent
// evaluator) and compared with the input; numbers outside the family are left alone.
import assert from 'node:assert/strict';
import { test } from 'node:test';
import fc from 'fast-check';
import { evaluate } from 'mathjs';
import { recognizeConstant } from '../../cas/expr/recognize.js';
import { toText } from '../../cas/expr/print.js';

test('q * 2^(s/2) * pi^(m/2), real or imaginary: recognised, and mathjs gives back the same number (500 generated cases)', () => {
  fc.assert(
    fc.property(
      fc.integer({ min: -60, max: 60 }).filter((p) => p !== 0),
      fc.integer({ min: 1, max: 12 }),
      fc.integer({ min: 0, max: 1 }),
      fc.integer({ min: 0, max: 4 }),
      fc.boolean(),
      (p, q, s, m, imaginary) => {
        const x = (p / q) * Math.SQRT2 ** s * Math.PI ** (m / 2);
        const e = recognizeConstant(imaginary ? { re: 0, im: x } : { re: x, im: 0 });
        assert.ok(e, `recognised ${x}`);
        const back = evaluate(toText(e).replace(/\bi\b/g, 'i')) as number | { re: number; im: number };
        const z = typeof back === 'number' ? { re: back, im: 0 } : back;
        const want = imaginary ? { re: 0, im: x } : { re: x, im: 0 };
        assert.ok(Math.hypot(z.re - want.re, z.im - want.im) <= 1e-12 * Math.abs(x), `${toText(e)} = ${JSON.stringify(z)}, wanted ${x}`);
      },
    ),
    { numRuns: 500 },
  );
});

test('numbers outside the family are not given a closed form', () => {
  for (const x of [Math.E, Math.log(2), Math.sqrt(3), 0.123456789, 1e-20]) assert.equal(recognizeConstant({ re: x, im: 0 }), null, String(x));
  assert.equal(recognizeConstant({ re: 1, im: 1 }), null, 'a general complex number');
  assert.equal(recognizeConstant({ re: NaN, im: 0 }), null);
});
