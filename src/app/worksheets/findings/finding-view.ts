import type { StatementReport, Step } from '@shared/evaluation';

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
  invalid: 'Not understood',
};

export function kindWord(kind: StatementReport['kind']): string {
  return KIND_WORDS[kind] ?? kind;
}

function stepOf(st: StatementReport, kind: Step['kind']): Step | undefined {
  return st.steps.find((s) => s.kind === kind);
}

/** Convergence: the verdict, and whether it was proved or only sampled (with the count). */
export function convergenceBadge(st: StatementReport): BadgeView | null {
  if (!st.convergence) return null;
  const samples = stepOf(st, 'convergence')?.samples;
  const sampled = st.proof === 'sampled';
  const how = sampled
    ? samples
      ? `checked at ${samples.count} point${samples.count === 1 ? '' : 's'}, not proved`
      : 'checked at sample points, not proved'
    : st.proof === 'proved'
      ? 'proved'
      : '';
  const base: Record<string, Omit<BadgeView, 'kind' | 'detail'>> = {
    absolute: { icon: 'check_circle', label: 'Converges absolutely', tone: 'good' },
    oscillatory: { icon: 'waves', label: 'Oscillatory (i·ε limit)', tone: 'caution' },
    divergent: { icon: 'cancel', label: 'Diverges', tone: 'bad' },
    unknown: { icon: 'help', label: 'Convergence unknown', tone: 'neutral' },
  };
  const b = base[st.convergence];
  const label = how ? `${b.label} · ${how}` : b.label;
  const tone = sampled && b.tone === 'good' ? 'caution' : b.tone;
  return { kind: 'convergence', ...b, tone, label, detail: `Convergence: ${label}.` };
}

/** Branch: is 1/sqrt(det A) with the principal root right, and if not, why. */
export function branchBadge(st: StatementReport): BadgeView | null {
  if (!st.branch) return null;
  return st.branch.principalSqrtDetCorrect
    ? {
        kind: 'branch',
        icon: 'task_alt',
        label: 'Principal root correct',
        detail: `Branch: the principal root of det A is correct. ${st.branch.reason}`,
        tone: 'good',
      }
    : {
        kind: 'branch',
        icon: 'swap_vert',
        label: 'Principal root flipped',
        detail: `Branch: the principal root of det A has the wrong sign. ${st.branch.reason}`,
        tone: 'caution',
      };
}

/** Numeric check: agrees, disagrees, or not run. */
export function numericBadge(st: StatementReport): BadgeView | null {
  if (st.kind === 'param' || st.kind === 'note' || st.kind === 'invalid') return null;
  const check = stepOf(st, 'numeric-check');
  if (!check) {
    return { kind: 'numeric', icon: 'radio_button_unchecked', label: 'Numeric check not run', detail: 'No numeric check was run for this statement.', tone: 'neutral' };
  }
  const err = check.relativeError;
  const errText = err !== undefined ? ` (relative deviation ${formatSmall(err)})` : '';
  const disagrees = st.status === 'failed' || /\bdisagree/i.test(check.text);
  return disagrees
    ? { kind: 'numeric', icon: 'error', label: 'Numeric check disagrees', detail: `Numeric check disagrees${errText}. ${check.text}`, tone: 'bad' }
    : { kind: 'numeric', icon: 'verified', label: 'Numeric check agrees', detail: `Numeric check agrees${errText}. ${check.text}`, tone: 'good' };
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
