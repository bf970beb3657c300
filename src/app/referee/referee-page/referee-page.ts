import { DatePipe } from '@angular/common';
import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { Title } from '@angular/platform-browser';
import { catchError, of, switchMap, tap } from 'rxjs';
import { apiErrorMessage } from '../../core/http/api-error';
import { FindingCard } from '../../worksheets/findings/finding-card';
import { RefereeApi, type RefereeView } from '../referee-api';

/**
 * /referee/:token, for a referee without an account: one frozen version of a worksheet,
 * its source read only and its findings. No editor, no group, nothing else.
 */
@Component({
  selector: 'app-referee-page',
  imports: [DatePipe, FindingCard],
  templateUrl: './referee-page.html',
  styleUrl: './referee-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class RefereePage {
  private readonly api = inject(RefereeApi);
  private readonly pageTitle = inject(Title);

  /** The route parameter :token. */
  readonly token = input.required<string>();

  protected readonly view = signal<RefereeView | null>(null);
  protected readonly loading = signal(true);
  protected readonly error = signal<{ heading: string; text: string } | null>(null);
  protected readonly statements = computed(() => this.view()?.report.statements ?? []);
  protected readonly selectedLine = signal<number | null>(null);

  constructor() {
    toObservable(this.token)
      .pipe(
        tap(() => {
          this.loading.set(true);
          this.error.set(null);
        }),
        switchMap((t) =>
          this.api.open(t).pipe(
            catchError((err: unknown) => {
              this.error.set(describe(err));
              return of(null);
            }),
          ),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((v) => {
        this.loading.set(false);
        this.view.set(v);
        if (v) this.pageTitle.setTitle(`${v.worksheet.title} (referee copy) · Sheetwise`);
      });
  }
}

function describe(err: unknown): { heading: string; text: string } {
  if (err instanceof HttpErrorResponse && err.status === 404) {
    return { heading: 'This link does not open anything', text: apiErrorMessage(err) };
  }
  if (err instanceof HttpErrorResponse && err.status === 410) {
    return { heading: 'This link can no longer be used', text: apiErrorMessage(err) };
  }
  return { heading: 'The worksheet could not be shown', text: apiErrorMessage(err) };
}
