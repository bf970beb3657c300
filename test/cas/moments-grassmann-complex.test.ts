/**
 * Moments, derivatives, complex and Grassmann variables, against sources outside the project:
 * handbook moments of the normal distribution (Abramowitz and Stegun 26.2, from memory),
 * sympy (derivatives of the generating function exp(J^T A^-1 J / 2), a separate process),
 * mpmath quadrature (a separate process), and Berezin integrals expanded by hand in a small
 * Grassmann algebra written in this test.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import * as math from 'mathjs';
import { run } from './support/run.js';
import type { StatementReport, Step } from '../../shared/evaluation.js';
import { renderStep } from '../../shared/record/render.js';

const python = (script: string, input: unknown): unknown => {
  const r = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', script], { input: JSON.stringify(input), encoding: 'utf8' });
  if (r.status !== 0) throw new Error(r.stderr);
  return JSON.parse(r.stdout);
};
const stepOf = <K extends Step['kind']>(s: StatementReport, kind: K) => s.steps.find((x): x is Extract<Step, { kind: K }> => x.kind === kind)!;
const at = (text: string, scope: Record<string, number>) => { const v = math.evaluate(text, scope) as number | math.Complex; return typeof v === 'number' ? { re: v, im: 0 } : { re: v.re, im: v.im }; };

test('moments of the one-variable Gaussian: <x^(2n)> = (2n-1)!!/a^n for n = 1..5 (Abramowitz and Stegun 26.2, from memory), and odd moments vanish', () => {
  const lines = ['param a : positive', 'integral Z = exp(-a*x^2/2) d(x)'];
  for (let n = 1; n <= 5; n++) lines.push(`moment X${2 * n} = x^${2 * n} under Z`);
  lines.push('moment X3 = x^3 under Z');
  const r = run(lines.join('\n'));
  const dfact = (m: number) => { let f = 1; for (let k = m; k > 1; k -= 2) f *= k; return f; };
  for (let n = 1; n <= 5; n++) {
    const s = r.statements[1 + n]!;
    assert.equal(s.status, 'ok');
    const want = dfact(2 * n - 1);
    assert.equal(s.result!.text, n === 1 ? '1/a' : `${want}/a^${n}`);
    assert.equal(stepOf(s, 'moment').pairings, want);
    assert.match(renderStep(stepOf(s, 'moment')).text, new RegExp(`${want} pairing`));
  }
  assert.equal(r.statements[7]!.result!.text, '0');
});

test('a four-variable correlator <x1 x2 x3 x4> and a three-variable <x1^2 x2 x3> against sympy derivatives of the generating function exp(J^T A^-1 J/2)', () => {
  const A = [[4, 1, 0, 1], [1, 5, 2, 0], [0, 2, 6, 1], [1, 0, 1, 3]];
  const quad = A.map((row, i) => row.map((v, j) => (v === 0 ? '' : `${i === j ? '' : '2*'}${v}*x${i + 1}*x${j + 1}`)).filter((t, j) => t && j >= i)).flat().join(' + ');
  const r = run(`integral Z = exp(-(${quad})/2) d(x1, x2, x3, x4)\nmoment C4 = x1*x2*x3*x4 under Z\nmoment C3 = x1^2*x2*x3 under Z`);
  const got = [r.statements[1]!.result!.text, r.statements[2]!.result!.text].map((t) => math.fraction(math.evaluate(t) as number));
  const script = String.raw`
import json, sys
from sympy import Matrix, symbols, exp, diff, Rational, nsimplify
A = Matrix(json.load(sys.stdin))
J = symbols('J1:5')
Jv = Matrix(J)
W = exp((Jv.T * A.inv() * Jv)[0] / 2)
zero = {j: 0 for j in J}
m4 = diff(W, J[0], J[1], J[2], J[3]).subs(zero)
m3 = diff(W, J[0], 2, J[1], J[2]).subs(zero)
print(json.dumps([str(Rational(m4)), str(Rational(m3))]))`;
  const want = python(script, A) as string[];
  assert.equal(math.format(got[0]!, { fraction: 'ratio' }), want[0]);
  assert.equal(math.format(got[1]!, { fraction: 'ratio' }), want[1]);
});

test('a moment with a source: <x^3> = (3 J a + J^3)/a^3, and a two-variable <x y> — mpmath quadrature at a = 1.3, J = 0.4', () => {
  const r = run('param a : positive\nparam J : real\nintegral W = exp(-a*x^2/2 + J*x) d(x)\nmoment M3 = x^3 under W\nintegral Q = exp(-(2*x^2 + 2*x*y + 3*y^2)/2) d(x, y)\nmoment C = x*y under Q');
  const m3 = r.statements[3]!;
  assert.equal(m3.result!.text, '(3*J*a + J^3)/a^3');
  const [want3, wantC] = python(String.raw`
import json, sys
import mpmath as mp
mp.mp.dps = 20
a, J = mp.mpf('1.3'), mp.mpf('0.4')
w = lambda x: mp.exp(-a*x**2/2 + J*x)
m3 = mp.quad(lambda x: x**3*w(x), [-mp.inf, 0, mp.inf]) / mp.quad(w, [-mp.inf, 0, mp.inf])
q = lambda x, y: mp.exp(-(2*x**2 + 2*x*y + 3*y**2)/2)
c = mp.quad(lambda x, y: x*y*q(x, y), [-8, 0, 8], [-8, 0, 8]) / mp.quad(q, [-8, 0, 8], [-8, 0, 8])
print(json.dumps([float(m3), float(c)]))`, null) as number[];
  assert.ok(Math.abs(at(m3.result!.text, { a: 1.3, J: 0.4 }).re - want3!) < 1e-12);
  assert.equal(r.statements[5]!.result!.text, '-1/5');
  assert.ok(Math.abs(-0.2 - wantC!) < 1e-9);
});

test('derivatives: -2 d log Z/dk = <x^2> = 1/k, the connected two-point function d^2 log W/dJ^2 = 1/a, and an energy -d log Z/dbeta = 1/(2 beta) (equipartition, common practice), exact and checked by central differences', () => {
  const r = run('param k, a, beta, w : positive\nparam J : real\nintegral Z = exp(-k*x^2/2) d(x)\nderivative X2 = -2*log(Z) by k\nintegral W = exp(-a*x^2/2 + J*x) d(x)\nderivative G1 = log(W) by J\nderivative G2 = G1 by J\nintegral T = exp(-beta*w^2*x^2/2) d(x)\nderivative U = -log(T) by beta');
  const byName = (n: string) => r.statements.find((s) => s.name === n)!;
  assert.equal(byName('X2').result!.text, '1/k');
  assert.equal(byName('G1').result!.text, 'J/a');
  assert.equal(byName('G2').result!.text, '1/a');
  assert.equal(byName('U').result!.text, '1/(2*beta)');
  for (const n of ['X2', 'G1', 'G2', 'U']) {
    const d = stepOf(byName(n), 'derivative');
    assert.ok(d.checks.count >= 6 && d.checks.worst < 1e-6, `${n}: ${JSON.stringify(d.checks)}`);
  }
});

test('complex Gaussian: the integral over C of exp(-a |z|^2) with d^2z = dx dy is pi/a, and at a = 1 + 2i it is 0.6283185307 - 1.2566370614i (the issue\'s check value; handbook pi/a)', () => {
  const r = run('param a : positive\nintegral C = exp(-a*z*conj(z)) d(z : complex)\nintegral C1 = exp(-(1 + 2*i)*z*conj(z)) d(z : complex)');
  const c = r.statements[1]!;
  assert.equal(c.result!.text, 'pi/a');
  assert.match(renderStep(stepOf(c, 'variables')).text, /d\^2z = dx dy/);
  const v = r.statements[2]!.result!.value!;
  assert.ok(Math.abs(v.re - 0.6283185307) < 1e-10 && Math.abs(v.im + 1.2566370614) < 1e-10, JSON.stringify(v));
  assert.equal(r.statements[2]!.convergence, 'absolute');
});

/** A small Grassmann algebra for the check: elements are maps from ascending index lists to numbers. */
type G = Map<string, number>;
const gmul = (a: G, b: G): G => {
  const out: G = new Map();
  for (const [ka, va] of a) for (const [kb, vb] of b) {
    const idx = [...(ka ? ka.split(',').map(Number) : []), ...(kb ? kb.split(',').map(Number) : [])];
    if (new Set(idx).size < idx.length) continue;
    let sign = 1; // bubble sort, counting transpositions
    for (let i = 0; i < idx.length; i++) for (let j = 0; j + 1 < idx.length - i; j++) if (idx[j]! > idx[j + 1]!) { [idx[j], idx[j + 1]] = [idx[j + 1]!, idx[j]!]; sign = -sign; }
    const k = idx.join(',');
    out.set(k, (out.get(k) ?? 0) + sign * va * vb);
  }
  return out;
};
const gexp = (x: G, n: number): G => { let term: G = new Map([['', 1]]); let sum: G = new Map([['', 1]]); for (let j = 1; j <= n; j++) { term = gmul(term, x); term = new Map([...term].map(([k, v]) => [k, v / j])); for (const [k, v] of term) sum.set(k, (sum.get(k) ?? 0) + v); } return sum; };
/** integral dtheta_0 dtheta_1 ... dtheta_{n-1} f, the rightmost differential first: d/dtheta_k from the left. */
const berezin = (f: G, n: number): number => {
  let cur = f;
  for (let k = n - 1; k >= 0; k--) {
    const next: G = new Map();
    for (const [key, v] of cur) {
      const idx = key ? key.split(',').map(Number) : [];
      const pos = idx.indexOf(k);
      if (pos < 0) continue;
      idx.splice(pos, 1);
      next.set(idx.join(','), (next.get(idx.join(',')) ?? 0) + (pos % 2 ? -1 : 1) * v);
    }
    cur = next;
  }
  return cur.get('') ?? 0;
};
const quadratic = (terms: [number, number, number][]): G => new Map(terms.map(([c, i, j]) => [`${i},${j}`, -c]));

