import { HttpInterceptorFn, HttpResponse } from '@angular/common/http';
import { from, of, switchMap } from 'rxjs';

/**
 * GET requests started before the application is up: a visit that starts on a worksheet (a
 * link, a reload) asks for the worksheet and its stored report while the app's code loads
 * and the session is checked, instead of after the page's code has arrived (bench
 * open-worksheet: the two requests left ~200 ms later than they could).
 *
 * The interceptor answers the first matching GET from the early response, once, within
 * EARLY_FOR_MS of its start; an early request that failed or did not answer 200 is simply
 * asked again the usual way, so errors, sign-in and the other interceptors behave as ever.
 */
const EARLY_FOR_MS = 10_000;
const early = new Map<string, { at: number; body: Promise<unknown> }>();

/** Stands for "no usable early response" (a failed request, or an answer other than 200). */
const NONE = Symbol('none');

export function fetchEarly(url: string): void {
  if (typeof fetch !== 'function') return;
  const body = fetch(url, { credentials: 'same-origin', headers: { Accept: 'application/json' } })
    .then((r) => (r.status === 200 ? r.json() : NONE))
    .catch(() => NONE);
  early.set(url, { at: Date.now(), body });
}

/** The early response body for `url`, taken once; null when there is none (or it is too old). */
function takeEarly(url: string): Promise<unknown> | null {
  const e = early.get(url);
  if (!e) return null;
  early.delete(url);
  return Date.now() - e.at <= EARLY_FOR_MS ? e.body : null;
}

export const earlyResponseInterceptor: HttpInterceptorFn = (req, next) => {
  const body = req.method === 'GET' && req.responseType === 'json' ? takeEarly(req.urlWithParams) : null;
  if (!body) return next(req);
  return from(body).pipe(switchMap((b) => (b === NONE ? next(req) : of(new HttpResponse({ status: 200, statusText: 'OK', url: req.urlWithParams, body: b })))));
};
