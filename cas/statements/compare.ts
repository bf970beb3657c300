/**
 * compare A with B: the ratio A/B simplified by the algebra package (accepted only when it agrees
 * numerically), evaluated on the continuous branches at sampled points of the declared domains;
 * verdict equal, equal up to a constant phase (named, as m*pi/4 where it is one), or different.
 */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Statement } from '../lang/ast.js';
import { div, mul } from '../expr/build.js';
import { squareForm } from '../verdicts/squareForm.js';
import { rfDiv, rfEquals, rfSub, ratfunc } from '../exact/ratfunc.js';
import { polyConst } from '../exact/poly.js';
import { sqrtExpr } from '../expr/fromExact.js';
import { fresnelPhase } from '../gaussian/closedForm.js';
import type { Expr } from '../lang/ast.js';
import { toLatex, toText } from '../expr/print.js';
import { tidy } from '../expr/tidy.js';
import { rewriteChecked } from '../algebra/adapter.js';
import { pointRecord, sampledBasis, samplePoints } from '../domains/sample.js';
import { complexApprox, complexApproxLatex } from '../../shared/record/numbers.js';
import { checkDeadline } from '../deadline.js';
import { blankReport, domainsOf, StatementFailure, type Context } from './context.js';
import { resultNamed } from './shared.js';
import { constantRatioHow } from '../verdicts/identity.js';
import { gqToString, gToNumber, Q1, qadd, qIsZero, qmul, qsub } from '../exact/q.js';

const SAMPLES = 24;

