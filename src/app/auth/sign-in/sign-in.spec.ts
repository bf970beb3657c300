import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { SignIn } from './sign-in';

describe('SignIn', () => {
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [SignIn],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  async function fill(email: string, password: string) {
    const fixture = TestBed.createComponent(SignIn);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const emailInput = el.querySelector<HTMLInputElement>('input[name="email"]')!;
    const passwordInput = el.querySelector<HTMLInputElement>('input[name="password"]')!;
    emailInput.value = email;
    emailInput.dispatchEvent(new Event('input'));
    passwordInput.value = password;
    passwordInput.dispatchEvent(new Event('input'));
    el.querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    await fixture.whenStable();
    return { fixture, el };
  }

  it('shows the server sentence when the password is wrong', async () => {
    const { fixture, el } = await fill('Author@Demo.Sheetwise.test', 'not the password');
    const req = http.expectOne('/api/auth/login');
    expect(req.request.body).toEqual({ email: 'author@demo.sheetwise.test', password: 'not the password' });
    req.flush(
      { error: { code: 'bad_credentials', message: 'That e-mail and password do not match an account.' } },
      { status: 401, statusText: 'Unauthorized' },
    );
    await fixture.whenStable();
    expect(el.querySelector('[data-testid="sign-in-error"]')?.textContent).toContain(
      'That e-mail and password do not match an account.',
    );
  });

  it('checks the e-mail with the shared schema before sending anything', async () => {
    const { el } = await fill('not-an-address', 'whatever');
    http.expectNone('/api/auth/login');
    expect(el.textContent).toContain('Enter a valid e-mail address.');
  });

  it('links to the forgotten-password page', async () => {
    const fixture = TestBed.createComponent(SignIn);
    await fixture.whenStable();
    const link = (fixture.nativeElement as HTMLElement).querySelector('[data-testid="forgot-password-link"]');
    expect(link?.getAttribute('href')).toBe('/forgot-password');
    expect(link?.textContent?.trim()).toBe('Forgot your password?');
  });

  it('goes to the groups after signing in', async () => {
    const router = TestBed.inject(Router);
    const navigate = vi.spyOn(router, 'navigateByUrl').mockResolvedValue(true);
    const { fixture } = await fill('author@demo.sheetwise.test', 'sheetwise-demo');
    http.expectOne('/api/auth/login').flush({
      user: { id: 2, email: 'author@demo.sheetwise.test', displayName: 'A', siteRole: 'user', disabled: false },
    });
    await fixture.whenStable();
    expect(navigate).toHaveBeenCalledWith('/groups');
  });
});
