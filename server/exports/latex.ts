import type { StatementReport, WorksheetReport } from '../../shared/evaluation.js';
import type { StatementReviewDto } from '../../shared/collaboration.js';
import { renderStep } from '../../shared/record/render.js';

const TEX_ESCAPES: Record<string, string> = {
  '\\': '\\textbackslash{}', '#': '\\#', $: '\\$', '%': '\\%', '&': '\\&', _: '\\_', '{': '\\{', '}': '\\}',
  '~': '\\textasciitilde{}', '^': '\\textasciicircum{}',
};

/** Escapes text for LaTeX's text mode, one character at a time. */
export function texText(s: string): string {
  let out = '';
  for (const ch of s) out += TEX_ESCAPES[ch] ?? ch;
  return out;
}

const verdictWords: Record<string, string> = {
  unreviewed: 'not reviewed',
  requested: 'review requested',
  confirmed: 'confirmed by a reviewer',
  disputed: 'disputed by a reviewer',
};

function statementSection(s: StatementReport, review: StatementReviewDto | undefined): string {
  const out: string[] = [];
  out.push(`\\paragraph{Line ${s.line}${s.name ? ` (${texText(s.name)})` : ''}.}`);
  out.push(`\\begin{verbatim}\n${s.source}\n\\end{verbatim}`);
  if (s.error) out.push(`\\noindent\\textbf{Error:} ${texText(s.error.message)}\n`);
  if (s.convergence) {
    out.push(`\\noindent Convergence: ${s.convergence} (${s.proof === 'proved' ? 'proved' : 'checked at sampled points, not proved'}).\n`);
  }
  if (s.result) out.push(`\\[ ${s.name ? `${s.name} = ` : ''}${s.result.latex} \\]`);
  // The branch verdict's reasons are its branch step, rendered like every other step.
  const branchStep = s.branch ? s.steps.find((step) => step.kind === 'branch') : undefined;
  if (branchStep) out.push(`\\noindent Branch: ${texText(renderStep(branchStep).text)}\n`);
  if (s.steps.length) {
    out.push('\\begin{enumerate}');
    for (const step of s.steps) {
      const { text, latex } = renderStep(step);
      out.push(`  \\item ${texText(text)}${latex ? `\\\\ \\( ${latex} \\)` : ''}`);
    }
    out.push('\\end{enumerate}');
  }
  const status = review?.status ?? 'unreviewed';
  const decided = review?.reviews.find((r) => !r.stale && r.status === status);
  out.push(`\\noindent Review: ${verdictWords[status]}${decided ? ` (${texText(decided.reviewer)}, ${decided.decidedAt?.slice(0, 10) ?? ''})` : ''}.\n`);
  return out.join('\n');
}

/**
 * A standalone appendix (article class, amsmath only) with each statement, its
 * result, its numbered steps and their reasons, and its review status.
 */
export function latexAppendix(o: { title: string; version: number; report: WorksheetReport; reviews: StatementReviewDto[] }): string {
  const byLine = new Map(o.reviews.map((r) => [r.line, r]));
  const body = o.report.statements
    .filter((s) => s.kind !== 'note' || s.steps.length)
    .map((s) => statementSection(s, byLine.get(s.line)))
    .join('\n\n');
  return [
    '\\documentclass{article}',
    '\\usepackage{amsmath}',
    '\\begin{document}',
    `\\section*{Appendix: ${texText(o.title)}}`,
    `Worksheet version ${o.version}, exported from Sheetwise. Verdicts marked` + " ``checked at sampled points'' " + 'rest on numerical sampling and are checks, not proofs.',
    '',
    body,
    '\\end{document}',
    '',
  ].join('\n');
}
