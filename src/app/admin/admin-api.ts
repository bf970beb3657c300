import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { UserDto } from '@shared/api';
import type { MailDeliveryDto, OutboxMessageDto } from '@shared/collaboration';

/** Site administration: /api/admin (site admins only). */
@Injectable({ providedIn: 'root' })
export class AdminApi {
  private readonly http = inject(HttpClient);

  users(): Observable<UserDto[]> {
    return this.http.get<{ users: UserDto[] }>('/api/admin/users').pipe(map((r) => r.users));
  }

  setDisabled(id: number, disabled: boolean): Observable<UserDto> {
    return this.http
      .patch<{ user: UserDto }>(`/api/admin/users/${id}`, { disabled })
      .pipe(map((r) => r.user));
  }

  /** Mail the local capture server received, newest first. */
  outbox(): Observable<OutboxMessageDto[]> {
    return this.http.get<{ messages: OutboxMessageDto[] }>('/api/admin/outbox').pipe(map((r) => r.messages));
  }

  /** The delivery state of every mail the product sent: pending retries and failures. */
  mailDeliveries(): Observable<MailDeliveryDto[]> {
    return this.http
      .get<{ deliveries: MailDeliveryDto[] }>('/api/admin/mail-deliveries')
      .pipe(map((r) => r.deliveries));
  }
}
