import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { UserDto } from '@shared/api';
import type {
  AcceptInvitationBody,
  InvitationDto,
  InvitationPreviewDto,
  InviteBody,
} from '@shared/collaboration';

/** What accepting an invitation answers: the account now signed in and the group joined. */
export interface AcceptedInvitation {
  user: UserDto;
  groupId: number;
}

/** Invitations by e-mail: /api/groups/:groupId/invitations (owners) and /api/invitations/:token (anyone with the link). */
@Injectable({ providedIn: 'root' })
export class InvitationsApi {
  private readonly http = inject(HttpClient);

  pending(groupId: number): Observable<InvitationDto[]> {
    return this.http
      .get<{ invitations: InvitationDto[] }>(`/api/groups/${groupId}/invitations`)
      .pipe(map((r) => r.invitations));
  }

  invite(groupId: number, body: InviteBody): Observable<InvitationDto> {
    return this.http
      .post<{ invitation: InvitationDto }>(`/api/groups/${groupId}/invitations`, body)
      .pipe(map((r) => r.invitation));
  }

  revoke(groupId: number, invitationId: number): Observable<void> {
    return this.http.delete<void>(`/api/groups/${groupId}/invitations/${invitationId}`);
  }

  preview(token: string): Observable<InvitationPreviewDto> {
    return this.http
      .get<{ invitation: InvitationPreviewDto }>(`/api/invitations/${encodeURIComponent(token)}`)
      .pipe(map((r) => r.invitation));
  }

  accept(token: string, body: AcceptInvitationBody): Observable<AcceptedInvitation> {
    return this.http.post<AcceptedInvitation>(`/api/invitations/${encodeURIComponent(token)}/accept`, body);
  }
}
