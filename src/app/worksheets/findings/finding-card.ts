import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import type { StatementReviewDto } from '@shared/collaboration';
import type { StatementReport } from '@shared/evaluation';
import { reviewStatusView } from '../../reviews/review-status';
import { renderStep } from '@shared/record/render';
import { badgesOf, branchReason, isCheckable, kindWord, resultLatex, resultText, verdictView, type BadgeView } from './finding-view';
import { MathDirective } from './math';

/**
 * One badge: an icon and a word, never colour alone. It is a button (reachable by Tab): pressing
 * it shows its sentence under the badges, pressing again hides it.
 */
@Component({
  selector: 'app-badge',
  template: `
    <button
      type="button"
      [class]="'sw-badge badge-button tone-' + badge().tone"
      [attr.data-badge]="badge().kind"
      [attr.title]="badge().detail"
      [attr.aria-expanded]="expanded()"
      (click)="toggled.emit(badge().kind)"
    >
      <span class="material-symbols-outlined" aria-hidden="true">{{ badge().icon }}</span>
      <span class="word">{{ badge().label }}</span>
      <span class="sw-visually-hidden">{{ badge().detail }}</span>
    </button>
  `,
  styles: `
    :host { display: inline-flex; }
    .badge-button { font: inherit; font-size: 0.82rem; font-weight: 600; cursor: pointer; }
    .badge-button:hover .word { text-decoration: underline; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Badge {
  readonly badge = input.required<BadgeView>();
  readonly expanded = input(false);
  readonly toggled = output<BadgeView['kind']>();
}

/**
 * The findings of one statement: result, badges, error, numbered steps. Clicking the head
 * selects the statement (the page moves the editor to its line). The review badge shows the
 * statement's review status and opens its thread; a read-only card (the referee's view) has none.
 */
@Component({
  selector: 'app-finding-card',
  imports: [Badge, MathDirective],
  templateUrl: './finding-card.html',
  styleUrl: './finding-card.scss',
  host: {
    'data-testid': 'finding-card',
    '[attr.data-line]': 'statement().line',
    '[attr.data-status]': 'statement().status',
    '[attr.data-kind]': 'statement().kind',
    '[attr.data-verdict]': 'verdict().label',
    '[class.selected]': 'selected()',
    '[class.problem]': 'verdict().problem',
    role: 'listitem',
  },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FindingCard {
  readonly statement = input.required<StatementReport>();
  readonly selected = input(false);
  /** A newer evaluation is on its way: the card is shown dimmed. */
  readonly stale = input(false);
  readonly select = output<number>();
  /** The review state of this statement (from the worksheet's reviews), or none yet. */
  readonly review = input<StatementReviewDto | null>(null);
  /** False where reviews are not shown at all (the referee's read-only view). */
  readonly reviewable = input(true);
  /** The review badge was clicked: open the thread of the statement at this line. */
  readonly openReview = output<number>();
  /** The verify statements of this result (the page finds them in the report). */
  readonly checks = input<readonly StatementReport[]>([]);
  /** Whether the reader may add a numeric check (a `verify` line) from the card. */
  readonly canCheck = input(false);
  /** "Check numerically" was pressed: the page adds a verify line for this result. */
  readonly checkNumerically = output<StatementReport>();

  protected readonly kind = computed(() => kindWord(this.statement().kind));
  protected readonly badges = computed(() => badgesOf(this.statement(), this.checks()));
  /** The badge whose sentence is shown under the badges (toggled by pressing it). */
  protected readonly openBadge = signal<BadgeView['kind'] | null>(null);
  protected readonly openDetail = computed(() => this.badges().find((b) => b.kind === this.openBadge())?.detail ?? null);
  protected readonly verdict = computed(() => verdictView(this.statement()));
  protected readonly formula = computed(() => resultLatex(this.statement()));
  protected readonly formulaText = computed(() => resultText(this.statement()));
  /** Offer a one-click numeric check: a result that verify can check and that has none yet. */
  protected toggleBadge(kind: BadgeView['kind']): void {
    this.openBadge.update((k) => (k === kind ? null : kind));
  }
  protected readonly offerCheck = computed(
    () => this.canCheck() && isCheckable(this.statement()) && !this.checks().length && this.badges().some((b) => b.kind === 'numeric' && b.tone === 'neutral'),
  );
  /** The steps as the one renderer words them (never the step data read here). */
  protected readonly steps = computed(() =>
    this.statement()
      .steps.map((s) => ({ kind: s.kind, ...renderStep(s) }))
      .filter((s) => s.kind !== 'result' || s.latex),
  );
  protected readonly branchReason = computed(() => branchReason(this.statement()));
  protected readonly headline = computed(() => {
    const st = this.statement();
    return st.name ? `${this.kind()} ${st.name}` : this.kind();
  });
  /**
   * Review badges on findings only: results and checks (expect, verify, compare), never on
   * parameter lines, notes, lines not understood or a statement without a result (unless it
   * was reviewed before, so its thread stays reachable).
   */
  protected readonly showReview = computed(() => {
    const st = this.statement();
    if (!this.reviewable() || st.kind === 'param' || st.kind === 'note' || st.kind === 'invalid') return false;
    const finding = !!st.result || st.kind === 'expect' || st.kind === 'verify' || st.kind === 'compare';
    return finding || (this.review()?.reviews.length ?? 0) > 0;
  });
  protected readonly reviewView = computed(() => reviewStatusView(this.review()));
  protected readonly noteText = computed(() => {
    const st = this.statement();
    if (st.kind !== 'note' && st.kind !== 'param') return '';
    return st.steps[0] ? renderStep(st.steps[0]).text : (st.result?.text ?? '');
  });
}

/** Scroll a list of cards (not the page) so the card of a line is in view. */
export function scrollCardIntoView(list: HTMLElement | undefined, line: number): void {
  const el = list?.querySelector<HTMLElement>(`[data-testid="finding-card"][data-line="${line}"]`);
  if (!list || !el) return;
  const top = el.offsetTop - list.offsetTop;
  if (top < list.scrollTop) list.scrollTop = top;
  else if (top + el.offsetHeight > list.scrollTop + list.clientHeight) list.scrollTop = top + el.offsetHeight - list.clientHeight;
}
