/** integral NAME = EXPR d(VARS): a Gaussian integral with its convergence, branch and closed form on the record. */
import type { Convergence, Proof, Step, StatementReport } from '../../shared/evaluation.js';
import type { Expr, Statement } from '../lang/ast.js';
import { LANGUAGE_LIMITS } from '../../shared/language.js';
import { exactFormOf } from '../verdicts/exactForm.js';
import { analyzeOnLine } from '../verdicts/exactGaussian.js';
import { evaluateIntegralExactly, NonFiniteValue } from './integralExact.js';
import { freeNames, substitute } from '../expr/names.js';
import { mul, neg, num } from '../expr/build.js';
import { ratExpr } from '../expr/fromExact.js';
import { fromExpr, rfEvalComplex } from '../exact/ratfunc.js';
import { variables } from '../exact/poly.js';
import { gaussianAverage } from './moment.js';
import { complexExpr } from '../expr/numberExpr.js';
import { evaluate } from '../expr/evaluate.js';
import { formulaOf, toLatex, toText } from '../expr/print.js';
import { tidy } from '../expr/tidy.js';
import { agreeAt, differentiate, rewriteChecked } from '../algebra/adapter.js';
import { pointRecord, sampledBasis, samplePoints, type Point } from '../domains/sample.js';
import { checkDeadline } from '../deadline.js';
import { splitIntegrand, IntegrandError } from '../gaussian/integrand.js';
import { expand, NotPolynomial, prune, totalDegree } from '../gaussian/polynomial.js';
import { formFromPoly, type QuadraticForm } from '../gaussian/form.js';
import { proveConvergence } from '../gaussian/convergenceProof.js';
import { analyzeAt, numericForm, type PointAnalysis } from '../gaussian/numericModel.js';
import { closedForm } from '../gaussian/closedForm.js';
import { complexText, fmt, matrixLatex, matrixText, piMultiple, polar, quarterPhaseText, vectorLatex, vectorText } from '../gaussian/describe.js';
import { blankReport, domainsOf, StatementFailure, type Context } from './context.js';
import { integralDiagram } from './shared.js';
import { evaluateBerezin } from './berezin.js';
import { realPartsOf } from './complexVariables.js';
import { complexApprox, complexApproxLatex, pointText } from '../../shared/record/numbers.js';

type IntegralStatement = Extract<Statement, { kind: 'integral' }>;

/** How many parameter points a sampled verdict rests on. */
export const SAMPLE_COUNT = 32;
/** Largest number of variables with symbolic parameters: the language's own limit. */
const MAX_SYMBOLIC_VARS = LANGUAGE_LIMITS.symbolicVariables;

function fail(message: string, line: number, span: { start: { column: number } } | undefined, fallback: number): never {
  throw new StatementFailure(message, line, span?.start.column ?? fallback);
}

function checkNames(s: IntegralStatement, ctx: Context): string[] {
  const line = s.span.start.line;
  const vars = new Set<string>();
  for (const v of s.vars) {
    if (ctx.params.has(v.name)) fail(`${v.name} is declared as a parameter on line ${ctx.params.get(v.name)!.line}; an integration variable needs a name of its own.`, line, v.span, 1);
    vars.add(v.name);
  }
  if (ctx.params.has(s.name.name) || ctx.results.has(s.name.name) || vars.has(s.name.name)) {
    fail(`The name ${s.name.name} is already in use; give the integral a new name.`, line, s.name.span, 1);
  }
  const used: string[] = [];
  for (const [n, span] of freeNames(s.integrand)) {
    if (vars.has(n)) continue;
    if (ctx.params.has(n)) { used.push(n); continue; }
    if (ctx.results.has(n)) fail(`Results such as ${n} cannot appear inside an integral in this version.`, line, span, 1);
    fail(`Unknown name "${n}": declare it with param, or list it among the integration variables d(...).`, line, span, 1);
  }
  // keep declaration order, so records are stable
  return [...ctx.params.keys()].filter((p) => used.includes(p));
}

