import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { ResetPassword } from './reset-password';

const TOKEN = 'reset-token-abcdefghijkl';

describe('ResetPassword', () => {
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [ResetPassword],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  async function submit(password: string, repeat: string) {
    const fixture = TestBed.createComponent(ResetPassword);
    fixture.componentRef.setInput('token', TOKEN);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    for (const [name, value] of [['password', password], ['repeat', repeat]]) {
      const input = el.querySelector<HTMLInputElement>(`input[name="${name}"]`)!;
      input.value = value;
      input.dispatchEvent(new Event('input'));
    }
    el.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    await fixture.whenStable();
    return { fixture, el };
  }

  const signedOut = () =>
    http.expectOne('/api/auth/me').flush({ error: { code: 'unauthenticated', message: 'Sign in.' } }, { status: 401, statusText: 'Unauthorized' });

  it('refuses a short password and two different ones before sending anything', async () => {
    const short = await submit('short', 'short');
    expect(short.el.textContent).toContain('Use a password of at least 12 characters.');
    const differ = await submit('a-long-new-password', 'a-long-new-passwort');
    expect(differ.el.textContent).toContain('The two passwords differ.');
    http.expectNone('/api/auth/password-reset/confirm');
  });

  it('sends the token with the new password and then says to sign in, with a link', async () => {
    const { fixture, el } = await submit('a-long-new-password', 'a-long-new-password');
    signedOut();
    const req = http.expectOne('/api/auth/password-reset/confirm');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ token: TOKEN, password: 'a-long-new-password' });
    req.flush(null, { status: 204, statusText: 'No Content' });
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="reset-done"]')?.textContent).toContain('Password changed');
    expect(el.querySelector('[data-testid="reset-sign-in"]')?.getAttribute('href')).toBe('/sign-in');
    expect(el.querySelector('input[name="password"]')).toBeNull();
  });

  it('shows why a spent link fails and offers a new one', async () => {
    const { fixture, el } = await submit('a-long-new-password', 'a-long-new-password');
    signedOut();
    http.expectOne('/api/auth/password-reset/confirm').flush(
      { error: { code: 'reset_invalid', message: 'This reset link is not valid any more (used, expired or mistyped). Ask for a new one.' } },
      { status: 400, statusText: 'Bad Request' },
    );
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="reset-error"]')?.textContent).toContain('not valid any more');
    expect(el.querySelector('a[href="/forgot-password"]')?.textContent).toContain('Ask for a new link');
  });
});
