// Accounts, part 2 (issue 15, finding 7): sign-in back-off instead of a lock any
// stranger can trigger. Keys are normalised; back-off per account and client address,
// per client address across accounts, and per account for addresses it never used; the
// unlock link clears the limiter; counters live in PostgreSQL. Client addresses come
// from X-Forwarded-For, which the server trusts from loopback only.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { QueryTypes } from 'sequelize';
import { LIMITS } from '../../shared/api.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let admin: ApiClient;
// LOGIN_RATE_LIMIT=5: 5 free failures per account and address, 10 per address across accounts.
before(async () => {
  server = await startTestServer({ LOGIN_RATE_LIMIT: '5' });
  admin = new ApiClient(server.url);
  await admin.request('POST', '/api/auth/login', { email: DEMO.admin, password: 'sheetwise-demo' }, from('192.0.2.200'));
});
after(async () => server?.stop());

function from(ip: string) {
  return { headers: { 'x-forwarded-for': ip } };
}
const login = (email: string, password: string, ip: string) => new ApiClient(server.url).request('POST', '/api/auth/login', { email, password }, from(ip));

async function unlockTokenFor(address: string) {
  for (let n = 0; n < 60; n++) {
    await server.running.mailer.flush();
    const all = (await admin.get('/api/admin/outbox')).json.messages as { to: string; subject: string; text: string }[];
    const found = all.find((m) => m.to === address && /locked/.test(m.subject));
    if (found) return /\/unlock\/([A-Za-z0-9_-]+)/.exec(found.text)![1];
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no unlock mail to ${address}`);
}

test('case and whitespace variants of an address share one counter; the refusal says when to retry', async () => {
  const variants = ['Reader@Demo.Sheetwise.Test', ' reader@demo.sheetwise.test', 'READER@DEMO.SHEETWISE.TEST ', 'reader@demo.sheetwise.test', 'rEaDeR@demo.sheetwise.test'];
  for (const email of variants) {
    const res = await login(email, 'wrong-password-here', '198.51.100.1');
    assert.equal(res.status, 401, res.text);
  }
  const limited = await login('  READER@demo.sheetwise.test', 'wrong-password-again', '198.51.100.1');
  assert.equal(limited.status, 429, limited.text);
  assert.match(limited.json.error.message, /Too many sign-in attempts/);
  assert.ok(Number(limited.headers.get('retry-after')) >= 1, 'Retry-After is sent');
  // The right password is held back too from that address (else the wait would be an oracle)...
  assert.equal((await login(DEMO.reader, 'sheetwise-demo', '198.51.100.1')).status, 429);
  // ...but not from another address: the owner is not kept out by someone else's guesses.
  assert.equal((await login(DEMO.reader, 'sheetwise-demo', '198.51.100.2')).status, 200);
  // The counters are in the database, shared by every server process.
  const [row] = await server.running.sequelize.query<{ failures: number }>(`SELECT failures FROM sign_in_throttle WHERE scope = 'pair' AND key = $1`, {
    bind: [`${DEMO.reader}|198.51.100.1`],
    type: QueryTypes.SELECT,
  });
  assert.equal(row.failures, 5);
});

test('spraying many accounts from one address is slowed down', async () => {
  const accounts = [DEMO.owner, DEMO.author, DEMO.reviewer, 'a1@lab.test', 'a2@lab.test', 'a3@lab.test'];
  const statuses: number[] = [];
  for (let round = 0; round < 9; round++) {
    for (const email of accounts) statuses.push((await login(email, `spray-guess-${round}`, '203.0.113.50')).status);
  }
  const answered = statuses.filter((s) => s === 401).length;
  assert.ok(answered <= 12, `at most about 10 guesses were checked, not ${answered}`);
  assert.ok(statuses.filter((s) => s === 429).length >= 40, `the rest were refused: ${statuses.join(' ')}`);
  // Another address is not affected.
  assert.equal((await login(DEMO.owner, 'sheetwise-demo', '203.0.113.51')).status, 200);
});

test('a stranger cannot keep the owner out: guesses hold back only addresses the account never used', async () => {
  // The reviewer signs in from their own address once: it becomes known.
  assert.equal((await login(DEMO.reviewer, 'sheetwise-demo', '192.0.2.10')).status, 200);
  // A stranger guesses from many addresses (staying under each per-address limit).
  const stranger: number[] = [];
  for (let n = 0; n < LIMITS.failedSignInsBeforeLock + 5; n++) stranger.push((await login(DEMO.reviewer, `stranger-guess-${n}`, `198.51.100.${100 + n}`)).status);
  assert.ok(stranger.every((s) => s === 401), stranger.join(' '));
  // The owner from their own address, with the right password, gets in.
  const owner = await login(DEMO.reviewer, 'sheetwise-demo', '192.0.2.10');
  assert.equal(owner.status, 200, owner.text);
  // A new address is held back for a while (or until the mailed link is used)...
  const newPlace = await login(DEMO.reviewer, 'sheetwise-demo', '192.0.2.77');
  assert.equal(newPlace.status, 401);
  assert.match(newPlace.json.error.message, /locked after 10 failed sign-ins/);
  assert.match(newPlace.json.error.message, /unlock link/);
  assert.ok(Number(newPlace.headers.get('retry-after')) > 0);
  // ...and the hold ends by time as well: back-off, not a lock until someone reads mail.
  await server.running.sequelize.query(`UPDATE sign_in_throttle SET last_failed_at = now() - interval '2 hours' WHERE scope = 'account' AND key = $1`, { bind: [DEMO.reviewer] });
  assert.equal((await login(DEMO.reviewer, 'sheetwise-demo', '192.0.2.77')).status, 200);
});

test('the unlock link clears the limiter for the account: no 429 after unlocking', async () => {
  // Five misses from the owner's own address, five more from elsewhere: locked and held back.
  for (let n = 0; n < 5; n++) assert.equal((await login(DEMO.author, `miss-${n}-typed-badly`, '192.0.2.30')).status, 401);
  for (let n = 0; n < 5; n++) await login(DEMO.author, `other-${n}-typed-badly`, `198.51.100.${200 + n}`);
  // refused: 429 while the address's back-off lasts (1 s after the fifth miss), 401 "locked" once it has run out on a slow machine
  assert.ok([401, 429].includes((await login(DEMO.author, 'sheetwise-demo', '192.0.2.30')).status));
  const token = await unlockTokenFor(DEMO.author);
  const anon = new ApiClient(server.url);
  assert.equal((await anon.post('/api/auth/unlock', { token })).status, 200);
  assert.equal((await anon.post('/api/auth/unlock', { token })).status, 400, 'the link works once');
  const after = await login(DEMO.author, 'sheetwise-demo', '192.0.2.30');
  assert.equal(after.status, 200, after.text);
});

test('parallel guesses cannot slip past the count', async () => {
  const results = await Promise.all(Array.from({ length: 20 }, (_, n) => login('parallel@lab.test', `parallel-${n}`, '198.51.100.250')));
  const checked = results.filter((r) => r.status === 401).length;
  assert.ok(checked <= 6, `${checked} guesses were checked`);
});

test('a storm of correct sign-ins of two accounts from one address never deadlocks into a 500 (the counters are locked in one order and never deleted)', async () => {
  for (let round = 0; round < 3; round++) {
    const results = await Promise.all(
      Array.from({ length: 40 }, (_, n) => login(n % 2 ? DEMO.author : DEMO.owner, 'sheetwise-demo', '203.0.113.77')),
    );
    // every try counts until its password is checked, so of 40 at once some may be held back
    // (429, or 401 "locked" from an address the account never used); none may fail with a 500
    const statuses = results.map((r) => r.status);
    assert.ok(statuses.every((st) => st < 500), `round ${round}: ${statuses.join(',')}`);
    assert.ok(statuses.includes(200), `round ${round}: ${statuses.join(',')}`);
  }
});
