import { HttpEventType, HttpHeaderResponse, HttpHeaders, HttpResponse, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { EvaluationApi, EvaluationError, type EvaluationEvent } from './evaluation-api';
import { FIXTURE_REPORT } from './testing/report-fixture';

describe('EvaluationApi', () => {
  let http: HttpTestingController;
  let api: EvaluationApi;
  const SSE = new HttpHeaders({ 'content-type': 'text/event-stream' });

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    api = TestBed.inject(EvaluationApi);
  });
  afterEach(() => http.verify());

  function collect(source: ReturnType<EvaluationApi['evaluateStream']>) {
    const events: EvaluationEvent[] = [];
    const out = { events, error: null as EvaluationError | null, done: false };
    source.subscribe({ next: (e) => events.push(e), error: (e: EvaluationError) => (out.error = e), complete: () => (out.done = true) });
    return out;
  }

  it('streams through HttpClient: progress as the text arrives in pieces, then the validated report', () => {
    const run = collect(api.evaluateStream('param k : positive'));
    const req = http.expectOne('/api/evaluate');
    expect(req.request.method).toBe('POST');
    expect(req.request.headers.get('accept')).toBe('text/event-stream');
    expect(req.request.reportProgress).toBe(true);
    expect(req.request.responseType).toBe('text');
    const text = `event: progress\ndata: {"index":0,"line":1,"total":2}\n\nevent: progress\ndata: {"index":1,"line":2,"total":2}\n\nevent: report\ndata: ${JSON.stringify(FIXTURE_REPORT)}\n\n`;
    req.event(new HttpHeaderResponse({ headers: SSE, status: 200 }));
    // A chunk may end in the middle of an event: only whole events come out.
    const cut = text.indexOf('"index":1') + 5;
    req.event({ type: HttpEventType.DownloadProgress, loaded: cut, partialText: text.slice(0, cut) });
    expect(run.events).toEqual([{ type: 'progress', index: 0, line: 1, total: 2 }]);
    req.event({ type: HttpEventType.DownloadProgress, loaded: text.length, partialText: text });
    req.flush(text, { headers: { 'content-type': 'text/event-stream' } });
    expect(run.events.map((e) => e.type)).toEqual(['progress', 'progress', 'report']);
    expect((run.events[2] as { report: unknown }).report).toEqual(FIXTURE_REPORT);
    expect(run.done).toBe(true);
  });

  it('takes the stored-report envelope in a report event', () => {
    const run = collect(api.recompute(7));
    const req = http.expectOne('/api/worksheets/7/report');
    const body = `event: report\ndata: ${JSON.stringify({ version: 4, engine: 'x', current: true, report: FIXTURE_REPORT })}\n\n`;
    req.event(new HttpHeaderResponse({ headers: SSE, status: 200 }));
    req.event(new HttpResponse({ body, headers: SSE, status: 200 }));
    expect(run.events).toEqual([{ type: 'report', report: FIXTURE_REPORT, stored: { version: 4, engine: 'x', current: true } }]);
  });

  it('turns a malformed report into an error with a sentence, not a crash', () => {
    const run = collect(api.evaluateStream('x'));
    const bad = { ...FIXTURE_REPORT, statements: [{ line: 'one' }] };
    http.expectOne('/api/evaluate').flush(JSON.stringify(bad), { headers: { 'content-type': 'application/json' } });
    expect(run.events).toEqual([]);
    expect(run.error).toBeInstanceOf(EvaluationError);
    expect(run.error!.code).toBe('malformed_report');
    expect(run.error!.message).toContain('cannot read');
  });

  it('reads the server’s error sentence from a text body and from an error event', () => {
    const run = collect(api.evaluateStream('x'));
    http.expectOne('/api/evaluate').flush(JSON.stringify({ error: { code: 'too_large', message: 'The worksheet is too long.' } }), { status: 413, statusText: 'Too Large' });
    expect(run.error!.message).toBe('The worksheet is too long.');
    expect(run.error!.status).toBe(413);

    const second = collect(api.evaluateStream('y'));
    const req = http.expectOne('/api/evaluate');
    req.event(new HttpHeaderResponse({ headers: SSE, status: 200 }));
    req.event(new HttpResponse({ body: 'event: error\ndata: {"error":{"code":"evaluation_failed","message":"The evaluation stopped."}}\n\n', headers: SSE, status: 200 }));
    expect(second.error!.message).toBe('The evaluation stopped.');
  });

  it('reads the stored report of the latest version', () => {
    let got: unknown;
    api.stored(7).subscribe((s) => (got = s));
    http.expectOne({ method: 'GET', url: '/api/worksheets/7/report' }).flush({ version: 3, engine: 'e', current: false, report: null });
    expect(got).toEqual({ version: 3, engine: 'e', current: false, report: null });
  });
});
