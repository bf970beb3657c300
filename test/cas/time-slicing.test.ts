/**
 * Time slicing with a number of slices N: `sliced NAME = V on interval L | on circle BETA
 * periodic | antiperiodic with N slices`, its N -> inf limit by the exact expansion, and the
 * comparison with the functional determinant.
 *
 * Sources: the tridiagonal recursion D_n = (2 + eps^2 V) D_{n-1} - D_{n-2} and the circulant's
 * eigenvalues are common practice; the continuum values are Gel'fand-Yaglom's ratio
 * det(-d^2 + w^2)/det(-d^2) = sinh(w L)/(w L) = 1.915169877217778 at L = 3, w = 0.7 and, on a
 * circle of length beta = 2, 4 sinh(beta w/2)^2 = 2.301796930786281 (periodic) and
 * 4 cosh(beta w/2)^2 = 6.301796930786281 (antiperiodic) (G. V. Dunne, "Functional determinants
 * in quantum field theory", J. Phys. A 41 (2008) 304006). Independently of the closed form in N,
 * each sliced value is recomputed by mpmath in a separate process as the determinant of the
 * explicit matrix (mp.det at 30 digits), and the coefficient of 1/N^2 by Richardson
 * extrapolation of mpmath's recursion at large N.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { run, statement } from './support/run.js';
import { evaluate } from '../../cas/expr/evaluate.js';
import { parseExpression } from '../../cas/lang/parse.js';
import { renderStep } from '../../shared/record/render.js';
import type { StatementReport } from '../../shared/evaluation.js';
import { Complex } from 'complex.js';

type C = { re: number; im: number };

/** mpmath: the determinant of the sliced matrix, built entry by entry (corners added for the circle). */
const MATRIX_DET = String.raw`
import json, sys
import mpmath as mp
mp.mp.dps = 30
out = []
for job in json.load(sys.stdin):
    N, L, cond = job['N'], mp.mpf(job['L']), job['cond']
    eps = L / N
    pot = job['V']
    def V(t):
        if pot['kind'] == 'const': return mp.mpc(*pot['value'])
        return mp.mpf(pot['a']) + mp.mpf(pot['b']) * t + mp.mpf(pot['c']) * t * t
    n = N - 1 if cond == 'dirichlet' else N
    if n == 0:
        out.append([1.0, 0.0]); continue
    M = mp.matrix(n, n)
    for i in range(n):
        j = i + 1 if cond == 'dirichlet' else i
        M[i, i] += 2 + eps ** 2 * V(j * eps)
        if cond == 'dirichlet':
            if i + 1 < n:
                M[i, i + 1] += -1; M[i + 1, i] += -1
        else:
            s = -1 if (i + 1 < n or cond == 'periodic') else 1
            M[i, (i + 1) % n] += s; M[(i + 1) % n, i] += s
    d = mp.det(M)
    if cond == 'dirichlet': d = d / N
    out.append([float(mp.re(d)), float(mp.im(d))])
print(json.dumps(out))
`;

/** mpmath: N^2 (D_{N-1}/N - sinh(x)/x) at N and 2N by the recursion at 40 digits, Richardson-extrapolated to N -> inf. */
const RATE_COEFFICIENT = String.raw`
import json, sys
import mpmath as mp
mp.mp.dps = 40
job = json.load(sys.stdin)
L, w = mp.mpf(job['L']), mp.mpf(job['w'])
x = L * w
def f(N):
    a = 2 + (L / N) ** 2 * w ** 2
    d0, d1 = mp.mpf(0), mp.mpf(1)
    for _ in range(N - 1): d0, d1 = d1, a * d1 - d0
    return N ** 2 * (d1 / N - mp.sinh(x) / x)
f1, f2, f4 = f(400), f(800), f(1600)
r1, r2 = (4 * f2 - f1) / 3, (4 * f4 - f2) / 3
print(json.dumps(float((16 * r2 - r1) / 15)))
`;

