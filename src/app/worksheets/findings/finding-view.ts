import type { StatementReport, Step, StepKind, StepOf } from '@shared/evaluation';
import { nameLatex, renderStep } from '@shared/record/render';

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
  product: 'Mode product',
  determinant: 'Functional determinant',
  sliced: 'Time-sliced determinant',
  sum: 'Gaussian sum',
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

/** Statements that define a value a `verify NAME` line can check by quadrature. */
export function isCheckable(st: StatementReport): boolean {
  return !!st.name && !!st.result && st.status === 'ok' && (st.kind === 'integral' || (st.kind === 'rotate' && st.legal !== false));
}

/** The verify statements of a result: `verify NAME` lines after it, before NAME is defined again. */
export function checksOf(st: StatementReport, all: readonly StatementReport[]): StatementReport[] {
  if (!isCheckable(st)) return [];
  const redefined = all.find((o) => o.line > st.line && o.name === st.name && (o.kind === 'integral' || o.kind === 'rotate' || o.kind === 'let'));
  return all.filter((o) => o.kind === 'verify' && o.name === st.name && o.line > st.line && (!redefined || o.line < redefined.line));
}

/** Whether a verify statement agrees: its typed `agrees`, else its agreement step's; an erring or failed one does not. */
function verifyAgrees(v: StatementReport): boolean | undefined {
  if (v.status === 'error') return false;
  const agrees = v.agrees ?? stepOf(v, 'numeric-agreement')?.agrees;
  return agrees === undefined ? undefined : agrees && v.status !== 'failed';
}

/**
 * Numeric check, read from the typed record: on a verify card its own `agrees`; on a result
 * (an integral or an allowed rotation) the verify statements of that result (`checks`), or an
 * agreement step of its own. Other statements (continuations, limits, notes…) have none.
 */
export function numericBadge(st: StatementReport, checks: readonly StatementReport[] = []): BadgeView | null {
  if (st.kind !== 'verify' && !isCheckable(st) && !stepOf(st, 'numeric-agreement')) return null;
  const agreement = stepOf(st, 'numeric-agreement');
  const own = st.kind === 'verify' ? verifyAgrees(st) : agreement?.agrees;
  const lines = checks.map((v) => ({ line: v.line, agrees: verifyAgrees(v) })).filter((c) => c.agrees !== undefined);
  if (own === undefined && !lines.length) {
    return { kind: 'numeric', icon: 'radio_button_unchecked', label: 'Numeric check not run', detail: 'No numeric check was run for this result: a verify line for it checks it by quadrature.', tone: 'neutral' };
  }
  const where = lines.length ? ` (verify on line${lines.length > 1 ? 's' : ''} ${lines.map((c) => c.line).join(', ')})` : '';
  const agrees = own !== false && lines.every((c) => c.agrees);
  const diff = agreement?.relativeDifference;
  const diffText = diff != null ? ` (relative deviation ${formatSmall(diff)})` : '';
  const sentence = agreement ? ` ${renderStep(agreement).text}` : '';
  return agrees
    ? { kind: 'numeric', icon: 'verified', label: 'Numeric check agrees', detail: `Numeric check agrees${diffText}${where}.${sentence}`, tone: 'good' }
    : { kind: 'numeric', icon: 'error', label: 'Numeric check disagrees', detail: `Numeric check disagrees${diffText}${where}.${sentence}`, tone: 'bad' };
}

export function badgesOf(st: StatementReport, checks: readonly StatementReport[] = []): BadgeView[] {
  return [convergenceBadge(st), branchBadge(st), numericBadge(st, checks)].filter((b): b is BadgeView => !!b);
}

/** The verdict in a card's head: an icon, a word, a tone, and the exact condition where it has one. */
export interface VerdictView {
  icon: string;
  label: string;
  tone: 'good' | 'caution' | 'bad' | 'neutral';
  /** An exact condition from the record (a region's formula), shown after the word. */
  condition?: { text: string; latex: string };
  /** Whether it counts in the problem total. */
  problem: boolean;
}

const joinConditions = (cs: { condition: { text: string; latex: string } }[]) =>
  cs.length ? { text: cs.map((c) => c.condition.text).join(' or '), latex: cs.map((c) => c.condition.latex).join(' \\ \\text{or}\\ ') } : undefined;

