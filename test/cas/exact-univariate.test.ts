/** Real roots of one-variable polynomials over Q: against sympy's real_roots / count_roots in a separate process, and properties. */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import {
  type UPoly, upolyFromCoeffs, umul, uderiv, ugcd, usqfree, udivExact, usign, countRoots, isolateRoots, refineRoot,
  rootToNumber, signAtRoot, recognizeRoot, compareRoots, isExact, uevalQ,
} from '../../cas/exact/univariate.js';
import { signsOnIntervals } from '../../cas/exact/signs.js';
import { q, qcmp, qsub, qToString } from '../../cas/exact/q.js';
import { sympyRealRoots, sympyCountRoots, sympySignsAtRoots } from './support/sympy.js';

const P = (...cs: number[]) => upolyFromCoeffs(cs);
const pow = (p: UPoly, e: number) => { let r: UPoly = [1n]; for (let i = 0; i < e; i++) r = umul(r, p); return r; };

function rng(seed: number) {
  let s = seed >>> 0;
  return (n: number) => { s = (Math.imul(s, 1664525) + 1013904223) >>> 0; return s % n; };
}
/** Products of (x - r)^m (integer and half-integer r, 0 included), x^2 - c, and a random factor. */
function randomPoly(r: (n: number) => number): UPoly {
  let p: UPoly = [BigInt(1 + r(3))];
  const factors = 1 + r(4);
  for (let f = 0; f < factors; f++) {
    const kind = r(4);
    const m = 1 + r(3);
    if (kind === 0) p = umul(p, pow(P(-(r(11) - 5), 1), m));
    else if (kind === 1) p = umul(p, pow(P(-(r(7) - 3), 2), m));
    else if (kind === 2) p = umul(p, pow(P(-(1 + r(12)), 0, 1), m));
    else p = umul(p, P(r(9) - 4, r(9) - 4, r(5) - 2, 1 + r(3)));
  }
  if (r(3) === 0) p = umul(p, pow(P(0, 1), 1 + r(3))); // roots at 0
  return p;
}

test('Im det of (30 + i t) I_3: the roots of 2700 t - t^3 are 0 and -+30*sqrt(3)', () => {
  const p = P(0, 2700, 0, -1);
  const names = isolateRoots(p).map((x) => recognizeRoot(x));
  assert.deepEqual(names.map((n) => n.text), ['-30*sqrt(3)', '0', '30*sqrt(3)']);
  assert.deepEqual(names[2], { kind: 'quadratic', a: q(0n), b: q(30n), c: 3n, decimal: names[2]!.decimal, text: '30*sqrt(3)' });
});

test('root names: rational, quadratic, algebraic', () => {
  const name = (p: UPoly, i: number) => recognizeRoot(isolateRoots(p)[i]!).text;
  assert.equal(name(P(-3, 0, 1), 1), 'sqrt(3)');
  assert.equal(name(P(-1, 1, 1), 1), '-1/2 + sqrt(5)/2');
  assert.equal(name(P(-1, 1, 1), 0), '-1/2 - sqrt(5)/2');
  assert.equal(name(P(-5, -2, 0, 1), 0), 'the root of t^3 - 2*t - 5 near 2.0946');
  assert.equal(name(umul(P(-5, -2, 0, 1), P(-1, 2)), 1), 'the root of t^3 - 2*t - 5 near 2.0946', 'the rational root is divided out');
  assert.equal(name(umul(P(-2, 3), P(-7, 0, 0, 1)), 0), '2/3');
  assert.equal(name(umul(P(1, 0, -12), pow(P(-5, -2, 0, 1), 2)), 1), 'sqrt(3)/6');
  assert.equal(name(P(-11, 4, 1), 1), '-2 + sqrt(15)');
});

test('distinct real roots against sympy real_roots in a separate process (values to 1e-12)', () => {
  const r = rng(17);
  const ps = Array.from({ length: 40 }, () => randomPoly(r));
  const ref = sympyRealRoots(ps);
  ps.forEach((p, j) => {
    const mine = isolateRoots(p);
    assert.equal(mine.length, ref[j]!.length, `poly ${j}: ${p}`);
    mine.forEach((x, i) => {
      const v = rootToNumber(x), w = ref[j]![i]!;
      assert.ok(Math.abs(v - w) <= 1e-12 * Math.max(1, Math.abs(w)), `poly ${j} root ${i}: ${v} vs ${w}`);
      const name = recognizeRoot(x);
      assert.ok(Math.abs(name.decimal - w) <= 1e-12 * Math.max(1, Math.abs(w)));
    });
    for (let i = 1; i < mine.length; i++) assert.equal(compareRoots(mine[i - 1]!, mine[i]!), -1);
  });
});

