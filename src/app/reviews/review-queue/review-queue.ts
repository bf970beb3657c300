import { ChangeDetectionStrategy, Component, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import type { ReviewDto } from '@shared/collaboration';
import { apiErrorMessage } from '../../core/http/api-error';
import { ReviewsApi } from '../reviews-api';
import { ReviewTable } from '../review-table/review-table';

/** /reviews: what the signed-in person was asked to review and has not answered yet. */
@Component({
  selector: 'app-review-queue',
  imports: [MatButtonModule, RouterLink, ReviewTable],
  template: `
    <div class="sw-page">
      <nav class="crumbs" aria-label="Breadcrumb"><a routerLink="/groups">Groups</a> <span aria-hidden="true">/</span> <span aria-current="page">Reviews</span></nav>
      <p class="sw-eyebrow">Review queue</p>
      <h1>Asked of you</h1>
      <p class="sw-muted">Results you were asked to review and have not answered yet, oldest first. Open one to confirm or dispute it.</p>
      @if (error(); as text) {
        <div class="sw-inline-error" role="alert">{{ text }} <button mat-button type="button" (click)="load()">Try again</button></div>
      }
      <app-review-table [reviews]="reviews()" [loading]="loading()" label="Your review queue" empty="Nothing is waiting for your review." />
    </div>
  `,
  styles: `.crumbs { display: flex; gap: 0.5rem; font-size: 0.92rem; margin-bottom: 1rem; a { text-decoration: none; } } h1 { margin-top: 0; }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewQueue {
  private readonly api = inject(ReviewsApi);
  protected readonly reviews = signal<ReviewDto[]>([]);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);

  constructor() {
    this.load();
  }

  protected load(): void {
    this.loading.set(true);
    this.error.set(null);
    this.api.queue().subscribe({
      next: (r) => {
        this.reviews.set(r);
        this.loading.set(false);
      },
      error: (err: unknown) => {
        this.error.set(apiErrorMessage(err));
        this.loading.set(false);
      },
    });
  }
}
