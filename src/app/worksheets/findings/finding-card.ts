import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import type { StatementReviewDto } from '@shared/collaboration';
import type { StatementReport } from '@shared/evaluation';
import { reviewStatusView } from '../../reviews/review-status';
import { renderStep } from '@shared/record/render';
import { badgesOf, branchReason, kindWord, statusView, type BadgeView } from './finding-view';
import { MathDirective } from './math';

/** One badge: an icon and a word, never colour alone. */
@Component({
  selector: 'app-badge',
  template: `
    <span class="material-symbols-outlined" aria-hidden="true">{{ badge().icon }}</span>
    <span class="word">{{ badge().label }}</span>
    <span class="sw-visually-hidden">{{ badge().detail }}</span>
  `,
  host: {
    '[class]': "'sw-badge tone-' + badge().tone",
    '[attr.data-badge]': 'badge().kind',
    '[attr.title]': 'badge().detail',
  },
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Badge {
  readonly badge = input.required<BadgeView>();
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
    '[class.selected]': 'selected()',
    '[class.problem]': "statement().status !== 'ok'",
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

  protected readonly kind = computed(() => kindWord(this.statement().kind));
  protected readonly badges = computed(() => badgesOf(this.statement()));
  protected readonly status = computed(() => statusView(this.statement()));
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
  protected readonly showReview = computed(() => this.reviewable() && (!!this.statement().result || !!this.review()));
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
