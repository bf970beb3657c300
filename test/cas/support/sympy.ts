/**
 * Independent algebra: python3 with sympy, run as a separate process (sympy 1.11 or later:
 * only Poly, QQ_I, Matrix.det(method='berkowitz'), sqf_list, real_roots, count_roots).
 * Polynomials cross as JSON term lists, so no expression text is parsed on either side.
 */
import { spawnSync } from 'node:child_process';
import { type Poly, polyFromTerms } from '../../../cas/exact/poly.js';
import { qFromString, qToString } from '../../../cas/exact/q.js';
import type { UPoly } from '../../../cas/exact/univariate.js';

type JTerm = [[string, number][], string, string];

const SCRIPT = String.raw`
import json, sys
from sympy import Symbol, Rational, I, Poly, Matrix, real_roots, N, re, im, sign, Integer
tasks = json.load(sys.stdin)
def mk(terms, syms):
    e = Integer(0)
    for (m, a, b) in terms:
        c = Rational(a) + Rational(b) * I
        for (v, k) in m:
            c = c * syms[v] ** k
        e += c
    return e
def out(p, gens):
    res = []
    for (mon, c) in Poly(p, *gens, domain='QQ_I').terms():
        r, i = re(c), im(c)
        res.append([[[str(g), int(k)] for g, k in zip(gens, mon) if k], str(Rational(r)), str(Rational(i))])
    return res
x = Symbol('x')
def up(cs):
    return Poly(list(reversed([Integer(int(c)) for c in cs])), x)
res = []
for t in tasks:
    op = t['op']
    if op in ('minors', 'gcd', 'sqf'):
        syms = {v: Symbol(v) for v in t['vars']}
        gens = [syms[v] for v in t['vars']]
    if op == 'minors':
        M = Matrix([[mk(e, syms) for e in row] for row in t['M']])
        n = M.shape[0]
        res.append([out(M[:k, :k].det(method='berkowitz').expand(), gens) for k in range(1, n + 1)])
    elif op == 'gcd':
        a = Poly(mk(t['a'], syms), *gens, domain='QQ_I'); b = Poly(mk(t['b'], syms), *gens, domain='QQ_I')
        res.append(out(a.gcd(b).as_expr(), gens))
    elif op == 'sqf':
        a = Poly(mk(t['a'], syms), *gens, domain='QQ_I')
        c, fs = a.sqf_list()
        res.append([[out(f.as_expr(), gens), k] for (f, k) in fs])
    elif op == 'roots':
        p = up(t['p'])
        rs = real_roots(p.sqf_part())
        res.append([str(N(r, 30)) for r in rs])
    elif op == 'count':
        p = up(t['p'])
        res.append(int(p.sqf_part().count_roots(Rational(t['a']), Rational(t['b']))))
    elif op == 'signs':
        p = up(t['p']); q = up(t['q'])
        s = []
        for r in real_roots(p.sqf_part()):
            v = N(q.as_expr().subs(x, r), 60)
            s.append(0 if abs(v) < 1e-40 else (1 if v > 0 else -1))
        res.append(s)
print(json.dumps(res))
`;

export type SympyTask =
  | { op: 'minors'; vars: string[]; M: Poly[][] }
  | { op: 'gcd'; vars: string[]; a: Poly; b: Poly }
  | { op: 'sqf'; vars: string[]; a: Poly }
  | { op: 'roots'; p: UPoly }
  | { op: 'count'; p: UPoly; a: string; b: string }
  | { op: 'signs'; p: UPoly; q: UPoly };

const toJ = (p: Poly): JTerm[] => [...p.terms.values()].map((t) => [t.m.map(([v, e]) => [v, e]), qToString(t.c.re), qToString(t.c.im)]);
const fromJ = (ts: JTerm[]): Poly => polyFromTerms(ts.map(([m, a, b]) => ({ m, c: { re: qFromString(a), im: qFromString(b) } })));

function run(tasks: SympyTask[]): unknown[] {
  const input = JSON.stringify(tasks.map((t) => {
    switch (t.op) {
      case 'minors': return { ...t, M: t.M.map((r) => r.map(toJ)) };
      case 'gcd': return { ...t, a: toJ(t.a), b: toJ(t.b) };
      case 'sqf': return { ...t, a: toJ(t.a) };
      case 'roots': return { op: t.op, p: t.p.map(String) };
      case 'count': return { ...t, p: t.p.map(String) };
      case 'signs': return { op: t.op, p: t.p.map(String), q: t.q.map(String) };
    }
  }));
  const r = spawnSync(process.env['SHEETWISE_PYTHON'] ?? 'python3', ['-c', SCRIPT], { input, encoding: 'utf8', timeout: 120_000 });
  if (r.status !== 0) throw new Error(`sympy failed: ${r.stderr || r.error}`);
  return JSON.parse(r.stdout) as unknown[];
}

/** Leading principal minors by sympy's Berkowitz determinant. */
export const sympyMinors = (cases: { vars: string[]; M: Poly[][] }[]): Poly[][] =>
  (run(cases.map((c) => ({ op: 'minors' as const, ...c }))) as JTerm[][][]).map((ms) => ms.map(fromJ));
/** sympy's Poly.gcd over QQ_I. */
export const sympyGcd = (cases: { vars: string[]; a: Poly; b: Poly }[]): Poly[] =>
  (run(cases.map((c) => ({ op: 'gcd' as const, ...c }))) as JTerm[][]).map(fromJ);
/** sympy's Poly.sqf_list over QQ_I (the factors; the unit is left out). */
export const sympySqf = (cases: { vars: string[]; a: Poly }[]): { f: Poly; k: number }[][] =>
  (run(cases.map((c) => ({ op: 'sqf' as const, ...c }))) as [JTerm[], number][][]).map((fs) => fs.map(([f, k]) => ({ f: fromJ(f), k })));
/** Distinct real roots by sympy's real_roots, 30 digits each, increasing. */
export const sympyRealRoots = (ps: UPoly[]): number[][] =>
  (run(ps.map((p) => ({ op: 'roots' as const, p }))) as string[][]).map((rs) => rs.map(Number));
/** Distinct roots in [a, b] by sympy's count_roots (a, b rationals as text). */
export const sympyCountRoots = (cases: { p: UPoly; a: string; b: string }[]): number[] =>
  run(cases.map((c) => ({ op: 'count' as const, ...c }))) as number[];
/** Sign of q at each distinct real root of p: sympy's real_roots, q evaluated to 60 digits. */
export const sympySignsAtRoots = (cases: { p: UPoly; q: UPoly }[]): number[][] =>
  run(cases.map((c) => ({ op: 'signs' as const, ...c }))) as number[][];
