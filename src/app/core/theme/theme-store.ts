import { DOCUMENT } from '@angular/common';
import { Injectable, effect, inject, signal } from '@angular/core';

const KEY = 'sheetwise.theme';

/** Light or dark for the whole application; remembered in this browser. */
@Injectable({ providedIn: 'root' })
export class ThemeStore {
  private readonly document = inject(DOCUMENT);
  readonly dark = signal(readInitial());

  constructor() {
    effect(() => {
      const dark = this.dark();
      this.document.documentElement.classList.toggle('sw-dark', dark);
      try {
        localStorage.setItem(KEY, dark ? 'dark' : 'light');
      } catch {
        // Storage may be off; the choice then lasts for this page only.
      }
    });
  }

  toggle(): void {
    this.dark.update((d) => !d);
  }
}

function readInitial(): boolean {
  try {
    const stored = localStorage.getItem(KEY);
    if (stored) return stored === 'dark';
  } catch {
    // ignore
  }
  return typeof matchMedia === 'function' && matchMedia('(prefers-color-scheme: dark)').matches;
}