/** The adapter's exact derivatives, used for display when they agree with the structural expansion. */
function derivativeForm(exponent: Expr, form: QuadraticForm, points: readonly Point[]): { form: QuadraticForm; agreed: boolean } {
  const n = form.vars.length;
  const zero = new Map(form.vars.map((v) => [v, num(0)] as const));
  const first = form.vars.map((v) => differentiate(exponent, v));
  const A: Expr[][] = form.A.map((row) => [...row]);
  const J: Expr[] = [...form.J];
  let agreed = true;
  for (let j = 0; j < n && agreed; j++) {
    const dj = first[j];
    if (!dj) { agreed = false; break; }
    const jj = atZero(dj, zero, points);
    if (!agreeAt(jj, form.J[j]!, points) && !(isZeroAt(jj, points) && isZeroAt(form.J[j]!, points))) { agreed = false; break; }
    J[j] = jj;
    for (let k = j; k < n; k++) {
      checkDeadline();
      const d2 = differentiate(dj, form.vars[k]!);
      if (!d2) { agreed = false; break; }
      const a = atZero(neg(d2), zero, points);
      if (!agreeAt(a, form.A[j]![k]!, points) && !(isZeroAt(a, points) && isZeroAt(form.A[j]![k]!, points))) { agreed = false; break; }
      A[j]![k] = a; A[k]![j] = a;
    }
  }
  if (!agreed) return { form, agreed };
  const c = atZero(exponent, zero, points);
  return { form: { vars: form.vars, A, J, c: agreeAt(c, form.c, points) || isZeroAt(c, points) ? c : form.c }, agreed };
}

/** e at x = 0; expanded only when the variables actually occur (second derivatives of a quadratic are already constant). */
function atZero(e: Expr, zero: ReadonlyMap<string, Expr>, points: readonly Point[]): Expr {
  const names = freeNames(e);
  if (![...zero.keys()].some((v) => names.has(v))) return e;
  return rewriteChecked('expand', substitute(e, zero), points).expr;
}

function isZeroAt(e: Expr, points: readonly Point[]): boolean {
  return points.every((p) => { try { return evaluate(e, p).abs() < 1e-300; } catch { return false; } });
}

/** Entries without parameters shown as numbers. */
function numericDisplay(form: QuadraticForm): QuadraticForm {
  const empty = new Map();
  const show = (e: Expr) => complexExpr(evaluate(e, empty));
  return { vars: form.vars, A: form.A.map((r) => r.map(show)), J: form.J.map(show), c: show(form.c) };
}

function simplifyDisplay(form: QuadraticForm, points: readonly Point[]): QuadraticForm {
  const s = (e: Expr) => rewriteChecked('simplify', e, points).expr;
  return { vars: form.vars, A: form.A.map((r) => r.map(s)), J: form.J.map(s), c: s(form.c) };
}

/** Dispatch on the kinds of variables: Grassmann (Berezin), complex (as real pairs), or real. */
export function evaluateIntegral(s: IntegralStatement, ctx: Context): StatementReport {
  const kinds = s.kinds ?? [];
  if (kinds.includes('grassmann')) return evaluateBerezin(s, ctx, (b) => evaluateIntegral(b, ctx));
  if (kinds.includes('complex')) {
    const taken = (n: string) => ctx.params.has(n) || ctx.results.has(n) || s.vars.some((v) => v.name === n);
    const { statement, pairs } = realPartsOf(s, taken);
    const report = evaluateRealIntegral(statement, ctx);
    report.steps.unshift({ kind: 'variables', complex: pairs, grassmann: [] });
    return report;
  }
  const poly = polynomialPrefactor(s);
  if (poly) return evaluateWithPolynomial(s, ctx, poly.P, poly.bare);
  return evaluateRealIntegral(s, ctx);
}

/** Factors of the integrand that hold integration variables but no exp: a polynomial P(x) before exp(S). */
function polynomialPrefactor(s: IntegralStatement): { P: Expr; bare: Expr } | null {
  const vars = new Set(s.vars.map((v) => v.name));
  const factors: Expr[] = [];
  const flat = (e: Expr) => { if (e.t === 'bin' && e.op === '*') { flat(e.a); flat(e.b); } else factors.push(e); };
  flat(s.integrand);
  const holdsVar = (e: Expr) => [...freeNames(e).keys()].some((n) => vars.has(n));
  const isExp = (e: Expr) => e.t === 'call' && e.fn === 'exp';
  const polys = factors.filter((f) => !isExp(f) && holdsVar(f));
  if (!polys.length || !factors.some(isExp)) return null;
  // only a polynomial in the variables takes this route; anything else gets the real route's message at its place
  const isPolynomial = (f: Expr) => { const r = fromExpr(f); return !!r && !variables(r.den).some((v) => vars.has(v)); };
  if (!polys.every(isPolynomial)) return null;
  const rest = factors.filter((f) => !polys.includes(f));
  return { P: polys.reduce((a, b) => mul(a, b)), bare: rest.reduce((a, b) => mul(a, b)) };
}

