/**
 * Integrals over Grassmann variables, d(t1, ..., tn : grassmann), by the Berezin rule
 * (integral of dtheta = 0, of theta dtheta = 1), integrated in the order written with the
 * leftmost differential outermost. For an exponent -1/2 theta^T A theta + c (A antisymmetric,
 * read off the products as written: c_ij theta_i theta_j gives A_ij = -c_ij, A_ji = c_ij), the
 * top term of the exponential is (-1)^(n/2) Pf(A) theta_1...theta_n and the ordered measure
 * contributes (-1)^(n(n-1)/2), whose product is +1 for every even n: the result is
 * exp(c) Pf(A), exactly. Pairs psibar, psi are Grassmann variables like any other, so
 * exp(-psibar M psi) comes out as +-det M according to the order written (recorded).
 * Real or complex variables alongside give the product of the bosonic Gaussian and the
 * Pfaffian (a superdeterminant), provided no term mixes the two kinds.
 */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Expr, NameRef, Statement } from '../lang/ast.js';
import { Complex } from 'complex.js';
import { div, mul, neg, num, call, add } from '../expr/build.js';
import { evaluate } from '../expr/evaluate.js';
import { freeNames } from '../expr/names.js';
import { formulaOf } from '../expr/print.js';
import { ratExpr } from '../expr/fromExact.js';
import { fromExpr, rfEvalComplex, rfIsZero, rfNeg, RF0, type RatFunc } from '../exact/ratfunc.js';
import { pfaffianExact } from '../exact/pfaffian.js';
import { reorder } from '../exact/grassmann.js';
import { blankReport, StatementFailure, type Context } from './context.js';
import type { Point } from '../domains/sample.js';

type IntegralStatement = Extract<Statement, { kind: 'integral' }>;

/** A sum of scalar coefficients times ordered products of Grassmann variables (indices ascending). */
type GSum = Map<string, { coef: Expr; vars: number[] }>;

const keyOf = (vars: number[]) => vars.join(',');


function gAdd(a: GSum, b: GSum, sign = 1): GSum {
  const out = new Map(a);
  for (const [k, t] of b) {
    const c = sign < 0 ? neg(t.coef) : t.coef;
    const prev = out.get(k);
    out.set(k, prev ? { vars: t.vars, coef: add(prev.coef, c) } : { vars: t.vars, coef: c });
  }
  return out;
}

function gMul(a: GSum, b: GSum): GSum {
  let out: GSum = new Map();
  for (const x of a.values()) for (const y of b.values()) {
    const { sign, idx: vars } = reorder([...x.vars, ...y.vars]);
    if (sign === 0) continue;
    const c = mul(x.coef, y.coef);
    out = gAdd(out, new Map([[keyOf(vars), { vars, coef: c }]]), sign);
  }
  return out;
}

