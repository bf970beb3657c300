/** Exact polynomials over Q(i), rational functions and Bareiss minors: against sympy in a separate process, and properties. */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import fc from 'fast-check';
import {
  type Poly, ZERO, ONE, polyVar, polyConst, polyAdd, polySub, polyMul, polyPow, polyScale, polyEquals, polyToString,
  isZero, isConstant, divideExact, gcd, squareFree, derivative, substitute, evalExact, evalComplex, imagPart, realPart,
  degree, totalDegree, variables, coefficients, fromCoefficients, content, primitivePart,
} from '../../cas/exact/poly.js';
import { type GQ, q, gq, gint, GI, G0, G1, gadd, gsub, gmul, gdiv, gpow, geq, gIsZero, qFromString, gqToString, qToString } from '../../cas/exact/q.js';
import { det, leadingMinors, leadingMinorsRat, detRat } from '../../cas/exact/matrix.js';
import { fromExpr, rfEvalExact, ratfunc, rfAdd, rfMul, rfDiv, rfPow, rfEquals, rfVar, rfConst, rfSub } from '../../cas/exact/ratfunc.js';
import { upolyFromPoly, isolateRoots, recognizeRoot } from '../../cas/exact/univariate.js';
import type { Expr } from '../../cas/lang/ast.js';
import { sympyMinors, sympyGcd, sympySqf } from './support/sympy.js';

const k = polyVar('k'), t = polyVar('t'), g = polyVar('g');
const c = (re: number, im = 0) => polyConst(gint(re, im));

/** A small seeded generator, so the sympy batches are reproducible. */
function rng(seed: number) {
  let s = seed >>> 0;
  return (n: number) => { s = (Math.imul(s, 1664525) + 1013904223) >>> 0; return s % n; };
}
function randCoeff(r: (n: number) => number): GQ {
  const d = BigInt(1 + r(3));
  return gq(q(BigInt(r(9) - 4), d), r(2) ? q(BigInt(r(7) - 3), BigInt(1 + r(2))) : q(0n));
}
function randPoly(r: (n: number) => number, vars: string[], maxDeg: number, terms: number): Poly {
  let p = ZERO;
  for (let j = 0; j < terms; j++) {
    let m = polyConst(randCoeff(r));
    for (const v of vars) m = polyMul(m, polyPow(polyVar(v), r(maxDeg + 1)));
    p = polyAdd(p, m);
  }
  return p;
}
/** a and b agree up to a nonzero constant factor. */
function sameUpToUnit(a: Poly, b: Poly): boolean {
  if (isZero(a) || isZero(b)) return isZero(a) && isZero(b);
  const r = divideExact(a, b);
  return r !== null && isConstant(r);
}

test('q: decimals and text', () => {
  assert.deepEqual(qFromString('0.0005'), q(1n, 2000n));
  assert.deepEqual(qFromString('-12.50'), q(-25n, 2n));
  assert.deepEqual(qFromString('1e-3'), q(1n, 1000n));
  assert.equal(qToString(q(3n, 4n)), '3/4');
  assert.equal(qToString(q(-2n)), '-2');
  assert.equal(gqToString(gq(q(1n, 2n), q(3n, 4n))), '1/2 + 3/4*i');
  assert.equal(gqToString(gq(q(1n), q(-1n))), '1 - i');
  assert.ok(geq(gmul(GI, GI), gint(-1)));
  assert.ok(geq(gdiv(gint(1, 2), gint(3, -1)), gq(q(1n, 10n), q(7n, 10n))));
});

test('det of (30 + i t) I_3 is (30 + i t)^3; Im det = 2700 t - t^3 has the root 30*sqrt(3)', () => {
  const d = polyAdd(c(30), polyScale(t, GI));
  const M = [[d, ZERO, ZERO], [ZERO, d, ZERO], [ZERO, ZERO, d]];
  const D = det(M);
  assert.ok(polyEquals(D, polyPow(d, 3)));
  assert.ok(polyEquals(leadingMinors(M)[2]!, D));
  const im = imagPart(D);
  assert.ok(polyEquals(im, polySub(polyScale(t, 2700), polyPow(t, 3))), polyToString(im));
  assert.ok(polyEquals(realPart(D), polySub(c(27000), polyScale(polyPow(t, 2), 90))));
  const roots = isolateRoots(upolyFromPoly(im)!, 0, Infinity);
  assert.equal(roots.length, 1);
  const name = recognizeRoot(roots[0]!);
  assert.equal(name.kind, 'quadratic');
  if (name.kind !== 'quadratic') return;
  assert.deepEqual([name.a, name.b, name.c], [q(0n), q(30n), 3n]);
  assert.equal(name.text, '30*sqrt(3)');
  assert.ok(Math.abs(name.decimal - 30 * Math.sqrt(3)) < 1e-12);
});

