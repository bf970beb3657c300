import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { apiErrorMessage } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { REFEREE_DAYS, RefereeApi, type CreatedRefereeLink, type RefereeLinkDto } from '../referee-api';
import { Confirmer } from '../../core/dialogs/confirmer';

/** Referee links of a worksheet: create one for the current version, copy it once, revoke. */
@Component({
  selector: 'app-referee-links',
  imports: [DatePipe, MatButtonModule, MatFormFieldModule, MatInputModule],
  templateUrl: './referee-links.html',
  styleUrl: './referee-links.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RefereeLinks {
  private readonly confirmer = inject(Confirmer);
  private readonly api = inject(RefereeApi);
  private readonly notifier = inject(Notifier);

  readonly worksheetId = input.required<number>();
  /** The current saved version: the one a new link freezes. */
  readonly version = input.required<number>();

  protected readonly range = REFEREE_DAYS;
  protected readonly days = signal<number>(REFEREE_DAYS.default);
  protected readonly links = signal<RefereeLinkDto[]>([]);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);
  protected readonly createError = signal<string | null>(null);
  protected readonly created = signal<CreatedRefereeLink | null>(null);
  protected readonly busy = signal(false);

  constructor() {
    effect(() => this.load(this.worksheetId()));
  }

  load(id = this.worksheetId()): void {
    this.loading.set(true);
    this.error.set(null);
    this.api.list(id).subscribe({
      next: (links) => {
        this.links.set(links);
        this.loading.set(false);
      },
      error: (err: unknown) => {
        this.error.set(apiErrorMessage(err));
        this.loading.set(false);
      },
    });
  }

  protected expired(l: RefereeLinkDto): boolean {
    return new Date(l.expiresAt).getTime() <= Date.now();
  }

  protected create(): void {
    const days = Math.round(Number(this.days()));
    if (!Number.isFinite(days) || days < REFEREE_DAYS.min || days > REFEREE_DAYS.max) {
      this.createError.set(`Choose between ${REFEREE_DAYS.min} and ${REFEREE_DAYS.max} days.`);
      return;
    }
    this.createError.set(null);
    this.busy.set(true);
    this.api.create(this.worksheetId(), days, this.version()).subscribe({
      next: (link) => {
        this.busy.set(false);
        this.created.set(link);
        this.load();
      },
      error: (err: unknown) => {
        this.busy.set(false);
        this.createError.set(apiErrorMessage(err));
      },
    });
  }

  protected async copy(url: string): Promise<void> {
    try {
      await navigator.clipboard.writeText(url);
      this.notifier.info('Link copied. It is shown only now; keep it somewhere safe.');
    } catch {
      this.notifier.error('The browser did not allow copying. Select the address and copy it by hand.');
    }
  }

  protected revoke(l: RefereeLinkDto): void {
    this.confirmer
      .ask({ title: 'Withdraw this link?', message: `Withdraw the referee link to version ${l.version}? Whoever has it can no longer open it.`, confirm: 'Withdraw', danger: true })
      .subscribe((ok) => ok && this.revokeNow(l));
  }

  private revokeNow(l: RefereeLinkDto): void {
    this.api.revoke(this.worksheetId(), l.id).subscribe({
      next: () => {
        if (this.created()?.id === l.id) this.created.set(null);
        this.notifier.info('Referee link withdrawn.');
        this.load();
      },
      error: (err: unknown) => this.notifier.error(err),
    });
  }
}
