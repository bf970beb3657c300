import { DestroyRef, Injectable, effect, inject, signal } from '@angular/core';
import { NavigationEnd, Router } from '@angular/router';
import { filter } from 'rxjs';
import { AuthStore } from '../../core/auth/auth-store';

const REFRESH_MS = 60_000;

/**
 * How many reviews wait for the signed-in person: asked on sign-in, after each navigation,
 * every minute while the window is visible, and when a verdict is given here (refresh()).
 * A plain fetch of a small count, so the page's loading bar does not flicker for it.
 */
@Injectable({ providedIn: 'root' })
export class PendingReviewsStore {
  private readonly auth = inject(AuthStore);
  readonly count = signal(0);

  constructor() {
    effect(() => (this.auth.signedIn() ? this.refresh() : this.count.set(0)));
    inject(Router)
      .events.pipe(filter((e) => e instanceof NavigationEnd))
      .subscribe(() => this.refresh());
    const timer = setInterval(() => document.visibilityState === 'visible' && this.refresh(), REFRESH_MS);
    inject(DestroyRef).onDestroy(() => clearInterval(timer));
  }

  refresh(): void {
    if (!this.auth.signedIn()) return;
    fetch('/api/review-queue/count', { credentials: 'same-origin', headers: { accept: 'application/json' } })
      .then((res) => (res.ok ? (res.json() as Promise<{ count: number }>) : null))
      .then((body) => body && this.count.set(body.count))
      .catch(() => undefined);
  }
}
