/**
 * compare A with B: the ratio A/B simplified by the algebra package (accepted only when it agrees
 * numerically), evaluated on the continuous branches at sampled points of the declared domains;
 * verdict equal, equal up to a constant phase (named, as m*pi/4 where it is one), or different.
 */
import type { StatementReport } from '../../shared/evaluation.js';
import type { Statement } from '../lang/ast.js';
import { div } from '../expr/build.js';
import { toLatex, toText } from '../expr/print.js';
import { tidy } from '../expr/tidy.js';
import { rewriteChecked } from '../algebra/adapter.js';
import { pointRecord, sampledBasis, samplePoints } from '../domains/sample.js';
import { complexApprox, complexApproxLatex } from '../../shared/record/numbers.js';
import { checkDeadline } from '../deadline.js';
import { blankReport, domainsOf, StatementFailure, type Context } from './context.js';
import { resultNamed } from './shared.js';

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
  // the symbolic ratio, kept only when it agrees with the numbers
  let ratioText: string | null = null;
  let ratioLatex: string | null = null;
  if (a.expr && b.expr) {
    const sym = rewriteChecked('simplify', div(a.expr, b.expr), points.slice(0, 8));
    const t = tidy(sym.expr);
    const symAgrees = ratios.every(({ p, r }) => {
      try { const v = ratioAt(t, p); return Math.hypot(v.re - r.re, v.im - r.im) <= 1e-8 * Math.max(1, Math.hypot(r.re, r.im)); } catch { return false; }
    });
    if (symAgrees) { ratioText = toText(t); ratioLatex = toLatex(t); }
  }
  const worst = ratios.reduce((w, x) => (Math.hypot(x.r.re - 1, x.r.im) > Math.hypot(w.r.re - 1, w.r.im) ? x : w), ratios[0]!);
  const basis = names.length
    ? sampledBasis(domainsOf(ctx, names), names, ratios.length, ratios.filter(({ r }) => Math.hypot(r.re - r0.re, r.im - r0.im) < 1e-9 * Math.max(1, modulus)).length)
    : { kind: 'numeric' as const };
  report.steps.push({
    kind: 'comparison', a: s.target.name, b: s.other.name,
    ratio: ratioText === null ? null : { text: ratioText, latex: ratioLatex! },
    ratioValue: r0, constant, basis, spread,
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
