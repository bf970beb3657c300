import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, effect, inject, input, output, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import type { WorksheetDto, WorksheetVersionDto } from '@shared/api';
import { Confirmer } from '../../core/dialogs/confirmer';
import { apiErrorMessage } from '../../core/http/api-error';
import { WorksheetsApi } from '../worksheets-api';

/**
 * The versions of a worksheet, newest first; one opens to show its text, and an editor can
 * restore it as the next version (asked first when unsaved text would be replaced).
 */
@Component({
  selector: 'app-version-history',
  imports: [DatePipe, MatButtonModule],
  template: `
    @if (error(); as text) {
      <p class="sw-error">{{ text }}</p>
    }
    @let ws = worksheet();
    <ol class="versions" data-testid="version-list">
      @for (v of versions(); track v.number) {
        <li [class.current]="v.number === ws.version">
          <button type="button" class="version-row" [attr.aria-expanded]="open()?.number === v.number" (click)="toggle(v)">
            <span class="num">v{{ v.number }}</span>
            <span class="who">{{ v.authorName }}</span>
            <time [attr.datetime]="v.createdAt">{{ v.createdAt | date: 'd MMM, HH:mm' }}</time>
          </button>
          @if (open()?.number === v.number) {
            <pre class="source-view" tabindex="0" [attr.aria-label]="'Version ' + v.number + ', read only'">{{ v.source }}</pre>
            @if (canEdit() && v.number !== ws.version) {
              <button mat-stroked-button type="button" (click)="restoreVersion(v)" data-testid="restore-version">
                <span class="material-symbols-outlined" aria-hidden="true">restore</span>
                Restore as version {{ ws.version + 1 }}
              </button>
            }
          }
        </li>
      } @empty {
        <li class="sw-muted">No versions listed yet.</li>
      }
    </ol>
  `,
  styleUrl: './version-history.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class VersionHistory {
  private readonly api = inject(WorksheetsApi);
  private readonly confirmer = inject(Confirmer);
  readonly worksheet = input.required<WorksheetDto>();
  readonly canEdit = input(false);
  /** Unsaved text would be replaced by a restore. */
  readonly dirty = input(false);
  readonly restore = output<string>();

  protected readonly versions = signal<WorksheetVersionDto[]>([]);
  protected readonly error = signal<string | null>(null);
  protected readonly open = signal<WorksheetVersionDto | null>(null);

  constructor() {
    // Loaded when shown, and again after each new version.
    effect(() => {
      const { id } = this.worksheet();
      this.worksheet().version;
      untracked(() => this.load(id));
    });
  }

  protected toggle(v: WorksheetVersionDto): void {
    this.open.update((open) => (open?.number === v.number ? null : v));
  }

  protected restoreVersion(v: WorksheetVersionDto): void {
    if (!this.dirty()) return this.restore.emit(v.source);
    this.confirmer
      .ask({
        title: 'Replace your unsaved text?',
        message: 'Restoring replaces the text you have not saved yet. Restore anyway?',
        confirm: 'Restore',
        danger: true,
      })
      .subscribe((ok) => ok && this.restore.emit(v.source));
  }

  private load(id: number): void {
    this.error.set(null);
    this.api.versions(id).subscribe({
      next: (versions) => this.versions.set(versions),
      error: (err: unknown) => this.error.set(apiErrorMessage(err)),
    });
  }
}
