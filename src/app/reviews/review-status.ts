import type { StatementReport } from '@shared/evaluation';
import type { ReviewDto, ReviewStatus, StatementReviewDto } from '@shared/collaboration';

/** How a review status reads: an icon and a word, a tone on top (never colour alone). */
export interface ReviewStatusView {
  status: ReviewStatus;
  icon: string;
  label: string;
  tone: 'good' | 'caution' | 'bad' | 'neutral';
  /** The newest verdict, when it was given on an older form of the statement. */
  stale: { verdict: 'confirmed' | 'disputed'; version: number } | null;
  /** A sentence for tooltips and screen readers. */
  detail: string;
}

const WORDS: Record<ReviewStatus, Omit<ReviewStatusView, 'status' | 'stale' | 'detail'>> = {
  unreviewed: { icon: 'rate_review', label: 'Unreviewed', tone: 'neutral' },
  requested: { icon: 'pending', label: 'Review requested', tone: 'caution' },
  confirmed: { icon: 'verified_user', label: 'Confirmed', tone: 'good' },
  disputed: { icon: 'gpp_bad', label: 'Disputed', tone: 'bad' },
};

export function statusWord(status: ReviewStatus): string {
  return WORDS[status].label;
}

export function statusIcon(status: ReviewStatus): string {
  return WORDS[status].icon;
}

/** The badge of one statement: its status, and a stale verdict marked plainly with its version. */
export function reviewStatusView(review: StatementReviewDto | null | undefined): ReviewStatusView {
  const status = review?.status ?? 'unreviewed';
  const reviews = review?.reviews ?? [];
  const newestVerdict = reviews.find((r) => r.status !== 'requested');
  const stale =
    newestVerdict && newestVerdict.stale && newestVerdict.status !== 'requested'
      ? { verdict: newestVerdict.status, version: newestVerdict.version }
      : null;
  const base = WORDS[status];
  const who = reviews.find((r) => !r.stale && r.status === status);
  let detail: string;
  switch (status) {
    case 'confirmed':
    case 'disputed':
      detail = `Review: ${status} by ${who?.reviewer ?? 'a reviewer'}.`;
      break;
    case 'requested':
      detail = `Review: requested from ${reviews.filter((r) => r.status === 'requested' && !r.stale).map((r) => r.reviewer).join(', ') || 'a reviewer'}.`;
      break;
    default:
      detail = 'Review: nobody has reviewed this result in its current form.';
  }
  if (stale) detail += ` The last verdict (${stale.verdict}, version ${stale.version}) is stale: the statement or something it uses changed since.`;
  return { status, ...base, stale, detail };
}

/** Statements whose key is the name they define (the others are keyed by their text). */
const NAMING_KINDS = new Set<StatementReport['kind']>(['param', 'integral', 'let', 'rotate']);

/**
 * The review entry of a card. While the findings belong to the saved text, lines match
 * one to one; while an edit is not saved yet, lines may have moved, so only a result name
 * (the statement key) is trusted.
 */
export function reviewForStatement(st: StatementReport, reviews: readonly StatementReviewDto[], linesMatch: boolean): StatementReviewDto | null {
  if (linesMatch) return reviews.find((r) => r.line === st.line) ?? null;
  return st.name && NAMING_KINDS.has(st.kind) ? (reviews.find((r) => r.key === st.name) ?? null) : null;
}

/** A review's own state in a word, with stale said plainly. */
export function reviewLine(r: ReviewDto): string {
  const word = r.status === 'requested' ? 'Requested' : r.status === 'confirmed' ? 'Confirmed' : 'Disputed';
  return r.stale ? `${word} · stale (version ${r.version})` : `${word} · version ${r.version}`;
}
