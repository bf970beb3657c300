import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { WorksheetReport } from '@shared/evaluation';

/** A file attached to a worksheet (GET /api/worksheets/:id/attachments). */
export interface AttachmentDto {
  id: number;
  fileName: string;
  mediaType: string;
  size: number;
  uploadedBy: string;
  createdAt?: string;
}

/** What an import would create, before anything is stored. */
export interface ImportPreview {
  title: string;
  source: string;
  report: WorksheetReport;
}

export type ExportFormat = 'swk' | 'json' | 'latex';

/** Uploads (imports, attachments) and exports. Multipart bodies carry the file as field "file". */
@Injectable({ providedIn: 'root' })
export class FilesApi {
  private readonly http = inject(HttpClient);

  attachments(worksheetId: number): Observable<AttachmentDto[]> {
    return this.http
      .get<{ attachments: AttachmentDto[] }>(`/api/worksheets/${worksheetId}/attachments`)
      .pipe(map((r) => r.attachments));
  }

  attach(worksheetId: number, file: File): Observable<AttachmentDto> {
    const body = new FormData();
    body.append('file', file, file.name);
    return this.http
      .post<{ attachment: AttachmentDto }>(`/api/worksheets/${worksheetId}/attachments`, body)
      .pipe(map((r) => r.attachment));
  }

  removeAttachment(worksheetId: number, attachmentId: number): Observable<void> {
    return this.http.delete<void>(`/api/worksheets/${worksheetId}/attachments/${attachmentId}`);
  }

  attachmentUrl(worksheetId: number, attachmentId: number): string {
    return `/api/worksheets/${worksheetId}/attachments/${attachmentId}`;
  }

  exportUrl(worksheetId: number, format: ExportFormat): string {
    return `/api/worksheets/${worksheetId}/export?format=${format}`;
  }

  exportText(worksheetId: number, format: ExportFormat): Observable<string> {
    return this.http.get(this.exportUrl(worksheetId, format), { responseType: 'text' });
  }

  previewImport(groupId: number, file: File, title?: string): Observable<ImportPreview> {
    return this.http
      .post<{ preview: ImportPreview }>(`/api/groups/${groupId}/imports`, importBody(file, title))
      .pipe(map((r) => r.preview));
  }

  saveImport(groupId: number, file: File, title?: string): Observable<{ id: number; title: string; version: number }> {
    return this.http
      .post<{ worksheet: { id: number; title: string; version: number } }>(`/api/groups/${groupId}/imports?save=1`, importBody(file, title))
      .pipe(map((r) => r.worksheet));
  }
}

function importBody(file: File, title?: string): FormData {
  const body = new FormData();
  // The title goes first so the server has it when the file arrives.
  if (title?.trim()) body.append('title', title.trim());
  body.append('file', file, file.name);
  return body;
}

/** A size in words a person reads at a glance. */
export function formatSize(bytes: number): string {
  if (bytes < 1024) return `${bytes} B`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(bytes < 10 * 1024 ? 1 : 0)} kB`;
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
}