test('[[1, g], [g, 100]]: minors 1 and 100 - g^2 with roots -10 and 10', () => {
  const [m1, m2] = leadingMinors([[ONE, g], [g, c(100)]]);
  assert.ok(polyEquals(m1!, ONE));
  assert.ok(polyEquals(m2!, polySub(c(100), polyMul(g, g))));
  const names = isolateRoots(upolyFromPoly(m2!)!).map((r) => recognizeRoot(r));
  assert.deepEqual(names.map((n) => n.text), ['-10', '10']);
  assert.ok(names.every((n) => n.kind === 'rational'));
});

test('square-free factorisation of (k + i t)^4 expanded is (k + i t) with multiplicity 4', () => {
  const p = polyPow(polyAdd(k, polyScale(t, GI)), 4);
  const sf = squareFree(p);
  assert.equal(sf.factors.length, 1);
  assert.equal(sf.factors[0]!.k, 4);
  assert.ok(sameUpToUnit(sf.factors[0]!.f, polyAdd(k, polyScale(t, GI))));
  assert.ok(polyEquals(polyScale(polyPow(sf.factors[0]!.f, 4), sf.unit), p));
});

test('inspection: degrees, variables, coefficients, content', () => {
  const p = polyAdd(polyMul(polyPow(k, 2), polyAdd(t, c(1))), polyScale(polyMul(k, t), gint(0, 3)));
  assert.equal(degree(p, 'k'), 2);
  assert.equal(degree(p, 't'), 1);
  assert.equal(totalDegree(p), 3);
  assert.deepEqual(variables(p), ['k', 't']);
  assert.ok(polyEquals(fromCoefficients(coefficients(p, 'k'), 'k'), p));
  const q2 = polyMul(polyAdd(t, c(2)), polyAdd(k, t));
  assert.ok(sameUpToUnit(content(q2, 'k'), polyAdd(t, c(2))));
  assert.ok(sameUpToUnit(primitivePart(q2, 'k'), polyAdd(k, t)));
  assert.equal(divideExact(p, polyAdd(k, c(7))), null);
});

test('leading minors and determinants against sympy Matrix.det(berkowitz) in a separate process', () => {
  const r = rng(7);
  const cases: { vars: string[]; M: Poly[][] }[] = [];
  for (let j = 0; j < 24; j++) {
    const n = 2 + (j % 3);
    const vars = j % 2 ? ['k', 't'] : ['t'];
    const M = Array.from({ length: n }, () => Array.from({ length: n }, () => (r(4) === 0 ? ZERO : randPoly(r, vars, 1, 1 + r(2)))));
    if (j % 6 === 5) { M[0]![0] = ZERO; M[1]![1] = ZERO; } // identically zero M_1: the pivoting route
    cases.push({ vars, M });
  }
  const ref = sympyMinors(cases);
  cases.forEach((cs, j) => {
    const mine = leadingMinors(cs.M);
    assert.equal(mine.length, ref[j]!.length);
    mine.forEach((m, i) => assert.ok(polyEquals(m, ref[j]![i]!), `case ${j} minor ${i + 1}: ${polyToString(m)} vs ${polyToString(ref[j]![i]!)}`));
    assert.ok(polyEquals(det(cs.M), ref[j]![cs.M.length - 1]!));
  });
});

test('gcd against sympy Poly.gcd over QQ_I in a separate process', () => {
  const r = rng(11);
  const cases: { vars: string[]; a: Poly; b: Poly }[] = [];
  for (let j = 0; j < 20; j++) {
    const vars = j % 3 === 0 ? ['t'] : j % 3 === 1 ? ['k', 't'] : ['a', 'k', 't'];
    const f = randPoly(r, vars, 2, 2), a = randPoly(r, vars, 1, 2), b = randPoly(r, vars, 1, 2);
    cases.push({ vars, a: polyMul(f, a), b: polyMul(f, j % 4 === 0 ? polyMul(a, b) : b) });
  }
  const ref = sympyGcd(cases);
  cases.forEach((cs, j) => {
    const mine = gcd(cs.a, cs.b);
    assert.ok(sameUpToUnit(mine, ref[j]!), `case ${j}: ${polyToString(mine)} vs ${polyToString(ref[j]!)}`);
  });
});

