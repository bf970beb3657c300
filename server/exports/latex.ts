import type { StatementReport, WorksheetReport } from '../../shared/evaluation.js';
import type { StatementReviewDto } from '../../shared/collaboration.js';

/** Escapes text for LaTeX's text mode. */
export function texText(s: string): string {
  return s
    .replace(/\\/g, '\\textbackslash{}')
    .replace(/([#$%&_{}])/g, '\\$1')
    .replace(/~/g, '\\textasciitilde{}')
    .replace(/\^/g, '\\textasciicircum{}');
}

const verdictWords: Record<string, string> = {
  unreviewed: 'not reviewed',
  requested: 'review requested',
  confirmed: 'confirmed by a reviewer',
  disputed: 'disputed by a reviewer',
};

function statementSection(s: StatementReport, source: string, review: StatementReviewDto | undefined): string {
  const out: string[] = [];
  out.push(`\\paragraph{Line ${s.line}${s.name ? ` (${texText(s.name)})` : ''}.}`);
  out.push(`\\begin{verbatim}\n${source}\n\\end{verbatim}`);
  if (s.error) out.push(`\\noindent\\textbf{Error:} ${texText(s.error.message)}\n`);
  if (s.convergence) {
    out.push(`\\noindent Convergence: ${s.convergence} (${s.proof === 'proved' ? 'proved' : 'checked at sampled points, not proved'}).\n`);
  }
  if (s.result) out.push(`\\[ ${s.name ? `${s.name} = ` : ''}${s.result.latex} \\]`);
  if (s.branch) out.push(`\\noindent Branch: ${texText(s.branch.reason)}\n`);
  if (s.steps.length) {
    out.push('\\begin{enumerate}');
    for (const step of s.steps) {
      out.push(`  \\item ${texText(step.text)}${step.latex ? `\\\\ \\( ${step.latex} \\)` : ''}`);
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
export function latexAppendix(o: { title: string; version: number; source: string; report: WorksheetReport; reviews: StatementReviewDto[] }): string {
  const lines = o.source.split('\n');
  const byLine = new Map(o.reviews.map((r) => [r.line, r]));
  const body = o.report.statements
    .filter((s) => s.kind !== 'note' || s.steps.length)
    .map((s) => statementSection(s, lines[s.line - 1] ?? '', byLine.get(s.line)))
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