/**
 * integral of P(x) exp(S): the Gaussian integral of exp(S) with all its verdicts, times the
 * average <P> by Wick contractions (statements/moment.ts), exactly. Convergence and the
 * branch are those of the bare integral: a polynomial does not change either.
 */
function evaluateWithPolynomial(s: IntegralStatement, ctx: Context, P: Expr, bare: Expr): StatementReport {
  const line = s.span.start.line;
  const name = s.name.name;
  const report = evaluateRealIntegral({ ...s, integrand: bare }, ctx);
  const entry = ctx.results.get(name);
  if (report.status !== 'ok' || !entry?.gaussian || !report.result) return report;
  const g = entry.gaussian;
  const avg = gaussianAverage(g, P, (msg) => { throw new StatementFailure(msg, line, s.span.start.column); });
  const avgExpr = ratExpr(avg.result, true);
  const at = (p: Point) => rfEvalComplex(avg.result, new Map([...p].map(([k, z]) => [k, { re: z.re, im: z.im }])));
  const expr = entry.expr ? mul(avgExpr, entry.expr) : null;
  const times = (a: { re: number; im: number }, b: { re: number; im: number }) => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re });
  report.steps.push(
    {
      kind: 'moment', name, under: name, polynomial: formulaOf(P),
      mean: avg.mu.map((m) => formulaOf(ratExpr(m, true))), covariance: avg.C.map((row) => row.map((x) => formulaOf(ratExpr(x, true)))),
      pairings: avg.pairings, result: formulaOf(avgExpr), convergence: g.convergence,
    },
    { kind: 'note', text: `The steps above are those of exp(S) alone (a polynomial changes neither convergence nor the branch); the polynomial ${formulaOf(P).text} multiplies that integral by its average ${formulaOf(avgExpr).text}${expr ? `: ${name} = ${formulaOf(expr).text}` : ''}.` },
  );
  if (expr) report.result = { ...formulaOf(expr), value: report.result.value ? times(report.result.value, at(new Map())) : null };
  const params = [...new Set([...entry.params, ...[...ctx.params.keys()].filter((p) => freeNames(avgExpr).has(p))])];
  ctx.results.set(name, {
    ...entry, expr, gaussian: undefined, definition: expr ?? undefined, params,
    valueAt: entry.valueAt ? (p) => { const v = entry.valueAt!(p); return v && times(v, at(p)); } : null,
  });
  return report;
}