test('square-free factorisation against sympy Poly.sqf_list over QQ_I in a separate process', () => {
  const r = rng(5);
  const cases: { vars: string[]; a: Poly }[] = [];
  for (let j = 0; j < 14; j++) {
    const vars = j % 2 ? ['k', 't'] : ['t'];
    let a = polyConst(randCoeff(r) === G0 ? G1 : gint(2, 1));
    for (let f = 0; f < 3; f++) a = polyMul(a, polyPow(randPoly(r, vars, 1, 2), 1 + r(3)));
    if (j === 0) a = polyPow(polyAdd(k, polyScale(t, GI)), 4);
    if (j === 1) a = polyMul(polyPow(t, 3), polyPow(polyAdd(t, c(0, 2)), 2));
    cases.push({ vars: j === 0 ? ['k', 't'] : vars, a });
  }
  const ref = sympySqf(cases);
  cases.forEach((cs, j) => {
    const mine = squareFree(cs.a);
    // sympy may split one multiplicity into several factors: compare products per multiplicity
    const byK = new Map<number, Poly>();
    for (const { f, k: m } of ref[j]!) byK.set(m, polyMul(byK.get(m) ?? ONE, f));
    for (const m of [...byK.keys()]) if (isConstant(byK.get(m)!)) byK.delete(m);
    assert.deepEqual(mine.factors.map((f) => f.k), [...byK.keys()].sort((x, y) => x - y), `case ${j}`);
    for (const { f, k: m } of mine.factors) assert.ok(sameUpToUnit(f, byK.get(m)!), `case ${j} k=${m}`);
    const back = mine.factors.reduce((s, { f, k: m }) => polyMul(s, polyPow(f, m)), polyConst(mine.unit));
    assert.ok(polyEquals(back, cs.a), `case ${j}: unit * prod f^k`);
  });
});

// ---- properties (fast-check) -------------------------------------------------------

const arbQ = fc.tuple(fc.integer({ min: -6, max: 6 }), fc.integer({ min: 1, max: 4 })).map(([n, d]) => q(BigInt(n), BigInt(d)));
const arbG = fc.tuple(arbQ, arbQ).map(([re, im]) => gq(re, im));
const arbPoly = (vars: string[], maxDeg = 2) =>
  fc.array(fc.tuple(arbG, fc.array(fc.integer({ min: 0, max: maxDeg }), { minLength: vars.length, maxLength: vars.length })), { maxLength: 4 })
    .map((ts) => ts.reduce((s, [cf, es]) => polyAdd(s, es.reduce((m, e, i) => polyMul(m, polyPow(polyVar(vars[i]!), e)), polyConst(cf))), ZERO));
const V = ['k', 't'];
const arbPoint = fc.tuple(arbG, arbG).map(([a, b]) => new Map([['k', a], ['t', b]]));

test('ring laws, exact division, substitution and evaluation (fast-check properties)', () => {
  fc.assert(fc.property(arbPoly(V), arbPoly(V), arbPoly(V), arbPoint, (a, b, d, at) => {
    assert.ok(polyEquals(polyMul(a, polyAdd(b, d)), polyAdd(polyMul(a, b), polyMul(a, d))));
    assert.ok(geq(evalExact(polyMul(a, b), at), gmul(evalExact(a, at), evalExact(b, at))));
    if (!isZero(b)) assert.ok(polyEquals(divideExact(polyMul(a, b), b)!, a));
    // d(ab) = a'b + ab'
    assert.ok(polyEquals(derivative(polyMul(a, b), 't'), polyAdd(polyMul(derivative(a, 't'), b), polyMul(a, derivative(b, 't')))));
    const s = substitute(a, 'k', b);
    const at2 = new Map(at); at2.set('k', evalExact(b, at));
    assert.ok(geq(evalExact(s, at), evalExact(a, at2)));
    const z = evalComplex(a, new Map([...at].map(([v, x]) => [v, { re: Number(x.re.n) / Number(x.re.d), im: Number(x.im.n) / Number(x.im.d) }])));
    const e = evalExact(a, at);
    assert.ok(Math.abs(z.re - Number(e.re.n) / Number(e.re.d)) < 1e-6 && Math.abs(z.im - Number(e.im.n) / Number(e.im.d)) < 1e-6);
  }), { numRuns: 150 });
});

