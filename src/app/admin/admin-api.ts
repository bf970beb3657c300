import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';
import type { UserDto } from '@shared/api';

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
}
