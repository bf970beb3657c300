import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { ActivatedRouteSnapshot, Router, RouterStateSnapshot, UrlTree, provideRouter } from '@angular/router';
import { Observable, firstValueFrom } from 'rxjs';
import { adminGuard, authGuard } from './auth-guard';

describe('route guards', () => {
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
  });

  function run(guard: typeof authGuard, url: string): Promise<boolean | UrlTree> {
    const result = TestBed.runInInjectionContext(() =>
      guard({} as ActivatedRouteSnapshot, { url } as RouterStateSnapshot),
    ) as Observable<boolean | UrlTree>;
    return firstValueFrom(result);
  }

  it('sends a signed-out user to sign-in with the page to come back to', async () => {
    const result = run(authGuard, '/worksheets/7');
    http.expectOne('/api/auth/me').flush(null, { status: 401, statusText: 'Unauthorized' });
    const tree = (await result) as UrlTree;
    expect(TestBed.inject(Router).serializeUrl(tree)).toBe('/sign-in?returnUrl=%2Fworksheets%2F7');
  });

  it('lets a signed-in user through', async () => {
    const result = run(authGuard, '/groups');
    http.expectOne('/api/auth/me').flush({
      user: { id: 1, email: 'a@b.test', displayName: 'A', siteRole: 'user', disabled: false },
    });
    expect(await result).toBe(true);
  });

  it('keeps a user who is not a site admin out of the admin page', async () => {
    const result = run(adminGuard, '/admin/users');
    http.expectOne('/api/auth/me').flush({
      user: { id: 1, email: 'a@b.test', displayName: 'A', siteRole: 'user', disabled: false },
    });
    expect(TestBed.inject(Router).serializeUrl((await result) as UrlTree)).toBe('/groups');
  });
});