test('gcd divides both and takes common factors; Yun reconstructs (fast-check properties)', () => {
  fc.assert(fc.property(arbPoly(V, 1), arbPoly(V, 1), arbPoly(V, 1), (f, a, b) => {
    const A = polyMul(f, a), B = polyMul(f, b);
    const G = gcd(A, B);
    if (isZero(A) && isZero(B)) return;
    assert.ok(divideExact(A, G) !== null && divideExact(B, G) !== null);
    if (!isZero(f) && !isZero(A) && !isZero(B)) assert.ok(divideExact(G, gcd(f, f)) !== null, 'f | gcd(fa, fb)');
    const P = polyMul(polyMul(A, A), B);
    if (isZero(P)) return;
    const sf = squareFree(P);
    const back = sf.factors.reduce((s, { f: x, k: m }) => polyMul(s, polyPow(x, m)), polyConst(sf.unit));
    assert.ok(polyEquals(back, P));
    for (const { f: x } of sf.factors) for (const v of variables(x)) assert.ok(isConstant(gcd(x, derivative(x, v))) || degree(gcd(x, derivative(x, v)), v) === 0);
  }), { numRuns: 60 });
});

// ---- rational functions -------------------------------------------------------------

const num = (v: string): Expr => ({ t: 'num', v });
const nm = (name: string): Expr => ({ t: 'name', name });
const bin = (op: '+' | '-' | '*' | '/' | '^', a: Expr, b: Expr): Expr => ({ t: 'bin', op, a, b });
const I: Expr = { t: 'const', name: 'i' };

test('fromExpr: exact rational functions of the names, null otherwise', () => {
  const r = fromExpr(bin('/', bin('+', nm('k'), bin('*', I, nm('t'))), bin('*', num('2'), nm('k'))))!;
  assert.ok(polyEquals(r.den, k));
  assert.ok(polyEquals(r.num, polyScale(polyAdd(k, polyScale(t, GI)), q(1n, 2n))));
  assert.deepEqual(fromExpr(num('0.0005'))!.num.terms.get('')!.c.re, q(1n, 2000n));
  const p = fromExpr(bin('*', { t: 'const', name: 'pi' }, bin('^', nm('k'), { t: 'neg', a: num('2') })))!;
  assert.deepEqual(variables(p.num), ['pi']);
  assert.ok(polyEquals(p.den, polyPow(k, 2)));
  // cancellation: (k^2 - t^2)/(k - t) = k + t
  const cancel = fromExpr(bin('/', bin('-', bin('^', nm('k'), num('2')), bin('^', nm('t'), num('2'))), bin('-', nm('k'), nm('t'))))!;
  assert.ok(polyEquals(cancel.num, polyAdd(k, t)) && polyEquals(cancel.den, ONE));
  for (const bad of [
    { t: 'call', fn: 'exp', args: [nm('k')] } as Expr, bin('^', nm('k'), num('0.5')), bin('^', nm('k'), num('65')),
    { t: 'const', name: 'e' } as Expr, bin('/', nm('k'), bin('-', nm('t'), nm('t'))), bin('^', nm('k'), nm('t')),
    bin('^', bin('+', bin('+', nm('a'), nm('b')), bin('+', nm('c'), nm('d'))), num('40')),
  ]) assert.equal(fromExpr(bad), null, JSON.stringify(bad));
  assert.equal(fromExpr(bin('+', nm('k'), nm('z')), ['k']), null, 'names outside realVars');
  assert.notEqual(fromExpr(bin('^', bin('+', nm('k'), num('1')), num('-64'))), null);
});

test('rational functions evaluate like Gaussian arithmetic on random expression trees (fast-check)', () => {
  type Node = { e: Expr; v: (at: Map<string, GQ>) => GQ | null };
  const leaf: fc.Arbitrary<Node> = fc.oneof(
    fc.integer({ min: -9, max: 9 }).map((n) => ({ e: n < 0 ? { t: 'neg', a: num(String(-n)) } as Expr : num(String(n)), v: () => gint(n) })),
    fc.constantFrom('k', 't').map((n) => ({ e: nm(n), v: (at: Map<string, GQ>) => at.get(n)! })),
    fc.constant({ e: I, v: () => GI }),
  );
  const tree = fc.letrec<{ node: Node }>((tie) => ({
    node: fc.oneof({ maxDepth: 4, depthIdentifier: 'x' }, leaf,
      fc.tuple(fc.constantFrom('+', '-', '*', '/'), tie('node'), tie('node')).map(([op, a, b]) => ({
        e: bin(op as '+', a.e, b.e),
        v: (at: Map<string, GQ>) => {
          const x = a.v(at), y = b.v(at);
          if (!x || !y) return null;
          return op === '+' ? gadd(x, y) : op === '-' ? gsub(x, y) : op === '*' ? gmul(x, y) : gIsZero(y) ? null : gdiv(x, y);
        },
      })),
      fc.tuple(tie('node'), fc.integer({ min: -3, max: 3 })).map(([a, n]) => ({
        e: bin('^', a.e, n < 0 ? { t: 'neg', a: num(String(-n)) } : num(String(n))),
        v: (at: Map<string, GQ>) => { const x = a.v(at); return !x || (n < 0 && gIsZero(x)) ? null : gpow(x, n); },
      }))),
  })).node;
  fc.assert(fc.property(tree, arbPoint, (n, at) => {
    const r = fromExpr(n.e);
    const direct = n.v(at);
    if (!r || !direct) return; // a division by an identically or locally zero value
    if (gIsZero(evalExact(r.den, at))) return;
    assert.ok(geq(rfEvalExact(r, at), direct), `${JSON.stringify(n.e)}`);
  }), { numRuns: 200 });
});