function evaluateRealIntegral(s: IntegralStatement, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const name = s.name.name;
  const report = blankReport(line, 'integral', name);
  const vars = s.vars.map((v) => v.name);
  const n = vars.length;
  const params = checkNames(s, ctx);
  const domains = domainsOf(ctx, params);
  const symbolic = params.length > 0;
  if (symbolic && n > MAX_SYMBOLIC_VARS) {
    fail(`Integrals over more than ${MAX_SYMBOLIC_VARS} variables with symbolic parameters are not supported in this version; give the parameters numbers.`, line, s.span, 1);
  }

  let split;
  try { split = splitIntegrand(s.integrand, new Set(vars)); } catch (e) {
    if (e instanceof IntegrandError) fail(e.message, line, e.span, s.integrand.span?.start.column ?? 1);
    throw e;
  }
  const points = symbolic ? samplePoints(domains, params, SAMPLE_COUNT) : [new Map()];
  const idPoints = symbolic ? [...points.slice(0, 3), ...samplePoints(new Map(), params, 2, 999)] : points;

  let poly;
  try { poly = prune(expand(split.exponent, vars), idPoints); } catch (e) {
    if (e instanceof NotPolynomial) {
      fail(`${e.message}`, line, freeNames(s.integrand).get(e.variable) ?? s.integrand.span, 1);
    }
    throw e;
  }
  const deg = totalDegree(poly);
  if (deg.degree > 2) {
    const exps = deg.exps!;
    const j = exps.indexOf(Math.max(...exps));
    const term = vars.map((v, k) => (exps[k]! === 0 ? '' : exps[k]! === 1 ? v : `${v}^${exps[k]}`)).filter(Boolean).join('*');
    fail(`The exponent has degree ${deg.degree} in ${vars[j]} (the term ${term}); a Gaussian integral needs an exponent of degree at most 2.`, line, freeNames(s.integrand).get(vars[j]!), 1);
  }
  const structural = formFromPoly(poly, vars);
  checkDeadline();

  // Exact first: entries rational in at most one real parameter (after scaling) are decided on the whole domain.
  const exactForm = symbolic || (n <= 3 && exactEntries(structural, split.prefactor)) ? exactFormOf(structural) : null;
  const onLine = exactForm ? analyzeOnLine(exactForm, domains) : null;
  checkDeadline();
  if (exactForm && onLine) {
    try {
      return evaluateIntegralExactly({ name, line, vars, params, domains, structural, prefactor: split.prefactor, integrand: s.integrand, form: exactForm, analysis: onLine }, ctx, report);
    } catch (e) {
      if (e instanceof NonFiniteValue) fail(`${e.message} Write the large factor separately (for example with let) or change the parameters.`, line, s.span, 1);
      throw e;
    }
  }

  // Numbers first: every verdict below is decided from these.
  const analyses: PointAnalysis[] = points.map((p) => { checkDeadline(); return analyzeAt(numericForm(structural, split.prefactor, p)); });

  // The record shows the adapter's exact derivatives when they agree with the expansion.
  let display: QuadraticForm;
  let source: 'derivatives' | 'expansion' | 'numbers' = 'numbers';
  if (symbolic) {
    const d = derivativeForm(split.exponent, structural, idPoints);
    display = d.agreed ? d.form : simplifyDisplay(structural, idPoints);
    source = d.agreed ? 'derivatives' : 'expansion';
  } else {
    display = numericDisplay(structural);
  }
  report.steps.push({
    kind: 'quadratic-form', vars, source, rotated: false,
    A: display.A.map((r) => r.map(formulaOf)), J: display.J.map(formulaOf), c: formulaOf(display.c),
  });

  // Convergence.
  const proof = symbolic ? proveConvergence(display.A, domains) : null;
  const kinds = analyses.map((a) => a.verdict.kind);
  const count = (k: string) => kinds.filter((x) => x === k).length;
  let convergence: Convergence;
  let proofKind: Proof;
  const first = analyses[0]!;
  if (proof && count(proof.kind) === analyses.length) {
    convergence = proof.kind; proofKind = 'proved';
    report.steps.push({
      kind: 'convergence', verdict: proof.kind, basis: { kind: 'proved' },
      reason: proof.kind === 'absolute' ? 'sylvester' : proof.kind === 'oscillatory' ? 'i-epsilon' : 'diagonal',
      minors: proof.kind === 'absolute' ? proof.minors.map(formulaOf) : [],
      realEigenvalues: [], regions: [], boundaries: [], counts: {},
      ...(proof.kind === 'divergent' ? { direction: proof.direction } : {}),
    });
  } else if (!symbolic) {
    convergence = first.verdict.kind; proofKind = 'proved';
    const ev = first.verdict.realEigenvalues;
    const cholesky = first.verdict.kind === 'absolute' ? first.verdict.smallestCholeskyPivot : undefined;
    const reason = cholesky !== undefined ? 'cholesky'
      : first.verdict.kind === 'oscillatory' ? 'i-epsilon'
      : first.verdict.kind === 'divergent' ? (first.verdict.grows ? 'grows' : 'no-decay') : 'eigenvalues';
    report.steps.push({
      kind: 'convergence', verdict: convergence, reason, basis: { kind: 'numeric' },
      minors: [], realEigenvalues: ev, regions: [], boundaries: [], counts: {},
      ...(cholesky !== undefined ? { smallestPivot: cholesky } : {}),
      ...(first.verdict.kind === 'divergent' ? { direction: first.verdict.direction } : {}),
    });
  } else {
    const kindsSeen = [...new Set(kinds)];
    proofKind = 'sampled';
    if (kindsSeen.length === 1) {
      convergence = kindsSeen[0]!;
      const div = first.verdict.kind === 'divergent' ? first.verdict : null;
      report.steps.push({
        kind: 'convergence', verdict: convergence, reason: 'sampled', basis: sampledBasis(domains, params, analyses.length),
        minors: [], realEigenvalues: [], regions: [], boundaries: [], counts: {},
        ...(div ? { direction: div.direction, at: pointRecord(points[0]!) } : {}),
      });
    } else {
      convergence = 'unknown';
      const bad = analyses.findIndex((a) => a.verdict.kind === 'divergent');
      const badVerdict = bad >= 0 ? analyses[bad]!.verdict : null;
      report.steps.push({
        kind: 'convergence', verdict: 'unknown', reason: 'sampled',
        basis: sampledBasis(domains, params, analyses.length, analyses.length - (bad >= 0 ? count('divergent') : 0)),
        minors: [], realEigenvalues: [], regions: [], boundaries: [],
        counts: Object.fromEntries(kindsSeen.map((k) => [k, count(k)])),
        ...(badVerdict?.kind === 'divergent' ? { direction: badVerdict.direction, at: pointRecord(points[bad]!) } : {}),
      });
    }
  }
  report.convergence = convergence;
  report.proof = proofKind;

  const good = analyses.map((a, k) => ({ a, p: points[k]! })).filter((x) => x.a.branch && x.a.value);
  if (convergence === 'divergent' || good.length === 0) {
    report.steps.push({ kind: 'result', name, formula: null, written: 'none', verified: true, basis: { kind: 'proved' }, value: null, pieces: [] });
    ctx.results.set(name, { line, unavailable: `${name} (line ${line}) diverges and has no value`, expr: null, params, valueAt: null });
    return report;
  }

  // Branch of det(A)^(1/2).
  const signs = good.map((x) => x.a.branch!.principalSign);
  const plus = signs.filter((x) => x === 1).length;
  const b0 = good[0]!.a.branch!;
  const decisive = good.find((x) => x.a.branch!.principalSign === -1) ?? good[0]!;
  const bd = decisive.a.branch!;
  const pivotsDisagree = good.filter((x) => x.a.branch!.pivotsAgree === false).length;
  const provedPrincipal = n === 1 || (n === 2 && convergence === 'absolute' && proofKind === 'proved');
  const byPivotsOnly = bd.eigenvalues.length === 0;
  const principal: 'right' | 'wrong' | 'piecewise' = plus === signs.length ? 'right' : plus === 0 ? 'wrong' : 'piecewise';
  const rule = !symbolic ? (byPivotsOnly ? 'pivots' : 'eigenvalues')
    : provedPrincipal && principal === 'right' ? (n === 1 ? 'one-variable' : 'two-variables') : 'sampled';
  report.branch = { principalSqrtDetCorrect: principal === 'right', principal };
  report.diagram = integralDiagram(bd.eigenvalues, symbolic ? pointText(pointRecord(decisive.p)) : undefined);
  report.steps.push({
    kind: 'branch', principal, rule,
    basis: !symbolic ? { kind: 'numeric' } : rule === 'sampled' ? sampledBasis(domains, params, signs.length, plus) : { kind: 'proved' },
    eigenvalues: bd.eigenvalues.map(polar),
    pivots: bd.pivots ? bd.pivots.map(polar) : [],
    argumentSum: bd.argumentSum,
    pivotsAgree: byPivotsOnly ? null : pivotsDisagree === 0,
    crossings: [], regions: [],
    ...(symbolic ? { at: pointRecord(decisive.p) } : {}),
  });

  // Fresnel signature, when A = -iB with B real at every point.
  let fresnel: { positive: number; negative: number } | null = null;
  if (convergence === 'oscillatory') {
    const sigs = good.map((x) => {
      const f = numericForm(structural, split.prefactor, x.p);
      const scale = Math.max(...Array.from(f.A.im, Math.abs), ...Array.from(f.A.re, Math.abs));
      if (Array.from(f.A.re).some((v) => Math.abs(v) > 1e-12 * scale)) return null;
      // B = i A = -Im A when Re A = 0
      const negIm = Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => -f.A.im[i * n + j]!));
      const ev = x.a.branch!.eigenvalues.map((z) => -z.im);
      return { positive: ev.filter((v) => v > 0).length, negative: ev.filter((v) => v < 0).length, negIm, ev };
    });
    const s0 = sigs[0];
    if (s0 && sigs.every((s) => s && s.positive === s0.positive && s.negative === s0.negative)) {
      fresnel = { positive: s0.positive, negative: s0.negative };
      const sig = s0.positive - s0.negative;
      void sig;
      report.steps.push({
        kind: 'fresnel-phase', signature: fresnel, realEigenvalues: s0.ev,
        basis: symbolic ? sampledBasis(domains, params, sigs.length) : { kind: 'numeric' },
      });
    }
  }

  const value = symbolic ? null : good[0]!.a.value!;
  if (!symbolic && (n > 3 || !exactEntries(structural, split.prefactor))) {
    // Long decimal entries: a closed form would only restate the number, at great cost.
    const e = complexExpr(value!);
    // a number from floating point is printed with ≈, never dressed up as an exact form
    const approxFormula = { text: complexApprox(value!, 15), latex: complexApproxLatex(value!, 15) };
    report.result = { ...approxFormula, value: { re: value!.re, im: value!.im } };
    report.steps.push({ kind: 'result', name, formula: approxFormula, written: 'numeric', verified: true, basis: { kind: 'numeric' }, value: { re: value!.re, im: value!.im }, pieces: [] });
    setResult(ctx, name, line, e, params, structural, split.prefactor, { integrand: s.integrand, vars, convergence });
    return report;
  }
  const cf = closedForm({
    form: display, prefactor: split.prefactor, domains,
    points: good.map((x) => x.p), values: good.map((x) => x.a.value!), signs, fresnel,
  });
  checkDeadline();
  report.result = { text: cf.text, latex: cf.latex, value: value && { re: value.re, im: value.im } };
  report.steps.push({
    kind: 'result', name, formula: { text: cf.text, latex: cf.latex }, written: cf.written, verified: cf.verified,
    basis: symbolic ? sampledBasis(domains, params, good.length, cf.verified ? good.length : 0) : { kind: 'numeric' },
    value: value ? { re: value.re, im: value.im } : null, pieces: [],
  });
  setResult(ctx, name, line, cf.expr, params, structural, split.prefactor, { integrand: s.integrand, vars, convergence });
  return report;
}

