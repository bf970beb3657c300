import type { StatementReport } from '@shared/evaluation';
import { renderStep } from '@shared/record/render';
import type { EditorProblem } from '../editor/code-editor';
import { isProblem } from '../findings/finding-view';

/** The problems of a report as editor markers: errors at their column, failed statements at their line. */
export function editorProblems(statements: readonly StatementReport[]): EditorProblem[] {
  return statements.filter(isProblem).map((s) => ({
    line: s.error?.line ?? s.line,
    column: s.error?.column ?? 1,
    message: s.error?.message ?? failedMessage(s),
    severity: s.status === 'error' ? 'error' : 'warning',
  }));
}

/** Each result's one-line value by name, for the editor's hovers. */
export function resultTexts(statements: readonly StatementReport[]): Map<string, string> {
  const m = new Map<string, string>();
  for (const s of statements) if (s.name && s.result && !m.has(s.name)) m.set(s.name, s.result.text);
  return m;
}

/** Why a statement failed: the sentence of its last expectation or numeric step. */
function failedMessage(s: StatementReport): string {
  const step = [...s.steps].reverse().find((x) => x.kind === 'expect' || x.kind === 'numeric-agreement' || x.kind === 'numeric-check');
  return step ? renderStep(step).text : 'This statement failed.';
}