export function evaluateBerezin(s: IntegralStatement, ctx: Context, real: (s: IntegralStatement) => StatementReport): StatementReport {
  const line = s.span.start.line;
  const name = s.name.name;
  const kinds = s.kinds ?? s.vars.map(() => 'real' as const);
  const odd = s.vars.filter((_, k) => kinds[k] === 'grassmann');
  const even: NameRef[] = s.vars.filter((_, k) => kinds[k] !== 'grassmann');
  const index = new Map(odd.map((v, k) => [v.name, k]));
  const fail = (msg: string, col = s.span.start.column): never => { throw new StatementFailure(msg, line, col); };
  if (odd.length % 2) fail(`An odd number of Grassmann variables (${odd.length}) integrates a Gaussian to 0; list an even number.`);

  // the integrand: a prefactor free of Grassmann variables times exp(E)
  const factors: Expr[] = [];
  const flat = (e: Expr) => { if (e.t === 'bin' && e.op === '*') { flat(e.a); flat(e.b); } else factors.push(e); };
  flat(s.integrand);
  const exps = factors.filter((f) => f.t === 'call' && f.fn === 'exp');
  const hasOdd = (e: Expr) => [...freeNames(e).keys()].some((n) => index.has(n));
  if (exps.length !== 1 || factors.some((f) => !exps.includes(f) && hasOdd(f))) fail('With Grassmann variables the integrand must be exp(EXPONENT), or a factor free of them times it.');
  const exponent = (exps[0] as Extract<Expr, { t: 'call' }>).args[0]!;

  const expandG = (e: Expr): GSum => {
    switch (e.t) {
      case 'num': case 'const': return new Map([['', { coef: e, vars: [] }]]);
      case 'name': return index.has(e.name) ? new Map([[String(index.get(e.name)), { coef: num(1), vars: [index.get(e.name)!] }]]) : new Map([['', { coef: e, vars: [] }]]);
      case 'neg': return gAdd(new Map(), expandG(e.a), -1);
      case 'bin': {
        if (e.op === '+') return gAdd(expandG(e.a), expandG(e.b));
        if (e.op === '-') return gAdd(expandG(e.a), expandG(e.b), -1);
        if (e.op === '*') return gMul(expandG(e.a), expandG(e.b));
        if (hasOdd(e.b)) return fail('A Grassmann variable may not appear in a divisor or an exponent.');
        if (e.op === '/') return new Map([...expandG(e.a)].map(([k, t]) => [k, { ...t, coef: div(t.coef, e.b) }]));
        if (hasOdd(e.a)) return fail('Write products of Grassmann variables as products (t1*t2), not powers: a power of one vanishes.');
        return new Map([['', { coef: e, vars: [] }]]);
      }
      case 'call':
        if (hasOdd(e)) return fail(`${e.fn} of a Grassmann variable is not a Gaussian exponent.`);
        return new Map([['', { coef: e, vars: [] }]]);
    }
  };
  const E = expandG(exponent);
  const n = odd.length;
  const A: RatFunc[][] = Array.from({ length: n }, () => Array.from({ length: n }, () => RF0));
  let scalar: Expr = num(0);
  for (const t of E.values()) {
    if (t.vars.length === 0) { scalar = add(scalar, t.coef); continue; }
    if (t.vars.length !== 2) fail(`The exponent has a term of degree ${t.vars.length} in the Grassmann variables; only quadratic terms (and none linear: sources are not supported yet) give a Gaussian.`);
    if ([...freeNames(t.coef).keys()].some((v) => even.some((x) => x.name === v))) fail('A term mixes Grassmann and real variables; the integral is then not a product of a Gaussian and a Pfaffian.');
    const c = fromExpr(t.coef);
    if (!c) fail('The coefficients of the Grassmann terms must be rational in the parameters to give an exact Pfaffian.');
    const [i, j] = t.vars as [number, number];
    A[i]![j] = rfNeg(c!);
    A[j]![i] = c!;
  }
  const pf = pfaffianExact(A);
  const pfExpr = ratExpr(pf, true);
  const steps = [
    { kind: 'variables' as const, complex: [], grassmann: odd.map((v) => v.name) },
    {
      kind: 'berezin' as const, vars: odd.map((v) => v.name), A: A.map((row) => row.map((x) => formulaOf(ratExpr(x, true)))),
      pfaffian: formulaOf(pfExpr), constant: !even.length && !(scalar.t === 'num' && Number(scalar.v) === 0) ? formulaOf(scalar) : null,
    },
  ];
  const others = factors.filter((f) => f !== exps[0]);
  const prefactor = others.reduce<Expr>((a, b) => mul(a, b), num(1));

  if (!even.length) {
    // exp(c) * prefactor * Pf(A): no convergence question
    const report = blankReport(line, 'integral', name);
    if (ctx.results.has(name) || ctx.params.has(name)) fail(`The name ${name} is already in use; give the integral a new name.`);
    for (const v of freeNames(s.integrand).keys()) if (!index.has(v) && !ctx.params.has(v)) fail(`Unknown name "${v}": declare it with param, or list it among the integration variables.`);
    const isZeroScalar = scalar.t === 'num' && Number(scalar.v) === 0;
    let expr: Expr = pfExpr;
    if (!isZeroScalar) expr = mul(expr, call('exp', scalar));
    if (others.length) expr = mul(prefactor, expr);
    const params = [...ctx.params.keys()].filter((p) => freeNames(expr).has(p));
    const valueAt = (p: Point) => {
      try { const z = evaluate(expr, new Map(p)); return Number.isFinite(z.re) && Number.isFinite(z.im) ? { re: z.re, im: z.im } : null; } catch { return null; }
    };
    report.proof = 'proved';
    report.result = { ...formulaOf(expr), value: params.length ? null : valueAt(new Map()) };
    report.steps.push(...steps);
    ctx.results.set(name, { line, unavailable: null, expr, params, valueAt, definition: expr, berezin: { vars: odd.map((v) => v.name), A } });
    return report;
  }
  // the bosonic part through the real route, then times the Pfaffian
  const bosonic: IntegralStatement = { ...s, integrand: mul(prefactor, call('exp', scalar)), vars: even, kinds: even.map((v) => (s.kinds ?? [])[s.vars.indexOf(v)] ?? 'real') };
  const report = real(bosonic);
  report.steps.unshift(...steps);
  const entry = ctx.results.get(name);
  if (report.status !== 'ok' || !entry || !report.result) return report;
  const pfAt = (p: Point) => rfEvalComplex(pf, new Map([...p].map(([k, z]) => [k, { re: z.re, im: z.im }])));
  const expr = entry.expr ? mul(pfExpr, entry.expr) : null;
  report.result = expr ? { ...formulaOf(expr), value: report.result.value ? mulC(report.result.value, pfAt(new Map())) : null } : report.result;
  ctx.results.set(name, {
    ...entry, expr, gaussian: undefined, definition: expr ?? undefined,
    params: [...new Set([...entry.params, ...[...ctx.params.keys()].filter((p) => freeNames(pfExpr).has(p))])],
    valueAt: entry.valueAt ? (p) => { const v = entry.valueAt!(p); return v && mulC(v, pfAt(p)); } : null,
  });
  report.steps.push({ kind: 'note', text: rfIsZero(pf)
    ? 'The Pfaffian is identically zero, so the integral vanishes.'
    : `The result is the Pfaffian ${formulaOf(pfExpr).text} times the integral over ${even.map((v) => v.name).join(', ')} above${expr ? `: ${name} = ${formulaOf(expr).text}` : ''}.` });
  return report;
}

const mulC = (a: { re: number; im: number }, b: { re: number; im: number }) => { const z = new Complex(a.re, a.im).mul(b.re, b.im); return { re: z.re, im: z.im }; };
