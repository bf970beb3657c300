import { DatePipe } from '@angular/common';
import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { Title } from '@angular/platform-browser';
import { catchError, of, switchMap, tap } from 'rxjs';
import { apiErrorMessage } from '../../core/http/api-error';
import { MatButtonModule } from '@angular/material/button';
import { ComplexDiagram } from '../../worksheets/diagram/complex-diagram';
import { drawnStatement } from '../../worksheets/diagram/diagram-data';
import { FindingCard } from '../../worksheets/findings/finding-card';
import { RefereeApi, type RefereeView } from '../referee-api';

/**
 * /referee/:token, for a referee without an account: one frozen version of a worksheet,
 * its source read only (long lines wrap, with their line numbers kept beside them), its
 * findings, the complex plane of the selected statement, and the record as a PDF. No
 * editor, no group, nothing else.
 */
@Component({
  selector: 'app-referee-page',
  imports: [DatePipe, MatButtonModule, FindingCard, ComplexDiagram],
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
  protected readonly selected = computed(() => {
    const line = this.selectedLine();
    return this.statements().find((s) => (line === null ? s.kind === 'integral' : s.line === line)) ?? null;
  });
  protected readonly drawn = computed(() => drawnStatement(this.selected(), this.statements()));
  protected readonly pdfBusy = signal(false);
  protected readonly pdfError = signal<string | null>(null);

  protected async downloadPdf(): Promise<void> {
    this.pdfBusy.set(true);
    this.pdfError.set(null);
    try {
      const { blob, fileName } = await this.api.pdf(this.token());
      const url = URL.createObjectURL(blob);
      const a = document.createElement('a');
      a.href = url;
      a.download = fileName;
      a.click();
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
    } catch (err) {
      this.pdfError.set(err instanceof Error ? err.message : String(err));
    } finally {
      this.pdfBusy.set(false);
    }
  }

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
