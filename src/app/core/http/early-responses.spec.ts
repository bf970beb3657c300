import { HttpClient, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { firstValueFrom } from 'rxjs';
import { earlyResponseInterceptor, fetchEarly } from './early-responses';

describe('early responses', () => {
  let http: HttpClient;
  let backend: HttpTestingController;
  let realFetch: typeof fetch;
  let asked: string[];

  /** fetch answering `status` with `body` for every URL, recording what was asked. */
  function fakeFetch(status: number, body: unknown): void {
    globalThis.fetch = ((url: string) => {
      asked.push(url);
      return Promise.resolve(new Response(JSON.stringify(body), { status, headers: { 'Content-Type': 'application/json' } }));
    }) as typeof fetch;
  }

  beforeEach(() => {
    realFetch = globalThis.fetch;
    asked = [];
    TestBed.configureTestingModule({ providers: [provideHttpClient(withInterceptors([earlyResponseInterceptor])), provideHttpClientTesting()] });
    http = TestBed.inject(HttpClient);
    backend = TestBed.inject(HttpTestingController);
  });

  afterEach(() => {
    globalThis.fetch = realFetch;
    backend.verify();
  });

  it('answers the first matching GET from the early request, once', async () => {
    fakeFetch(200, { worksheet: { id: 7 } });
    fetchEarly('/api/worksheets/7');
    expect(await firstValueFrom(http.get('/api/worksheets/7'))).toEqual({ worksheet: { id: 7 } });
    expect(asked).toEqual(['/api/worksheets/7']);
    // a second GET goes to the server as usual
    const again = firstValueFrom(http.get('/api/worksheets/7'));
    backend.expectOne('/api/worksheets/7').flush({ worksheet: { id: 7, title: 'newer' } });
    expect(await again).toEqual({ worksheet: { id: 7, title: 'newer' } });
  });

  it('asks again the usual way when the early request did not answer 200', async () => {
    fakeFetch(401, { error: { code: 'unauthenticated' } });
    fetchEarly('/api/worksheets/8/report');
    const got = firstValueFrom(http.get('/api/worksheets/8/report'));
    await new Promise((r) => setTimeout(r, 0));
    backend.expectOne('/api/worksheets/8/report').flush({ report: null });
    expect(await got).toEqual({ report: null });
  });

  it('leaves other URLs and methods alone', async () => {
    fakeFetch(200, { ok: true });
    fetchEarly('/api/worksheets/9');
    const other = firstValueFrom(http.get('/api/worksheets/10'));
    backend.expectOne('/api/worksheets/10').flush({ worksheet: { id: 10 } });
    await other;
    const put = firstValueFrom(http.put('/api/worksheets/9', {}));
    backend.expectOne((r) => r.method === 'PUT' && r.url === '/api/worksheets/9').flush({});
    await put;
    // the early response is still there for its own GET
    expect(await firstValueFrom(http.get('/api/worksheets/9'))).toEqual({ ok: true });
  });
});
