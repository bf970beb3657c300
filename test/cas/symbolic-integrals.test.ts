/**
 * Symbolic integrals up to eight variables through the exact route, checked against an
 * independent computation: python3 with sympy and mpmath in a separate process reads the
 * integrand's exponent, takes A, J and c from its derivatives, and computes the value
 * (2 pi)^(n/2) exp(J^T A^-1 J / 2 + c) / prod sqrt(lambda_j) from A's eigenvalues (each
 * in the closed right half-plane, so each principal root is the continuous branch),
 * then evaluates our printed result at the same points. No figure of ours is used by it.
 */
import { test } from 'node:test';
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { evaluateWorksheet } from '../../cas/index.js';
import { LANGUAGE_LIMITS } from '../../shared/language.js';

const SCRIPT = String.raw`
import json, sys
import mpmath
from sympy import Symbol, I, pi, sqrt, exp, hessian, Matrix, lambdify
from sympy.parsing.sympy_parser import parse_expr
mpmath.mp.dps = 30
out = []
for case in json.load(sys.stdin):
    names = {v: Symbol(v) for v in case['vars'] + case['params']}
    local = dict(names, i=I, pi=pi, sqrt=sqrt, exp=exp)
    read = lambda text: parse_expr(text.replace('^', '**'), local_dict=local)
    X = [names[v] for v in case['vars']]
    E = read(case['exponent'])
    at0 = {x: 0 for x in X}
    A = -hessian(E, X).subs(at0)
    J = Matrix([E.diff(x).subs(at0) for x in X])
    c = E.subs(at0)
    ours = read(case['result'])
    rows = []
    for point in case['points']:
        sub = {names[k]: mpmath.mpf(v) for k, v in point.items()}
        An = mpmath.matrix([[complex(A[r, s].subs(sub).evalf(30)) for s in range(len(X))] for r in range(len(X))])
        Jn = mpmath.matrix([complex(J[r].subs(sub).evalf(30)) for r in range(len(X))])
        cn = complex(c.subs(sub).evalf(30))
        ev = mpmath.eig(An, left=False, right=False)
        value = (2 * mpmath.pi) ** (mpmath.mpf(len(X)) / 2) * mpmath.exp((Jn.T * mpmath.inverse(An) * Jn)[0] / 2 + cn)
        for lam in ev:
            value /= mpmath.sqrt(lam)
        mine = complex(ours.subs(sub).evalf(30))
        rows.append({'point': point, 'reference': [float(mpmath.re(value)), float(mpmath.im(value))], 'ours': [mine.real, mine.imag]})
    out.append(rows)
print(json.dumps(out))
`;

interface Case { title: string; source: string; vars: string[]; params: string[]; exponent: string; points: Record<string, number>[]; printed?: string }

const squares = (n: number, name = 'x') => Array.from({ length: n }, (_, k) => `${name}${k + 1}^2`).join(' + ');
const list = (n: number, name = 'x') => Array.from({ length: n }, (_, k) => `${name}${k + 1}`);

/** The time-sliced free particle from 0 back to 0 with n intermediate positions (n + 1 slices of length h). */
function propagator(n: number): Case {
  const steps = [`x1^2`, ...Array.from({ length: n - 1 }, (_, k) => `(x${k + 2} - x${k + 1})^2`), `x${n}^2`].join(' + ');
  const exponent = `i*m*(${steps})/(2*h)`;
  return {
    title: `free particle, ${n} intermediate positions`,
    source: `param m : positive\nparam h : positive\nintegral K = exp(${exponent}) d(${list(n).join(', ')})`,
    vars: list(n), params: ['m', 'h'], exponent,
    points: [{ m: 1, h: 1 }, { m: 0.7, h: 2.5 }],
  };
}

const z = (n: number): Case => {
  const exponent = `-(1/2)*(k + i*t)*(${squares(n)})`;
  return {
    title: `(k + i*t) times the identity, ${n} variables`,
    source: `param k : positive\nparam t : real\nintegral Z = exp(${exponent}) d(${list(n).join(', ')})\nexpect Z = (2*pi)^${n / 2}/(k + i*t)^${n / 2}`,
    vars: list(n), params: ['k', 't'], exponent,
    // t beyond k: (k + i*t)^n crosses the principal cut, the printed form must not
    points: [{ k: 1, t: 0.3 }, { k: 0.7, t: -2.9 }, { k: 2, t: 7 }],
    printed: `(2*pi)^${n / 2}/(k + i*t)^${n / 2}`,
  };
};

