/**
 * Property tests: the product's closed-form values against routes that share
 * nothing with its branch rule — mpmath quadrature in a separate python3
 * process (n <= 2), and sqrt(det) continued along the straight path from the
 * identity with determinants from mathjs (every n up to 5).
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import * as math from 'mathjs';
import { statement } from './support/run.js';
import { gaussianLine, gaussianReference, relErr, sqrtDetAlongPath, withEigenvalues, type CMatrix, type Cx } from './support/reference.js';
import { mpmathGaussians } from './support/mpmath.js';

/** Doubles rounded to 12 decimals, so worksheets never see subnormal numbers. */
const real = (lo: number, hi: number) => fc.double({ min: lo, max: hi, noNaN: true, noDefaultInfinity: true }).map((x) => Number(x.toFixed(12)) + 0);
const cplx = (r: number) => fc.record({ re: real(-r, r), im: real(-r, r) });

/** Complex symmetric A with Re A = M M^T + delta I (positive definite) and a symmetric imaginary part. */
function positiveRealPart(n: number, imScale = 2) {
  return fc.record({
    m: fc.array(fc.array(real(-1, 1), { minLength: n, maxLength: n }), { minLength: n, maxLength: n }),
    im: fc.array(fc.array(real(-imScale, imScale), { minLength: n, maxLength: n }), { minLength: n, maxLength: n }),
    delta: real(0.2, 1.5),
    j: fc.array(cplx(1), { minLength: n, maxLength: n }),
  }).map(({ m, im, delta, j }) => {
    const A: CMatrix = Array.from({ length: n }, (_, r) => Array.from({ length: n }, (_, c) => {
      let re = r === c ? delta : 0;
      for (let k = 0; k < n; k++) re += m[r]![k]! * m[c]![k]!;
      return { re, im: (im[r]![c]! + im[c]![r]!) / 2 };
    }));
    return { A, J: j };
  });
}

function realEigenvalues(a: CMatrix): number[] {
  const { values } = math.eigs(a.map((r) => r.map((z) => z.re))) as unknown as { values: number[] };
  return Array.from(values as ArrayLike<number>).map(Number);
}

for (let n = 1; n <= 5; n++) {
  test(`n = ${n}: value agrees with sqrt(det) continued from the identity (mathjs determinants, phase unwrapped)`, () => {
    fc.assert(fc.property(positiveRealPart(n), ({ A, J }) => {
      const s = statement(gaussianLine('Z', A, J), 'Z');
      assert.equal(s.status, 'ok', JSON.stringify(s.error));
      assert.equal(s.convergence, 'absolute');
      const expected = gaussianReference(A, J, sqrtDetAlongPath(A));
      const e = relErr(s.result!.value!, expected);
      assert.ok(e < 1e-10, `relative error ${e}`);
    }), { numRuns: n <= 3 ? 40 : 25, seed: 4242 + n });
  });
}

test('n = 30 (above the size where Re A > 0 is decided by Cholesky and the branch by pivots alone): value agrees with sqrt(det) continued from the identity (mathjs determinants)', () => {
  fc.assert(fc.property(positiveRealPart(30, 3), ({ A, J }) => {
    const s = statement(gaussianLine('Z', A, J), 'Z');
    assert.equal(s.status, 'ok', JSON.stringify(s.error));
    assert.equal(s.convergence, 'absolute');
    const conv = s.steps.find((x) => x.kind === 'convergence');
    assert.ok(conv?.kind === 'convergence' && conv.reason === 'cholesky');
    const expected = gaussianReference(A, J, sqrtDetAlongPath(A));
    const e = relErr(s.result!.value!, expected);
    assert.ok(e < 1e-9, `relative error ${e}`);
  }), { numRuns: 3, seed: 3030 });
});

test('n = 30 with a large imaginary diagonal, so that the pivots\' arguments sum past pi: the principal root is wrong for some and the value still agrees with mathjs', () => {
  const signs: boolean[] = [];
  fc.assert(fc.property(positiveRealPart(30, 0.5), real(2, 12), ({ A, J }, s) => {
    const shifted = A.map((row, i) => row.map((z, j) => (i === j ? { re: z.re, im: z.im + s } : z)));
    const st = statement(gaussianLine('Z', shifted, J), 'Z');
    assert.equal(st.status, 'ok', JSON.stringify(st.error));
    signs.push(st.branch!.principalSqrtDetCorrect);
    const e = relErr(st.result!.value!, gaussianReference(shifted, J, sqrtDetAlongPath(shifted)));
    assert.ok(e < 1e-9, `relative error ${e}`);
  }), { numRuns: 6, seed: 3131 });
  assert.ok(signs.includes(false) && signs.includes(true), `both sheets met: ${signs}`);
});

