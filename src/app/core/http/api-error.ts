import { HttpErrorResponse } from '@angular/common/http';
import type { ApiErrorBody, VersionConflictBody } from '@shared/api';

/** Turn any failed request into one sentence a person can act on. */
export function apiErrorMessage(err: unknown): string {
  if (err instanceof HttpErrorResponse) {
    const body = err.error as Partial<ApiErrorBody> | null;
    const message = body && typeof body === 'object' ? body.error?.message : undefined;
    if (message) return message;
    switch (err.status) {
      case 0:
        return 'The server could not be reached. Check your connection and try again.';
      case 401:
        return 'You are signed out. Sign in again to continue.';
      case 403:
        return 'Your role does not allow this.';
      case 404:
        return 'This item does not exist, or you are not a member of its group.';
      case 409:
        return 'Someone changed this meanwhile. Reload to see their version.';
      case 413:
        return 'That is too large to send.';
      case 429:
        return 'Too many attempts. Wait a minute and try again.';
      default:
        return err.status >= 500
          ? 'The server ran into a problem. Try again in a moment.'
          : 'The request was not accepted. Check what you entered and try again.';
    }
  }
  return 'Something went wrong. Try again.';
}

/** The machine-readable code of a failed request (`invitation_used`, …), or null. */
export function apiErrorCode(err: unknown): string | null {
  if (err instanceof HttpErrorResponse) {
    const code = (err.error as Partial<ApiErrorBody> | null)?.error?.code;
    return typeof code === 'string' ? code : null;
  }
  return null;
}

/** The field-level messages of a 400, keyed by field path. */
export function apiErrorDetails(err: unknown): Record<string, string> {
  const out: Record<string, string> = {};
  if (err instanceof HttpErrorResponse) {
    const details = (err.error as Partial<ApiErrorBody> | null)?.error?.details ?? [];
    for (const d of details) out[d.path] ??= d.message;
  }
  return out;
}

/** The 409 body of a stale save, or null when the error is something else. */
export function versionConflict(err: unknown): VersionConflictBody | null {
  if (err instanceof HttpErrorResponse && err.status === 409) {
    const body = err.error as Partial<VersionConflictBody> | null;
    if (body?.current) return body as VersionConflictBody;
  }
  return null;
}
