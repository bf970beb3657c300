/** integral NAME = EXPR d(VARS): a Gaussian integral with its convergence, branch and closed form on the record. */
import type { Convergence, Proof, Step, StatementReport } from '../../shared/evaluation.js';
import type { Expr, Statement } from '../lang/ast.js';
import { freeNames, substitute } from '../expr/names.js';
import { neg, num } from '../expr/build.js';
import { complexExpr } from '../expr/numberExpr.js';
import { evaluate } from '../expr/evaluate.js';
import { toLatex, toText } from '../expr/print.js';
import { tidy } from '../expr/tidy.js';
import { agreeAt, differentiate, rewriteChecked } from '../algebra/adapter.js';
import { describePoint, pointRecord, samplePoints, type Point } from '../domains/sample.js';
import { checkDeadline } from '../deadline.js';
import { splitIntegrand, IntegrandError } from '../gaussian/integrand.js';
import { expand, NotPolynomial, prune, totalDegree } from '../gaussian/polynomial.js';
import { formFromPoly, type QuadraticForm } from '../gaussian/form.js';
import { proveConvergence } from '../gaussian/convergenceProof.js';
import { analyzeAt, numericForm, type PointAnalysis } from '../gaussian/numericModel.js';
import { closedForm } from '../gaussian/closedForm.js';
import { complexText, fmt, matrixLatex, matrixText, piMultiple, polar, quarterPhaseText, vectorLatex, vectorText } from '../gaussian/describe.js';
import { blankReport, domainsOf, StatementFailure, type Context } from './context.js';

type IntegralStatement = Extract<Statement, { kind: 'integral' }>;

/** How many parameter points a sampled verdict rests on. */
export const SAMPLE_COUNT = 32;
/** Largest number of variables with symbolic parameters (cofactor expansion grows as n!). */
const MAX_SYMBOLIC_VARS = 4;

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

