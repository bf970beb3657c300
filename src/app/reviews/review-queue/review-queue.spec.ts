import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { GroupReviews } from '../group-reviews/group-reviews';
import { review } from '../testing';
import { ReviewQueue } from './review-queue';

describe('ReviewQueue and GroupReviews', () => {
  let http: HttpTestingController;
  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
  });
  afterEach(() => http.verify());

  it('lists what is asked of me, each row linking to its worksheet and statement', async () => {
    const fixture = TestBed.createComponent(ReviewQueue);
    await fixture.whenStable();
    http.expectOne('/api/review-queue').flush({ reviews: [review(), review({ id: 12, statementKey: 'Zone', worksheetId: 8, worksheetTitle: 'Other' })] });
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const rows = el.querySelectorAll('[data-testid="queue-row"]');
    expect(rows.length).toBe(2);
    expect(rows[0].textContent).toContain('Two coupled modes');
    expect(rows[0].textContent).toContain('Z3');
    expect(rows[0].textContent).toContain('Priya Ramaswamy');
    expect(rows[0].textContent).toContain('Review requested');
    expect(rows[1].querySelector('a')!.getAttribute('href')).toBe('/worksheets/8?review=Zone');
  });

  it('says so when the queue is empty, and shows errors in plain words', async () => {
    const fixture = TestBed.createComponent(ReviewQueue);
    await fixture.whenStable();
    http.expectOne('/api/review-queue').flush({ reviews: [] });
    await fixture.whenStable();
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Nothing is waiting for your review.');
  });

  it('shows a group\'s reviews with reviewer and stale status', async () => {
    const fixture = TestBed.createComponent(GroupReviews);
    fixture.componentRef.setInput('groupId', 5);
    await fixture.whenStable();
    http.expectOne('/api/groups/5/reviews').flush({ reviews: [review({ status: 'confirmed', stale: true, version: 1 })] });
    await fixture.whenStable();
    const row = (fixture.nativeElement as HTMLElement).querySelector('[data-testid="queue-row"]')!;
    expect(row.textContent).toContain('Tobiah Osei');
    expect(row.textContent).toContain('Confirmed');
    expect(row.textContent).toContain('stale');
  });
});
