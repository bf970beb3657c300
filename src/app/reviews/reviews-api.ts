import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { ReviewDto, StatementReviewDto } from '@shared/collaboration';

/** The statements of a worksheet's current version with their reviews. */
export interface WorksheetReviews {
  version: number;
  statements: StatementReviewDto[];
}

/** Review and sign-off: /api/worksheets/:id/reviews, /api/reviews/:id, the queues. */
@Injectable({ providedIn: 'root' })
export class ReviewsApi {
  private readonly http = inject(HttpClient);

  forWorksheet(worksheetId: number): Observable<WorksheetReviews> {
    return this.http.get<WorksheetReviews>(`/api/worksheets/${worksheetId}/reviews`);
  }

  request(worksheetId: number, statementKey: string, reviewerIds: number[]): Observable<ReviewDto[]> {
    return this.http
      .post<{ reviews: ReviewDto[] }>(`/api/worksheets/${worksheetId}/reviews`, { statementKey, reviewerIds })
      .pipe(map((r) => r.reviews));
  }

  verdict(reviewId: number, verdict: 'confirmed' | 'disputed', comment: string): Observable<ReviewDto> {
    return this.http
      .post<{ review: ReviewDto }>(`/api/reviews/${reviewId}/verdict`, { verdict, comment })
      .pipe(map((r) => r.review));
  }

  reply(reviewId: number, body: string): Observable<ReviewDto> {
    return this.http.post<{ review: ReviewDto }>(`/api/reviews/${reviewId}/comments`, { body }).pipe(map((r) => r.review));
  }

  /** What the signed-in person was asked to review and has not answered. */
  queue(): Observable<ReviewDto[]> {
    return this.http.get<{ reviews: ReviewDto[] }>('/api/review-queue').pipe(map((r) => r.reviews));
  }

  forGroup(groupId: number): Observable<ReviewDto[]> {
    return this.http.get<{ reviews: ReviewDto[] }>(`/api/groups/${groupId}/reviews`).pipe(map((r) => r.reviews));
  }
}
