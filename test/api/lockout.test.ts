// Repeated failed sign-ins lock the account for client addresses it never signed in from
// (back-off, see server/auth/throttle.ts); the mailed link unlocks it once.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { LIMITS } from '../../shared/api.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
before(async () => {
  // A high per-address rate limit, so that the account lock is what stops the guessing here.
  server = await startTestServer({ LOGIN_RATE_LIMIT: '100' });
});
after(async () => server?.stop());

test('a locked account refuses even the right password until the mailed link unlocks it', async () => {
  const guesser = new ApiClient(server.url);
  for (let n = 0; n < LIMITS.failedSignInsBeforeLock - 1; n++) {
    const res = await guesser.post('/api/auth/login', { email: DEMO.author, password: `guess-number-${n}` });
    assert.equal(res.status, 401);
    assert.match(res.json.error.message, /password is wrong/);
  }
  const locking = await guesser.post('/api/auth/login', { email: DEMO.author, password: 'the-last-guess' });
  assert.match(locking.json.error.message, /locked after 10 failed sign-ins/);
  const right = await new ApiClient(server.url).post('/api/auth/login', { email: DEMO.author, password: 'sheetwise-demo' });
  assert.equal(right.status, 401);
  assert.match(right.json.error.message, /locked/);

  await server.running.mailer.flush();
  const admin = new ApiClient(server.url);
  await admin.login(DEMO.admin);
  const mail = (await admin.get('/api/admin/outbox')).json.messages.find((m: { to: string; subject: string }) => m.to === DEMO.author && /locked/.test(m.subject));
  assert.ok(mail, 'the unlock mail arrived');
  const token = /\/unlock\/([A-Za-z0-9_-]+)/.exec(mail.text)![1];
  const anon = new ApiClient(server.url);
  assert.equal((await anon.post('/api/auth/unlock', { token })).status, 200);
  assert.equal((await anon.post('/api/auth/unlock', { token })).status, 400, 'the link works once');
  await anon.login(DEMO.author);
});

test('a successful sign-in resets the count of failures', async () => {
  const client = new ApiClient(server.url);
  for (let n = 0; n < LIMITS.failedSignInsBeforeLock - 1; n++) await client.post('/api/auth/login', { email: DEMO.reader, password: `miss-${n}` });
  await client.login(DEMO.reader);
  const after = await new ApiClient(server.url).post('/api/auth/login', { email: DEMO.reader, password: 'one-more-miss' });
  assert.match(after.json.error.message, /password is wrong/);
});