/**
 * The statement's verdict for its card head, read from typed fields only: an error, a failure,
 * a rotation not allowed, a divergent integral, the sheet of a continuation, the verdict of a
 * comparison, a limit's outcome, a verdict that holds on part of the domain (with its condition).
 */
export function verdictView(st: StatementReport): VerdictView {
  if (st.status === 'error') return { icon: 'report', label: 'Error', tone: 'bad', problem: true };
  if (st.status === 'failed') {
    return st.kind === 'expect' ? { icon: 'block', label: 'Does not hold', tone: 'bad', problem: true }
      : st.kind === 'verify' ? { icon: 'block', label: 'Disagrees', tone: 'bad', problem: true }
      : { icon: 'block', label: 'Failed', tone: 'bad', problem: true };
  }
  if (st.kind === 'rotate' && st.legal === false) {
    const legality = stepOf(st, 'legality');
    const allowed = joinConditions(legality?.regions.filter((r) => r.holds) ?? []);
    return allowed
      ? { icon: 'block', label: 'Not allowed; allowed only for', condition: allowed, tone: 'bad', problem: true }
      : { icon: 'block', label: 'Not allowed', tone: 'bad', problem: true };
  }
  if ((st.kind === 'integral' || st.kind === 'rotate') && st.convergence === 'divergent') return { icon: 'cancel', label: 'Divergent', tone: 'bad', problem: true };
  if (st.kind === 'continue' && st.sheet) {
    return st.sheet === 'principal'
      ? { icon: 'layers', label: 'Principal sheet', tone: 'good', problem: false }
      : { icon: 'flip', label: 'Minus the principal sheet', tone: 'caution', problem: false };
  }
  if (st.kind === 'compare' && st.verdict) {
    const m = st.phaseOverPiQuarter ?? stepOf(st, 'comparison-verdict')?.phaseOverPiQuarter ?? null;
    switch (st.verdict) {
      case 'equal': return { icon: 'equal', label: 'Equal', tone: 'good', problem: false };
      case 'phase': return m !== null
        ? { icon: 'rotate_right', label: 'Equal up to the phase', condition: { text: `exp(${m}*i*pi/4)`, latex: `e^{${m === 1 ? '' : m === -1 ? '-' : m}i\\pi/4}` }, tone: 'caution', problem: false }
        : { icon: 'rotate_right', label: 'Equal up to a constant phase', tone: 'caution', problem: false };
      case 'different': return { icon: 'not_equal', label: 'Different', tone: 'caution', problem: false };
    }
  }
  if (st.kind === 'limit') {
    const lim = stepOf(st, 'limit');
    switch (lim?.outcome) {
      case 'asymptotic': return { icon: 'trending_flat', label: 'Leading behaviour', tone: 'neutral', problem: false };
      case 'divergent': return { icon: 'north_east', label: 'Diverges', tone: 'caution', problem: false };
      case 'oscillating': return { icon: 'waves', label: 'No limit (oscillates)', tone: 'caution', problem: false };
      case 'unknown': return { icon: 'help', label: 'Limit unknown', tone: 'neutral', problem: false };
      default: break;
    }
  }
  if (st.convergence === 'piecewise') {
    const conv = stepOf(st, 'convergence');
    const where = joinConditions(conv?.regions.filter((r) => r.verdict === 'absolute' || r.verdict === 'oscillatory') ?? []);
    return { icon: 'rule', label: where ? 'Converges only for' : 'Converges on part of the domain', condition: where, tone: 'caution', problem: false };
  }
  if (st.branch?.principal === 'piecewise') {
    const br = stepOf(st, 'branch');
    const where = joinConditions(br?.regions.filter((r) => r.holds) ?? []);
    return { icon: 'swap_vert', label: where ? 'Principal root right only for' : 'Branch depends on the parameters', condition: where, tone: 'caution', problem: false };
  }
  // A note or a declaration has no verdict to show.
  if (st.kind === 'note' || st.kind === 'param') return { icon: '', label: '', tone: 'neutral', problem: false };
  if (st.kind === 'expect') return { icon: 'check', label: 'Holds', tone: 'good', problem: false };
  if (st.kind === 'verify') return { icon: 'check', label: 'Agrees', tone: 'good', problem: false };
  return { icon: 'check', label: 'Done', tone: 'neutral', problem: false };
}

