/** The readable (non-JSON) report of the command line tool; every step worded by the shared renderer. */
import type { StatementReport, WorksheetReport } from '../../shared/evaluation.js';
import { quarterPhase, renderStep } from '../../shared/record/render.js';
import { complexApprox } from '../../shared/record/numbers.js';

/** One statement's lines of the readable report (the command line's threads send these as statements finish). */
export function statementLines(s: StatementReport): string[] {
  // what the statement's verdicts rest on, at the top: proved on the whole domain, piecewise, or sampled
  const piecewise = s.convergence === 'piecewise' || s.branch?.principal === 'piecewise' || s.steps.some((st) => (st.kind === 'expect' || st.kind === 'legality') && st.regions.length > 0);
  const sampled = s.proof === 'sampled' || s.steps.some((st) => 'basis' in st && st.basis.kind === 'sampled');
  const rests = sampled ? 'sampled, not proved' : s.proof === 'proved' ? (piecewise ? 'piecewise, proved' : 'proved on the whole domain') : '';
  const head = `line ${s.line}  ${s.kind}${s.name ? ` ${s.name}` : ''}: ${s.status}${rests ? ` (${rests})` : ''}`;
  const out = [head];
  if (s.error) out.push(`  error (line ${s.error.line}, column ${s.error.column}): ${s.error.message}`);
  const conv = s.steps.find((st) => st.kind === 'convergence');
  const convBasis = conv && 'basis' in conv ? conv.basis.kind : s.proof === 'proved' ? 'proved' : 'sampled';
  if (s.convergence) out.push(`  convergence: ${s.convergence} (${convBasis === 'sampled' ? 'sampled, not proved' : convBasis === 'numeric' ? 'decided in double precision' : 'proved'})`);
  if (s.result) {
    // A comparison's result is the ratio of its two names (its report name is "A, B").
    const name = s.kind === 'compare' ? (s.name ?? '').replace(', ', '/') : (s.name ?? '');
    out.push(`  result: ${name} ${s.result.text.startsWith('≈') ? '' : '= '}${s.result.text}`);
    if (s.result.value) out.push(`  value: ${complexApprox(s.result.value, 15)}`);
  }
  if (s.branch) out.push(`  branch: principal sqrt(det A) ${{ right: 'is correct', wrong: 'is NOT correct', piecewise: 'is correct only on part of the domain', unknown: 'undecided' }[s.branch.principal]}`);
  if (s.legal !== undefined) out.push(`  legal: ${s.legal}`);
  if (s.sheet) out.push(`  sheet: ${s.sheet}`);
  // the phase only where it is the verdict (an equal pair has ratio 1)
  if (s.verdict) out.push(`  verdict: ${s.verdict}${s.verdict === 'phase' && s.phaseOverPiQuarter !== undefined && s.phaseOverPiQuarter !== null ? ` (phase ${quarterPhase(s.phaseOverPiQuarter)})` : ''}`);
  if (s.agrees !== undefined) out.push(`  agrees: ${s.agrees}`);
  s.steps.forEach((st, k) => out.push(`  ${k + 1}. [${st.kind}] ${renderStep(st).text}`));
  return out;
}

export function formatReport(r: WorksheetReport): string {
  const lines = [`${r.file ?? '(worksheet)'}: ${r.ok ? 'ok' : 'NOT ok'}`];
  for (const s of r.statements) lines.push(...statementLines(s));
  return lines.join('\n');
}
