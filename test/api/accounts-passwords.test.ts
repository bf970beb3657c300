// Accounts, part 3 (issue 15, findings 9, 10, 11 and 12): registration races answer 409,
// a password policy for new passwords, no silent cut at 72 bytes (old hashes still work
// and are upgraded), reset requests answered before any account work, and a reset that
// ends every other reset link and the account's lock.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { createHmac } from 'node:crypto';
import bcrypt from 'bcryptjs';
import { QueryTypes } from 'sequelize';
import { LIMITS } from '../../shared/api.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let admin: ApiClient;
let ipCount = 0;
/** A new client address per request, so that the per-address registration limit stays out of the way. */
const fresh = () => ({ headers: { 'x-forwarded-for': `203.0.113.${++ipCount}` } });

before(async () => {
  server = await startTestServer();
  admin = new ApiClient(server.url);
  await admin.login(DEMO.admin);
});
after(async () => server?.stop());

const register = (email: string, password: string, displayName = 'Someone') =>
  new ApiClient(server.url).request('POST', '/api/auth/register', { email, displayName, password }, fresh());
/** A POST from a new client address (the reset routes have a per-address limit too). */
const postFresh = (client: ApiClient, path: string, body: unknown) => client.request('POST', path, body, fresh());
const hashOf = async (email: string) =>
  (await server.running.sequelize.query<{ password_hash: string }>('SELECT password_hash FROM users WHERE email = $1', { bind: [email], type: QueryTypes.SELECT }))[0].password_hash;

async function mailsTo(address: string, subject: RegExp, atLeast = 1) {
  for (let n = 0; n < 60; n++) {
    await server.running.mailer.flush();
    const all = (await admin.get('/api/admin/outbox')).json.messages as { to: string; subject: string; text: string }[];
    const found = all.filter((m) => m.to === address && subject.test(m.subject)).reverse();
    if (found.length >= atLeast) return found;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail to ${address} arrived`);
}
const tokenIn = (text: string, path: string) => new RegExp(`/${path}/([A-Za-z0-9_-]+)`).exec(text)![1];

describe('registration races (finding 9)', () => {
  test('10 simultaneous registrations of one address: one account, nine clear 409s', async () => {
    const results = await Promise.all(Array.from({ length: 10 }, (_, n) => register('racer@lab.test', 'quiet-harbor-lamp-417', `Racer ${n}`)));
    assert.deepEqual(results.map((r) => r.status).sort(), [201, 409, 409, 409, 409, 409, 409, 409, 409, 409], results.map((r) => r.text).join('\n'));
    for (const r of results.filter((x) => x.status === 409)) assert.match(r.json.error.message, /exists already/);
    const [row] = await server.running.sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM users WHERE email = 'racer@lab.test'`, { type: QueryTypes.SELECT });
    assert.equal(Number(row.n), 1);
  });
});

