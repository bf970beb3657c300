import { HttpErrorResponse } from '@angular/common/http';
import { apiErrorMessage } from '../core/http/api-error';

/** An upload that was refused, in plain words: the server's sentence, or one of ours for 413/415. */
export function uploadErrorMessage(err: unknown, limit: string): string {
  if (err instanceof HttpErrorResponse && !(err.error as { error?: { message?: string } } | null)?.error?.message) {
    if (err.status === 413) return `The file is larger than ${limit}. Choose a smaller file.`;
    if (err.status === 415) return 'This kind of file cannot be uploaded here.';
  }
  return apiErrorMessage(err);
}
