import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';
import type { ApiErrorBody } from '@shared/api';
import type { WorksheetReport } from '@shared/evaluation';

/** A stored evaluation: the report of one saved version. */
export interface StoredEvaluation {
  version: number;
  report: WorksheetReport;
}

/** What a streamed evaluation tells while it runs, and at its end. */
export type EvaluationEvent =
  | { type: 'progress'; index: number; line: number; total: number }
  | { type: 'report'; report: WorksheetReport };

/** An evaluation that failed on the server, with the server's sentence. */
export class EvaluationError extends Error {
  constructor(
    message: string,
    readonly code: string,
    readonly status = 0,
  ) {
    super(message);
  }
}

/** The evaluation endpoints: live evaluation of a draft, and the stored report of a saved version. */
@Injectable({ providedIn: 'root' })
export class EvaluationApi {
  private readonly http = inject(HttpClient);

  /** Evaluate a draft; unsubscribing aborts the request (and the evaluation on the server). */
  evaluate(source: string): Observable<WorksheetReport> {
    return this.http.post<WorksheetReport>('/api/evaluate', { source });
  }

  /**
   * Evaluate a draft as a server-sent-event stream: progress as each statement starts, then the
   * report. Unsubscribing aborts the fetch, which cancels the evaluation on the server. A server
   * that answers plain JSON instead of a stream is accepted too.
   */
  evaluateStream(source: string): Observable<EvaluationEvent> {
    return new Observable<EvaluationEvent>((subscriber) => {
      const abort = new AbortController();
      const token = readCookie('XSRF-TOKEN');
      (async () => {
        const res = await fetch('/api/evaluate', {
          method: 'POST',
          credentials: 'same-origin',
          headers: {
            'content-type': 'application/json',
            accept: 'text/event-stream',
            ...(token ? { 'x-xsrf-token': token } : {}),
          },
          body: JSON.stringify({ source }),
          signal: abort.signal,
        });
        const type = res.headers.get('content-type') ?? '';
        if (!res.ok) {
          const body = (await res.json().catch(() => null)) as Partial<ApiErrorBody> | null;
          throw new EvaluationError(
            body?.error?.message ?? `The evaluation was not accepted (status ${res.status}).`,
            body?.error?.code ?? 'http_error',
            res.status,
          );
        }
        if (!type.includes('text/event-stream') || !res.body) {
          subscriber.next({ type: 'report', report: (await res.json()) as WorksheetReport });
          subscriber.complete();
          return;
        }
        const reader = res.body.pipeThrough(new TextDecoderStream()).getReader();
        let buffer = '';
        for (;;) {
          const { value, done } = await reader.read();
          if (done) break;
          buffer += value.replace(/\r\n/g, '\n');
          let cut: number;
          while ((cut = buffer.indexOf('\n\n')) >= 0) {
            const block = buffer.slice(0, cut);
            buffer = buffer.slice(cut + 2);
            const event = parseSse(block);
            if (!event) continue;
            if (event.name === 'progress') {
              const p = JSON.parse(event.data) as { index: number; line: number; total: number };
              subscriber.next({ type: 'progress', ...p });
            } else if (event.name === 'report') {
              subscriber.next({ type: 'report', report: JSON.parse(event.data) as WorksheetReport });
              subscriber.complete();
              return;
            } else if (event.name === 'error') {
              const body = JSON.parse(event.data) as Partial<ApiErrorBody>;
              throw new EvaluationError(body.error?.message ?? 'The evaluation failed.', body.error?.code ?? 'error');
            }
          }
        }
        throw new EvaluationError('The evaluation ended without a report. Try again.', 'incomplete');
      })().catch((err: unknown) => {
        if (abort.signal.aborted) return;
        subscriber.error(
          err instanceof EvaluationError
            ? err
            : new EvaluationError('The server could not be reached. Check your connection and try again.', 'network'),
        );
      });
      return () => abort.abort();
    });
  }

  /** The stored report of the worksheet's current version (404 when none is stored yet). */
  stored(worksheetId: number): Observable<StoredEvaluation> {
    return this.http.get<StoredEvaluation>(`/api/worksheets/${worksheetId}/evaluation`);
  }

  /** Evaluate the worksheet's current saved version and store the report with it. */
  evaluateSaved(worksheetId: number): Observable<StoredEvaluation> {
    return this.http.post<StoredEvaluation>(`/api/worksheets/${worksheetId}/evaluation`, {});
  }
}

function readCookie(name: string): string | null {
  const hit = document.cookie.split('; ').find((c) => c.startsWith(`${name}=`));
  return hit ? decodeURIComponent(hit.slice(name.length + 1)) : null;
}

function parseSse(block: string): { name: string; data: string } | null {
  let name = 'message';
  const data: string[] = [];
  for (const line of block.split('\n')) {
    if (line.startsWith(':')) continue;
    const colon = line.indexOf(':');
    const field = colon < 0 ? line : line.slice(0, colon);
    const value = colon < 0 ? '' : line.slice(colon + 1).replace(/^ /, '');
    if (field === 'event') name = value;
    else if (field === 'data') data.push(value);
  }
  return data.length ? { name, data: data.join('\n') } : null;
}