test('Berezin integrals of 2 and 4 Grassmann variables against a hand expansion of the exponential, and the 4x4 Pfaffian a12 a34 - a13 a24 + a14 a23', () => {
  const r = run('param a : positive\nparam b, c, e, f, g, h : real\nintegral P2 = exp(-a*t1*t2) d(t1, t2 : grassmann)\nintegral P4 = exp(-(b*t1*t2 + c*t1*t3 + e*t1*t4 + f*t2*t3 + g*t2*t4 + h*t3*t4)) d(t1, t2, t3, t4 : grassmann)\nintegral R = exp(-(2*s2*s1 + 5*s3*s4)) d(s1, s2, s3, s4 : grassmann)');
  assert.equal(r.statements[2]!.result!.text, 'a');
  assert.equal(berezin(gexp(quadratic([[1.7, 0, 1]]), 2), 2), 1.7);
  const vals = { b: 0.3, c: -1.1, e: 2.2, f: 0.7, g: -0.4, h: 1.9 };
  const hand = berezin(gexp(quadratic([[vals.b, 0, 1], [vals.c, 0, 2], [vals.e, 0, 3], [vals.f, 1, 2], [vals.g, 1, 3], [vals.h, 2, 3]]), 4), 4);
  const p4 = r.statements[3]!;
  assert.ok(Math.abs(at(p4.result!.text, vals).re - hand) < 1e-12, `${p4.result!.text} vs ${hand}`);
  // the Pfaffian of A = [[0, b, c, e], ...]: a12 a34 - a13 a24 + a14 a23 (handbook, from memory)
  assert.ok(Math.abs(hand - (vals.b * vals.h - vals.c * vals.g + vals.e * vals.f)) < 1e-12);
  // written out of order: s2*s1 = -s1*s2
  const handR = berezin(gexp(new Map([['0,1', 2], ['2,3', -5]]), 4), 4);
  assert.equal(Number(r.statements[4]!.result!.text), handR);
});

