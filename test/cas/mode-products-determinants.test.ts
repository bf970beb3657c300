/**
 * Products over modes (zeta-regularised) and functional determinants of -d^2/dt^2 + V.
 * Closed forms and check values from J. R. Quine, S. H. Heydari, R. Y. Song, "Zeta regularized
 * products", Trans. AMS 338 (1993) (Lerch's formula), G. V. Dunne, "Functional determinants in
 * quantum field theory", J. Phys. A 41 (2008) 304006 and K. Kirsten, A. J. McKane, Ann. Phys.
 * 308 (2003) 502 (Gel'fand-Yaglom). Independently of the closed forms, each value is recomputed
 * by mpmath in a separate process: a product from its spectral zeta function
 * zeta(s) = sum P(n)^-s, continued to s = 0 by expanding P(n)^-s in powers of 1/n (Hurwitz
 * zeta tails) and differentiated numerically; a determinant by mpmath's ODE solver (odefun).
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { run } from './support/run.js';
import type { StatementReport, Step } from '../../shared/evaluation.js';
import { renderStep } from '../../shared/record/render.js';
import { parseWorksheet } from '../../cas/lang/parse.js';
import { statementNames } from '../../cas/lang/statement-names.js';

type C = { re: number; im: number };

/** The zeta-regularised product of P(n) = sum coeffs[k] n^k over n >= start, from its spectral zeta function, by mpmath. */
const ZETA_PRODUCT = String.raw`
import json, sys
import mpmath as mp
mp.mp.dps = 30
def reg_product(coeffs, start, logc=None):
    d = len(coeffs) - 1
    c = coeffs[d]
    Lc = mp.log(c) if logc is None else logc
    e = [coeffs[d - k] / c for k in range(d + 1)]
    M, N = 14, 30
    def amn(s):
        u = [mp.mpc(0)] * (M + 1)
        for k in range(1, d + 1): u[k] = e[k]
        res = [mp.mpc(0)] * (M + 1); res[0] = mp.mpc(1)
        upow = [mp.mpc(1)] + [mp.mpc(0)] * M
        for j in range(1, M + 1):
            new = [mp.mpc(0)] * (M + 1)
            for a in range(M + 1):
                if upow[a] == 0: continue
                for b in range(1, M + 1 - a): new[a + b] += upow[a] * u[b]
            upow = new
            bj = mp.binomial(-s, j)
            for a in range(M + 1): res[a] += bj * upow[a]
        return res
    def P(n): return sum(coeffs[k] * mp.mpf(n) ** k for k in range(d + 1))
    def F(s):
        a = amn(s)
        cs = mp.exp(-s * Lc)
        head = sum(mp.exp(-s * (mp.log(P(n)))) for n in range(start, N))
        tail = cs * sum(a[m] * mp.zeta(d * s + m, N) for m in range(M + 1))
        def rem(n):
            n = mp.mpf(n)
            return mp.exp(-s * (Lc + mp.log(P(n) / c))) - cs * sum(a[m] * n ** (-d * s - m) for m in range(M + 1))
        return head + tail + mp.nsum(rem, [N, mp.inf])
    h = mp.mpf('1e-9')
    der = (8 * (F(h) - F(-h)) - (F(2 * h) - F(-2 * h))) / (12 * h)
    return mp.exp(-der)
out = []
for job in json.load(sys.stdin):
    coeffs = [mp.mpc(re, im) for re, im in job['coeffs']]
    logc = None if job.get('logc') is None else mp.mpc(*job['logc'])
    v = reg_product(coeffs, job['start'], logc)
    out.append([float(v.real), float(v.imag)])
print(json.dumps(out))
`;

function python(script: string, input: unknown): unknown {
  const r = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', script], { input: JSON.stringify(input), encoding: 'utf8' });
  if (r.status !== 0) throw new Error(r.stderr);
  return JSON.parse(r.stdout);
}

