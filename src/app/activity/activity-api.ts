import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';

/** One thing someone did in a group. */
export interface ActivityDto {
  id: number;
  who: string;
  action: string;
  subject: string;
  worksheetId: number | null;
  at: string;
}

/** A group's activity: /api/groups/:groupId/activity (newest first, the last 200). */
@Injectable({ providedIn: 'root' })
export class ActivityApi {
  private readonly http = inject(HttpClient);

  forGroup(groupId: number): Observable<ActivityDto[]> {
    return this.http.get<{ activity: ActivityDto[] }>(`/api/groups/${groupId}/activity`).pipe(map((r) => r.activity));
  }
}
