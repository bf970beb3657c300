import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { WorksheetReport } from '@shared/evaluation';

export interface RefereeLinkDto {
  id: number;
  version: number;
  expiresAt: string;
  revoked: boolean;
  createdAt: string;
}

/** The answer to creating a link: the only time its address is shown. */
export interface CreatedRefereeLink {
  id: number;
  version: number;
  expiresAt: string;
  url: string;
}

/** What a referee sees: one frozen version and its findings, nothing else. */
export interface RefereeView {
  worksheet: { title: string; version: number; savedAt: string; source: string };
  report: WorksheetReport;
  expiresAt: string;
}

export const REFEREE_DAYS = { min: 1, max: 90, default: 30 } as const;

/** Read-only referee links: managed by authors and owners, opened by anyone with the link. */
@Injectable({ providedIn: 'root' })
export class RefereeApi {
  private readonly http = inject(HttpClient);

  list(worksheetId: number): Observable<RefereeLinkDto[]> {
    return this.http.get<{ links: RefereeLinkDto[] }>(`/api/worksheets/${worksheetId}/referee-links`).pipe(map((r) => r.links));
  }

  create(worksheetId: number, days: number, version: number): Observable<CreatedRefereeLink> {
    return this.http
      .post<{ link: CreatedRefereeLink }>(`/api/worksheets/${worksheetId}/referee-links`, { days, version })
      .pipe(map((r) => r.link));
  }

  revoke(worksheetId: number, linkId: number): Observable<void> {
    return this.http.delete<void>(`/api/worksheets/${worksheetId}/referee-links/${linkId}`);
  }

  open(token: string): Observable<RefereeView> {
    return this.http.get<RefereeView>(`/api/referee/${encodeURIComponent(token)}`);
  }

  /**
   * The record as a PDF (the standalone LaTeX export compiled on the server), with the
   * file name the server gives; fails with the server's sentence (e.g. no pdflatex there).
   */
  async pdf(token: string): Promise<{ blob: Blob; fileName: string }> {
    const res = await fetch(`/api/referee/${encodeURIComponent(token)}/pdf`, { credentials: 'same-origin' });
    if (!res.ok) {
      const body = (await res.json().catch(() => null)) as { error?: { message?: string } } | null;
      throw new Error(body?.error?.message ?? `The PDF could not be made (${res.status}).`);
    }
    const name = /filename="([^"]+)"/.exec(res.headers.get('content-disposition') ?? '')?.[1] ?? 'record.pdf';
    return { blob: await res.blob(), fileName: name };
  }
}
