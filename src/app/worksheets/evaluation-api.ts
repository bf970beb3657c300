import { HttpClient, HttpErrorResponse, HttpEventType, HttpHeaders, type HttpEvent } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { createParser, type EventSourceMessage } from 'eventsource-parser';
import { Observable, catchError, map, mergeMap, of, throwError, type OperatorFunction } from 'rxjs';
import type { z } from 'zod';
import type { ApiErrorBody } from '@shared/api';
import { evaluationProgress, worksheetReport, type EvaluationProgress, type WorksheetReport } from '@shared/evaluation';
import { storedReportResponse, type StoredReportResponse } from '@shared/report-api';
import { apiErrorMessage } from '../core/http/api-error';

/** The stored report of a worksheet's latest version; `current` is false when another engine made it (or none is stored). */
export type StoredReport = StoredReportResponse;

/** What a streamed evaluation tells while it runs, and at its end. */
export type EvaluationEvent =
  | ({ type: 'progress' } & EvaluationProgress)
  | { type: 'report'; report: WorksheetReport; stored?: Omit<StoredReport, 'report'> };

/** An evaluation that failed (on the server, on the way, or in a malformed report), with a sentence to show. */
export class EvaluationError extends Error {
  constructor(
    message: string,
    readonly code: string,
    readonly status = 0,
  ) {
    super(message);
  }
}

const STREAM = new HttpHeaders({ accept: 'text/event-stream' });

/**
 * The evaluation endpoints, all through HttpClient so the XSRF, loading and session
 * interceptors see them: live evaluation of a draft (POST /api/evaluate) and the stored
 * report of the latest saved version (GET / POST /api/worksheets/:id/report). Every report
 * is checked against the shared zod schema before the screen uses it.
 */
@Injectable({ providedIn: 'root' })
export class EvaluationApi {
  private readonly http = inject(HttpClient);

  /** Stream the evaluation of a draft; unsubscribing aborts the request and the work on the server. */
  evaluateStream(source: string): Observable<EvaluationEvent> {
    return this.stream('/api/evaluate', { source });
  }

  /** The stored report of the worksheet's latest version; never evaluates. */
  stored(worksheetId: number): Observable<StoredReport> {
    return this.http.get<unknown>(`/api/worksheets/${worksheetId}/report`).pipe(
      map((body) => parseStored(body)),
      catchError((err: unknown) => throwError(() => toEvaluationError(err))),
    );
  }

  /** Evaluate the latest saved version on the server, which stores the report; streamed. */
  recompute(worksheetId: number): Observable<EvaluationEvent> {
    return this.stream(`/api/worksheets/${worksheetId}/report`, {});
  }

  private stream(url: string, body: object): Observable<EvaluationEvent> {
    return this.http
      .post(url, body, { headers: STREAM, observe: 'events', reportProgress: true, responseType: 'text' })
      .pipe(
        serverSentEvents(),
        mergeMap((m) => of(...toEvents(m))),
        catchError((err: unknown) => throwError(() => toEvaluationError(err))),
      );
  }
}

/**
 * The server-sent events of a text response, parsed as they arrive: HttpClient hands over the
 * whole text so far with each chunk, so only the new tail is fed to the parser. A server that
 * answered plain JSON instead of a stream gives one `report` message at the end.
 */
export function serverSentEvents(): OperatorFunction<HttpEvent<string>, EventSourceMessage> {
  return (events) =>
    new Observable<EventSourceMessage>((subscriber) => {
      let fed = 0;
      let streamed = false;
      const parser = createParser({ onEvent: (m) => subscriber.next(m) });
      const feed = (text: string) => {
        if (text.length > fed) parser.feed(text.slice(fed));
        fed = text.length;
      };
      return events.subscribe({
        next: (e) => {
          if (e.type === HttpEventType.ResponseHeader) {
            streamed = (e.headers.get('content-type') ?? '').includes('text/event-stream');
          } else if (e.type === HttpEventType.DownloadProgress && streamed) {
            feed(e.partialText ?? '');
          } else if (e.type === HttpEventType.Response) {
            if (streamed) feed(e.body ?? '');
            else subscriber.next({ event: 'report', data: e.body ?? '', id: undefined });
          }
        },
        error: (err: unknown) => subscriber.error(err),
        complete: () => subscriber.complete(),
      });
    });
}

/** One server-sent message as events for the screen; a malformed message is an error, never a crash. */
export function toEvents(m: EventSourceMessage): EvaluationEvent[] {
  const data = parseJson(m.data);
  switch (m.event) {
    case 'progress': {
      const p = evaluationProgress.safeParse(data);
      return p.success ? [{ type: 'progress', ...p.data }] : [];
    }
    case 'report':
      return [reportEvent(data)];
    case 'error': {
      const body = data as Partial<ApiErrorBody> | null;
      throw new EvaluationError(body?.error?.message ?? 'The evaluation failed.', body?.error?.code ?? 'error');
    }
    default:
      return [];
  }
}

/** A `report` event carries the report itself or the stored-report envelope around it. */
function reportEvent(data: unknown): EvaluationEvent {
  if (data && typeof data === 'object' && Array.isArray((data as { statements?: unknown }).statements)) {
    return { type: 'report', report: checkedReport(data) };
  }
  const stored = parseStored(data);
  if (!stored.report) throw new EvaluationError('The server sent no report. Try again.', 'no_report');
  const { report, ...rest } = stored;
  return { type: 'report', report, stored: rest };
}

/** The stored-report envelope, checked against the shared schema with its report. */
export function parseStored(body: unknown): StoredReport {
  return checked(storedReportResponse, body);
}

/** A report checked against the shared schema (the server's word is not taken on trust). */
export function checkedReport(data: unknown): WorksheetReport {
  return checked(worksheetReport, data);
}

function checked<T>(schema: z.ZodType<T>, data: unknown): T {
  const r = schema.safeParse(data);
  if (r.success) return r.data;
  const issue = r.error.issues[0];
  throw malformed(`${issue?.path.map(String).join('.') || 'report'}: ${issue?.message ?? 'not a report'}`);
}

function malformed(detail: string): EvaluationError {
  return new EvaluationError(`The server sent a report this page cannot read (${detail}). Reload the page; if it stays, tell the maintainers.`, 'malformed_report');
}

function parseJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    throw malformed('not JSON');
  }
}

/** Any failure as an EvaluationError; a text error body (responseType 'text') is read as the JSON error it is. */
export function toEvaluationError(err: unknown): EvaluationError {
  if (err instanceof EvaluationError) return err;
  if (err instanceof HttpErrorResponse) {
    let error: unknown = err.error;
    if (typeof error === 'string') {
      try {
        error = JSON.parse(error);
      } catch {
        error = null;
      }
    }
    const parsed = new HttpErrorResponse({ error, status: err.status, statusText: err.statusText, url: err.url ?? undefined });
    const code = (error as Partial<ApiErrorBody> | null)?.error?.code ?? 'http_error';
    return new EvaluationError(apiErrorMessage(parsed), code, err.status);
  }
  return new EvaluationError('Something went wrong while evaluating. Try again.', 'unknown');
}
