// `expect` decided on the whole domain with more than two parameters (cas/verdicts/
// expectExact.ts, decideBySignOnComponents; cas/verdicts/positiveOnDomain.ts). The
// Gaussian formula int exp(-A q^2/2 + f q) dq = sqrt(2*pi/A) * exp(f^2/(2*A)) for Re A > 0
// is common practice; each verdict's value is also checked against mpmath's quadrature in
// a separate process, and every polynomial the positivity test accepts is checked with
// mathjs at random points of its domain.
import { spawnSync } from 'node:child_process';
import { test } from 'node:test';
import assert from 'node:assert/strict';
import * as math from 'mathjs';
import fc from 'fast-check';
import { parseExpression } from '../../cas/lang/parse.js';
import { fromExpr } from '../../cas/exact/ratfunc.js';
import { polyPositiveOnDomain } from '../../cas/verdicts/positiveOnDomain.js';
import type { Domain } from '../../shared/evaluation.js';
import { run } from './support/run.js';

/** mpmath: int exp(-(A) q^2/2 + f q) dq over the real line, for each case. */
function mpmathGauss(cases: { A: [number, number]; f: number }[]): [number, number][] {
  const script = String.raw`
import json, sys
import mpmath as mp
mp.mp.dps = 20
out = []
for c in json.load(sys.stdin):
    A = mp.mpc(*c["A"]); f = c["f"]
    # a finite range outside which the integrand is below e^-70 of its size, cut into short pieces (it oscillates)
    L = mp.sqrt(140 / A.real) + 2 * abs(f) / A.real
    v = mp.quad(lambda q: mp.exp(-A * q * q / 2 + f * q), mp.linspace(-L, L, 161))
    out.append([float(v.real), float(v.imag)])
print(json.dumps(out))
`;
  const r = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', script], { input: JSON.stringify(cases), encoding: 'utf8', timeout: 60_000 });
  assert.equal(r.status, 0, r.stderr);
  return JSON.parse(r.stdout) as [number, number][];
}

const SOURCE = `param a : positive
param b, f : real
integral Z = exp(-(a + i*b)*q^2/2 + f*q) d(q)
expect Z = sqrt(2*pi/(a + i*b))*exp(f^2/(2*(a + i*b)))
expect Z = -sqrt(2*pi/(a + i*b))*exp(f^2/(2*(a + i*b)))
param c : nonzero
integral W = exp(-(a + i*b + c^2)*q^2/2) d(q)
expect W = sqrt(2*pi)/sqrt(a + c^2 + i*b)
expect W = sqrt(2*pi/(i*b - a))
`;

test('three parameters: the same square, every root off its cut, the sign read once per piece', () => {
  const r = run(SOURCE);
  const at = (line: number) => r.statements.find((s) => s.line === line)!;
  const [holds, opposite, holdsW, other] = [at(4), at(5), at(8), at(9)];
  assert.equal(holds!.status, 'ok');
  assert.equal(holds!.proof, 'proved');
  assert.ok(holds!.steps.some((s) => s.kind === 'expect' && s.how === 'continuous-sign'));
  assert.equal(opposite!.status, 'failed');
  assert.equal(opposite!.proof, 'proved');
  assert.equal(holdsW!.status, 'ok');
  assert.equal(holdsW!.proof, 'proved'); // c nonzero: two pieces, c < 0 and c > 0, one point each
  // sqrt(2*pi/(i*b - a)): Re(i*b - a) < 0, so its radicand is not shown off the cut: left to sampling
  assert.equal(other!.proof, 'sampled');
  // the proved form against mpmath's quadrature at points of the domain
  const pts = [{ a: 1.3, b: 0.7, f: 0.7 }, { a: 0.2, b: -3, f: 1.5 }, { a: 4, b: 10, f: -2 }];
  const ref = mpmathGauss(pts.map((p) => ({ A: [p.a, p.b], f: p.f })));
  pts.forEach((p, k) => {
    const A = math.complex(p.a, p.b);
    const v = math.multiply(math.sqrt(math.divide(2 * Math.PI, A) as math.Complex), math.exp(math.divide(p.f * p.f, math.multiply(2, A)) as math.Complex)) as math.Complex;
    assert.ok(Math.hypot(v.re - ref[k]![0], v.im - ref[k]![1]) < 1e-10 * Math.hypot(v.re, v.im), `at ${JSON.stringify(p)}`);
  });
});

test('positivity on the domain: accepted polynomials are positive at random points (mathjs)', () => {
  const domains = new Map<string, Domain>([['a', 'positive'], ['n', 'negative'], ['b', 'real'], ['c', 'nonzero']]);
  const ok = (t: string) => polyPositiveOnDomain(fromExpr(parseExpression(t))!.num, domains);
  for (const t of ['a^2 + b^2', '1 + b^2', 'c^2', 'a*b^4 + a', '-n', 'n^2 + 3', 'pi*a']) assert.equal(ok(t), true, t);
  for (const t of ['b^2', 'a*b + 1', '(a - 1)^2 + 1', 'n', 'a - 1', 'c', '0']) assert.equal(ok(t), false, t);
  const pick: Record<string, fc.Arbitrary<number>> = {
    a: fc.double({ min: 1e-6, max: 50, noNaN: true }), n: fc.double({ min: -50, max: -1e-6, noNaN: true }),
    b: fc.double({ min: -50, max: 50, noNaN: true }), c: fc.oneof(fc.double({ min: -50, max: -1e-6, noNaN: true }), fc.double({ min: 1e-6, max: 50, noNaN: true })),
  };
  const monomial = fc.tuple(fc.integer({ min: -3, max: 5 }), fc.constantFrom('a', 'n', 'b', 'c', '1'), fc.integer({ min: 0, max: 4 }), fc.constantFrom('a', 'n', 'b', 'c', '1'), fc.integer({ min: 0, max: 4 }));
  fc.assert(fc.property(fc.array(monomial, { minLength: 1, maxLength: 4 }), pick['a']!, pick['n']!, pick['b']!, pick['c']!, (ms, a, n, b, c) => {
    const text = ms.map(([k, x, e, y, g]) => `(${k})*${x}^${e}*${y}^${g}`).join(' + ');
    if (!fromExpr(parseExpression(text))?.num.terms.size || !ok(text)) return;
    assert.ok((math.evaluate(text, { a, n, b, c }) as number) > 0, `${text} at a=${a}, n=${n}, b=${b}, c=${c}`);
  }), { numRuns: 300, seed: 20261203 });
});
