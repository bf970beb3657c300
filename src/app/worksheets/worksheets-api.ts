import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type {
  CreateWorksheetBody,
  Page,
  SaveWorksheetBody,
  WorksheetDto,
  WorksheetListQuery,
  WorksheetSummaryDto,
} from '@shared/api';
import type { CheckpointBody, DraftBody, DraftDto, HeadDto, MilestoneCheckDto, VersionDto } from '@shared/versions-api';

/** The answer to keeping a draft: the draft (null when it equals its version), the latest version, and the automatic version it became, if it did. */
export interface DraftSaved {
  draft: DraftDto | null;
  worksheet: WorksheetDto;
  autoVersion: number | null;
}

/** Worksheets: the group's list and one worksheet with its versions. */
@Injectable({ providedIn: 'root' })
export class WorksheetsApi {
  private readonly http = inject(HttpClient);

  list(groupId: number, query: WorksheetListQuery): Observable<Page<WorksheetSummaryDto>> {
    const params = new HttpParams({
      fromObject: {
        search: query.search,
        sort: query.sort,
        direction: query.direction,
        page: query.page,
        pageSize: query.pageSize,
      },
    });
    return this.http.get<Page<WorksheetSummaryDto>>(`/api/groups/${groupId}/worksheets`, { params });
  }

  create(groupId: number, body: CreateWorksheetBody): Observable<WorksheetDto> {
    return this.http
      .post<{ worksheet: WorksheetDto }>(`/api/groups/${groupId}/worksheets`, body)
      .pipe(map((r) => r.worksheet));
  }

  get(id: number): Observable<WorksheetDto> {
    return this.http.get<{ worksheet: WorksheetDto }>(`/api/worksheets/${id}`).pipe(map((r) => r.worksheet));
  }

  /** keepalive: the request outlives the page (used on unload). A stale baseVersion fails with 409 and the current version (see versionConflict). */
  save(id: number, body: SaveWorksheetBody | CheckpointBody, options: { keepalive?: boolean } = {}): Observable<WorksheetDto> {
    return this.http
      .put<{ worksheet: WorksheetDto }>(`/api/worksheets/${id}`, body, options)
      .pipe(map((r) => r.worksheet));
  }

  remove(id: number): Observable<void> {
    return this.http.delete<void>(`/api/worksheets/${id}`);
  }

  versions(id: number): Observable<VersionDto[]> {
    return this.http.get<{ versions: VersionDto[] }>(`/api/worksheets/${id}/versions`).pipe(map((r) => r.versions));
  }

  /** The caller's own draft (autosave keeps it on the server; it is not a version). */
  draft(id: number): Observable<DraftDto | null> {
    return this.http.get<{ draft: DraftDto | null }>(`/api/worksheets/${id}/draft`).pipe(map((r) => r.draft));
  }

  keepDraft(id: number, body: DraftBody, options: { keepalive?: boolean } = {}): Observable<DraftSaved> {
    return this.http.put<DraftSaved>(`/api/worksheets/${id}/draft`, body, options);
  }

  discardDraft(id: number): Observable<void> {
    return this.http.delete<void>(`/api/worksheets/${id}/draft`);
  }

  /** The latest version's number and author (polled to tell this window of newer versions). */
  head(id: number): Observable<HeadDto> {
    return this.http.get<HeadDto>(`/api/worksheets/${id}/head`);
  }

  milestoneCheck(id: number, version: number): Observable<MilestoneCheckDto> {
    return this.http.get<MilestoneCheckDto>(`/api/worksheets/${id}/versions/${version}/milestone`);
  }

  signOff(id: number, version: number): Observable<VersionDto> {
    return this.http.post<{ version: VersionDto }>(`/api/worksheets/${id}/versions/${version}/milestone`, {}).pipe(map((r) => r.version));
  }
}