test('a mixed real and Grassmann Gaussian is the product of the real Gaussian and the Pfaffian, and a term mixing the two kinds is refused with a reason', () => {
  const r = run('param a : positive\nintegral M = exp(-a*x^2/2 - a*t1*t2) d(x) d(t1, t2 : grassmann)\nintegral Bad = exp(-a*x^2/2 - x*t1*t2) d(x) d(t1, t2 : grassmann)');
  const m = r.statements[1]!;
  assert.equal(m.status, 'ok');
  const [want] = python('import json, mpmath as mp\nprint(json.dumps([float(1.6*mp.quad(lambda x: mp.exp(-1.6*x**2/2), [-mp.inf, mp.inf]))]))', null) as number[];
  assert.ok(Math.abs(at(m.result!.text, { a: 1.6 }).re - want!) < 1e-12, m.result!.text);
  assert.equal(r.statements[2]!.status, 'error');
  assert.match(r.statements[2]!.error!.message, /mixes Grassmann and real variables/);
});

test('a three-variable moment <x1 x2 x3^2> against mpmath quadrature (tensor Gauss-Legendre on a box where the weight has fallen below e^-60)', () => {
  const r = run('integral Z = exp(-(3*x1^2 + 2*x1*x2 + 4*x2^2 + 2*x2*x3 + 5*x3^2)/2) d(x1, x2, x3)\nmoment M = x1*x2*x3^2 under Z\nmoment N = x1^2*x3^2 under Z');
  const got = [r.statements[1]!, r.statements[2]!].map((s) => s.result!.value!.re);
  const want = python(String.raw`
import json, math
import mpmath as mp
mp.mp.dps = 20
A = [[3, 1, 0], [1, 4, 1], [0, 1, 5]]
gl = mp.calculus.quadrature.GaussLegendre(mp.mp)
nodes = gl.calc_nodes(6, mp.mp.prec)  # degree 6: 3*2^5 = 96 nodes on [-1, 1]
L = 7.0
xs = [(float(x) * L, float(w) * L) for x, w in nodes]
def weight(p):
    s = 0.0
    for i in range(3):
        for j in range(3):
            s += A[i][j] * p[i] * p[j]
    return math.exp(-s / 2)
z = m = n = 0.0
for a, wa in xs:
    for b, wb in xs:
        for c, wc in xs:
            w = wa * wb * wc * weight((a, b, c))
            z += w; m += w * a * b * c * c; n += w * a * a * c * c
print(json.dumps([m / z, n / z]))`, null) as number[];
  got.forEach((g, k) => assert.ok(Math.abs(g - want[k]!) < 1e-9 * Math.max(1, Math.abs(want[k]!)), `${g} vs ${want[k]}`));
});

