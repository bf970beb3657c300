import { FIXTURE_REPORT } from '../worksheets/testing/report-fixture';
import { reviewForStatement, reviewStatusView } from './review-status';
import { review, statementReview } from './testing';

const [param, z3, cont] = FIXTURE_REPORT.statements;

describe('review status', () => {
  it('reads each status with an icon and a word', () => {
    expect(reviewStatusView(null)).toMatchObject({ status: 'unreviewed', label: 'Unreviewed', stale: null });
    expect(reviewStatusView(statementReview({ status: 'requested', reviews: [review()] })).label).toBe('Review requested');
    const confirmed = reviewStatusView(statementReview({ status: 'confirmed', reviews: [review({ status: 'confirmed' })] }));
    expect(confirmed).toMatchObject({ label: 'Confirmed', tone: 'good', icon: 'verified_user' });
    expect(confirmed.detail).toContain('confirmed by Tobiah Osei');
    expect(reviewStatusView(statementReview({ status: 'disputed', reviews: [review({ status: 'disputed' })] })).tone).toBe('bad');
  });

  it('marks the newest verdict stale with the version it was given on', () => {
    const v = reviewStatusView(statementReview({ status: 'unreviewed', reviews: [review({ status: 'confirmed', stale: true, version: 1 })] }));
    expect(v.stale).toEqual({ verdict: 'confirmed', version: 1 });
    expect(v.detail).toContain('version 1');
    // A fresh verdict after the stale one: not stale.
    const fresh = reviewStatusView(
      statementReview({ status: 'disputed', reviews: [review({ id: 2, status: 'disputed' }), review({ id: 1, status: 'confirmed', stale: true, version: 1 })] }),
    );
    expect(fresh.stale).toBeNull();
  });

  it('matches cards by line while the findings are of the saved text, else by result name', () => {
    const list = [statementReview({ key: 'k', line: 1 }), statementReview({ key: 'Z3', line: 2 }), statementReview({ key: 'continue Z3 : k along 0 -> 2*i', line: 3 })];
    expect(reviewForStatement(z3, list, true)?.key).toBe('Z3');
    expect(reviewForStatement(cont, list, true)?.line).toBe(3);
    const moved = [statementReview({ key: 'Z3', line: 9 }), statementReview({ key: 'k', line: 4 })];
    expect(reviewForStatement(z3, moved, false)?.line).toBe(9);
    expect(reviewForStatement(param, moved, false)?.key).toBe('k');
    expect(reviewForStatement(cont, moved, false)).toBeNull();
  });
});