test('n <= 2: value agrees with mpmath quadrature (separate python3 process)', () => {
  const cases: { A: CMatrix; J: Cx[] }[] = [
    ...fc.sample(positiveRealPart(1, 1.5), { numRuns: 8, seed: 11 }),
    ...fc.sample(positiveRealPart(2, 1), { numRuns: 5, seed: 12 }),
  ];
  const withBounds = cases.map((c) => {
    const lmin = Math.min(...realEigenvalues(c.A));
    const inv = math.inv(c.A.map((r) => r.map((z) => math.complex(z.re, z.im)))) as unknown as math.Complex[][];
    const shift = Math.max(...inv.map((row) => Math.abs(row.reduce((t, z, k) => t + (math.multiply(z, math.complex(c.J[k]!.re, c.J[k]!.im)) as math.Complex).re, 0))));
    return { ...c, lmin, shift };
  });
  const quad = mpmathGaussians(withBounds);
  cases.forEach((c, k) => {
    const s = statement(gaussianLine('Z', c.A, c.J), 'Z');
    const e = relErr(s.result!.value!, quad[k]!);
    assert.ok(e < 1e-10, `case ${k} (n = ${c.A.length}): relative error ${e}`);
  });
});

test('Re A with a negative eigenvalue is classified divergent, with a growth direction', () => {
  fc.assert(fc.property(fc.integer({ min: 1, max: 5 }).chain((n) => fc.record({
    base: positiveRealPart(n),
    shift: real(0.3, 3),
  })), ({ base, shift }) => {
    // Re A - (lambda_min + shift) I has the negative eigenvalue -shift.
    const lmin = Math.min(...realEigenvalues(base.A));
    const A = base.A.map((row, r) => row.map((z, c) => (r === c ? { re: z.re - lmin - shift, im: z.im } : z)));
    const s = statement(gaussianLine('D', A, base.J), 'D');
    assert.equal(s.status, 'ok');
    assert.equal(s.convergence, 'divergent');
    assert.equal(s.result, null);
    const step = s.steps.find((st) => st.kind === 'convergence');
    const v = step?.direction;
    assert.ok(v && v.length === A.length);
    // the integrand grows along v: v^T Re A v < 0
    let q = 0;
    for (let r = 0; r < A.length; r++) for (let c = 0; c < A.length; c++) q += v[r]! * A[r]![c]!.re * v[c]!;
    assert.ok(q < 0, `v^T Re A v = ${q}`);
  }), { numRuns: 40, seed: 77 });
});

test('n >= 3, principal sqrt(det A) made wrong on purpose: the result still follows the continuous branch', () => {
  fc.assert(fc.property(fc.integer({ min: 3, max: 5 }).chain((n) => fc.record({
    n: fc.constant(n),
    r: fc.array(real(0.5, 2), { minLength: n, maxLength: n }),
    // arguments near +pi/2 (all of one sign) so that their sum exceeds pi
    theta: fc.array(real(0.36 * Math.PI, 0.47 * Math.PI), { minLength: n, maxLength: n }),
    sign: fc.constantFrom(1, -1),
    seed: fc.array(fc.array(real(-1, 1), { minLength: n, maxLength: n }), { minLength: n, maxLength: n }),
    j: fc.array(cplx(0.5), { minLength: n, maxLength: n }),
  })), ({ n, r, theta, sign, seed, j }) => {
    const lambda = r.map((m, k) => ({ re: m * Math.cos(theta[k]!), im: sign * m * Math.sin(theta[k]!) }));
    const argSum = theta.reduce((t, x) => t + x, 0);
    fc.pre(argSum > Math.PI * 1.02 && argSum < Math.PI * 2.98 && Math.abs(argSum - 2 * Math.PI) > 0.05 * Math.PI);
    const A = withEigenvalues(lambda, seed.map((row, k) => row.map((x, c) => x + (k === c ? 2 : 0))));
    const s = statement(gaussianLine('Z', A, j), 'Z');
    assert.equal(s.convergence, 'absolute');
    const path = sqrtDetAlongPath(A);
    const expected = gaussianReference(A, j, path);
    assert.ok(relErr(s.result!.value!, expected) < 1e-10, `n=${n}: ${relErr(s.result!.value!, expected)}`);
    // the principal root of the mathjs determinant: wrong exactly when the argument sum leaves (-pi, pi]
    const det = math.det(A.map((row) => row.map((z) => math.complex(z.re, z.im)))) as unknown as math.Complex;
    const principal = math.sqrt(det) as math.Complex;
    const principalRight = principal.re * path.re + principal.im * path.im > 0;
    assert.equal(s.branch?.principalSqrtDetCorrect, principalRight);
    if (argSum < 2 * Math.PI) assert.equal(principalRight, false);
  }), { numRuns: 40, seed: 99 });
});
