import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { Observable, catchError, map, of, shareReplay, tap, throwError } from 'rxjs';
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

  private accept(user: UserDto): void {
    this.current.set(user);
    this.loading$ = of(user);
  }
}
