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
  WorksheetVersionDto,
} from '@shared/api';

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
  save(id: number, body: SaveWorksheetBody, options: { keepalive?: boolean } = {}): Observable<WorksheetDto> {
    return this.http
      .put<{ worksheet: WorksheetDto }>(`/api/worksheets/${id}`, body, options)
      .pipe(map((r) => r.worksheet));
  }

  remove(id: number): Observable<void> {
    return this.http.delete<void>(`/api/worksheets/${id}`);
  }

  versions(id: number): Observable<WorksheetVersionDto[]> {
    return this.http
      .get<{ versions: WorksheetVersionDto[] }>(`/api/worksheets/${id}/versions`)
      .pipe(map((r) => r.versions));
  }
}