export function evaluateCompare(s: Extract<Statement, { kind: 'compare' }>, ctx: Context): StatementReport {
  const line = s.span.start.line;
  const report = blankReport(line, 'compare', `${s.target.name}, ${s.other.name}`);
  const a = resultNamed(ctx, s.target, line, 'comparison');
  const b = resultNamed(ctx, s.other, line, 'comparison');
  const names = [...ctx.params.keys()].filter((p) => a.params.includes(p) || b.params.includes(p));
  const points = names.length ? samplePoints(domainsOf(ctx, names), names, SAMPLES, 31337) : [new Map()];
  const ratios: { p: typeof points[number]; r: { re: number; im: number } }[] = [];
  for (const p of points) {
    checkDeadline();
    const va = a.valueAt(p); const vb = b.valueAt(p);
    if (!va || !vb || Math.hypot(vb.re, vb.im) === 0) continue;
    const d = vb.re * vb.re + vb.im * vb.im;
    ratios.push({ p, r: { re: (va.re * vb.re + va.im * vb.im) / d, im: (va.im * vb.re - va.re * vb.im) / d } });
  }
  if (!ratios.length) throw new StatementFailure(`${s.target.name} or ${s.other.name} diverges at every sampled point: nothing to compare.`, line, s.span.start.column);
  const r0 = ratios[0]!.r;
  const spread = Math.max(...ratios.map(({ r }) => Math.hypot(r.re - r0.re, r.im - r0.im) / Math.max(Math.hypot(r0.re, r0.im), 1e-300)));
  const constant = spread < 1e-9;
  const modulus = Math.hypot(r0.re, r0.im);
  const arg = Math.atan2(r0.im, r0.re);
  const m = Math.round(arg / (Math.PI / 4));
  const isQuarter = Math.abs(m * (Math.PI / 4) - arg) < 1e-9;
  let verdict: 'equal' | 'phase' | 'different';
  if (constant && Math.abs(modulus - 1) < 1e-9 && isQuarter && ((m % 8) + 8) % 8 === 0) verdict = 'equal';
  else if (constant && Math.abs(modulus - 1) < 1e-9) verdict = 'phase';
  else verdict = 'different';
  report.verdict = verdict;
  report.phaseOverPiQuarter = constant && Math.abs(modulus - 1) < 1e-9 && isQuarter ? (m === -4 ? 4 : m) : null;
  // proved on the whole domain when the ratio is an exact constant of the forms (verdicts/identity.ts),
  // kept only when every sampled ratio agrees with it
  // (a let's exact form, not its sampled simplification: see ResultInfo.exactForm)
  const [fa, fb] = [a.exactForm ?? a.expr, b.exactForm ?? b.expr];
  const shown = fa && fb ? constantRatioHow(fa, fb) : null;
  const c = shown?.ratio ?? null;
  const cv = c && gToNumber(c);
  const provedRatio = !!cv && ratios.every(({ r }) => Math.hypot(r.re - cv.re, r.im - cv.im) <= 1e-9 * Math.max(1, Math.hypot(cv.re, cv.im)));
  if (provedRatio) {
    const unit = qIsZero(qsub(qadd(qmul(c!.re, c!.re), qmul(c!.im, c!.im)), Q1));
    const quarter = c!.im.n === 0n ? (c!.re.n > 0n ? 0 : 4) : c!.re.n === 0n ? (c!.im.n > 0n ? 2 : -2) : null;
    verdict = unit && quarter === 0 ? 'equal' : unit ? 'phase' : 'different';
    report.verdict = verdict;
    report.phaseOverPiQuarter = unit && quarter !== null ? quarter : null;
  }
  // the symbolic ratio, kept only when it agrees with the numbers
  let ratioText: string | null = null;
  let ratioLatex: string | null = null;
  // exact first: equal exponentials and a constant ratio of squares give |ratio| exactly and its phase as m*pi/4
  // (a proved constant ratio is printed as that constant: no form to simplify)
  const exact = a.expr && b.expr && !provedRatio ? exactConstantRatio(a.expr, b.expr, r0) : null;
  if (exact) {
    const agrees = ratios.every(({ p, r }) => {
      try { const v = ratioAt(exact, p); return Math.hypot(v.re - r.re, v.im - r.im) <= 1e-8 * Math.max(1, Math.hypot(r.re, r.im)); } catch { return false; }
    });
    if (agrees) { ratioText = toText(exact); ratioLatex = toLatex(exact); }
  }
  if (ratioText === null && a.expr && b.expr && !provedRatio) {
    const sym = rewriteChecked('simplify', div(a.expr, b.expr), points.slice(0, 8));
    const t = tidy(sym.expr);
    const symAgrees = ratios.every(({ p, r }) => {
      try { const v = ratioAt(t, p); return Math.hypot(v.re - r.re, v.im - r.im) <= 1e-8 * Math.max(1, Math.hypot(r.re, r.im)); } catch { return false; }
    });
    if (symAgrees) { ratioText = toText(t); ratioLatex = toLatex(t); }
  }
  if (provedRatio) { ratioText = gqToString(c!); ratioLatex = ratioText.replace(/\*/g, ''); }
  const worst = ratios.reduce((w, x) => (Math.hypot(x.r.re - 1, x.r.im) > Math.hypot(w.r.re - 1, w.r.im) ? x : w), ratios[0]!);
  const basis = provedRatio ? { kind: 'proved' as const } : names.length
    ? sampledBasis(domainsOf(ctx, names), names, ratios.length, ratios.filter(({ r }) => Math.hypot(r.re - r0.re, r.im - r0.im) < 1e-9 * Math.max(1, modulus)).length)
    : { kind: 'numeric' as const };
  if (provedRatio) report.proof = 'proved';
  report.steps.push({
    kind: 'comparison', a: s.target.name, b: s.other.name,
    ratio: ratioText === null ? null : { text: ratioText, latex: ratioLatex! },
    ratioValue: r0, constant, basis, spread,
    ...(provedRatio ? { how: shown!.how } : {}),
  });
  report.steps.push({
    kind: 'comparison-verdict', a: s.target.name, b: s.other.name, verdict,
    phaseOverPiQuarter: report.phaseOverPiQuarter,
    ...(verdict === 'phase' && report.phaseOverPiQuarter === null ? { phase: arg } : {}),
    ...(verdict === 'different' ? { example: { ...(names.length ? { at: pointRecord(worst.p) } : {}), ratio: worst.r } } : {}),
  });
  report.result = ratioText !== null
    ? { text: ratioText, latex: ratioLatex!, value: names.length === 0 || constant ? r0 : null }
    : { text: complexApprox(r0, 12), latex: complexApproxLatex(r0, 12), value: names.length === 0 || constant ? r0 : null };
  return report;
}