test('rational function arithmetic keeps lowest terms', () => {
  const a = rfDiv(rfVar('k'), rfAdd(rfVar('t'), rfConst(1)));
  const b = rfSub(rfConst(1), a);
  const s = rfAdd(a, b);
  assert.ok(rfEquals(s, rfConst(1)));
  assert.ok(rfEquals(rfMul(rfPow(a, -2), rfPow(a, 2)), rfConst(1)));
  assert.ok(rfEquals(ratfunc(polyMul(k, t), polyScale(polyMul(t, t), 3)), ratfunc(polyScale(k, q(1n, 3n)), t)));
});

test('leadingMinorsRat and detRat match exact elimination at random Gaussian points', () => {
  const r = rng(3);
  for (let j = 0; j < 12; j++) {
    const n = j === 11 ? 4 : 2 + (j % 2); // one 4x4: a rational 4x4 in two variables takes ~0.5 s (gcd normalisation)
    const M = Array.from({ length: n }, () => Array.from({ length: n }, () =>
      ratfunc(randPoly(r, V, 1, 2), r(2) ? ONE : polyAdd(randPoly(r, V, 1, 1), c(5)))));
    const mins = leadingMinorsRat(M);
    assert.ok(rfEquals(detRat(M), mins[n - 1]!));
    const at = new Map([['k', gq(q(BigInt(r(7) + 1), 3n), q(1n, 5n))], ['t', gq(q(BigInt(r(5) - 2), 7n))]]);
    let ok = true;
    const num2 = M.map((row) => row.map((x) => { const d = evalExact(x.den, at); if (gIsZero(d)) ok = false; return ok ? rfEvalExact(x, at) : G0; }));
    if (!ok) continue;
    mins.forEach((m, i) => assert.ok(geq(rfEvalExact(m, at), gaussDet(num2.slice(0, i + 1).map((row) => row.slice(0, i + 1)))), `case ${j} minor ${i + 1}`));
  }
});

/** Plain Gaussian elimination over Q(i), an independent determinant. */
function gaussDet(m: GQ[][]): GQ {
  const a = m.map((r) => r.slice());
  let d = G1;
  for (let col = 0; col < a.length; col++) {
    const p = a.findIndex((r, i) => i >= col && !gIsZero(r[col]!));
    if (p < 0) return G0;
    if (p !== col) { [a[p], a[col]] = [a[col]!, a[p]!]; d = gsub(G0, d); }
    d = gmul(d, a[col]![col]!);
    for (let i = col + 1; i < a.length; i++) {
      const f = gdiv(a[i]![col]!, a[col]![col]!);
      for (let j = col; j < a.length; j++) a[i]![j] = gsub(a[i]![j]!, gmul(f, a[col]![j]!));
    }
  }
  return d;
}

test('minors of a 3x3 in one parameter and of 8x8 tridiagonal and diagonal matrices in two parameters have the degrees worked out by hand (timings are in npm run bench, not here)', () => {
  const d = polyAdd(c(30), polyScale(t, GI));
  const M3 = [[d, c(1), polyScale(t, 2)], [c(1), d, c(0, 1)], [polyScale(t, 2), c(0, 1), d]];
  assert.equal(degree(leadingMinors(M3)[2]!, 't'), 3);
  const n = 8;
  const M8 = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) =>
    i === j ? polyAdd(polyScale(k, i + 1), polyScale(t, gint(0, 1))) : Math.abs(i - j) === 1 ? polyAdd(c(1), polyScale(g, q(1n, 2n))) : ZERO));
  const mins: Poly[] = leadingMinors(M8);
  assert.equal(totalDegree(mins[7]!), 8);
  const D8 = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? polyAdd(c(i + 1), polyScale(t, GI)) : ZERO)));
  const dd = leadingMinors(D8);
  assert.equal(degree(dd[7]!, 't'), 8);
});