export function evaluateIntegral(s: IntegralStatement, ctx: Context): StatementReport {
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

  // Numbers first: every verdict below is decided from these.
  const analyses: PointAnalysis[] = points.map((p) => { checkDeadline(); return analyzeAt(numericForm(structural, split.prefactor, p)); });

  // The record shows the adapter's exact derivatives when they agree with the expansion.
  let display: QuadraticForm;
  let derivNote = 'read off by expanding the exponent';
  if (symbolic) {
    const d = derivativeForm(split.exponent, structural, idPoints);
    display = d.agreed ? d.form : simplifyDisplay(structural, idPoints);
    derivNote = d.agreed
      ? 'by exact differentiation (A = -d^2S/dx dx, J = dS/dx, c = S at x = 0), confirmed against the term-by-term expansion'
      : 'from the term-by-term expansion (the algebra package\'s derivatives disagreed with it at sample points and were not used)';
  } else {
    display = numericDisplay(structural);
  }
  report.steps.push({
    kind: 'quadratic-form',
    text: `The exponent is S = -1/2 x^T A x + J^T x + c in x = (${vars.join(', ')}), with A = ${matrixText(display.A)}, J = ${vectorText(display.J)}, c = ${toText(tidy(display.c))}, ${derivNote}.`,
    latex: `A = ${matrixLatex(display.A)},\\quad J = ${vectorLatex(display.J)},\\quad c = ${toLatex(tidy(display.c))}`,
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
      kind: 'convergence', text: `${proof.kind[0]!.toUpperCase()}${proof.kind.slice(1)}, proved: ${proof.reason}`,
      latex: proof.kind === 'absolute'
        ? `\\operatorname{Re} A \\succ 0:\\quad ${proof.minors.map((m, k) => `\\Delta_{${k + 1}} = ${toLatex(tidy(m))}`).join(',\\ ')}`
        : proof.kind === 'oscillatory' ? `\\operatorname{Re} A = 0,\\quad \\det(\\operatorname{Im} A) = ${toLatex(tidy(proof.detB))} \\neq 0`
        : `\\operatorname{Re} A \\not\\succeq 0`,
      ...(proof.kind === 'divergent' ? { direction: proof.direction } : {}),
      samples: { count: analyses.length, agreeing: analyses.length },
    });
  } else if (!symbolic) {
    convergence = first.verdict.kind; proofKind = 'proved';
    const ev = first.verdict.realEigenvalues;
    const words = {
      absolute: 'Absolutely convergent: every eigenvalue of Re A is positive',
      oscillatory: 'Oscillatory: Re A is only semidefinite and Im A is nondegenerate on its kernel, so the integral is defined as the limit of A + epsilon*I as epsilon -> 0+ (the i*epsilon prescription)',
      divergent: first.verdict.kind === 'divergent' && first.verdict.grows
        ? 'Divergent: Re A has a negative eigenvalue, so the integrand grows along its eigenvector'
        : 'Divergent: the exponent has no decaying part along the direction given, so the integrand does not decay',
    }[convergence];
    const cholesky = first.verdict.kind === 'absolute' ? first.verdict.smallestCholeskyPivot : undefined;
    if (cholesky !== undefined) {
      report.steps.push({
        kind: 'convergence',
        text: `Absolutely convergent: Re A is positive definite, since its Cholesky factorization succeeds with every pivot positive (smallest ${fmt(cholesky)}; decided numerically in double precision; with ${n} variables the eigenvalues are not computed).`,
        latex: '\\operatorname{Re} A \\succ 0',
      });
    } else report.steps.push({
      kind: 'convergence',
      text: `${words} (eigenvalues of Re A: ${ev.map((x) => fmt(x)).join(', ')}; decided numerically in double precision)${first.verdict.kind === 'divergent' ? `; direction x = (${first.verdict.direction.join(', ')})` : ''}.`,
      latex: `\\operatorname{spec}(\\operatorname{Re} A) = \\{${ev.map((x) => fmt(x)).join(',\\ ')}\\}`,
      realEigenvalues: ev,
      ...(first.verdict.kind === 'divergent' ? { direction: first.verdict.direction } : {}),
    });
  } else {
    const kindsSeen = [...new Set(kinds)];
    proofKind = 'sampled';
    if (kindsSeen.length === 1) {
      convergence = kindsSeen[0]!;
      const div = first.verdict.kind === 'divergent' ? first.verdict : null;
      report.steps.push({
        kind: 'convergence',
        text: `${convergence[0]!.toUpperCase()}${convergence.slice(1)} at all ${analyses.length} sampled parameter points (checked at ${analyses.length} points, not proved)${convergence === 'oscillatory' ? '; defined as the limit of A + epsilon*I as epsilon -> 0+ (the i*epsilon prescription)' : ''}${div ? `; at ${describePoint(points[0]!)} the integrand ${div.grows ? 'grows' : 'does not decay'} along the direction (${div.direction.join(', ')})` : ''}.`,
        latex: convergence === 'absolute' ? '\\operatorname{Re} A \\succ 0' : convergence === 'oscillatory' ? '\\operatorname{Re} A \\succeq 0' : '\\operatorname{Re} A \\not\\succ 0',
        samples: { count: analyses.length, agreeing: analyses.length },
        ...(div ? { direction: div.direction, at: pointRecord(points[0]!) } : {}),
      });
    } else {
      convergence = 'unknown';
      const bad = analyses.findIndex((a) => a.verdict.kind === 'divergent');
      const badVerdict = bad >= 0 ? analyses[bad]!.verdict : null;
      report.steps.push({
        kind: 'convergence',
        text: `The verdict changes inside the declared domains: ${kindsSeen.map((k) => `${k} at ${count(k)}`).join(', ')} of ${analyses.length} sampled points${bad >= 0 ? `; for example at ${describePoint(points[bad]!)} it diverges along (${badVerdict?.kind === 'divergent' ? badVerdict.direction.join(', ') : ''})` : ''}. The closed form below holds only where the integral converges.`,
        latex: '\\text{convergence depends on the parameters}',
        samples: { count: analyses.length, agreeing: analyses.length - (bad >= 0 ? count('divergent') : 0) },
        ...(badVerdict?.kind === 'divergent' ? { direction: badVerdict.direction, at: pointRecord(points[bad]!) } : {}),
      });
    }
  }
  report.convergence = convergence;
  report.proof = proofKind;

  const good = analyses.map((a, k) => ({ a, p: points[k]! })).filter((x) => x.a.branch && x.a.value);
  if (convergence === 'divergent' || good.length === 0) {
    report.steps.push({ kind: 'result', text: 'The integral diverges: no value.', latex: '\\text{divergent}' });
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
  const eigText = bd.eigenvalues.map((z) => `${complexText(z, 5)} (arg ${piMultiple(Math.atan2(z.im, z.re))})`).join(', ');
  const provedPrincipal = n === 1 || (n === 2 && convergence === 'absolute' && proofKind === 'proved');
  let reason: string;
  const byPivotsOnly = bd.eigenvalues.length === 0;
  if (!symbolic && byPivotsOnly) {
    // Large n with Re A > 0: the pivots alone decide (see gaussian/branchAt.ts).
    const where = b0.principalSign === 1
      ? 'inside (-pi, pi], so the principal sqrt(det A) is that product'
      : 'outside (-pi, pi], so the principal sqrt(det A) has the wrong sign: det(A)^(-1/2) = -1/sqrt(det A)';
    reason = `Re A > 0, so every L D L^T pivot of A has positive real part and det(A)^(1/2) is the product of the pivots' principal roots; the pivots' arguments sum to ${piMultiple(b0.argumentSum)}, ${where}.`;
  } else if (!symbolic) {
    reason = b0.principalSign === 1
      ? `The eigenvalues of A are ${eigText}; their arguments sum to ${piMultiple(b0.argumentSum)}, inside (-pi, pi], so the principal sqrt(det A) is the product of the principal roots.`
      : `The eigenvalues of A are ${eigText}; their arguments sum to ${piMultiple(b0.argumentSum)}, outside (-pi, pi], so the principal sqrt(det A) has the wrong sign: det(A)^(-1/2) = -1/sqrt(det A).`;
  } else if (provedPrincipal && plus === signs.length) {
    reason = n === 1
      ? 'With one variable det A is the eigenvalue itself, in the closed right half plane, so its principal root is the continuous one.'
      : 'With two variables and Re A > 0 both eigenvalue arguments lie in (-pi/2, pi/2), so their sum lies in (-pi, pi) and the principal sqrt(det A) is the product of the principal roots on the whole domain.';
  } else if (plus === signs.length) {
    reason = `The principal sqrt(det A) equals the product of principal roots of the eigenvalues at all ${signs.length} sampled points (checked, not proved).`;
  } else if (plus === 0) {
    reason = `The principal sqrt(det A) has the wrong sign at all ${signs.length} sampled points: det(A)^(-1/2) = -1/sqrt(det A) there (checked, not proved); for example at ${describePoint(decisive.p)} the eigenvalues are ${eigText}, arguments summing to ${piMultiple(bd.argumentSum)}.`;
  } else {
    reason = `The sheet changes inside the domain: the principal sqrt(det A) is right at ${plus} and wrong at ${signs.length - plus} of ${signs.length} sampled points${whereSigns(params, good.map((x) => x.p), signs)} (for example at ${describePoint(decisive.p)}, eigenvalues ${eigText}); the result is written with the product of the pivots' principal roots instead.`;
  }
  report.branch = { principalSqrtDetCorrect: plus === signs.length, reason };
  report.steps.push({
    kind: 'branch',
    text: byPivotsOnly ? reason : `${reason} The L D L^T pivots give the same root${pivotsDisagree ? ` except at ${pivotsDisagree} point(s), where the eigenvalues were used` : ''}.`,
    latex: byPivotsOnly
      ? `\\det(A)^{1/2} = \\prod_k d_k^{1/2},\\quad \\sum_k \\arg d_k = ${fmt(bd.argumentSum / Math.PI, 4)}\\,\\pi`
      : `\\det(A)^{1/2} = \\prod_k \\lambda_k^{1/2},\\quad \\sum_k \\arg \\lambda_k = ${fmt(bd.argumentSum / Math.PI, 4)}\\,\\pi`,
    eigenvalues: bd.eigenvalues.map(polar),
    ...(bd.pivots ? { pivots: bd.pivots.map(polar) } : {}),
    argumentSum: bd.argumentSum,
    ...(symbolic ? { samples: { count: signs.length, agreeing: plus }, at: pointRecord(decisive.p) } : {}),
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
      report.steps.push({
        kind: 'fresnel-phase',
        text: `A = -iB with B real symmetric of signature (${s0.positive}, ${s0.negative}), sig B = ${sig}${symbolic ? ` at all ${sigs.length} sampled points (checked, not proved)` : ''}: det(A)^(-1/2) = |det B|^(-1/2) exp(i*pi*sig/4), phase ${quarterPhaseText(sig)}.`,
        latex: `\\det(A)^{-1/2} = \\left|\\det B\\right|^{-1/2} e^{i\\pi \\operatorname{sig}(B)/4},\\quad \\operatorname{sig}(B) = ${sig}`,
        realEigenvalues: s0.ev,
        signature: fresnel,
      });
    }
  }

  const value = symbolic ? null : good[0]!.a.value!;
  if (!symbolic && (n > 3 || !exactEntries(structural, split.prefactor))) {
    // Long decimal entries: a closed form would only restate the number, at great cost.
    const e = complexExpr(value!);
    report.result = { text: toText(e), latex: toLatex(e), value: { re: value!.re, im: value!.im } };
    report.steps.push({
      kind: 'result',
      text: `${name} = ${complexText(value!, 15)}, from (2 pi)^(n/2) det(A)^(-1/2) exp(J^T A^-1 J / 2 + c) in double precision on the branch above.`,
      latex: `${toLatex({ t: 'name', name })} = ${toLatex(e)}`,
    });
    setResult(ctx, name, line, e, params, structural, split.prefactor, { integrand: s.integrand, vars, convergence });
    return report;
  }
  const cf = closedForm({
    form: display, prefactor: split.prefactor, domains,
    points: good.map((x) => x.p), values: good.map((x) => x.a.value!), signs, fresnel,
  });
  checkDeadline();
  report.result = { text: cf.text, latex: cf.latex, value: value && { re: value.re, im: value.im } };
  const writtenWords = {
    principal: 'with the principal square root of det A',
    negated: 'as minus the principal form, as the branch requires',
    pivots: 'with the principal roots of the L D L^T pivots (the continuous branch throughout)',
    fresnel: 'in the Fresnel form |det B|^(-1/2) exp(i*pi*sig/4)',
  }[cf.written];
  report.steps.push({
    kind: 'result',
    text: `${name} = ${cf.text}, written ${writtenWords}; ${cf.verified
      ? `this form reproduces the continuous branch at ${symbolic ? `all ${good.length} sampled points` : 'the computed value'}`
      : 'WARNING: no written form reproduced the continuous branch at every sampled point; treat it with care'}${value ? `; numerically ${complexText(value, 15)}` : ''}.`,
    latex: `${toLatex({ t: 'name', name })} = ${cf.latex}`,
    samples: { count: good.length, agreeing: cf.verified ? good.length : 0 },
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
