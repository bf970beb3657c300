import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { ActivityList } from './activity-list';

describe('ActivityList', () => {
  let http: HttpTestingController;
  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
  });
  afterEach(() => http.verify());

  it('shows who did what and when, linking worksheets', async () => {
    const fixture = TestBed.createComponent(ActivityList);
    fixture.componentRef.setInput('groupId', 5);
    await fixture.whenStable();
    http.expectOne('/api/groups/5/activity').flush({
      activity: [
        { id: 2, who: 'Tobiah Osei', action: 'confirmed', subject: 'Zmix in Two modes', worksheetId: 7, at: '2026-03-02T10:00:00Z' },
        { id: 1, who: 'a former member', action: 'renamed group', subject: 'Lab', worksheetId: null, at: '2026-03-01T10:00:00Z' },
      ],
    });
    await fixture.whenStable();
    const rows = (fixture.nativeElement as HTMLElement).querySelectorAll('[data-testid="activity-row"]');
    expect(rows.length).toBe(2);
    expect(rows[0].textContent).toContain('Tobiah Osei confirmed');
    expect(rows[0].querySelector('a')!.getAttribute('href')).toBe('/worksheets/7');
    expect(rows[0].querySelector('time')!.getAttribute('datetime')).toBe('2026-03-02T10:00:00Z');
    expect(rows[1].querySelector('a')).toBeNull();
  });
});
