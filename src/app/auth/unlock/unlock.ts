import { ChangeDetectionStrategy, Component, OnInit, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { AuthStore } from '../../core/auth/auth-store';
import { apiErrorMessage } from '../../core/http/api-error';
import { AuthFrame } from '../auth-frame/auth-frame';

/** /unlock/:token — the page the lock mail links to; it unlocks the account on opening. */
@Component({
  selector: 'app-unlock',
  imports: [MatButtonModule, RouterLink, AuthFrame],
  templateUrl: './unlock.html',
  styleUrls: ['../sign-in/sign-in.scss', '../outcome.scss'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Unlock implements OnInit {
  private readonly auth = inject(AuthStore);

  /** The route parameter :token. */
  readonly token = input.required<string>();

  protected readonly working = signal(false);
  protected readonly result = signal<{ ok: boolean; text: string; retry: boolean } | null>(null);

  ngOnInit(): void {
    this.unlock();
  }

  protected unlock(): void {
    if (this.working()) return;
    this.working.set(true);
    this.result.set(null);
    this.auth.unlock(this.token()).subscribe({
      next: (text) => {
        this.working.set(false);
        this.result.set({ ok: true, text, retry: false });
      },
      error: (err: unknown) => {
        this.working.set(false);
        const status = (err as { status?: number }).status ?? 0;
        // A 400 means the link itself is spent; only a failed connection or a server problem is worth a retry.
        this.result.set({ ok: false, text: apiErrorMessage(err), retry: status === 0 || status >= 500 });
      },
    });
  }
}
