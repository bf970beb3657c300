import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { ForgotPassword } from './forgot-password';

const MESSAGE = 'If an account has this address, a link to choose a new password is on its way. It works once, for 60 minutes.';

describe('ForgotPassword', () => {
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [ForgotPassword],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  async function submit(email: string) {
    const fixture = TestBed.createComponent(ForgotPassword);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const input = el.querySelector<HTMLInputElement>('input[name="email"]')!;
    input.value = email;
    input.dispatchEvent(new Event('input'));
    el.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    await fixture.whenStable();
    return { fixture, el };
  }

  it('checks the address with the shared schema before sending anything', async () => {
    const { el } = await submit('not-an-address');
    http.expectNone('/api/auth/password-reset');
    http.expectNone('/api/auth/me');
    expect(el.textContent).toContain('Enter a valid e-mail address.');
  });

  it('sends the address (after the session cookie) and shows the server sentence', async () => {
    const { fixture, el } = await submit(' Reader@Demo.Sheetwise.test ');
    // A page opened fresh has no XSRF cookie yet: the store asks who we are first.
    http.expectOne('/api/auth/me').flush({ error: { code: 'unauthenticated', message: 'Sign in.' } }, { status: 401, statusText: 'Unauthorized' });
    const req = http.expectOne('/api/auth/password-reset');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ email: 'reader@demo.sheetwise.test' });
    req.flush({ message: MESSAGE }, { status: 202, statusText: 'Accepted' });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="reset-requested"]')?.textContent).toContain(MESSAGE);
    expect(el.querySelector('form')).toBeNull();
    expect(el.querySelector('a[href="/sign-in"]')).not.toBeNull();
  });

  it('shows a refusal (too many requests) in plain words and keeps the form', async () => {
    const { fixture, el } = await submit('reader@demo.sheetwise.test');
    http.expectOne('/api/auth/me').flush({ error: { code: 'unauthenticated', message: 'Sign in.' } }, { status: 401, statusText: 'Unauthorized' });
    http
      .expectOne('/api/auth/password-reset')
      .flush(
        { error: { code: 'rate_limited', message: 'Too many reset requests. Wait 15 minutes and try again.' } },
        { status: 429, statusText: 'Too Many Requests' },
      );
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="reset-error"]')?.textContent).toContain('Wait 15 minutes');
    expect(el.querySelector('form')).not.toBeNull();
  });
});
