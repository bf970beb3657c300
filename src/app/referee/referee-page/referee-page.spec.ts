import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { FIXTURE_REPORT, FIXTURE_SOURCE } from '../../worksheets/testing/report-fixture';
import { RefereePage } from './referee-page';

describe('RefereePage', () => {
  let http: HttpTestingController;
  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
  });
  afterEach(() => http.verify());

  async function open(token: string) {
    const fixture = TestBed.createComponent(RefereePage);
    fixture.componentRef.setInput('token', token);
    await fixture.whenStable();
    return { fixture, el: fixture.nativeElement as HTMLElement, req: http.expectOne(`/api/referee/${token}`) };
  }

  it('shows the title, version, source read only and the findings cards without review controls', async () => {
    const { fixture, el, req } = await open('tok123');
    req.flush({ worksheet: { title: 'Three modes', version: 4, savedAt: '2026-03-01T10:00:00Z', source: FIXTURE_SOURCE }, report: FIXTURE_REPORT, expiresAt: '2026-04-01T10:00:00Z' });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="referee-title"]')!.textContent).toContain('Three modes');
    expect(el.querySelector('[data-testid="referee-version"]')!.textContent).toContain('Version 4');
    expect(el.querySelector('[data-testid="referee-source"]')!.textContent).toContain('integral Z3');
    expect(el.querySelector('textarea, [data-testid="editor"]')).toBeNull();
    expect(el.querySelectorAll('[data-testid="finding-card"]').length).toBe(4);
    expect(el.querySelector('[data-testid="review-badge"]')).toBeNull();
  });

  for (const [status, code, message, heading] of [
    [404, 'link_unknown', 'This referee link is not valid. Ask the authors for a new one.', 'does not open anything'],
    [410, 'link_expired', 'This referee link has expired. Ask the authors for a new one.', 'can no longer be used'],
  ] as const) {
    it(`says plainly why a link does not open (${status})`, async () => {
      const { fixture, el, req } = await open('gone');
      req.flush({ error: { code, message } }, { status, statusText: 'x' });
      await fixture.whenStable();
      const box = el.querySelector('[data-testid="referee-error"]')!;
      expect(box.textContent).toContain(heading);
      expect(box.textContent).toContain(message);
    });
  }
});
