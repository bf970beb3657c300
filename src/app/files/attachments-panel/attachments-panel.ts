import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, effect, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { apiErrorMessage } from '../../core/http/api-error';
import { Notifier } from '../../core/notify/notifier';
import { FilesApi, formatSize, type AttachmentDto } from '../files-api';
import { uploadErrorMessage } from '../upload-error';
import { Confirmer } from '../../core/dialogs/confirmer';

/** Supporting files of a worksheet: list with downloads; upload and delete for authors and owners. */
@Component({
  selector: 'app-attachments-panel',
  imports: [DatePipe, MatButtonModule],
  templateUrl: './attachments-panel.html',
  styleUrl: './attachments-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AttachmentsPanel {
  private readonly confirmer = inject(Confirmer);
  private readonly api = inject(FilesApi);
  private readonly notifier = inject(Notifier);

  readonly worksheetId = input.required<number>();
  readonly canEdit = input(false);

  protected readonly files = signal<AttachmentDto[]>([]);
  protected readonly loading = signal(true);
  protected readonly error = signal<string | null>(null);
  protected readonly uploading = signal(false);
  protected readonly uploadError = signal<string | null>(null);
  protected readonly size = formatSize;

  constructor() {
    effect(() => this.load(this.worksheetId()));
  }

  protected url(a: AttachmentDto): string {
    return this.api.attachmentUrl(this.worksheetId(), a.id);
  }

  load(id = this.worksheetId()): void {
    this.loading.set(true);
    this.error.set(null);
    this.api.attachments(id).subscribe({
      next: (files) => {
        this.files.set(files);
        this.loading.set(false);
      },
      error: (err: unknown) => {
        this.error.set(apiErrorMessage(err));
        this.loading.set(false);
      },
    });
  }

  protected onFile(input: HTMLInputElement): void {
    const file = input.files?.[0];
    if (!file) return;
    this.uploadError.set(null);
    this.uploading.set(true);
    this.api.attach(this.worksheetId(), file).subscribe({
      next: (a) => {
        this.uploading.set(false);
        input.value = '';
        this.files.update((list) => [...list, a]);
        this.notifier.info(`${a.fileName} attached.`);
      },
      error: (err: unknown) => {
        this.uploading.set(false);
        input.value = '';
        this.uploadError.set(`${file.name}: ${uploadErrorMessage(err, '10 MB')}`);
      },
    });
  }

  protected remove(a: AttachmentDto): void {
    this.confirmer
      .ask({ title: 'Delete this file?', message: `Delete the file “${a.fileName}” from this worksheet?`, confirm: 'Delete', danger: true })
      .subscribe((ok) => ok && this.removeNow(a));
  }

  private removeNow(a: AttachmentDto): void {
    this.api.removeAttachment(this.worksheetId(), a.id).subscribe({
      next: () => {
        this.files.update((list) => list.filter((x) => x.id !== a.id));
        this.notifier.info(`${a.fileName} deleted.`);
      },
      error: (err: unknown) => this.notifier.error(err),
    });
  }
}
