import type { StatementReport, Step, StepKind, StepOf } from '@shared/evaluation';
import { renderStep } from '@shared/record/render';

/** How a badge reads: an icon and a word always, a tone for colour on top. (The review badge is the card's own button.) */
export interface BadgeView {
  kind: 'convergence' | 'branch' | 'numeric' | 'review';
  icon: string;
  label: string;
  /** A longer sentence, for the tooltip and screen readers. */
  detail: string;
  tone: 'good' | 'caution' | 'bad' | 'neutral';
}

const KIND_WORDS: Record<StatementReport['kind'], string> = {
  param: 'Parameter',
  integral: 'Integral',
  expect: 'Expectation',
  note: 'Note',
  rotate: 'Rotation',
  continue: 'Continuation',
  compare: 'Comparison',
  verify: 'Numeric check',
  let: 'Definition',
  limit: 'Limit',
  moment: 'Moment',
  derivative: 'Derivative',
  invalid: 'Not understood',
};

export function kindWord(kind: StatementReport['kind']): string {
  return KIND_WORDS[kind] ?? kind;
}

function stepOf<K extends StepKind>(st: StatementReport, kind: K): StepOf<K> | undefined {
  return st.steps.find((s: Step): s is StepOf<K> => s.kind === kind);
}

/** Convergence: the verdict, and whether it was proved or only sampled (with the count). */
export function convergenceBadge(st: StatementReport): BadgeView | null {
  if (!st.convergence) return null;
  const basis = stepOf(st, 'convergence')?.basis;
  const sampled = st.proof === 'sampled';
  const how = sampled
    ? basis?.kind === 'sampled'
      ? `checked at ${basis.count} point${basis.count === 1 ? '' : 's'}, not proved`
      : 'checked at sample points, not proved'
    : st.proof === 'proved'
      ? 'proved'
      : '';
  const base: Record<string, Omit<BadgeView, 'kind' | 'detail'>> = {
    absolute: { icon: 'check_circle', label: 'Converges absolutely', tone: 'good' },
    oscillatory: { icon: 'waves', label: 'Oscillatory (i·ε limit)', tone: 'caution' },
    divergent: { icon: 'cancel', label: 'Diverges', tone: 'bad' },
    piecewise: { icon: 'rule', label: 'Converges on part of the domain', tone: 'caution' },
    unknown: { icon: 'help', label: 'Convergence unknown', tone: 'neutral' },
  };
  const b = base[st.convergence];
  const label = how ? `${b.label} · ${how}` : b.label;
  const tone = sampled && b.tone === 'good' ? 'caution' : b.tone;
  return { kind: 'convergence', ...b, tone, label, detail: `Convergence: ${label}.` };
}

/** The sentence of the statement's branch step (why the principal root is or is not right). */
export function branchReason(st: StatementReport): string {
  const step = stepOf(st, 'branch');
  return step ? renderStep(step).text : '';
}

/** Branch: is 1/sqrt(det A) with the principal root right, and if not, why. */
export function branchBadge(st: StatementReport): BadgeView | null {
  if (!st.branch) return null;
  const why = branchReason(st);
  switch (st.branch.principal) {
    case 'right': return { kind: 'branch', icon: 'task_alt', label: 'Principal root correct', detail: `Branch: the principal root of det A is correct. ${why}`, tone: 'good' };
    case 'wrong': return { kind: 'branch', icon: 'swap_vert', label: 'Principal root flipped', detail: `Branch: the principal root of det A has the wrong sign. ${why}`, tone: 'caution' };
    case 'piecewise': return { kind: 'branch', icon: 'swap_vert', label: 'Principal root right on part of the domain', detail: `Branch: the principal root of det A is right only on part of the domain. ${why}`, tone: 'caution' };
    default: return { kind: 'branch', icon: 'help', label: 'Branch undecided', detail: `Branch: undecided. ${why}`, tone: 'neutral' };
  }
}

/**
 * Numeric check: agrees, disagrees, or not run, read from the typed record: a verify
 * statement's `agrees`, else the agreement step's `agrees`; a failed verify disagrees.
 */
export function numericBadge(st: StatementReport): BadgeView | null {
  if (st.kind === 'param' || st.kind === 'note' || st.kind === 'invalid') return null;
  const agreement = stepOf(st, 'numeric-agreement');
  const agrees = st.agrees ?? agreement?.agrees;
  if (agrees === undefined) {
    return { kind: 'numeric', icon: 'radio_button_unchecked', label: 'Numeric check not run', detail: 'No numeric check was run for this statement.', tone: 'neutral' };
  }
  const diff = agreement?.relativeDifference;
  const diffText = diff != null ? ` (relative deviation ${formatSmall(diff)})` : '';
  const sentence = agreement ? ` ${renderStep(agreement).text}` : '';
  const disagrees = !agrees || (st.kind === 'verify' && st.status === 'failed');
  return disagrees
    ? { kind: 'numeric', icon: 'error', label: 'Numeric check disagrees', detail: `Numeric check disagrees${diffText}.${sentence}`, tone: 'bad' }
    : { kind: 'numeric', icon: 'verified', label: 'Numeric check agrees', detail: `Numeric check agrees${diffText}.${sentence}`, tone: 'good' };
}

export function badgesOf(st: StatementReport): BadgeView[] {
  return [convergenceBadge(st), branchBadge(st), numericBadge(st)].filter((b): b is BadgeView => !!b);
}

/** The status of a whole statement, in a word (with an icon). */
export function statusView(st: StatementReport): { icon: string; label: string } {
  switch (st.status) {
    case 'error':
      return { icon: 'report', label: 'Error' };
    case 'failed':
      return { icon: 'block', label: 'Failed' };
    default:
      return { icon: 'check', label: 'Done' };
  }
}

/** A statement is a problem when it errs or an expectation fails. */
export function isProblem(st: StatementReport): boolean {
  return st.status !== 'ok';
}

export function formatSmall(x: number): string {
  if (x === 0) return '0';
  return Math.abs(x) < 1e-3 || Math.abs(x) >= 1e4 ? x.toExponential(1) : x.toPrecision(3);
}
