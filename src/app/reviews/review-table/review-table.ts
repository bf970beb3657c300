import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import type { ReviewDto } from '@shared/collaboration';
import { statusIcon, statusWord } from '../review-status';

export type ReviewColumn = 'worksheet' | 'statement' | 'reviewer' | 'requestedBy' | 'since' | 'status';

/** Reviews as a table: worksheet, statement, who asked, since when, status (stale said plainly). */
@Component({
  selector: 'app-review-table',
  imports: [DatePipe, MatTableModule, RouterLink],
  templateUrl: './review-table.html',
  styleUrl: './review-table.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewTable {
  readonly reviews = input.required<ReviewDto[]>();
  readonly loading = input(false);
  readonly withReviewer = input(false);
  readonly label = input('Reviews');
  readonly empty = input('No reviews.');

  protected readonly columns = computed<ReviewColumn[]>(() =>
    this.withReviewer() ? ['worksheet', 'statement', 'reviewer', 'requestedBy', 'since', 'status'] : ['worksheet', 'statement', 'requestedBy', 'since', 'status'],
  );
  protected readonly word = statusWord;
  protected readonly icon = statusIcon;
  protected tone(r: ReviewDto): string {
    if (r.stale) return 'neutral';
    return r.status === 'confirmed' ? 'good' : r.status === 'disputed' ? 'bad' : 'caution';
  }
}
