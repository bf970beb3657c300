import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatMenuModule } from '@angular/material/menu';
import { Notifier } from '../../core/notify/notifier';
import { FilesApi } from '../files-api';

/** Export the saved version: worksheet file, JSON record, LaTeX appendix, or the LaTeX to the clipboard. */
@Component({
  selector: 'app-export-menu',
  imports: [MatButtonModule, MatMenuModule],
  template: `
    <button mat-stroked-button type="button" data-testid="export-menu" [matMenuTriggerFor]="menu">
      <span class="material-symbols-outlined" aria-hidden="true">ios_share</span> Export
    </button>
    <mat-menu #menu="matMenu" xPosition="before">
      <p class="head" role="presentation">Version {{ version() }} as saved</p>
      <a mat-menu-item [href]="url('swk')" download data-testid="export-swk">
        <span class="material-symbols-outlined" aria-hidden="true">description</span><span>Worksheet file (.swk)</span>
      </a>
      <a mat-menu-item [href]="url('json')" download data-testid="export-json">
        <span class="material-symbols-outlined" aria-hidden="true">data_object</span><span>JSON record</span>
      </a>
      <a mat-menu-item [href]="url('latex')" download data-testid="export-latex">
        <span class="material-symbols-outlined" aria-hidden="true">functions</span><span>LaTeX appendix (.tex)</span>
      </a>
      <button mat-menu-item type="button" data-testid="copy-latex" [disabled]="copying()" (click)="copyLatex()">
        <span class="material-symbols-outlined" aria-hidden="true">content_copy</span><span>Copy LaTeX</span>
      </button>
    </mat-menu>
  `,
  styles: `.head { margin: 0.25rem 1rem 0.4rem; font-size: 0.82rem; color: var(--mat-sys-on-surface-variant); }`,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ExportMenu {
  private readonly api = inject(FilesApi);
  private readonly notifier = inject(Notifier);

  readonly worksheetId = input.required<number>();
  readonly version = input.required<number>();
  /** Unsaved edits are not in any export: say so when copying. */
  readonly dirty = input(false);

  protected readonly copying = signal(false);
  private readonly id = computed(() => this.worksheetId());

  protected url(format: 'swk' | 'json' | 'latex'): string {
    return this.api.exportUrl(this.id(), format);
  }

  protected copyLatex(): void {
    this.copying.set(true);
    this.api.exportText(this.id(), 'latex').subscribe({
      next: async (text) => {
        try {
          await navigator.clipboard.writeText(text);
          this.notifier.info(
            `LaTeX appendix of version ${this.version()} copied${this.dirty() ? ' (your unsaved changes are not in it)' : ''}.`,
          );
        } catch {
          this.notifier.error('The browser did not allow copying to the clipboard. Download the .tex file instead.');
        } finally {
          this.copying.set(false);
        }
      },
      error: (err: unknown) => {
        this.copying.set(false);
        this.notifier.error(err);
      },
    });
  }
}
