import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { GroupRole } from '@shared/api';
import type { StatementReviewDto } from '@shared/collaboration';
import { review, statementReview } from '../testing';
import { ReviewThread } from './review-thread';

describe('ReviewThread', () => {
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
  });
  afterEach(() => http.verify());

  async function render(role: GroupRole, st: StatementReviewDto | null, me = 2) {
    const fixture = TestBed.createComponent(ReviewThread);
    fixture.componentRef.setInput('worksheetId', 7);
    fixture.componentRef.setInput('groupId', 5);
    fixture.componentRef.setInput('role', role);
    fixture.componentRef.setInput('version', 3);
    fixture.componentRef.setInput('currentUserId', me);
    fixture.componentRef.setInput('statement', st);
    await fixture.whenStable();
    const changed: number[] = [];
    fixture.componentInstance.changed.subscribe(() => changed.push(1));
    return { fixture, el: fixture.nativeElement as HTMLElement, changed };
  }
  const q = (el: HTMLElement, id: string) => el.querySelector<HTMLElement>(`[data-testid="${id}"]`);

  it('lets an author ask reviewers and owners (not readers, not themself) to review the statement', async () => {
    const { fixture, el, changed } = await render('author', statementReview());
    q(el, 'ask-review')!.click();
    await fixture.whenStable();
    http.expectOne('/api/groups/5/members').flush({
      members: [
        { userId: 1, email: 'o@x.test', displayName: 'Ola Owner', role: 'owner' },
        { userId: 2, email: 'a@x.test', displayName: 'Me Author', role: 'author' },
        { userId: 3, email: 'r@x.test', displayName: 'Tobiah Osei', role: 'reviewer' },
        { userId: 4, email: 'd@x.test', displayName: 'Rea Reader', role: 'reader' },
      ],
    });
    await fixture.whenStable();
    const choices = [...el.querySelectorAll<HTMLElement>('[data-testid="reviewer-choice"]')];
    expect(choices.map((c) => c.textContent!.trim())).toEqual(['Ola Owner (owner)', 'Tobiah Osei (reviewer)']);
    q(el, 'send-review-request')!.click();
    await fixture.whenStable();
    expect(el.textContent).toContain('Choose at least one reviewer.');
    choices[1].querySelector('input')!.click();
    await fixture.whenStable();
    q(el, 'send-review-request')!.click();
    const req = http.expectOne('/api/worksheets/7/reviews');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ statementKey: 'Z3', reviewerIds: [3] });
    req.flush({ reviews: [review()] });
    await fixture.whenStable();
    expect(changed.length).toBe(1);
  });

  it('shows each review with reviewer, verdict, comments, and stale plainly', async () => {
    const { el } = await render(
      'reader',
      statementReview({
        status: 'unreviewed',
        reviews: [review({ status: 'confirmed', stale: true, version: 1, decidedAt: '2026-03-02T10:00:00Z', comments: [{ id: 1, author: 'Tobiah Osei', body: 'Checked by hand.', createdAt: '2026-03-02T10:00:00Z' }] })],
      }),
    );
    const entry = q(el, 'review-entry')!;
    expect(entry.textContent).toContain('Tobiah Osei');
    expect(entry.textContent).toContain('Confirmed · stale (version 1)');
    expect(entry.textContent).toContain('Checked by hand.');
    expect(q(el, 'thread-status')!.textContent).toContain('stale: confirmed on version 1');
    // A reader follows the thread but does not write in it, and cannot ask.
    expect(q(el, 'review-comment')).toBeNull();
    expect(q(el, 'ask-review')).toBeNull();
  });

  it('lets the asked reviewer confirm, and refuses a dispute without a comment', async () => {
    const { fixture, el, changed } = await render('reviewer', statementReview({ status: 'requested', reviews: [review()] }), 3);
    expect(q(el, 'ask-review')).toBeNull();
    q(el, 'dispute-review')!.click();
    await fixture.whenStable();
    q(el, 'review-submit')!.click();
    await fixture.whenStable();
    expect(el.textContent).toContain('Say what is wrong when you dispute a result.');
    q(el, 'confirm-review')!.click();
    await fixture.whenStable();
    expect(q(el, 'review-submit')!.textContent!.trim()).toBe('Confirm');
    const box = el.querySelector<HTMLTextAreaElement>('[data-testid="review-comment"]')!;
    box.value = 'Checked the branch.';
    box.dispatchEvent(new Event('input'));
    q(el, 'review-submit')!.click();
    const req = http.expectOne('/api/reviews/11/verdict');
    expect(req.request.body).toEqual({ verdict: 'confirmed', comment: 'Checked the branch.' });
    req.flush({ review: review({ status: 'confirmed' }) });
    await fixture.whenStable();
    expect(changed.length).toBe(1);
  });

  it('offers no verdict to a reviewer who was not asked, only a reply', async () => {
    const { fixture, el } = await render('owner', statementReview({ status: 'requested', reviews: [review()] }), 1);
    expect(q(el, 'confirm-review')).toBeNull();
    expect(q(el, 'review-submit')!.textContent!.trim()).toBe('Reply');
    const box = el.querySelector<HTMLTextAreaElement>('[data-testid="review-comment"]')!;
    box.value = 'See line 4.';
    box.dispatchEvent(new Event('input'));
    q(el, 'review-submit')!.click();
    const req = http.expectOne('/api/reviews/11/comments');
    expect(req.request.body).toEqual({ body: 'See line 4.' });
    req.flush({ review: review() }, { status: 201, statusText: 'Created' });
    await fixture.whenStable();
  });

  it('says to save first when the statement is not in the saved version', async () => {
    const { el } = await render('author', null);
    expect(q(el, 'thread-unsaved')).not.toBeNull();
    expect(q(el, 'ask-review')).toBeNull();
  });
});