test('root counts on intervals against sympy count_roots in a separate process', () => {
  const r = rng(23);
  const cases = Array.from({ length: 40 }, () => {
    const a = q(BigInt(r(13) - 8), BigInt(1 + r(2))), b = q(BigInt(r(13) - 2), BigInt(1 + r(2)));
    return { p: randomPoly(r), a: qcmp(a, b) < 0 ? a : b, b: qcmp(a, b) < 0 ? b : a };
  });
  const ref = sympyCountRoots(cases.map((c) => ({ p: c.p, a: qToString(c.a), b: qToString(c.b) })));
  cases.forEach((c, j) => {
    // sympy counts the closed [a, b]; countRoots the half-open (a, b]
    const mine = qcmp(c.a, c.b) === 0 ? (usign(c.p, c.a) === 0 ? 1 : 0) : countRoots(c.p, c.a, c.b) + (usign(c.p, c.a) === 0 ? 1 : 0);
    assert.equal(mine, ref[j], `case ${j}`);
    const open = isolateRoots(c.p, c.a, c.b).length;
    assert.equal(open, ref[j]! - (usign(c.p, c.a) === 0 ? 1 : 0) - (usign(c.p, c.b) === 0 && qcmp(c.a, c.b) < 0 ? 1 : 0), `open interval, case ${j}`);
  });
});

test('sign of q at the roots of p against sympy (roots evaluated to 60 digits) in a separate process', () => {
  const r = rng(29);
  const cases = Array.from({ length: 30 }, () => {
    const common = randomPoly(r);
    return { p: umul(randomPoly(r), r(2) ? common : [1n]), q: umul(randomPoly(r), common) };
  });
  const ref = sympySignsAtRoots(cases);
  cases.forEach((c, j) => {
    const mine = isolateRoots(c.p).map((x) => signAtRoot(c.q, x));
    assert.deepEqual(mine, ref[j], `case ${j}`);
  });
});

test('sign table of several polynomials: roots merged, samples inside, signs exact', () => {
  const t = signsOnIntervals([P(-100, 0, 1), P(0, 1), P(-10, 1), P(5)], -Infinity, Infinity);
  assert.equal(t.roots.length, 3);
  assert.deepEqual(t.roots.map((x) => recognizeRoot(x.root).text), ['-10', '0', '10']);
  assert.deepEqual(t.roots.map((x) => x.of), [[0], [1], [0, 2]]);
  assert.deepEqual(t.roots[2]!.signs, [0, 1, 0, 1]);
  assert.deepEqual(t.intervals.map((i) => i.signs), [[1, -1, -1, 1], [-1, -1, -1, 1], [-1, 1, -1, 1], [1, 1, 1, 1]]);
  const u = signsOnIntervals([P(0, 2700, 0, -1)], 0, Infinity);
  assert.equal(u.roots.length, 1);
  assert.deepEqual(u.intervals.map((i) => i.signs), [[1], [-1]]);
  const z = signsOnIntervals([[], P(3)], 0, 1);
  assert.deepEqual(z, { roots: [], intervals: [{ lo: 0, hi: 1, sample: q(1n, 2n), signs: [0, 1] }] });
});

// ---- properties (fast-check) --------------------------------------------------------

const arbP = fc.array(fc.integer({ min: -6, max: 6 }), { minLength: 1, maxLength: 6 }).map((cs) => upolyFromCoeffs(cs));
const arbRooty = fc.array(fc.tuple(fc.integer({ min: -4, max: 4 }), fc.integer({ min: 1, max: 3 }), fc.integer({ min: 1, max: 3 })), { minLength: 1, maxLength: 3 })
  .map((fs) => fs.reduce<UPoly>((p, [a, b, m]) => umul(p, pow(P(a, b), m)), [1n]));

test('gcd, square-free part, isolation and refinement (fast-check properties)', () => {
  fc.assert(fc.property(arbP, arbP, arbRooty, (a, b, c) => {
    const A = umul(a, c), B = umul(b, c);
    if (!A.length || !B.length) return;
    const g = ugcd(A, B);
    assert.ok(udivExact(A, g) && udivExact(B, g));
    assert.ok(udivExact(g, ugcd(c, c)));
    const s = usqfree(umul(A, A));
    assert.equal(ugcd(s, uderiv(s)).length, 1, 'square-free');
    const roots = isolateRoots(A);
    assert.equal(roots.length, countRoots(A));
    for (const x of roots) {
      if (isExact(x)) { assert.equal(uevalQ(A, x.lo).n, 0n); continue; }
      assert.equal(countRoots(A, x.lo, x.hi), 1);
      const y = refineRoot(x, q(1n, 1000n));
      assert.ok(isExact(y) || qcmp(qsub(y.hi, y.lo), q(1n, 1000n)) <= 0);
      assert.equal(signAtRoot(A, y), 0);
    }
    const tab = signsOnIntervals([A, B], -3, 3);
    for (const iv of tab.intervals) {
      assert.deepEqual(iv.signs, [usign(A, iv.sample), usign(B, iv.sample)]);
      assert.ok(iv.signs.every((x) => x !== 0) || !A.length || !B.length);
    }
  }), { numRuns: 150 });
});