/** For one real parameter, the sampled ranges where the principal root is right and wrong. */
function whereSigns(params: readonly string[], points: readonly Point[], signs: readonly (1 | -1)[]): string {
  if (params.length !== 1) return '';
  const name = params[0]!;
  const values = points.map((p) => p.get(name)!);
  if (values.some((v) => v.im !== 0)) return '';
  const range = (sign: 1 | -1) => {
    const xs = values.filter((_, k) => signs[k] === sign).map((v) => v.re);
    return `${name} in [${fmt(Math.min(...xs), 3)}, ${fmt(Math.max(...xs), 3)}]`;
  };
  return ` (right for sampled ${range(1)}, wrong for sampled ${range(-1)})`;
}

function setResult(ctx: Context, name: string, line: number, expr: Expr, params: string[], form: QuadraticForm, prefactor: Expr,
  g: { integrand: Expr; vars: string[]; convergence: Convergence }): void {
  ctx.results.set(name, {
    line, unavailable: null, expr, params,
    valueAt: (p) => analyzeAt(numericForm(form, prefactor, p)).value,
    gaussian: { ...g, form, prefactor, contour: null },
  });
}

/** Every entry a small exact fraction (possibly times i): then a closed form is worth writing. */
function exactEntries(form: QuadraticForm, prefactor: Expr): boolean {
  const empty = new Map();
  const exact = (e: Expr) => {
    const z = evaluate(e, empty);
    return [z.re, z.im].every((x) => { for (let q = 1; q <= 10000; q++) if (Math.abs(Math.round(x * q) - x * q) < 1e-12 * Math.max(1, Math.abs(x * q))) return true; return false; });
  };
  return [...form.A.flat(), ...form.J, form.c].every(exact) && freeNames(prefactor).size === 0;
}
