/**
 * The pivot rule is a claim, not a given: on random complex symmetric A with
 * Re A > 0, the product of principal roots of the L D L^T pivots must equal the
 * product of principal roots of the eigenvalues; the core's eigenvalues must
 * match mathjs', and the branch must match sqrt(det) continued from the identity.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import * as math from 'mathjs';
import { branchAt } from '../../cas/gaussian/branchAt.js';
import { eigenvalues } from '../../cas/numeric/eigen.js';
import { fromRows } from '../../cas/numeric/cmatrix.js';
import { relErr, sqrtDetAlongPath, withEigenvalues, type CMatrix } from './support/reference.js';

const real = (lo: number, hi: number) => fc.double({ min: lo, max: hi, noNaN: true, noDefaultInfinity: true }).map((x) => x + 0);

function randomPositive(n: number) {
  return fc.record({
    m: fc.array(fc.array(real(-1, 1), { minLength: n, maxLength: n }), { minLength: n, maxLength: n }),
    im: fc.array(fc.array(real(-3, 3), { minLength: n, maxLength: n }), { minLength: n, maxLength: n }),
    delta: real(0.05, 1),
  }).map(({ m, im, delta }): CMatrix => Array.from({ length: n }, (_, r) => Array.from({ length: n }, (_, c) => {
    let re = r === c ? delta : 0;
    for (let k = 0; k < n; k++) re += m[r]![k]! * m[c]![k]!;
    return { re, im: (im[r]![c]! + im[c]![r]!) / 2 };
  })));
}

/** Eigenvalues near the imaginary axis, all on one side: their arguments often sum beyond pi. */
function nearImaginaryAxis() {
  return fc.integer({ min: 3, max: 8 }).chain((n) => fc.record({
    r: fc.array(real(0.3, 3), { minLength: n, maxLength: n }),
    theta: fc.array(real(0.2 * Math.PI, 0.49 * Math.PI), { minLength: n, maxLength: n }),
    sign: fc.constantFrom(1, -1),
    seed: fc.array(fc.array(real(-1, 1), { minLength: n, maxLength: n }), { minLength: n, maxLength: n }),
  })).map(({ r, theta, sign, seed }) => withEigenvalues(
    r.map((m, k) => ({ re: m * Math.cos(theta[k]!), im: sign * m * Math.sin(theta[k]!) })),
    seed.map((row, k) => row.map((x, c) => x + (k === c ? 2 : 0))),
  ));
}

test('pivot route = eigenvalue route = continuation from the identity, 3,000 random matrices n = 1..8', (t) => {
  let wrongPrincipal = 0;
  let runs = 0;
  fc.assert(fc.property(fc.oneof(fc.integer({ min: 1, max: 8 }).chain(randomPositive), nearImaginaryAxis()), (A) => {
    runs++;
    const b = branchAt(fromRows(A));
    assert.notEqual(b.pivotsAgree, false, 'pivot and eigenvalue routes disagree');
    for (const z of b.eigenvalues) assert.ok(z.re > -1e-12, 'eigenvalue in the right half plane');
    if (b.principalSign < 0) wrongPrincipal++;
    if (A.length <= 5 && runs % 10 === 0) {
      const path = sqrtDetAlongPath(A);
      assert.ok(relErr(b.sqrtDet, path) < 1e-8, `continuation disagrees: ${relErr(b.sqrtDet, path)}`);
    }
  }), { numRuns: 3000, seed: 31337 });
  // the test is only meaningful if it met the hard cases
  t.diagnostic(`${wrongPrincipal} of ${runs} cases had the principal sqrt(det A) on the wrong sign`);
  assert.ok(wrongPrincipal > 0, 'no case with the principal root on the wrong sign was generated');
});

test('eigenvalues agree with mathjs eigs on complex symmetric matrices', () => {
  fc.assert(fc.property(fc.integer({ min: 1, max: 6 }).chain(randomPositive), (A) => {
    const ours = eigenvalues(fromRows(A));
    const values = math.eigs(A.map((r) => r.map((z) => math.complex(z.re, z.im))), { eigenvectors: false }).values as unknown;
    const theirs = (Array.isArray(values) ? values : (values as math.Matrix).toArray()) as (math.Complex | number)[];
    const pool = theirs.map((w) => (typeof w === 'number' ? { re: w, im: 0 } : { re: w.re, im: w.im }));
    const scale = Math.max(...pool.map((w) => Math.hypot(w.re, w.im)), 1);
    for (const z of ours) {
      let best = -1; let dist = Infinity;
      pool.forEach((w, k) => { const d = Math.hypot(z.re - w.re, z.im - w.im); if (d < dist) { dist = d; best = k; } });
      assert.ok(dist < 1e-8 * scale, `eigenvalue ${JSON.stringify(z)} not found (distance ${dist})`);
      pool.splice(best, 1);
    }
  }), { numRuns: 200, seed: 5 });
});

test('eigenvalues of Q diag(lambda) Q^T are lambda (known by construction)', () => {
  const lambda = [{ re: 0.3, im: 1.9 }, { re: 0.5, im: -2.4 }, { re: 2, im: 0.1 }, { re: 0.2, im: 1.1 }];
  const A = withEigenvalues(lambda, [[1, 0.2, 0.1, 0], [0.3, 1, 0, 0.5], [0, 0.4, 1, 0.2], [0.6, 0, 0.1, 1]]);
  const ev = eigenvalues(fromRows(A));
  for (const l of lambda) assert.ok(ev.some((z) => Math.hypot(z.re - l.re, z.im - l.im) < 1e-10));
});
