import { PendingReviewsStore } from '../pending-reviews/pending-reviews-store';
import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { roleCan, type GroupRole, type MemberDto } from '@shared/api';
import type { ReviewDto, StatementReviewDto } from '@shared/collaboration';
import { apiErrorMessage } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { GroupsApi } from '../../groups/groups-api';
import { ReviewsApi } from '../reviews-api';
import { reviewLine, reviewStatusView } from '../review-status';

type Choice = 'confirmed' | 'disputed' | null;

/**
 * The review thread of one statement: each review with its reviewer, time, verdict and
 * comments; "Ask for review" for authors and owners; Confirm or Dispute for the reviewer
 * who was asked; replies for everyone who takes part (readers only follow).
 */
@Component({
  selector: 'app-review-thread',
  imports: [DatePipe, MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatInputModule],
  templateUrl: './review-thread.html',
  styleUrl: './review-thread.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewThread {
  private readonly api = inject(ReviewsApi);
  private readonly groups = inject(GroupsApi);
  private readonly notifier = inject(Notifier);
  private readonly pending = inject(PendingReviewsStore);

  readonly worksheetId = input.required<number>();
  readonly groupId = input.required<number>();
  readonly role = input.required<GroupRole>();
  readonly currentUserId = input<number | null>(null);
  /** The statement's review state; null when the statement is not in the saved version. */
  readonly statement = input<StatementReviewDto | null>(null);
  /** The saved version, for "review of version N". */
  readonly version = input<number | null>(null);
  /** Something changed on the server: the page reloads the reviews. */
  readonly changed = output<void>();

  protected readonly view = computed(() => reviewStatusView(this.statement()));
  protected readonly reviews = computed(() => this.statement()?.reviews ?? []);
  protected readonly canAsk = computed(() => roleCan(this.role(), 'editWorksheets') && !!this.statement());
  protected readonly canTakePart = computed(() => roleCan(this.role(), 'review') || roleCan(this.role(), 'editWorksheets'));
  protected readonly line = reviewLine;

  // Asking for review.
  protected readonly asking = signal(false);
  protected readonly members = signal<MemberDto[] | null>(null);
  protected readonly membersError = signal<string | null>(null);
  protected readonly chosen = signal<ReadonlySet<number>>(new Set());
  protected readonly askError = signal<string | null>(null);
  protected readonly candidates = computed(() =>
    (this.members() ?? []).filter((m) => roleCan(m.role, 'review') && m.userId !== this.currentUserId()),
  );

  // Composers, one per review: verdict choice and text.
  protected readonly choice = signal<Partial<Record<number, Choice>>>({});
  protected readonly text = signal<Partial<Record<number, string>>>({});
  protected readonly composeError = signal<Partial<Record<number, string | null>>>({});
  protected readonly busy = signal(false);

  private readonly statementKey = computed(() => this.statement()?.key);
  private shownKey: string | undefined;

  constructor() {
    // A different statement: start over. Only a change of key counts: the same statement
    // arriving again (a recomputed report, reloaded reviews) must not drop a half-made request.
    effect(() => {
      const key = this.statementKey();
      // the thread's statement may be missing for a moment while reviews or the report reload
      if (key === undefined || key === this.shownKey) return;
      this.shownKey = key;
      this.asking.set(false);
      this.askError.set(null);
      this.chosen.set(new Set());
    });
  }

  /** The reviewer asked for this review may give its verdict. */
  protected canDecide(r: ReviewDto): boolean {
    return roleCan(this.role(), 'review') && r.reviewerId !== null && r.reviewerId === this.currentUserId();
  }

  protected startAsking(): void {
    this.asking.set(true);
    this.askError.set(null);
    if (this.members() === null) {
      this.groups.members(this.groupId()).subscribe({
        next: (m) => this.members.set(m),
        error: (err: unknown) => this.membersError.set(apiErrorMessage(err)),
      });
    }
  }

  protected toggle(userId: number, on: boolean): void {
    const next = new Set(this.chosen());
    if (on) next.add(userId);
    else next.delete(userId);
    this.chosen.set(next);
  }

  protected sendRequest(): void {
    const st = this.statement();
    const ids = [...this.chosen()];
    if (!st) return;
    if (!ids.length) {
      this.askError.set('Choose at least one reviewer.');
      return;
    }
    this.busy.set(true);
    this.api.request(this.worksheetId(), st.key, ids).subscribe({
      next: (made) => {
        this.busy.set(false);
        this.asking.set(false);
        this.chosen.set(new Set());
        this.notifier.info(`Review of ${st.key} requested from ${made.map((r) => r.reviewer).join(', ')}.`);
        this.changed.emit();
      },
      error: (err: unknown) => {
        this.busy.set(false);
        this.askError.set(apiErrorMessage(err));
      },
    });
  }

  protected choose(r: ReviewDto, c: Choice): void {
    this.choice.update((m) => ({ ...m, [r.id]: m[r.id] === c ? null : c }));
    this.composeError.update((m) => ({ ...m, [r.id]: null }));
  }

  protected setText(r: ReviewDto, value: string): void {
    this.text.update((m) => ({ ...m, [r.id]: value }));
  }

  protected submitLabel(r: ReviewDto): string {
    const c = this.choice()[r.id];
    return c === 'confirmed' ? 'Confirm' : c === 'disputed' ? 'Dispute' : 'Reply';
  }

  protected submit(r: ReviewDto): void {
    const c = this.canDecide(r) ? (this.choice()[r.id] ?? null) : null;
    const body = (this.text()[r.id] ?? '').trim();
    const fail = (message: string) => this.composeError.update((m) => ({ ...m, [r.id]: message }));
    if (c === 'disputed' && !body) return fail('Say what is wrong when you dispute a result.');
    if (!c && !body) return fail('Write a comment.');
    this.busy.set(true);
    const call = c ? this.api.verdict(r.id, c, body) : this.api.reply(r.id, body);
    call.subscribe({
      next: () => {
        this.busy.set(false);
        this.text.update((m) => ({ ...m, [r.id]: '' }));
        this.choice.update((m) => ({ ...m, [r.id]: null }));
        this.notifier.info(c ? `You ${c} ${r.statementKey}.` : 'Reply sent.');
        if (c) this.pending.refresh();
        this.changed.emit();
      },
      error: (err: unknown) => {
        this.busy.set(false);
        fail(apiErrorMessage(err));
      },
    });
  }
}
