// A statement that runs past the time limit ends with a clear error for that statement
// only; the other statements keep their results and the server stays up.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let client: ApiClient;
before(async () => {
  // A limit so small that any integral exceeds it, while notes and params do not.
  server = await startTestServer({ STATEMENT_TIME_LIMIT_MS: '1' });
  client = new ApiClient(server.url);
  await client.login(DEMO.author);
});
after(async () => server?.stop());

test('the slow statement errs, the others keep their results', async () => {
  const source = ['note "before"', 'param k : positive', 'param g : real', 'integral Z3 = exp(-(k*x^2 + k*y^2 + k*z^2 + 2*i*g*x*y + 2*i*g*y*z)/2) d(x, y, z)', 'note "after"'].join('\n');
  const res = await client.post('/api/evaluate', { source });
  assert.equal(res.status, 200, res.text);
  const [before, k, g, z3, afterNote] = res.json.statements;
  assert.equal(before.status, 'ok');
  assert.equal(k.status, 'ok');
  assert.equal(g.status, 'ok');
  assert.equal(afterNote.status, 'ok');
  assert.equal(z3.status, 'error');
  assert.match(z3.error.message, /time limit/);
  assert.equal(z3.error.line, 4);
  // The server still answers.
  assert.equal((await client.get('/api/auth/me')).status, 200);
});

test('a client that goes away cancels its streamed evaluation; progress events come first', async () => {
  const res = await client.stream('/api/evaluate', { source: 'note "one"\nnote "two"' });
  assert.match(res.headers.get('content-type') ?? '', /^text\/event-stream/);
  const text = await res.text();
  const events = [...text.matchAll(/^event: (\w+)$/gm)].map((m) => m[1]);
  assert.deepEqual(events, ['progress', 'progress', 'report']);
  assert.match(text, /"total":2/);
});
