/**
 * Products over modes of a factor of degree >= 3 (product NAME = P over n >= 1 | n >= 0 | all n):
 * P is factored exactly into factors of degree 1 and 2 and the closed forms multiplied.
 *
 * Every value is recomputed by mpmath in a separate process, in two ways that share nothing with
 * the closed forms in cas/:
 *  - Lerch: the roots -b_j of P by mpmath's polyroots, then c^zeta(0) * prod_j sqrt(2*pi)/Gamma(b_j + n0)
 *    with zeta(0) = 1/2 - n0 - (sum b_j)/d of the whole sequence (Lerch's formula, as quoted by
 *    J. R. Quine, S. H. Heydari, R. Y. Song, "Zeta regularized products", Trans. AMS 338 (1993));
 *  - the spectral zeta function Z(s) = sum P(n)^-s itself: a finite head of principal powers, and a
 *    tail c^-s * sum_m E_m(s) * zeta(d*s + m, N) with exp(-s * log(P(n)/(c n^d))) = sum_m E_m(s) n^-m
 *    from the power sums of the roots; the product is exp(-Z'(0)), Z' by central differences.
 * The second is what the product means, so it also checks the claim that splitting P into
 * polynomial factors brings no multiplicative anomaly, and that the leading coefficient enters
 * with zeta(0) of the whole sequence.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { Complex } from 'complex.js';
import { run } from './support/run.js';
import type { StatementReport, Step } from '../../shared/evaluation.js';
import { renderStep } from '../../shared/record/render.js';
import { evaluate } from '../../cas/expr/evaluate.js';
import { parseExpression } from '../../cas/lang/parse.js';

type C = { re: number; im: number };

const MPMATH = String.raw`
import json, sys
import mpmath as mp
mp.mp.dps = 40

def lerch(coeffs, n0):
    d = len(coeffs) - 1
    c = coeffs[d]
    roots = mp.polyroots(list(reversed(coeffs)), maxsteps=200, extraprec=200)
    bs = [-r for r in roots]
    z0 = mp.mpf(1) / 2 - n0 - sum(bs) / d
    v = mp.exp(z0 * mp.log(c))
    for b in bs:
        v *= mp.sqrt(2 * mp.pi) / mp.gamma(b + n0)
    return v

def spectral(coeffs, n0, N=60, M=40):
    d = len(coeffs) - 1
    c = coeffs[d]
    roots = mp.polyroots(list(reversed(coeffs)), maxsteps=200, extraprec=200)
    bs = [-r for r in roots]
    # log(P(n)/(c n^d)) = sum_j log(1 + b_j/n) = sum_k l_k n^-k
    l = [mp.mpc(0)] + [sum((-1) ** (k + 1) * b ** k for b in bs) / k for k in range(1, M + 1)]
    def P(n):
        return sum(coeffs[k] * mp.mpf(n) ** k for k in range(d + 1))
    def Z(s):
        E = [mp.mpc(1)]
        for m in range(1, M + 1):
            E.append(sum(k * (-s) * l[k] * E[m - k] for k in range(1, m + 1)) / m)
        head = sum(mp.exp(-s * mp.log(P(n))) for n in range(n0, N))
        tail = mp.exp(-s * mp.log(c)) * sum(E[m] * mp.zeta(d * s + m, N) for m in range(M + 1))
        return head + tail
    h = mp.mpf('1e-12')
    der = (8 * (Z(h) - Z(-h)) - (Z(2 * h) - Z(-2 * h))) / (12 * h)
    return mp.exp(-der)

out = []
for job in json.load(sys.stdin):
    cs = [mp.mpc(a, b) for a, b in job['coeffs']]
    parts = []
    if job['from'] == 'all':
        d = len(cs) - 1
        neg = [cs[k] * (-1) ** k for k in range(d + 1)]
        a = lerch(cs, 0) * lerch(neg, 1)
        b = spectral(cs, 0) * spectral(neg, 1)
    else:
        a = lerch(cs, job['from'])
        b = spectral(cs, job['from'])
    out.append([[float(a.real), float(a.imag)], [float(b.real), float(b.imag)]])
print(json.dumps(out))
`;

type Job = { coeffs: number[]; from: 0 | 1 | 'all' };
function mpmath(jobs: Job[]): { lerch: C; zeta: C }[] {
  const input = JSON.stringify(jobs.map((j) => ({ ...j, coeffs: j.coeffs.map((x) => [x, 0]) })));
  const r = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', MPMATH], { input, encoding: 'utf8', timeout: 120_000 });
  if (r.status !== 0) throw new Error(`mpmath failed: ${r.stderr}`);
  return (JSON.parse(r.stdout) as [number, number][][]).map(([a, b]) => ({ lerch: { re: a![0], im: a![1] }, zeta: { re: b![0], im: b![1] } }));
}

const close = (got: C | null | undefined, want: C, tol: number, what: string) => {
  assert.ok(got, `${what}: no value`);
  const d = Math.hypot(got.re - want.re, got.im - want.im) / Math.max(Math.hypot(want.re, want.im), 1e-300);
  assert.ok(d < tol, `${what}: got ${got.re} + ${got.im}i, want ${want.re} + ${want.im}i (relative difference ${d})`);
};

const stepOf = <K extends Step['kind']>(s: StatementReport, kind: K) => s.steps.find((x): x is Extract<Step, { kind: K }> => x.kind === kind)!;
const byName = (src: string) => {
  const r = run(src);
  return (n: string) => { const s = r.statements.find((x) => x.name === n)!; assert.equal(s.status, 'ok', s.error?.message); return s; };
};
/** The printed closed form evaluated at a point of the parameters. */
const at = (s: StatementReport, point: Record<string, number>): C => {
  const z = evaluate(parseExpression(s.result!.text), new Map(Object.entries(point).map(([k, v]) => [k, new Complex(v, 0)])));
  return { re: z.re, im: z.im };
};