function python(script: string, input: unknown): unknown {
  const r = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', script], { input: JSON.stringify(input), encoding: 'utf8' });
  if (r.status !== 0) throw new Error(r.stderr);
  return JSON.parse(r.stdout);
}

const rel = (a: C, b: C) => Math.hypot(a.re - b.re, a.im - b.im) / Math.max(Math.hypot(b.re, b.im), 1e-300);
const close = (got: C | null | undefined, want: C, tol: number, what: string) => {
  assert.ok(got, `${what}: no value`);
  const d = rel(got, want);
  assert.ok(d < tol, `${what}: got ${got.re} + ${got.im}i, want ${want.re} + ${want.im}i (relative difference ${d})`);
};
const ok = (s: StatementReport) => assert.equal(s.status, 'ok', s.error?.message);
const valueOf = (s: StatementReport) => s.result?.value ?? null;
/** A formula printed by the record, evaluated at a point (an independent reading of its text). */
const at = (text: string, point: Record<string, number>) => {
  const z = evaluate(parseExpression(text), new Map(Object.entries(point).map(([k, v]) => [k, new Complex(v, 0)])));
  return { re: z.re, im: z.im };
};

const SHAPES = [
  { cond: 'dirichlet', where: 'interval 3', L: 3 },
  { cond: 'periodic', where: 'circle 2 periodic', L: 2 },
  { cond: 'antiperiodic', where: 'circle 2 antiperiodic', L: 2 },
] as const;

test('closed form in N against mpmath determinants of the explicit matrices, N = 2..50 (recursion and circulant: common practice)', () => {
  const potentials: { text: string; mp: { kind: 'const'; value: [number, number] } }[] = [
    { text: '0.49', mp: { kind: 'const', value: [0.49, 0] } },
    { text: '-0.3', mp: { kind: 'const', value: [-0.3, 0] } },
    { text: '0.3 + 0.5*i', mp: { kind: 'const', value: [0.3, 0.5] } },
  ];
  const Ns = Array.from({ length: 49 }, (_, k) => k + 2);
  for (const shape of SHAPES) {
    for (const pot of potentials) {
      const lines = Ns.map((N) => `sliced S${N} = ${pot.text} on ${shape.where} with ${N} slices`);
      const report = run(lines.join('\n'));
      const want = python(MATRIX_DET, Ns.map((N) => ({ N, L: shape.L, cond: shape.cond, V: pot.mp }))) as [number, number][];
      report.statements.forEach((s, k) => {
        ok(s);
        close(valueOf(s), { re: want[k]![0], im: want[k]![1] }, 1e-9, `${shape.cond}, V = ${pot.text}, N = ${Ns[k]}`);
      });
    }
  }
});

test('symbolic N: the record gives the recursion, the branch of theta and a check against the matrix (V >= 0 real; complex V any root)', () => {
  const s = statement('param w, L : positive\nparam N : positive integer\nsliced S = w^2 on interval L with N slices', 'S');
  ok(s);
  assert.equal(s.proof, 'proved');
  const step = s.steps.find((x) => x.kind === 'time-slicing');
  assert.ok(step && step.kind === 'time-slicing');
  assert.equal(step.thetaBranch, 'real');
  assert.ok(step.checks && step.checks.worst < 1e-9 && step.checks.slices.length >= 5);
  const text = renderStep(step).text;
  assert.match(text, /D_n = \(2 \+ eps\^2\*V\)\*D_\(n-1\) - D_\(n-2\)/);
  assert.match(text, /real and >= 0/);
  // closed form at N = 9 against the explicit matrix (mpmath)
  const want = python(MATRIX_DET, [{ N: 9, L: 3, cond: 'dirichlet', V: { kind: 'const', value: [0.49, 0] } }]) as [number, number][];
  close(at(s.result!.text, { w: 0.7, L: 3, N: 9 }), { re: want[0]![0], im: want[0]![1] }, 1e-12, 'S at N = 9');

  const c = statement('param v : complex\nparam N : positive integer\nsliced SC = v on circle 2 periodic with N slices', 'SC');
  ok(c);
  const cs = c.steps.find((x) => x.kind === 'time-slicing');
  assert.ok(cs && cs.kind === 'time-slicing' && cs.thetaBranch === 'any');
  assert.match(renderStep(cs).text, /no branch enters the result/);
});