const zetaProducts = (jobs: { coeffs: [number, number][]; start: number; logc?: [number, number] }[]) => python(ZETA_PRODUCT, jobs) as [number, number][];

const close = (got: C | null, want: C, tol: number, what: string) => {
  assert.ok(got, `${what}: no value`);
  const d = Math.hypot(got.re - want.re, got.im - want.im) / Math.max(Math.hypot(want.re, want.im), 1e-300);
  assert.ok(d < tol, `${what}: got ${got.re} + ${got.im}i, want ${want.re} + ${want.im}i (relative difference ${d})`);
};

const stepOf = <K extends Step['kind']>(s: StatementReport, kind: K) => s.steps.find((x): x is Extract<Step, { kind: K }> => x.kind === kind)!;
const byName = (src: string) => {
  const r = run(src);
  return (n: string) => { const s = r.statements.find((x) => x.name === n)!; assert.equal(s.status, 'ok', s.error?.message); return s; };
};

test('zeta-regularised products: the check values of J. R. Quine, S. H. Heydari, R. Y. Song (Trans. AMS 338, 1993), exact closed forms, and mpmath from the spectral zeta function', () => {
  const get = byName([
    'product P1 = n over n >= 1',
    'product P2 = n + 0.3 over n >= 0',
    'product P3 = n^2 + 0.09 over n >= 1',
    'product P4 = m + 0.2 + 0.35*i over all m',
  ].join('\n'));
  // Quine, Heydari, Song: prod n = sqrt(2*pi) = 2.506628274631001
  assert.equal(get('P1').result!.text, 'sqrt(2*pi)');
  close(get('P1').result!.value, { re: 2.506628274631001, im: 0 }, 1e-14, 'prod n');
  // Lerch's formula (as quoted by J. R. Quine et al.): sqrt(2*pi)/Gamma(0.3) = 0.837897533016132
  assert.equal(get('P2').result!.text, 'sqrt(2*pi)/Gamma(3/10)');
  close(get('P2').result!.value, { re: 0.837897533016132, im: 0 }, 1e-14, 'prod (n + 0.3)');
  // Quine, Heydari, Song: prod over n >= 1 of (n^2 + a^2) = 2*sinh(pi*a)/a = 7.255570859442628 at a = 0.3
  assert.equal(get('P3').result!.text, '20*sinh(3*pi/10)/3');
  close(get('P3').result!.value, { re: 7.255570859442628, im: 0 }, 1e-14, 'prod (n^2 + 0.09)');
  // Quine, Heydari, Song: prod over all m of (m + u) = 1 - exp(2*pi*i*u) for Im u > 0; 0.965729620287557 - 0.105473383453731i
  close(get('P4').result!.value, { re: 0.965729620287557, im: -0.105473383453731 }, 1e-14, 'prod (m + u)');
  assert.equal(stepOf(get('P4'), 'regularisation').branch, 'upper');
  for (const n of ['P1', 'P2', 'P3', 'P4']) assert.equal(get(n).proof, 'proved');

  // the same four from the spectral zeta function, by mpmath (the all-integers product as its two halves,
  // u - m = -(m - u) with log(-1) = i*pi since every u - m lies in the upper half plane)
  const [a, b, c, d1, d2] = zetaProducts([
    { coeffs: [[0, 0], [1, 0]], start: 1 },
    { coeffs: [[0.3, 0], [1, 0]], start: 0 },
    { coeffs: [[0.09, 0], [0, 0], [1, 0]], start: 1 },
    { coeffs: [[0.2, 0.35], [1, 0]], start: 0 },
    { coeffs: [[0.2, 0.35], [-1, 0]], start: 1, logc: [0, Math.PI] },
  ])!;
  close(get('P1').result!.value, { re: a![0], im: a![1] }, 1e-13, 'mpmath prod n');
  close(get('P2').result!.value, { re: b![0], im: b![1] }, 1e-13, 'mpmath prod (n + 0.3)');
  close(get('P3').result!.value, { re: c![0], im: c![1] }, 1e-13, 'mpmath prod (n^2 + 0.09)');
  const all = { re: d1![0] * d2![0] - d1![1] * d2![1], im: d1![0] * d2![1] + d1![1] * d2![0] };
  close(get('P4').result!.value, all, 1e-13, 'mpmath prod (m + u)');
});

