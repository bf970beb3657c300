import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { GroupRole, GroupSummaryDto, MemberDto } from '@shared/api';

/** Groups and their members: /api/groups. */
@Injectable({ providedIn: 'root' })
export class GroupsApi {
  private readonly http = inject(HttpClient);

  list(): Observable<GroupSummaryDto[]> {
    return this.http.get<{ groups: GroupSummaryDto[] }>('/api/groups').pipe(map((r) => r.groups));
  }

  create(name: string): Observable<GroupSummaryDto> {
    return this.http.post<{ group: GroupSummaryDto }>('/api/groups', { name }).pipe(map((r) => r.group));
  }

  get(groupId: number): Observable<GroupSummaryDto> {
    return this.http.get<{ group: GroupSummaryDto }>(`/api/groups/${groupId}`).pipe(map((r) => r.group));
  }

  rename(groupId: number, name: string): Observable<GroupSummaryDto> {
    return this.http
      .patch<{ group: GroupSummaryDto }>(`/api/groups/${groupId}`, { name })
      .pipe(map((r) => r.group));
  }

  remove(groupId: number): Observable<void> {
    return this.http.delete<void>(`/api/groups/${groupId}`);
  }

  members(groupId: number): Observable<MemberDto[]> {
    return this.http
      .get<{ members: MemberDto[] }>(`/api/groups/${groupId}/members`)
      .pipe(map((r) => r.members));
  }

  changeRole(groupId: number, userId: number, role: GroupRole): Observable<MemberDto> {
    return this.http
      .patch<{ member: MemberDto }>(`/api/groups/${groupId}/members/${userId}`, { role })
      .pipe(map((r) => r.member));
  }

  removeMember(groupId: number, userId: number): Observable<void> {
    return this.http.delete<void>(`/api/groups/${groupId}/members/${userId}`);
  }
}
