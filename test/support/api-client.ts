/**
 * A small HTTP client with a cookie jar that behaves like Angular's HttpClient
 * towards our API: it sends the XSRF-TOKEN cookie back as X-XSRF-TOKEN.
 */
export class ApiClient {
  readonly cookies = new Map<string, string>();

  constructor(readonly baseUrl: string) {}

  async request(method: string, path: string, body?: unknown, opts: { raw?: string; csrf?: boolean; headers?: Record<string, string> } = {}) {
    if (method !== 'GET' && opts.csrf !== false && !this.cookies.has('XSRF-TOKEN')) {
      await this.request('GET', '/api/health');
    }
    const headers: Record<string, string> = { ...opts.headers };
    if (this.cookies.size) headers['cookie'] = [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
    if (opts.csrf !== false && this.cookies.has('XSRF-TOKEN')) headers['x-xsrf-token'] = decodeURIComponent(this.cookies.get('XSRF-TOKEN')!);
    let payload: string | undefined;
    if (opts.raw !== undefined) {
      payload = opts.raw;
      headers['content-type'] = 'application/json';
    } else if (body !== undefined) {
      payload = JSON.stringify(body);
      headers['content-type'] = 'application/json';
    }
    const res = await fetch(this.baseUrl + path, { method, headers, body: payload, redirect: 'manual' });
    for (const line of res.headers.getSetCookie()) {
      const [pair] = line.split(';');
      const eq = pair.indexOf('=');
      this.cookies.set(pair.slice(0, eq).trim(), pair.slice(eq + 1).trim());
    }
    const text = await res.text();
    let json: any = null;
    try {
      json = text ? JSON.parse(text) : null;
    } catch {
      json = null;
    }
    return { status: res.status, json, text, headers: res.headers };
  }

  /**
   * A streamed POST (Accept: text/event-stream) with the session cookie and XSRF header: the
   * raw Response, so a test can read progress events as they come or drop the connection.
   */
  async stream(path: string, body: unknown, signal?: AbortSignal): Promise<Response> {
    if (!this.cookies.has('XSRF-TOKEN')) await this.request('GET', '/api/health');
    return fetch(this.baseUrl + path, {
      method: 'POST',
      headers: {
        'content-type': 'application/json',
        accept: 'text/event-stream',
        'x-xsrf-token': decodeURIComponent(this.cookies.get('XSRF-TOKEN')!),
        cookie: [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; '),
      },
      body: JSON.stringify(body),
      ...(signal ? { signal } : {}),
    });
  }

  /** A multipart upload with one file in the field "file" (like a browser form). */
  async upload(path: string, fileName: string, bytes: Uint8Array | string, fields: Record<string, string> = {}) {
    if (!this.cookies.has('XSRF-TOKEN')) await this.request('GET', '/api/health');
    const form = new FormData();
    for (const [k, v] of Object.entries(fields)) form.append(k, v);
    form.append('file', new Blob([typeof bytes === 'string' ? bytes : Buffer.from(bytes)]), fileName);
    const headers: Record<string, string> = {
      cookie: [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; '),
      'x-xsrf-token': decodeURIComponent(this.cookies.get('XSRF-TOKEN')!),
    };
    const res = await fetch(this.baseUrl + path, { method: 'POST', headers, body: form });
    const text = await res.text();
    let json: any = null;
    try {
      json = JSON.parse(text);
    } catch {
      json = null;
    }
    return { status: res.status, json, text, headers: res.headers };
  }

  get(path: string) {
    return this.request('GET', path);
  }
  post(path: string, body?: unknown) {
    return this.request('POST', path, body ?? {});
  }
  put(path: string, body?: unknown) {
    return this.request('PUT', path, body ?? {});
  }
  patch(path: string, body?: unknown) {
    return this.request('PATCH', path, body ?? {});
  }
  delete(path: string) {
    return this.request('DELETE', path);
  }

  async login(email: string, password = 'sheetwise-demo') {
    const res = await this.post('/api/auth/login', { email, password });
    if (res.status !== 200) throw new Error(`sign-in as ${email} failed: ${res.status} ${res.text}`);
    return res.json.user;
  }
}

export const DEMO = {
  owner: 'owner@demo.sheetwise.test',
  author: 'author@demo.sheetwise.test',
  reviewer: 'reviewer@demo.sheetwise.test',
  reader: 'reader@demo.sheetwise.test',
  admin: 'admin@demo.sheetwise.test',
} as const;
