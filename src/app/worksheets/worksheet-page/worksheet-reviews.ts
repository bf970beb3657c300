import { Injectable, inject, signal } from '@angular/core';
import { Observable, catchError, of, tap } from 'rxjs';
import type { StatementReviewDto } from '@shared/collaboration';
import { apiErrorMessage } from '../../core/http/api-error';
import { ReviewsApi } from '../../reviews/reviews-api';

/** The reviews of one worksheet's statements, and which thread is open (one at a time); page-scoped. */
@Injectable()
export class WorksheetReviews {
  private readonly api = inject(ReviewsApi);
  readonly statements = signal<StatementReviewDto[]>([]);
  readonly error = signal<string | null>(null);
  /** The line whose thread is open, or null. */
  readonly threadLine = signal<number | null>(null);

  load(worksheetId: number): Observable<unknown> {
    return this.api.forWorksheet(worksheetId).pipe(
      tap((r) => {
        this.statements.set(r.statements);
        this.error.set(null);
      }),
      catchError((err: unknown) => {
        this.error.set(apiErrorMessage(err));
        return of(null);
      }),
    );
  }
}