describe('password policy for new passwords (finding 11)', () => {
  test('weak passwords are refused with a sentence that says what to do', async () => {
    const email = 'careful.person@lab.test';
    const cases: [string, RegExp][] = [
      [' '.repeat(10), /at least 12 characters/],
      [' '.repeat(14), /spaces only/],
      ['aaaaaaaaaa', /at least 12 characters/],
      ['aaaaaaaaaaaaaaaa', /repeats a few characters/],
      ['1234567890', /at least 12 characters/],
      ['123456789012', /common passwords|repeats/],
      ['password2024!', /common passwords/],
      ['Qwertyuiop123', /common passwords/],
      [email, /e-mail address/],
      [`${email.toUpperCase()}!`, /e-mail address/],
      ['careful.person99', /name/],
    ];
    for (const [password, message] of cases) {
      const res = await register(email, password);
      assert.equal(res.status, 400, `${JSON.stringify(password)}: ${res.text}`);
      assert.match(res.json.error.message, message, JSON.stringify(password));
      assert.match(res.json.error.message, /^password: /);
    }
    const ok = await register(email, 'careful.person-likes-quiet-trains');
    assert.equal(ok.status, 201, ok.text);
  });

  test('the policy applies to a reset and to signing up through an invitation', async () => {
    const owner = new ApiClient(server.url);
    await owner.login(DEMO.owner);
    const groupId = (await owner.get('/api/groups')).json.groups[0].id;
    await owner.post(`/api/groups/${groupId}/invitations`, { email: 'policy.invitee@lab.test', role: 'reader' });
    const invitation = tokenIn((await mailsTo('policy.invitee@lab.test', /invites you/))[0].text, 'invitations');
    const weak = await new ApiClient(server.url).post(`/api/invitations/${invitation}/accept`, { displayName: 'Invitee', password: 'iloveyou1234' });
    assert.equal(weak.status, 400);
    assert.match(weak.json.error.message, /common passwords/);
    assert.equal((await new ApiClient(server.url).post(`/api/invitations/${invitation}/accept`, { displayName: 'Invitee', password: 'violet-canyon-echo-52' })).status, 201);

    await postFresh(new ApiClient(server.url), '/api/auth/password-reset', { email: 'policy.invitee@lab.test' });
    const reset = tokenIn((await mailsTo('policy.invitee@lab.test', /Reset/))[0].text, 'reset-password');
    const refused = await postFresh(new ApiClient(server.url), '/api/auth/password-reset/confirm', { token: reset, password: 'abcabcabcabcabc' });
    assert.equal(refused.status, 400);
    // A refused password does not use up the link.
    assert.equal((await postFresh(new ApiClient(server.url), '/api/auth/password-reset/confirm', { token: reset, password: 'amber-meadow-kettle-8' })).status, 204);
  });

  test('the demo accounts keep their password (the policy is for newly chosen ones)', async () => {
    await new ApiClient(server.url).login(DEMO.reviewer, 'sheetwise-demo');
  });
});

describe('no silent cut at 72 bytes (finding 11)', () => {
  test('an 80-character password does not sign in with a different ending', async () => {
    const password = 'the quick brown fox jumps over the lazy dog, then naps in the warm autumn sun ok';
    assert.equal(password.length, 80);
    assert.equal((await register('long.password@lab.test', password)).status, 201);
    assert.match(await hashOf('long.password@lab.test'), /^sw3\$32768\$8\$1\$/);
    const other = password.slice(0, 72) + 'DIFFERENT';
    assert.equal((await new ApiClient(server.url).post('/api/auth/login', { email: 'long.password@lab.test', password: other })).status, 401);
    await new ApiClient(server.url).login('long.password@lab.test', password);
  });

  // The two earlier formats: bcrypt over the password, and bcrypt over its base64 HMAC-SHA-256
  // with the fixed key below (written out here as the format's definition).
  const earlierFormats: [string, (password: string) => string][] = [
    ['bare bcrypt', (password) => bcrypt.hashSync(password, 10)],
    ['bcrypt over the HMAC pre-hash', (password) => `sw2$${bcrypt.hashSync(createHmac('sha256', 'sheetwise-password-prehash-v2').update(password, 'utf8').digest('base64'), 10)}`],
  ];
  for (const [name, make] of earlierFormats) {
    test(`a hash of an earlier format (${name}) still signs in and is upgraded to scrypt`, async () => {
      const email = `legacy.${name.toLowerCase().replace(/\W+/g, '-')}@lab.test`;
      await server.running.sequelize.query(`INSERT INTO users (email, display_name, password_hash, created_at, updated_at) VALUES ($1, 'Legacy', $2, now(), now())`, { bind: [email, make('an-old-style-password')] });
      assert.equal((await new ApiClient(server.url).post('/api/auth/login', { email, password: 'an-old-style-passwort' })).status, 401);
      await new ApiClient(server.url).login(email, 'an-old-style-password');
      assert.match(await hashOf(email), /^sw3\$32768\$8\$1\$/);
      await new ApiClient(server.url).login(email, 'an-old-style-password');
      assert.equal((await new ApiClient(server.url).post('/api/auth/login', { email, password: 'an-old-style-passwort' })).status, 401);
    });
  }
});

