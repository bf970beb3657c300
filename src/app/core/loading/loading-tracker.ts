import { Injectable, computed, signal } from '@angular/core';

/** Counts requests in flight, so the shell can show one progress bar for every fetch. */
@Injectable({ providedIn: 'root' })
export class LoadingTracker {
  private readonly pending = signal(0);
  readonly busy = computed(() => this.pending() > 0);

  start(): void {
    this.pending.update((n) => n + 1);
  }

  stop(): void {
    this.pending.update((n) => Math.max(0, n - 1));
  }
}