test('a polynomial before the exponential: integral of x^2 exp(-a x^2/2) = sqrt(2 pi/a)/a and of (x^4 + 1) exp(...) (G&R 3.461.2, from memory), and x*y with a source in two variables — mpmath quadrature', () => {
  const r = run('param a : positive\nparam J : real\nintegral M = x^2*exp(-a*x^2/2) d(x)\nintegral M4 = (x^4 + 1)*exp(-a*x^2/2) d(x)\nintegral N = x*y*exp(-(2*x^2 + 2*x*y + 3*y^2)/2 + J*x) d(x, y)');
  const [m, m4, n] = [r.statements[2]!, r.statements[3]!, r.statements[4]!];
  for (const s of [m, m4, n]) { assert.equal(s.status, 'ok'); assert.equal(s.convergence, 'absolute'); assert.ok(s.steps.some((x) => x.kind === 'moment')); }
  assert.equal(m.result!.text, 'sqrt(2*pi/a)/a');
  const want = python(String.raw`
import json
import mpmath as mp
mp.mp.dps = 20
a, J = mp.mpf('1.3'), mp.mpf('0.4')
m = mp.quad(lambda x: x**2*mp.exp(-a*x**2/2), [-mp.inf, 0, mp.inf])
m4 = mp.quad(lambda x: (x**4 + 1)*mp.exp(-a*x**2/2), [-mp.inf, 0, mp.inf])
n = mp.quad(lambda x, y: x*y*mp.exp(-(2*x**2 + 2*x*y + 3*y**2)/2 + J*x), [-9, 0, 9], [-9, 0, 9])
print(json.dumps([float(m), float(m4), float(n)]))`, null) as number[];
  [m, m4, n].forEach((s, k) => assert.ok(Math.abs(at(s.result!.text, { a: 1.3, J: 0.4 }).re / want[k]! - 1) < 1e-9, `${s.result!.text}: ${want[k]}`));
});

test('averages under a Berezin integral: <t_i t_j> = (A^-1)_ij (mathjs inverse) and a four-point average, against the hand expansion; a fermion pair gives <p pb> = 1/M', () => {
  const r = run('param a, w, b : positive\nintegral P = exp(-(a*t1*t2 + w*t3*t4 + b*t1*t3)) d(t1, t2, t3, t4 : grassmann)\nmoment T12 = t1*t2 under P\nmoment T24 = t2*t4 under P\nmoment T4 = t1*t2*t3*t4 under P\nintegral F = exp(-2*pb*p) d(pb, p : grassmann)\nmoment FF = p*pb under F');
  const vals = { a: 2, w: 3, b: 5 };
  const A = [[0, vals.a, vals.b, 0], [-vals.a, 0, 0, 0], [-vals.b, 0, 0, vals.w], [0, 0, -vals.w, 0]];
  const inv = math.inv(A) as number[][];
  const weight = gexp(quadratic([[vals.a, 0, 1], [vals.b, 0, 2], [vals.w, 2, 3]]), 4);
  const z = berezin(weight, 4);
  const avg = (idx: number[]) => berezin(gmul(new Map([[idx.join(','), 1]]), weight), 4) / z;
  const byName = (n: string) => r.statements.find((s) => s.name === n)!;
  assert.ok(Math.abs(at(byName('T12').result!.text, vals).re - inv[0]![1]!) < 1e-12);
  assert.ok(Math.abs(at(byName('T12').result!.text, vals).re - avg([0, 1])) < 1e-12);
  assert.ok(Math.abs(at(byName('T24').result!.text, vals).re - inv[1]![3]!) < 1e-12);
  assert.ok(Math.abs(at(byName('T4').result!.text, vals).re - avg([0, 1, 2, 3])) < 1e-12);
  const step = stepOf(byName('T12'), 'moment');
  assert.equal(step.grassmann, true);
  step.covariance.forEach((row, i) => row.forEach((f, j) => assert.ok(Math.abs(at(f.text, vals).re - inv[i]![j]!) < 1e-12, `G[${i}][${j}]`)));
  assert.equal(byName('FF').result!.text, '1/2');
});
