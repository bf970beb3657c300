import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { UserDto } from '@shared/api';
import { AuthStore } from './auth-store';

const ada: UserDto = { id: 3, email: 'ada@example.test', displayName: 'Ada Field', siteRole: 'user', disabled: false };

describe('AuthStore', () => {
  let store: AuthStore;
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    store = TestBed.inject(AuthStore);
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  it('treats 401 from /api/auth/me as signed out, and asks only once', () => {
    let seen: UserDto | null | undefined;
    store.ensureLoaded().subscribe((u) => (seen = u));
    store.ensureLoaded().subscribe();
    http.expectOne('/api/auth/me').flush({ error: { code: 'unauthenticated', message: 'Sign in.' } }, { status: 401, statusText: 'Unauthorized' });
    expect(seen).toBeNull();
    expect(store.signedIn()).toBe(false);
  });

  it('signs in, then knows the user without asking the server again', () => {
    store.signIn({ email: 'ada@example.test', password: 'long enough pw' }).subscribe();
    const req = http.expectOne('/api/auth/login');
    expect(req.request.method).toBe('POST');
    expect(req.request.body).toEqual({ email: 'ada@example.test', password: 'long enough pw' });
    req.flush({ user: ada });
    expect(store.user()).toEqual(ada);

    let again: UserDto | null | undefined;
    store.ensureLoaded().subscribe((u) => (again = u));
    http.expectNone('/api/auth/me');
    expect(again).toEqual(ada);
  });

  it('forgets the user on sign-out even when the server call fails', () => {
    store.signIn({ email: 'ada@example.test', password: 'long enough pw' }).subscribe();
    http.expectOne('/api/auth/login').flush({ user: ada });
    store.signOut().subscribe();
    http.expectOne('/api/auth/logout').flush(null, { status: 500, statusText: 'Server Error' });
    expect(store.user()).toBeNull();
  });

  it('knows a site admin', () => {
    store.register({ email: 'root@example.test', displayName: 'Root', password: 'long enough pw' }).subscribe();
    http.expectOne('/api/auth/register').flush({ user: { ...ada, siteRole: 'admin' } }, { status: 201, statusText: 'Created' });
    expect(store.isAdmin()).toBe(true);
  });
});