/** The status of a whole statement, in a word (with an icon): the verdict of its head. */
export function statusView(st: StatementReport): { icon: string; label: string } {
  const v = verdictView(st);
  return { icon: v.icon, label: v.label };
}

/** A problem: an error, a failure, a rotation not allowed, a divergent integral. */
export function isProblem(st: StatementReport): boolean {
  return verdictView(st).problem;
}

/** The relation between a result's name and its value: "~" for leading behaviour (asymptotic or divergent limits), else "=". */
export function relationOf(st: StatementReport): '=' | '~' {
  const lim = st.kind === 'limit' ? stepOf(st, 'limit') : undefined;
  return lim && (lim.outcome === 'asymptotic' || lim.outcome === 'divergent') ? '~' : '=';
}

/** A name set in math (one letter italic, longer names upright): shared with the record's steps and the export. */
export { nameLatex };

/** The card's formula: the result with its name and relation, as a physicist writes it. */
export function resultLatex(st: StatementReport): string {
  const r = st.result;
  if (!r) return '';
  // A comparison's result is the ratio of its two names (its report name is "A, B").
  const pair = st.kind === 'compare' ? st.name?.split(', ') : undefined;
  const name = pair?.length === 2 ? `\\frac{${nameLatex(pair[0]!)}}{${nameLatex(pair[1]!)}}` : st.name ? nameLatex(st.name) : '';
  if (!st.name || /^\\(approx|sim)\b|^=/.test(r.latex.trim())) return st.name ? `${name} ${r.latex}` : r.latex;
  const lim = st.kind === 'limit' ? stepOf(st, 'limit') : undefined;
  if (lim && relationOf(st) === '=') return `\\lim_{${nameLatex(lim.param)} \\to ${lim.to.latex}} ${nameLatex(st.name)} = ${r.latex}`;
  if (lim) return `${nameLatex(st.name)} \\sim ${r.latex} \\quad (${nameLatex(lim.param)} \\to ${lim.to.latex})`;
  return `${name} = ${r.latex}`;
}

/** The same in words, for screen readers. */
export function resultText(st: StatementReport): string {
  const r = st.result;
  if (!r) return '';
  if (!st.name) return r.text;
  const name = st.kind === 'compare' ? st.name.replace(', ', '/') : st.name;
  const lim = st.kind === 'limit' ? stepOf(st, 'limit') : undefined;
  const tail = lim ? ` as ${lim.param} -> ${lim.to.text}` : '';
  return /^(≈|~|=)/.test(r.text.trim()) ? `${name} ${r.text}` : `${name} ${relationOf(st)} ${r.text}${tail}`;
}

export function formatSmall(x: number): string {
  if (x === 0) return '0';
  return Math.abs(x) < 1e-3 || Math.abs(x) >= 1e4 ? x.toExponential(1) : x.toPrecision(3);
}

/** The simplest value of each domain, for a numeric check's point. */
const SIMPLE_VALUE: Record<string, string> = { positive: '1', negative: '-1', nonzero: '1', real: '1/2', complex: '1' };

/**
 * The `verify NAME at …` line the card's "Check numerically" adds: the parameters of the result's
 * sampled box when the record has one (those are exactly its parameters), else every parameter
 * declared above it, each at the simplest value of its domain.
 */
export function verifyLineFor(st: StatementReport, params: readonly { name: string; domain: string; line: number }[]): string {
  const box = st.steps.flatMap((step) => ('basis' in step && step.basis.kind === 'sampled' ? step.basis.box.map((b) => b.name) : []));
  const used = box.length ? params.filter((p) => box.includes(p.name)) : params.filter((p) => p.line < st.line);
  const at = used.map((p) => `${p.name} = ${SIMPLE_VALUE[p.domain] ?? '1'}`).join(', ');
  return `verify ${st.name}${at ? ` at ${at}` : ''}`;
}