test('(n + 1)(n + 2)(n + 3) over n >= 0: three Lerch factors, (2*pi)^(3/2)/(Gamma(1)*Gamma(2)*Gamma(3)) = (2*pi)^(3/2)/2 — against mpmath (Lerch and the spectral zeta function)', () => {
  const get = byName('product P = (n + 1)*(n + 2)*(n + 3) over n >= 0\nproduct E = n^3 + 6*n^2 + 11*n + 6 over n >= 0');
  const p = get('P'); const e = get('E');
  assert.equal(p.result!.text, '(2*pi)^(3/2)/2');
  assert.equal(e.result!.text, '(2*pi)^(3/2)/2', 'the expanded polynomial is factored to the same product');
  assert.equal(p.proof, 'proved');
  // (2*pi)^(3/2)/2 = 7.874804972861... (worked out by hand from the closed form)
  close(p.result!.value, { re: Math.pow(2 * Math.PI, 1.5) / 2, im: 0 }, 1e-14, 'closed form');
  const [m] = mpmath([{ coeffs: [6, 11, 6, 1], from: 0 }]);
  close(p.result!.value, m!.lerch, 1e-13, 'mpmath Lerch');
  close(p.result!.value, m!.zeta, 1e-10, 'mpmath spectral zeta');
  const f = stepOf(e, 'mode-product');
  assert.equal(f.anomaly, 'factored-polynomial');
  assert.deepEqual(f.factorisation!.factors.map((x) => x.factor.text).sort(), ['n + 1', 'n + 2', 'n + 3']);
  assert.equal(stepOf(e, 'regularisation').zetaAtZero.text, '-3/2');
  const text = renderStep(f).text;
  assert.match(text, /factored exactly over the rational functions of the parameters/);
  assert.match(text, /confirmed by exact division/);
  assert.match(text, /No multiplicative anomaly.*Mizuno.*zeta\(0\) that of the whole sequence/);
});