test('N -> inf: the sliced interval ratio tends to sinh(w L)/(w L) = 1.915169877217778 at L = 3, w = 0.7 with rate 1/N^2 (G. V. Dunne; Gel\'fand-Yaglom)', () => {
  const src = 'param w, L : positive\nparam N : positive integer\nsliced S = w^2 on interval L with N slices\nlimit S : N -> inf\ndeterminant D = w^2 on interval L';
  const report = run(src);
  const lim = report.statements.find((s) => s.kind === 'limit')!;
  ok(lim);
  const step = lim.steps[0]!;
  assert.ok(step.kind === 'limit' && step.method === 'expansion' && step.basis.kind === 'proved');
  assert.equal(lim.result!.text, 'sinh(L*w)/(L*w)');
  const exact = 1.915169877217778;
  close(at(lim.result!.text, { L: 3, w: 0.7 }), { re: exact, im: 0 }, 1e-14, 'limit value');
  close(at(report.statements.find((s) => s.name === 'D')!.result!.text, { L: 3, w: 0.7 }), { re: exact, im: 0 }, 1e-14, 'functional determinant');
  // the correction: power 2 and the exact coefficient against mpmath's extrapolation
  assert.ok(step.kind === 'limit' && step.correction && step.correction.power === -2, 'a correction in 1/N^2');
  const coefficient = at(step.correction.formula!.text, { L: 3, w: 0.7, N: 1 });
  const mp = python(RATE_COEFFICIENT, { L: 3, w: 0.7 }) as number;
  close(coefficient, { re: mp, im: 0 }, 1e-8, 'coefficient of 1/N^2');
  // measured: errors at N and 2N have ratio close to 4
  const lines = [10, 20, 40, 80].map((N) => `sliced S${N} = 0.49 on interval 3 with ${N} slices`);
  const vals = run(lines.join('\n')).statements.map((s) => valueOf(s)!.re);
  for (let k = 0; k + 1 < vals.length; k++) {
    const ratio = (vals[k]! - exact) / (vals[k + 1]! - exact);
    assert.ok(Math.abs(ratio - 4) < 0.05, `error ratio at N = ${10 * 2 ** k}: ${ratio}`);
  }
  assert.ok(vals.every((v) => v < exact), 'the sliced ratio approaches from below');
});

