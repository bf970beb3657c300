import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { Unlock } from './unlock';

describe('Unlock', () => {
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [Unlock],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  async function open() {
    const fixture = TestBed.createComponent(Unlock);
    fixture.componentRef.setInput('token', 'unlock-token-abcdef');
    await fixture.whenStable();
    http.expectOne('/api/auth/me').flush({ error: { code: 'unauthenticated', message: 'Sign in.' } }, { status: 401, statusText: 'Unauthorized' });
    const req = http.expectOne('/api/auth/unlock');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ token: 'unlock-token-abcdef' });
    return { fixture, el: fixture.nativeElement as HTMLElement, req };
  }

  it('unlocks on opening and shows the server sentence with a way to sign in', async () => {
    const { fixture, el, req } = await open();
    req.flush({ message: 'The account is unlocked. Sign in with your password.' });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="unlock-result"]')?.textContent).toContain('The account is unlocked.');
    expect(el.querySelector('[data-testid="unlock-sign-in"]')?.getAttribute('href')).toBe('/sign-in');
  });

  it('says plainly that a spent link does not work, without a pointless retry', async () => {
    const { fixture, el, req } = await open();
    req.flush(
      { error: { code: 'unlock_invalid', message: 'This unlock link is not valid any more (used, expired or mistyped). Try to sign in to get a new one.' } },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="unlock-result"]')?.getAttribute('role')).toBe('alert');
    expect(el.textContent).toContain('not valid any more');
    expect(el.textContent).not.toContain('Try again');
  });

  it('offers a retry when the server could not be reached', async () => {
    const { fixture, el, req } = await open();
    req.error(new ProgressEvent('error'), { status: 0, statusText: '' });
    await fixture.whenStable();
    expect(el.textContent).toContain('The server could not be reached.');
    const retry = [...el.querySelectorAll('button')].find((b) => b.textContent?.includes('Try again'))!;
    retry.click();
    await fixture.whenStable();
    http.expectOne('/api/auth/unlock').flush({ message: 'The account is unlocked. Sign in with your password.' });
    await fixture.whenStable();
    expect(el.textContent).toContain('The account is unlocked.');
  });
});
