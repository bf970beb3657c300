import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { Observable, catchError, map, of, shareReplay, switchMap, tap, throwError } from 'rxjs';
import type { LoginBody, RegisterBody, UserDto } from '@shared/api';

/** Who is signed in. The one place that talks to /api/auth. */
@Injectable({ providedIn: 'root' })
export class AuthStore {
  private readonly http = inject(HttpClient);
  private readonly current = signal<UserDto | null>(null);
  private loading$: Observable<UserDto | null> | null = null;

  readonly user = this.current.asReadonly();
  readonly signedIn = computed(() => this.current() !== null);
  readonly isAdmin = computed(() => this.current()?.siteRole === 'admin');

  /** Ask the server once who we are; later calls reuse the answer. */
  ensureLoaded(): Observable<UserDto | null> {
    this.loading$ ??= this.http.get<{ user: UserDto }>('/api/auth/me').pipe(
      map((r) => r.user),
      catchError((err: unknown) => {
        if (err instanceof HttpErrorResponse && err.status === 401) return of(null);
        // Any other failure: forget the attempt so the next navigation asks again.
        this.loading$ = null;
        return throwError(() => err);
      }),
      tap((user) => this.current.set(user)),
      shareReplay({ bufferSize: 1, refCount: false }),
    );
    return this.loading$;
  }

  signIn(body: LoginBody): Observable<UserDto> {
    return this.http.post<{ user: UserDto }>('/api/auth/login', body).pipe(
      map((r) => r.user),
      tap((user) => this.accept(user)),
    );
  }

  register(body: RegisterBody): Observable<UserDto> {
    return this.http.post<{ user: UserDto }>('/api/auth/register', body).pipe(
      map((r) => r.user),
      tap((user) => this.accept(user)),
    );
  }

  /** Ask the server again who we are (after a sign-in that happened elsewhere, e.g. accepting an invitation). */
  refresh(): Observable<UserDto | null> {
    this.loading$ = null;
    return this.ensureLoaded();
  }

  /** Mail a reset link if the address has an account; the answer says so without telling whether it has. */
  requestPasswordReset(email: string): Observable<string> {
    return this.withSession(() =>
      this.http.post<{ message: string }>('/api/auth/password-reset', { email }).pipe(map((r) => r.message)),
    );
  }

  /** Choose a new password with the token from the reset mail. */
  resetPassword(token: string, password: string): Observable<void> {
    return this.withSession(() => this.http.post<void>('/api/auth/password-reset/confirm', { token, password }));
  }

  /** Unlock an account locked after failed sign-ins, with the token from the unlock mail. */
  unlock(token: string): Observable<string> {
    return this.withSession(() =>
      this.http.post<{ message: string }>('/api/auth/unlock', { token }).pipe(map((r) => r.message)),
    );
  }

  signOut(): Observable<void> {
    return this.http.post<void>('/api/auth/logout', {}).pipe(
      // Even if the server call fails, the client forgets the user.
      catchError(() => of(undefined)),
      tap(() => this.forget()),
      map(() => undefined),
    );
  }

  /** The session ended on the server (a 401 elsewhere). */
  forget(): void {
    this.current.set(null);
    this.loading$ = of(null);
  }

  /**
   * A page opened straight from a mail link may not have the XSRF-TOKEN cookie yet; the
   * server sets it on any API answer, so ask who we are (once) before a state-changing call.
   */
  private withSession<T>(call: () => Observable<T>): Observable<T> {
    return this.ensureLoaded().pipe(
      catchError(() => of(null)),
      switchMap(() => call()),
    );
  }

  private accept(user: UserDto): void {
    this.current.set(user);
    this.loading$ = of(user);
  }
}