test('n^3 + a^3 = (n + a)(n^2 - a*n + a^2) over n >= 1, at a = 0.7 — against mpmath', () => {
  const get = byName('param a : positive\nproduct C = n^3 + a^3 over n >= 1\nproduct N = n^3 + 0.343 over n >= 1');
  const c = get('C'); const nn = get('N');
  assert.equal(c.proof, 'proved');
  const f = stepOf(c, 'mode-product');
  assert.deepEqual(f.factorisation!.factors.map((x) => x.factor.text), ['n + a', 'n^2 - a*n + a^2']);
  assert.equal(stepOf(c, 'regularisation').zetaAtZero.text, '-1/2');
  assert.match(c.result!.text, /^\(2\*pi\)\^\(3\/2\)\/\(Gamma\(1 \+ a\)\*Gamma\(/);
  const [m] = mpmath([{ coeffs: [0.343, 0, 0, 1], from: 1 }]);
  const v = at(c, { a: 0.7 });
  close(v, m!.lerch, 1e-12, 'mpmath Lerch at a = 0.7');
  close(v, m!.zeta, 1e-10, 'mpmath spectral zeta at a = 0.7');
  close(nn.result!.value, v, 1e-13, 'the numeric coefficient 0.343 = 0.7^3 factors the same way');
  assert.match(renderStep(f).text, /^The closed forms are for factors of degree 1 and 2/);
});

test('degree 4: (n^2 + a^2)(n^2 + b^2) over n >= 1 is 4*sinh(pi*a)*sinh(pi*b)/(a*b); expanded, with numbers, and over all integers — against mpmath', () => {
  const get = byName([
    'param a, b : positive',
    'product Q = (n^2 + a^2)*(n^2 + b^2) over n >= 1',
    'product X = n^4 + (a^2 + b^2)*n^2 + a^2*b^2 over n >= 1',
    'product Y = n^4 + 0.58*n^2 + 0.0441 over n >= 0',
    'product Z = (m^2 + 0.09)*(m^2 + 0.49) over all m',
  ].join('\n'));
  assert.equal(get('Q').result!.text, '4*sinh(pi*a)*sinh(pi*b)/(a*b)');
  assert.equal(get('X').result!.text, '4*sinh(pi*a)*sinh(pi*b)/(a*b)');
  assert.deepEqual(stepOf(get('X'), 'mode-product').factorisation!.factors.map((x) => x.factor.text).sort(), ['n^2 + a^2', 'n^2 + b^2']);
  // over n >= 0 the modes n = 0 add a^2*b^2: 4*a*b*sinh(pi*a)*sinh(pi*b) at a = 0.3, b = 0.7
  assert.equal(get('Y').result!.text, '21*sinh(3*pi/10)*sinh(7*pi/10)/25');
  // over all integers: the two halves, 16*sinh(pi*a)^2*sinh(pi*b)^2 (each even factor gives 4*sinh^2)
  const z = get('Z');
  assert.equal(z.result!.text, '16*sinh(3*pi/10)^2*sinh(7*pi/10)^2');
  assert.equal(stepOf(z, 'mode-product').anomaly, 'all-integers-even');
  assert.equal(stepOf(z, 'regularisation').zetaAtZero.text, '0');
  const [q, y, w] = mpmath([
    { coeffs: [0.0441, 0, 0.58, 0, 1], from: 1 },
    { coeffs: [0.0441, 0, 0.58, 0, 1], from: 0 },
    { coeffs: [0.0441, 0, 0.58, 0, 1], from: 'all' },
  ]);
  const v = at(get('Q'), { a: 0.3, b: 0.7 });
  close(v, q!.lerch, 1e-12, 'Q, mpmath Lerch');
  close(v, q!.zeta, 1e-10, 'Q, mpmath spectral zeta');
  close(get('Y').result!.value, y!.zeta, 1e-10, 'Y over n >= 0, spectral zeta');
  close(z.result!.value, w!.lerch, 1e-12, 'Z over all m, mpmath Lerch halves');
  close(z.result!.value, w!.zeta, 1e-10, 'Z over all m, mpmath spectral zeta of both halves');
});

test('a leading coefficient enters as c^zeta(0) with zeta(0) of the whole sequence, not of the factors; repeated factors by the square-free decomposition; complex and non-square discriminants — against mpmath', () => {
  const get = byName([
    'product W = 2*(n + 1/3)*(n^2 + n + 1) over n >= 0',
    'product R = (n + 1)^2*(n + 1/2) over n >= 0',
    'product H = 5*(n + 1/2)*(n + 1/4)*(n + 2)*(n + 3) over n >= 1',
    'product K = 3*n^4 + 5*n^3 + 2*n^2 + n + 7 over n >= 1',
  ].join('\n'));
  const w = get('W');
  // zeta(0) = 1/2 - (1/3 + 1)/3 = 1/18; by factor it would be 2^(1/2 - 1/3) * ... or 2^0 * ..., neither right
  assert.equal(stepOf(w, 'regularisation').zetaAtZero.text, '1/18');
  assert.match(w.result!.text, /^2\^\(1\/18\)\*\(2\*pi\)\^\(3\/2\)\//);
  const r = get('R');
  assert.equal(r.result!.text, '(2*pi)^(3/2)/Gamma(1/2)');
  const fr = stepOf(r, 'mode-product').factorisation!;
  assert.equal(fr.repeated, true);
  assert.deepEqual(fr.factors.map((x) => [x.factor.text, x.power]).sort(), [['n + 1', 2], ['n + 1/2', 1]]);
  assert.match(renderStep(stepOf(r, 'mode-product')).text, /\(n \+ 1\)\^2/);
  const h = get('H');
  assert.equal(stepOf(h, 'regularisation').zetaAtZero.text, '-31/16');
  // K = (n^2 - n + 1)(3*n^2 + 8*n + 7): two quadratics with non-square discriminants, found from the expanded form
  const k = get('K');
  assert.deepEqual(stepOf(k, 'mode-product').factorisation!.factors.map((x) => x.factor.text).sort(), ['n^2 + 8*n/3 + 7/3', 'n^2 - n + 1']);
  assert.match(k.result!.text, /^\(2\*pi\)\^2\/\(3\^\(11\/12\)\*Gamma\(1\/2 \+ i\*sqrt\(3\)\/2\)/);
  const [mw, mr, mh, mk] = mpmath([
    { coeffs: [2 / 3, 8 / 3, 8 / 3, 2], from: 0 },
    { coeffs: [0.5, 2, 2.5, 1], from: 0 },
    { coeffs: [3.75, 25.625, 49.375, 28.75, 5], from: 1 },
    { coeffs: [7, 1, 2, 5, 3], from: 1 },
  ]);
  close(k.result!.value, mk!.lerch, 1e-12, 'K, Lerch');
  close(k.result!.value, mk!.zeta, 1e-10, 'K, spectral zeta');
  close(w.result!.value, mw!.lerch, 1e-12, 'W, Lerch with c^zeta(0)');
  close(w.result!.value, mw!.zeta, 1e-10, 'W, spectral zeta');
  // the wrong rule, c to the zeta(0) of one factor (n + 1/3 over n >= 0: 1/6), is far from it: the test tells them apart
  const wrong = { re: (w.result!.value!.re / Math.pow(2, 1 / 18)) * Math.pow(2, 1 / 6), im: 0 };
  assert.ok(Math.abs(wrong.re - mw!.zeta.re) / mw!.zeta.re > 1e-2);
  close(r.result!.value, mr!.zeta, 1e-10, 'R, spectral zeta');
  close(h.result!.value, mh!.lerch, 1e-12, 'H, Lerch');
  close(h.result!.value, mh!.zeta, 1e-10, 'H, spectral zeta');
});

test('over all integers, even degree with a general quadratic and linear factors: prod 2*sin(pi*b) over the shifts — against mpmath on both halves', () => {
  const get = byName('product A = (m^2 + m + 1)*(m + 1/3)*(m + 1/4) over all m\nproduct B = 2*(m^2 + m + 1)*(m^2 + 0.09) over all m');
  const a = get('A'); const b = get('B');
  assert.equal(a.result!.text, '8*(cosh(pi*sqrt(3)) + 1)*sin(pi/4)*sin(pi/3)');
  assert.equal(stepOf(b, 'regularisation').zetaAtZero.text, '0');
  const [ma, mb] = mpmath([
    { coeffs: [1 / 12, 8 / 12, 20 / 12, 19 / 12, 1], from: 'all' },
    { coeffs: [0.18, 0.18, 2.18, 2, 2], from: 'all' },
  ]);
  close(a.result!.value, ma!.lerch, 1e-12, 'A, Lerch halves');
  close(a.result!.value, ma!.zeta, 1e-10, 'A, spectral zeta of both halves');
  close(b.result!.value, mb!.zeta, 1e-10, 'B, spectral zeta of both halves (the leading 2 drops out)');
});

test('coefficients rational in the parameters and in pi: (n + 1/a)(n^2 + b/a)(n + 1) and (n + pi)(n^2 + 2) — against mpmath', () => {
  const get = byName('param a, b : positive\nproduct F = (n + 1/a)*(n^2 + b/a)*(n + 1) over n >= 1\nproduct H = (n + pi)*(n^2 + 2) over n >= 1');
  const f = get('F'); const h = get('H');
  assert.equal(f.result!.text, '4*pi*sinh(pi*sqrt(b/a))/(sqrt(b/a)*Gamma((1 + a)/a))');
  assert.equal(h.result!.text, '2*sqrt(2*pi)*sinh(pi*sqrt(2))/(sqrt(2)*Gamma(1 + pi))');
  const A = 0.6, B = 1.3;
  // (n + 1/a)(n + 1) = n^2 + (1/a + 1) n + 1/a, times n^2 + b/a
  const [mf, mh] = mpmath([
    { coeffs: [B / (A * A), (B / A) * (1 / A + 1), 1 / A + B / A, 1 / A + 1, 1], from: 1 },
    { coeffs: [2 * Math.PI, 2, Math.PI, 1], from: 1 },
  ]);
  close(at(f, { a: A, b: B }), mf!.zeta, 1e-10, 'F at a = 0.6, b = 1.3, spectral zeta');
  close(h.result!.value, mh!.zeta, 1e-10, 'H, spectral zeta');
  close(h.result!.value, mh!.lerch, 1e-12, 'H, Lerch');
});

test('refusals: no exact split into degree 1 and 2, odd degree over all integers, a zero mode', () => {
  const r = run([
    'param a : positive',
    'product T = n^3 + 2 over n >= 1',
    'product K = n^4 + n + 1 over n >= 1',
    'product O = m^3 + a^3 over all m',
    'product Z = (n - 2)*(n^2 + a^2) over n >= 0',
    'product U = n^5 + a over n >= 1',
  ].join('\n'));
  const err = (n: string) => r.statements.find((s) => s.name === n)!.error!.message;
  assert.match(err('T'), /degree 3 in n: .*not found to split into factors of degree 1 and 2/);
  assert.match(err('K'), /degree 4 in n: .*not found to split/);
  assert.match(err('O'), /odd degree 3.*opposite directions.*not computed/);
  assert.match(err('Z'), /mode n = 2 vanishes/);
  assert.match(err('U'), /degree 5 in n: .*not found to split/);
});
