import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { RefereeLinks } from './referee-links';
import { Confirmer } from '../../core/dialogs/confirmer';
import { of } from 'rxjs';

describe('RefereeLinks', () => {
  let http: HttpTestingController;
  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
  });
  afterEach(() => http.verify());

  const future = new Date(Date.now() + 5 * 86400_000).toISOString();

  async function render() {
    const fixture = TestBed.createComponent(RefereeLinks);
    fixture.componentRef.setInput('worksheetId', 7);
    fixture.componentRef.setInput('version', 3);
    await fixture.whenStable();
    http.expectOne('/api/worksheets/7/referee-links').flush({
      links: [
        { id: 1, version: 2, expiresAt: future, revoked: false, createdAt: '2026-03-01T10:00:00Z' },
        { id: 2, version: 1, expiresAt: future, revoked: true, createdAt: '2026-02-01T10:00:00Z' },
      ],
    });
    await fixture.whenStable();
    return { fixture, el: fixture.nativeElement as HTMLElement };
  }

  it('lists links with expiry; a withdrawn one says so', async () => {
    const { el } = await render();
    const rows = el.querySelectorAll('[data-testid="referee-link-row"]');
    expect(rows[0].textContent).toContain('Version 2');
    expect(rows[0].textContent).toContain('Expires');
    expect(rows[1].textContent).toContain('Withdrawn');
    expect(rows[1].querySelector('[data-testid="referee-revoke"]')).toBeNull();
  });

  it('creates a link to the current version and shows its address once', async () => {
    const { fixture, el } = await render();
    const days = el.querySelector<HTMLInputElement>('[data-testid="referee-days"]')!;
    days.value = '91';
    days.dispatchEvent(new Event('input'));
    el.querySelector<HTMLButtonElement>('[data-testid="referee-create"]')!.click();
    await fixture.whenStable();
    expect(el.textContent).toContain('Choose between 1 and 90 days.');
    days.value = '14';
    days.dispatchEvent(new Event('input'));
    el.querySelector<HTMLButtonElement>('[data-testid="referee-create"]')!.click();
    const req = http.expectOne('/api/worksheets/7/referee-links');
    expect(req.request.body).toEqual({ days: 14, version: 3 });
    req.flush({ link: { id: 3, version: 3, expiresAt: future, url: 'http://x.test/referee/abc' } }, { status: 201, statusText: 'Created' });
    http.expectOne('/api/worksheets/7/referee-links').flush({ links: [] });
    await fixture.whenStable();
    expect(el.querySelector<HTMLInputElement>('[data-testid="referee-url"]')!.value).toBe('http://x.test/referee/abc');
  });

  it('withdraws a link', async () => {
    const { fixture, el } = await render();
    vi.spyOn(TestBed.inject(Confirmer), 'ask').mockReturnValue(of(true));
    el.querySelector<HTMLButtonElement>('[data-testid="referee-revoke"]')!.click();
    const req = http.expectOne('/api/worksheets/7/referee-links/1');
    expect(req.request.method).toBe('DELETE');
    req.flush(null, { status: 204, statusText: 'No Content' });
    http.expectOne('/api/worksheets/7/referee-links').flush({ links: [] });
    await fixture.whenStable();
  });
});