import { evaluate } from '../expr/evaluate.js';
function ratioAt(e: Parameters<typeof evaluate>[0], p: Parameters<typeof evaluate>[1]) { return evaluate(e, p); }

/**
 * A/B as r * exp(i*pi*m/4) with r exact, when A and B have equal exponentials and the ratio of
 * their squares is a constant c with c real or purely imaginary; the sign (which root of c)
 * from the computed ratio r0, so the printed phase is exact: exp(3*i*pi/4)*sqrt(2), not 131836323*i/186444716 + ….
 */
function exactConstantRatio(a: Expr, b: Expr, r0: { re: number; im: number }): Expr | null {
  const fa = squareForm(a); const fb = squareForm(b);
  if (!fa || !fb) return null;
  // exponentials may differ by a constant phase i*pi*q (exp(3*i*pi/4) against none)
  let quarterTurns = 0;
  if (!rfEquals(fa.S, fb.S)) {
    const d = rfSub(fa.S, fb.S);
    const t = [...d.num.terms.values()];
    if (d.den.terms.size !== 1 || [...d.den.terms.values()][0]!.m.length || t.length !== 1) return null;
    const only = t[0]!; const den = [...d.den.terms.values()][0]!.c;
    if (only.m.length !== 1 || only.m[0]![0] !== 'pi' || only.m[0]![1] !== 1 || only.c.re.n !== 0n || den.im.n !== 0n) return null;
    const qn = only.c.im.n * den.re.d * 4n; const qd = only.c.im.d * den.re.n;
    if (qn % qd !== 0n) return null;
    quarterTurns = Number(qn / qd);
  }
  const c = rfDiv(fa.sq, fb.sq);
  if (c.num.terms.size > 1 || c.den.terms.size !== 1 || [...c.num.terms.values()].some((t) => t.m.length) || [...c.den.terms.values()].some((t) => t.m.length)) return null;
  const cv = [...c.num.terms.values()][0]?.c;
  const dv = [...c.den.terms.values()][0]!.c;
  if (!cv || dv.im.n !== 0n) return null;
  const re = { n: cv.re.n * dv.re.d, d: cv.re.d * dv.re.n }; const im = { n: cv.im.n * dv.re.d, d: cv.im.d * dv.re.n };
  if (re.n !== 0n && im.n !== 0n) return null;
  const mag = re.n !== 0n ? re : im;
  const abs = { n: mag.n < 0n ? -mag.n : mag.n, d: mag.d < 0n ? -mag.d : mag.d };
  // arg c in quarter turns: 0 (positive), 2 (negative), 1 (i), -1 (-i); the ratio's phase is half of it, or that plus pi
  const q = re.n > 0n || re.d < 0n && re.n < 0n ? 0 : re.n !== 0n ? 4 : (im.n > 0n) === (im.d > 0n) ? 2 : -2;
  const half = q / 2;
  const candidates = [half, half + 4].map((m) => (((m + quarterTurns) % 8) + 8) % 8);
  const arg0 = Math.atan2(r0.im, r0.re);
  const m = candidates.reduce((best, k) => (Math.abs(Math.cos(arg0 - (k * Math.PI) / 4) - 1) < Math.abs(Math.cos(arg0 - (best * Math.PI) / 4) - 1) ? k : best));
  const r = sqrtExpr(ratfunc(polyConst({ re: abs, im: { n: 0n, d: 1n } })), new Set());
  const phase = m === 0 ? null : fresnelPhase(m);
  return phase ? (r.t === 'num' && r.v === '1' ? phase : mul(phase, r)) : r;
}
