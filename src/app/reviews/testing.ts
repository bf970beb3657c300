// Review records for component tests (the shapes of shared/collaboration.ts).
import type { ReviewDto, StatementReviewDto } from '@shared/collaboration';

export const review = (over: Partial<ReviewDto> = {}): ReviewDto => ({
  id: 11,
  worksheetId: 7,
  worksheetTitle: 'Two coupled modes',
  statementKey: 'Z3',
  statementText: 'integral Z3 = exp(-x^2) d(x)',
  version: 3,
  status: 'requested',
  reviewer: 'Tobiah Osei',
  reviewerId: 3,
  requestedBy: 'Priya Ramaswamy',
  requestedAt: '2026-03-01T10:00:00Z',
  decidedAt: null,
  stale: false,
  comments: [],
  ...over,
});

export const statementReview = (over: Partial<StatementReviewDto> = {}): StatementReviewDto => ({
  key: 'Z3',
  line: 2,
  text: 'integral Z3 = exp(-x^2) d(x)',
  status: 'unreviewed',
  reviews: [],
  ...over,
});