const blocks: Case = (() => {
  const pair = (a: string, b: string) => `(k + i*t)*(${a}^2 + ${b}^2) + k*${a}*${b}`;
  const exponent = `-(${pair('x1', 'x2')} + ${pair('x3', 'x4')} + ${pair('x5', 'x6')} + ${pair('x7', 'x8')})/2 + x1 - x8`;
  return {
    title: 'four equal 2x2 blocks with a source, 8 variables',
    source: `param k : positive\nparam t : real\nintegral B = exp(${exponent}) d(${list(8).join(', ')})`,
    vars: list(8), params: ['k', 't'], exponent,
    points: [{ k: 1, t: 0.2 }, { k: 1.3, t: -4 }, { k: 0.5, t: 6 }],
  };
})();

const chain: Case = (() => {
  const links = Array.from({ length: 7 }, (_, k) => `x${k + 1}*x${k + 2}`).join(' + ');
  const exponent = `-(${squares(8)})/2 - i*g*(${links})`;
  return {
    title: 'an imaginary nearest-neighbour chain, 8 variables',
    source: `param g : real\nintegral C = exp(${exponent}) d(${list(8).join(', ')})`,
    vars: list(8), params: ['g'], exponent,
    points: [{ g: 0.1 }, { g: -1.7 }, { g: 4 }],
  };
})();

const CASES = [z(4), z(6), z(8), propagator(6), propagator(8), blocks, chain];

test(`the language admits ${LANGUAGE_LIMITS.symbolicVariables} symbolic variables`, () => {
  assert.equal(LANGUAGE_LIMITS.symbolicVariables, 8);
});

test('symbolic integrals up to 8 variables: ok, proved, and the printed result equals an independent sympy/mpmath value', () => {
  const results: string[] = [];
  for (const c of CASES) {
    const report = evaluateWorksheet(c.source);
    for (const s of report.statements) assert.equal(s.status, 'ok', `${c.title}, line ${s.line}: ${s.error?.message}`);
    const integral = report.statements.find((s) => s.kind === 'integral')!;
    assert.equal(integral.proof, 'proved', c.title);
    assert.notEqual(integral.result, null, c.title);
    const text = integral.result!.text;
    if (c.printed) assert.equal(text, c.printed, c.title);
    // the printed form is a short formula, not a product of pivots' roots
    assert.ok(text.length < 160, `${c.title}: ${text}`);
    results.push(text);
  }
  const input = JSON.stringify(CASES.map((c, k) => ({ vars: c.vars, params: c.params, exponent: c.exponent, points: c.points, result: results[k] })));
  const r = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', SCRIPT], { input, encoding: 'utf8', timeout: 300_000 });
  assert.equal(r.status, 0, r.stderr);
  const checked = JSON.parse(r.stdout) as { point: Record<string, number>; reference: [number, number]; ours: [number, number] }[][];
  checked.forEach((rows, k) => {
    for (const row of rows) {
      const [a, b] = row.reference, [x, y] = row.ours;
      const err = Math.hypot(a - x, b - y) / Math.hypot(a, b);
      assert.ok(err < 1e-10, `${CASES[k]!.title} at ${JSON.stringify(row.point)}: ours ${x} + ${y}i, reference ${a} + ${b}i (${results[k]})`);
    }
  });
});

test('an integral over more than the limit of symbolic variables is refused, naming the limit', () => {
  const n = LANGUAGE_LIMITS.symbolicVariables + 1;
  const report = evaluateWorksheet(`param k : positive\nintegral Z = exp(-k*(${squares(n)})) d(${list(n).join(', ')})`);
  const s = report.statements[1]!;
  assert.equal(s.status, 'error');
  assert.match(s.error!.message, new RegExp(`more than ${LANGUAGE_LIMITS.symbolicVariables} variables with symbolic parameters`));
});