test('N -> inf on the circle: periodic 2.301796930786281 and antiperiodic 6.301796930786281 at beta = 2, w = 0.7, rate 1/N^2 (G. V. Dunne)', () => {
  const cases = [
    { cond: 'periodic', exact: 2.301796930786281, closed: '4*sinh(beta*w/2)^2' },
    { cond: 'antiperiodic', exact: 6.301796930786281, closed: '4*cosh(beta*w/2)^2' },
  ];
  for (const c of cases) {
    const report = run(`param w, beta : positive\nparam N : positive integer\nsliced P = w^2 on circle beta ${c.cond} with N slices\nlimit P : N -> inf\ndeterminant D = w^2 on circle beta ${c.cond}`);
    const lim = report.statements.find((s) => s.kind === 'limit')!;
    ok(lim);
    assert.equal(lim.result!.text, c.closed);
    close(at(lim.result!.text, { beta: 2, w: 0.7 }), { re: c.exact, im: 0 }, 1e-14, `${c.cond} limit`);
    close(at(report.statements.find((s) => s.name === 'D')!.result!.text, { beta: 2, w: 0.7 }), { re: c.exact, im: 0 }, 1e-14, `${c.cond} functional`);
    const step = lim.steps[0]!;
    assert.ok(step.kind === 'limit' && step.correction?.power === -2, `${c.cond}: correction 1/N^2`);
    // the coefficient -(beta w)^3 sinh cosh/6
    const coefficient = at(step.correction.formula!.text, { beta: 2, w: 0.7, N: 1 }).re;
    // mpmath: f(N) = N^2 (det M_N - exact) from the explicit matrices at N = 30, 60, 120, extrapolated twice (Richardson)
    const dets = (python(MATRIX_DET, [30, 60, 120].map((N) => ({ N, L: 2, cond: c.cond, V: { kind: 'const', value: [0.49, 0] } }))) as [number, number][]).map((d) => d[0]);
    const f = dets.map((d, k) => (30 * 2 ** k) ** 2 * (d - c.exact));
    const r1 = (4 * f[1]! - f[0]!) / 3; const r2 = (4 * f[2]! - f[1]!) / 3;
    const measured = (16 * r2 - r1) / 15;
    assert.ok(Math.abs(measured - coefficient) < 1e-6 * Math.abs(coefficient), `${c.cond}: coefficient ${coefficient}, measured ${measured}`);
    const vals = run([20, 40, 80].map((N) => `sliced P${N} = 0.49 on circle 2 ${c.cond} with ${N} slices`).join('\n')).statements.map((s) => valueOf(s)!.re);
    for (let k = 0; k + 1 < vals.length; k++) {
      const ratio = (vals[k]! - c.exact) / (vals[k + 1]! - c.exact);
      assert.ok(Math.abs(ratio - 4) < 0.05, `${c.cond} error ratio ${ratio}`);
    }
  }
});

test('an explicit integral over N - 1 = 5 variables (6 slices) of the sliced action equals the sliced statement at N = 6 (Gaussian normalisation prod dx_j/sqrt(2 pi eps))', () => {
  // L = 3, eps = 1/2: (x_{j+1} - x_j)^2/(2 eps) = (x_{j+1} - x_j)^2 and eps w^2 x^2/2 = w^2 x^2/4.
  // int exp(-S) d^5x = (2 pi)^(5/2) det(M/eps)^(-1/2) = (2 pi)^(5/2) (2^5 D_5)^(-1/2), so
  // D_5/6 = (2 pi)^5/(192 Z6^2); with the measure prod dx_j/sqrt(2 pi eps) the integral is D_5^(-1/2).
  const src = [
    'param w : positive',
    'integral Z6 = exp(-(x1^2 + (x2 - x1)^2 + (x3 - x2)^2 + (x4 - x3)^2 + (x5 - x4)^2 + x5^2) - w^2*(x1^2 + x2^2 + x3^2 + x4^2 + x5^2)/4) d(x1, x2, x3, x4, x5)',
    'let R6 = (2*pi)^5/(192*Z6^2)',
    'sliced S6 = w^2 on interval 3 with 6 slices',
    'compare R6 with S6',
  ].join('\n');
  const report = run(src);
  report.statements.forEach(ok);
  const cmp = report.statements.find((s) => s.kind === 'compare')!;
  assert.match(cmp.steps.map((x) => renderStep(x).text).join(' '), /equal/i);
  for (const w of [0.7, 1.3, 4]) {
    close(at(report.statements.find((s) => s.name === 'R6')!.result!.text, { w }), at(report.statements.find((s) => s.name === 'S6')!.result!.text, { w }), 1e-12, `w = ${w}`);
  }
  const [want] = python(MATRIX_DET, [{ N: 6, L: 3, cond: 'dirichlet', V: { kind: 'const', value: [0.49, 0] } }]) as [number, number][];
  close(at(report.statements.find((s) => s.name === 'R6')!.result!.text, { w: 0.7 }), { re: want![0], im: want![1] }, 1e-12, 'R6 against mpmath');
});

