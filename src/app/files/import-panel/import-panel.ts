import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { Router } from '@angular/router';
import { LIMITS } from '@shared/api';
import type { StatementReport } from '@shared/evaluation';
import { Notifier } from '../../core/notify/notifier';
import { kindWord } from '../../worksheets/findings/finding-view';
import { FilesApi, type ImportPreview } from '../files-api';
import { uploadErrorMessage } from '../upload-error';

/**
 * Import a .swk file into the group: the server parses and evaluates it and shows the result
 * first; only "Save as new worksheet" stores it.
 */
@Component({
  selector: 'app-import-panel',
  imports: [MatButtonModule, MatFormFieldModule, MatInputModule],
  templateUrl: './import-panel.html',
  styleUrl: './import-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ImportPanel {
  private readonly api = inject(FilesApi);
  private readonly router = inject(Router);
  private readonly notifier = inject(Notifier);

  readonly groupId = input.required<number>();

  protected readonly limits = LIMITS;
  protected readonly open = signal(false);
  protected readonly file = signal<File | null>(null);
  protected readonly title = signal('');
  protected readonly preview = signal<ImportPreview | null>(null);
  protected readonly busy = signal(false);
  protected readonly error = signal<string | null>(null);
  protected readonly problems = computed(() => (this.preview()?.report.statements ?? []).filter((s) => s.status !== 'ok').length);

  protected onFile(picker: HTMLInputElement): void {
    const file = picker.files?.[0] ?? null;
    this.file.set(file);
    this.preview.set(null);
    this.error.set(null);
    if (!file) return;
    this.busy.set(true);
    this.api.previewImport(this.groupId(), file).subscribe({
      next: (p) => {
        this.busy.set(false);
        this.preview.set(p);
        this.title.set(p.title);
      },
      error: (err: unknown) => {
        this.busy.set(false);
        picker.value = '';
        this.file.set(null);
        this.error.set(`${file.name}: ${uploadErrorMessage(err, '1 MB')}`);
      },
    });
  }

  protected save(): void {
    const file = this.file();
    if (!file) return;
    const title = this.title().trim();
    if (!title) {
      this.error.set('Enter a title for the new worksheet.');
      return;
    }
    this.busy.set(true);
    this.error.set(null);
    this.api.saveImport(this.groupId(), file, title).subscribe({
      next: (ws) => {
        this.busy.set(false);
        this.notifier.info(`Worksheet “${ws.title}” imported.`);
        void this.router.navigate(['/worksheets', ws.id]);
      },
      error: (err: unknown) => {
        this.busy.set(false);
        this.error.set(uploadErrorMessage(err, '1 MB'));
      },
    });
  }

  protected cancel(): void {
    this.open.set(false);
    this.file.set(null);
    this.preview.set(null);
    this.error.set(null);
  }

  protected describe(s: StatementReport): string {
    return s.name ? `${kindWord(s.kind)} ${s.name}` : kindWord(s.kind);
  }
}