test('over all integers with Im u < 0: the other branch, 1 - exp(-2*pi*i*u), recorded — against mpmath with log(-1) = -i*pi', () => {
  const get = byName('product Q = m + 0.2 - 0.35*i over all m');
  const s = get('Q');
  assert.equal(stepOf(s, 'regularisation').branch, 'lower');
  assert.equal(s.result!.text, '1 - exp(-2*pi*i*(1/5 - 7*i/20))');
  const [h1, h2] = zetaProducts([
    { coeffs: [[0.2, -0.35], [1, 0]], start: 0 },
    { coeffs: [[0.2, -0.35], [-1, 0]], start: 1, logc: [0, -Math.PI] },
  ]);
  close(s.result!.value, { re: h1![0] * h2![0] - h1![1] * h2![1], im: h1![0] * h2![1] + h1![1] * h2![0] }, 1e-13, 'Im u < 0');
  assert.match(renderStep(stepOf(s, 'regularisation')).text, /lower half plane/);
});

test('no multiplicative anomaly for a polynomial in n: the split into linear factors agrees with mpmath on the zeta function of P itself (monic, with a leading coefficient, with complex roots)', () => {
  const get = byName([
    'param a : positive',
    'product A = (n + 3/10)*(n + 17/10) over n >= 0',
    'product B = 2*n^2 + 4*n + 1 over n >= 0',
    'product C = n^2 + (1 + i)*n + 0.5 over n >= 1',
    'product D = n^2 + a^2 over n >= 1',
    'product E = 3*n + 1 over n >= 1',
  ].join('\n'));
  const want = zetaProducts([
    { coeffs: [[0.51, 0], [2, 0], [1, 0]], start: 0 },
    { coeffs: [[1, 0], [4, 0], [2, 0]], start: 0 },
    { coeffs: [[0.5, 0], [1, 1], [1, 0]], start: 1 },
    { coeffs: [[1, 0], [3, 0]], start: 1 },
  ]);
  close(get('A').result!.value, { re: want[0]![0], im: want[0]![1] }, 1e-12, '(n + 0.3)(n + 1.7)');
  close(get('B').result!.value, { re: want[1]![0], im: want[1]![1] }, 1e-12, '2n^2 + 4n + 1 (leading coefficient to the power zeta(0))');
  close(get('C').result!.value, { re: want[2]![0], im: want[2]![1] }, 1e-12, 'complex coefficients');
  close(get('E').result!.value, { re: want[3]![0], im: want[3]![1] }, 1e-12, '3n + 1');
  assert.equal(get('D').result!.text, '2*sinh(pi*a)/a');
  assert.equal(stepOf(get('A'), 'mode-product').anomaly, 'split-polynomial');
  assert.match(renderStep(stepOf(get('A'), 'mode-product')).text, /No multiplicative anomaly/);
  assert.match(renderStep(stepOf(get('A'), 'regularisation')).text, /^Choice: .*zeta regularisation/);
});