describe('password reset (findings 10 and 12)', () => {
  test('a reset request is answered before any account work: same answer, no wait on the database', async () => {
    const sequelize = server.running.sequelize;
    // Hold the reset table: a request that did its work before answering would wait here.
    const hold = await sequelize.transaction();
    try {
      await sequelize.query('LOCK TABLE password_resets IN ACCESS EXCLUSIVE MODE', { transaction: hold });
      const ask = (email: string) =>
        Promise.race([postFresh(new ApiClient(server.url), '/api/auth/password-reset', { email }), new Promise<null>((r) => setTimeout(() => r(null), 8000))]);
      const known = await ask(DEMO.author);
      const unknown = await ask('nobody.here@lab.test');
      assert.ok(known && unknown, 'both answered while the account work was held up');
      assert.equal(known.status, 202);
      assert.deepEqual(known.json, unknown.json);
    } finally {
      await hold.commit();
    }
    // The mail still comes, after the answer.
    assert.ok((await mailsTo(DEMO.author, /Reset/)).length >= 1);
  });

  test('a reset ends every other outstanding reset link of the account', async () => {
    const anon = new ApiClient(server.url);
    await postFresh(anon, '/api/auth/password-reset', { email: DEMO.reader });
    const first = tokenIn((await mailsTo(DEMO.reader, /Reset/, 1))[0].text, 'reset-password');
    await postFresh(anon, '/api/auth/password-reset', { email: DEMO.reader });
    const second = tokenIn((await mailsTo(DEMO.reader, /Reset/, 2))[1].text, 'reset-password');
    assert.notEqual(first, second);
    assert.equal((await postFresh(anon, '/api/auth/password-reset/confirm', { token: second, password: 'copper-lantern-rain-71' })).status, 204);
    const old = await postFresh(anon, '/api/auth/password-reset/confirm', { token: first, password: 'someone-else-chose-this-9' });
    assert.equal(old.status, 400);
    assert.match(old.json.error.message, /not valid any more/);
    await new ApiClient(server.url).login(DEMO.reader, 'copper-lantern-rain-71');
  });

  test('a reset ends a lock and the sign-in back-off', async () => {
    for (let n = 0; n < LIMITS.failedSignInsBeforeLock; n++) {
      await new ApiClient(server.url).request('POST', '/api/auth/login', { email: DEMO.owner, password: `guess-${n}-wrong` }, fresh());
    }
    const place = { headers: { 'x-forwarded-for': '192.0.2.44' } };
    const locked = await new ApiClient(server.url).request('POST', '/api/auth/login', { email: DEMO.owner, password: 'sheetwise-demo' }, place);
    assert.equal(locked.status, 401);
    assert.match(locked.json.error.message, /locked/);
    const anon = new ApiClient(server.url);
    await postFresh(anon, '/api/auth/password-reset', { email: DEMO.owner });
    const token = tokenIn((await mailsTo(DEMO.owner, /Reset/))[0].text, 'reset-password');
    assert.equal((await postFresh(anon, '/api/auth/password-reset/confirm', { token, password: 'granite-swallow-piano-6' })).status, 204);
    const after = await new ApiClient(server.url).request('POST', '/api/auth/login', { email: DEMO.owner, password: 'granite-swallow-piano-6' }, place);
    assert.equal(after.status, 200, after.text);
    // The unlock link of that lock is used up by the reset.
    const unlock = tokenIn((await mailsTo(DEMO.owner, /locked/))[0].text, 'unlock');
    assert.equal((await anon.post('/api/auth/unlock', { token: unlock })).status, 400);
  });
});