test('V(t) at a numeric N: the determinant of the matrix with V(t_j), against mpmath', () => {
  const report = run('sliced St = 0.49 + 0.1*t - 0.05*t^2 on interval 3 with 12 slices\nsliced Sp = 0.49 + 0.1*t - 0.05*t^2 on circle 2 periodic with 9 slices');
  report.statements.forEach(ok);
  const want = python(MATRIX_DET, [
    { N: 12, L: 3, cond: 'dirichlet', V: { kind: 'poly', a: 0.49, b: 0.1, c: -0.05 } },
    { N: 9, L: 2, cond: 'periodic', V: { kind: 'poly', a: 0.49, b: 0.1, c: -0.05 } },
  ]) as [number, number][];
  close(valueOf(report.statements[0]!), { re: want[0]![0], im: want[0]![1] }, 1e-12, 'interval with V(t)');
  close(valueOf(report.statements[1]!), { re: want[1]![0], im: want[1]![1] }, 1e-12, 'circle with V(t)');
  assert.equal(report.statements[0]!.proof, null);
  assert.match(report.statements[0]!.result!.text, /^≈ /);
});

test('the expansion engine expands asinh: 2*N*asinh(x/(2*N)) = x - x^3/(24 N^2) + ... (Taylor series, common practice)', () => {
  const report = run('param x : positive\nparam N : positive integer\nlet T = 2*N*asinh(x/(2*N))\nlimit T : N -> inf');
  const lim = report.statements.find((s) => s.kind === 'limit')!;
  ok(lim);
  assert.equal(lim.result!.text, 'x');
  const step = lim.steps[0]!;
  assert.ok(step.kind === 'limit' && step.correction?.power === -2);
  close(at(step.correction.formula!.text, { x: 1.7, N: 1 }), { re: -(1.7 ** 3) / 24, im: 0 }, 1e-14, 'coefficient -x^3/24');
  // an argument that does not tend to 0 is refused with a reason, not guessed
  const far = run('param x : positive\nparam N : positive integer\nlet U = asinh(x + 1/N)\nlimit U : N -> inf').statements.find((s) => s.kind === 'limit')!;
  assert.equal(far.result?.text, 'unknown');
});

test('refusals: a slice count that is not a whole number, N not declared an integer, a non-integer N in verify, V(t) with symbolic N', () => {
  const msg = (src: string, name: string) => statement(src, name).error?.message ?? '';
  assert.match(msg('sliced S = 1 on interval 2 with 2.5 slices', 'S'), /whole number/);
  assert.match(msg('param N : positive\nsliced S = 1 on interval 2 with N slices', 'S'), /positive integer/);
  assert.match(msg('param N : positive integer\nsliced S = t on interval 2 with N slices', 'S'), /numerically/);
  const v = run('param N : positive integer\nintegral Z = exp(-N*x^2/2) d(x)\nverify Z at N = 2.5').statements[2]!;
  assert.equal(v.status, 'error');
  assert.match(v.error!.message, /not a whole number/);
  // V = -m < 0: the closed form stands (any root of cosh(theta) = 1 - eps^2*m/2 gives it), but
  // sin(L*sqrt(m)) can vanish, so the exact expansion gives no limit: unknown with its reason, in time
  const neg = run('param m, L : positive\nparam N : positive integer\nsliced S = -m on interval L with N slices\nlimit S : N -> inf');
  ok(neg.statements[2]!);
  const negStep = neg.statements[2]!.steps.find((x) => x.kind === 'time-slicing');
  assert.ok(negStep && negStep.kind === 'time-slicing' && negStep.thetaBranch === 'any');
  assert.equal(neg.statements[3]!.status, 'ok', neg.statements[3]!.error?.message);
  assert.equal(neg.statements[3]!.result?.text, 'unknown');
  // V = 0 periodic: the zero mode removed, det' = N^2
  const z = statement('param N : positive integer\nsliced Z = 0 on circle 2 periodic with N slices', 'Z');
  ok(z);
  assert.equal(z.result!.text, 'N^2');
});
