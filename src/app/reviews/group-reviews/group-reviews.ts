import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import type { ReviewDto } from '@shared/collaboration';
import { apiErrorMessage } from '../../core/http/api-error';
import { ReviewsApi } from '../reviews-api';
import { ReviewTable } from '../review-table/review-table';

/** The group page's Reviews tab: every review in the group, newest first. */
@Component({
  selector: 'app-group-reviews',
  imports: [MatButtonModule, ReviewTable],
  template: `
    @if (error(); as text) {
      <div class="sw-inline-error" role="alert">{{ text }} <button mat-button type="button" (click)="load()">Try again</button></div>
    }
    <app-review-table [reviews]="reviews()" [loading]="loading()" [withReviewer]="true" label="Reviews in this group" empty="Nobody has asked for a review in this group yet." />
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class GroupReviews {
  private readonly api = inject(ReviewsApi);
  readonly groupId = input.required<number>();
  protected readonly reviews = signal<ReviewDto[]>([]);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);

  constructor() {
    effect(() => this.load(this.groupId()));
  }

  load(groupId = this.groupId()): void {
    this.loading.set(true);
    this.error.set(null);
    this.api.forGroup(groupId).subscribe({
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