test('the multiplicative anomaly over all integers: prod (m^2 + a^2) = 4*sinh(pi*a)^2 (Quine, Heydari, Song), not the product (1 - exp(-2*pi*a))^2 of its first-order halves — mpmath from the spectral zeta function', () => {
  const get = byName('product Q = m^2 + 0.09 over all m\nproduct L1 = m + 0.3*i over all m\nproduct L2 = m - 0.3*i over all m\ndeterminant D = 0.09 on circle 2*pi periodic');
  const q = get('Q');
  assert.equal(q.result!.text, '4*sinh(3*pi/10)^2');
  const [h0, h1] = zetaProducts([{ coeffs: [[0.09, 0], [0, 0], [1, 0]], start: 0 }, { coeffs: [[0.09, 0], [0, 0], [1, 0]], start: 1 }]);
  close(q.result!.value, { re: h0![0] * h1![0], im: 0 }, 1e-12, 'mpmath prod over all m of (m^2 + 0.09)');
  // the first-order halves: (1 - exp(-0.6*pi))^2 = Q * exp(-0.6*pi), a factor exp(2*pi*i*x) with x = 0.3*i
  const l1 = get('L1').result!.value!; const l2 = get('L2').result!.value!;
  close({ re: l1.re * l2.re - l1.im * l2.im, im: l1.re * l2.im + l1.im * l2.re }, { re: q.result!.value!.re * Math.exp(-0.6 * Math.PI), im: 0 }, 1e-13, 'anomaly factor');
  assert.match(renderStep(stepOf(q, 'mode-product')).text, /Warning, multiplicative anomaly/);
  // the same number as the periodic determinant of -d^2/dt^2 + 0.09 on a circle of length 2*pi
  close(get('D').result!.value, q.result!.value!, 1e-13, 'circle determinant');
});

test('products that are not computed say why: a vanishing mode, degree 3 without factors of degree 1 and 2, Im u = 0 over all integers', () => {
  const r = run('product Z = n - 2 over n >= 0\nproduct T = n^3 + 2 over n >= 1\nproduct R = m + 0.5 over all m');
  assert.match(r.statements[0]!.error!.message, /mode n = 2 vanishes/);
  assert.match(r.statements[1]!.error!.message, /degree 3/);
  assert.match(r.statements[2]!.error!.message, /Im u vanishes/);
});

/** y'' = V(t) y by mpmath's Taylor-series ODE solver: y2(L) (y2(0) = 0, y2'(0) = 1) and y1(L) + y2'(L). */
const ODE = String.raw`
import json, sys
import mpmath as mp
mp.mp.dps = 20
out = []
for job in json.load(sys.stdin):
    V = eval('lambda t: ' + job['V'])
    L = mp.mpf(job['L'])
    F = lambda t, y: [y[1], V(t) * y[0]]
    y2 = mp.odefun(F, 0, [mp.mpf(0), mp.mpf(1)])(L)
    y1 = mp.odefun(F, 0, [mp.mpf(1), mp.mpf(0)])(L)
    out.append([float(y2[0]), float(y1[0] + y2[1])])
print(json.dumps(out))
`;

