import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { RouterLink } from '@angular/router';
import type { ReviewDto } from '@shared/collaboration';
import { apiErrorMessage } from '../../core/http/api-error';
import { ReviewsApi } from '../reviews-api';
import { PendingReviewsStore } from './pending-reviews-store';

/**
 * The home page's list of reviews waiting for the signed-in person (shown only when there
 * are some): each opens the worksheet at the statement's thread.
 */
@Component({
  selector: 'app-pending-reviews',
  imports: [RouterLink],
  template: `
    @if (reviews().length) {
      <section class="sw-panel pending" aria-labelledby="pending-heading" data-testid="pending-reviews">
        <h2 id="pending-heading">
          <span class="material-symbols-outlined" aria-hidden="true">rate_review</span>
          Waiting for your review <span class="count">{{ reviews().length }}</span>
        </h2>
        <ul>
          @for (r of reviews().slice(0, 6); track r.id) {
            <li>
              <a [routerLink]="['/worksheets', r.worksheetId]" [queryParams]="{ review: r.statementKey }" data-testid="pending-review-link">
                <strong>{{ r.statementKey }}</strong> in {{ r.worksheetTitle }}
              </a>
              <span class="sw-muted"> · asked by {{ r.requestedBy }}</span>
            </li>
          }
        </ul>
        @if (reviews().length > 6) {
          <a routerLink="/reviews">All {{ reviews().length }} in your review queue</a>
        } @else {
          <a routerLink="/reviews">Open your review queue</a>
        }
      </section>
    } @else if (error(); as text) {
      <p class="sw-inline-error" role="alert">{{ text }}</p>
    }
  `,
  styles: `
    .pending { margin-bottom: 1rem; }
    h2 { display: flex; align-items: center; gap: 0.4rem; font-size: 1.05rem; margin: 0 0 0.4rem; }
    .count { font-size: 0.8rem; font-weight: 700; padding: 0 0.45rem; border-radius: 999px; background: var(--sw-tone-caution-bg, var(--sw-tone-neutral-bg)); color: var(--sw-tone-caution-ink, inherit); }
    ul { margin: 0 0 0.4rem; padding-left: 1.1rem; }
    li { margin: 0.15rem 0; }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PendingReviews {
  private readonly api = inject(ReviewsApi);
  private readonly store = inject(PendingReviewsStore);
  protected readonly reviews = signal<ReviewDto[]>([]);
  protected readonly error = signal<string | null>(null);

  constructor() {
    this.api.queue().subscribe({
      next: (r) => {
        this.reviews.set(r);
        this.store.count.set(r.length);
      },
      error: (err: unknown) => this.error.set(apiErrorMessage(err)),
    });
  }
}