test('functional determinants, constant V: the check values of G. V. Dunne (J. Phys. A 41, 2008) and Kirsten & McKane (Ann. Phys. 308, 2003), exact', () => {
  const get = byName([
    'determinant D = 0.49 on interval 3',
    'determinant P = 0.49 on circle 2 periodic',
    'determinant A = 0.49 on circle 2 antiperiodic',
    'param w, L, beta : positive',
    'determinant DW = w^2 on interval L',
    'determinant Z0 = 0 on circle beta periodic',
  ].join('\n'));
  // G. V. Dunne: Dirichlet on [0, L], sinh(omega L)/(omega L) = 1.915169877217778 at L = 3, omega = 0.7 (Gel'fand-Yaglom)
  close(get('D').result!.value, { re: 1.915169877217778, im: 0 }, 1e-14, 'Dirichlet');
  // Kirsten & McKane / Dunne: beta = 2, omega = 0.7: periodic 4 sinh^2 = 2.301796930786281, antiperiodic 4 cosh^2 = 6.301796930786281
  close(get('P').result!.value, { re: 2.301796930786281, im: 0 }, 1e-14, 'periodic');
  close(get('A').result!.value, { re: 6.301796930786281, im: 0 }, 1e-14, 'antiperiodic');
  for (const n of ['D', 'P', 'A', 'DW', 'Z0']) assert.equal(get(n).proof, 'proved');
  assert.equal(get('DW').result!.text, 'sinh(w*L)/(w*L)');
  // the periodic zero mode at V = 0: found, removed, det' = beta^2 (the limit of 4 sinh^2(beta w/2)/w^2)
  const z = stepOf(get('Z0'), 'functional-determinant');
  assert.equal(z.zeroMode!.reduced.text, 'beta^2');
  assert.match(renderStep(z).text, /= 0: the constant is a zero mode.*removed, the determinant of the other modes is det' = beta\^2/);
  // the same three by mpmath's ODE solver (monodromy trace -+ 2 on the circle)
  const [d, c] = python(ODE, [{ V: '0.49', L: 3 }, { V: '0.49', L: 2 }]) as [number, number][];
  close(get('D').result!.value, { re: d![0] / 3, im: 0 }, 1e-13, 'mpmath Dirichlet');
  close(get('P').result!.value, { re: c![1] - 2, im: 0 }, 1e-13, 'mpmath periodic');
  close(get('A').result!.value, { re: c![1] + 2, im: 0 }, 1e-13, 'mpmath antiperiodic');
});

test('functional determinants, V depending on t: RK4 with step halving against mpmath odefun in a separate process', () => {
  const get = byName([
    'determinant D = 1 + 0.5*cos(t) on interval 3',
    'determinant P = 0.3 + t*(2 - t) on circle 2 periodic',
    'determinant A = 0.3 + t*(2 - t) on circle 2 antiperiodic',
    'determinant N = -2*exp(-t^2) on interval 2.5',
  ].join('\n'));
  const [d, c, n] = python(ODE, [
    { V: '1 + 0.5*mp.cos(t)', L: 3 },
    { V: '0.3 + t*(2 - t)', L: 2 },
    { V: '-2*mp.exp(-t**2)', L: 2.5 },
  ]) as [number, number][];
  close(get('D').result!.value, { re: d![0] / 3, im: 0 }, 1e-10, 'Dirichlet, V = 1 + cos(t)/2');
  close(get('P').result!.value, { re: c![1] - 2, im: 0 }, 1e-10, 'periodic');
  close(get('A').result!.value, { re: c![1] + 2, im: 0 }, 1e-10, 'antiperiodic');
  close(get('N').result!.value, { re: n![0] / 2.5, im: 0 }, 1e-10, 'Dirichlet, attractive well');
  const s = stepOf(get('D'), 'functional-determinant');
  assert.equal(s.method, 'ode');
  assert.equal(get('D').proof, null);
  assert.match(get('D').result!.text, /^≈ /);
  assert.match(renderStep(s).text, /Runge-Kutta.*numeric, not proved/);
});

test('parsing: the new statements, their names, and Gamma as a function', () => {
  const p = parseWorksheet('param a : positive\nproduct P = n^2 + a^2 over n >= 1\nproduct Q = m + a*i over all m\ndeterminant D = a*t on interval 2\ndeterminant E = a on circle 3 antiperiodic\nlet G = Gamma(a)');
  assert.deepEqual(p.errors, []);
  const st = p.lines.flatMap((l) => (l.ok ? [l.statement] : []));
  assert.deepEqual(st.map((x) => x.kind), ['param', 'product', 'product', 'determinant', 'determinant', 'let']);
  assert.deepEqual(statementNames(st[1]!).used, ['a']);
  assert.deepEqual(statementNames(st[3]!).used, ['a']);
  const r = run('param a : positive\nlet G = Gamma(a)\nlet H = Gamma(0.5)');
  // Gamma(1/2) = sqrt(pi) (Abramowitz & Stegun 6.1.8, number from memory)
  close(r.statements[2]!.result!.value, { re: Math.sqrt(Math.PI), im: 0 }, 1e-14, 'Gamma(1/2)');
});
