// Accounts, part 1 (issue 15, findings 3, 5, 6 and 10): no session row for signed-out
// visitors (the XSRF token is a signed cookie), role changes that always keep an owner,
// invitations that only the invited address can use, and members added by invitation.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { QueryTypes } from 'sequelize';
import { LIMITS } from '../../shared/api.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let admin: ApiClient;

before(async () => {
  server = await startTestServer();
  admin = new ApiClient(server.url);
  await admin.login(DEMO.admin);
});
after(async () => server?.stop());

const count = async (sql: string, bind: unknown[] = []) =>
  Number((await server.running.sequelize.query<{ n: string }>(sql, { bind, type: QueryTypes.SELECT }))[0].n);

/** Every captured mail to an address whose subject matches, oldest first. */
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
const from = (ip: string) => ({ headers: { 'x-forwarded-for': ip } });

describe('no session row for signed-out visitors (finding 3)', () => {
  test('many signed-out requests store nothing; sign-in and registration still pass the XSRF check', async () => {
    const before = await count('SELECT count(*) AS n FROM session');
    for (let n = 0; n < 60; n++) {
      // Each a new visitor without cookies, on pages a signed-out person reaches.
      const visitor = new ApiClient(server.url);
      assert.equal((await visitor.get('/api/health')).status, 200);
      assert.equal((await visitor.get('/api/auth/me')).status, 401);
      assert.equal((await visitor.get('/api/invitations/not-a-real-token-at-all')).status, 404);
      assert.ok(visitor.cookies.get('XSRF-TOKEN'), 'the signed-out page gets an XSRF token');
      assert.equal(visitor.cookies.get('sheetwise.sid'), undefined, 'but no session cookie');
    }
    // A signed-out visitor who sends forms (a failed sign-in, a reset request) stores no session either.
    const visitor = new ApiClient(server.url);
    assert.equal((await visitor.post('/api/auth/login', { email: 'nobody@lab.test', password: 'not-a-password-at-all' })).status, 401);
    assert.equal((await visitor.post('/api/auth/password-reset', { email: 'nobody@lab.test' })).status, 202);
    assert.equal(await count('SELECT count(*) AS n FROM session'), before, 'no session row for anonymous requests');

    // Sign-in from the signed-out page works with its token, and then a session exists.
    await visitor.login(DEMO.reviewer);
    assert.equal((await visitor.get('/api/auth/me')).json.user.email, DEMO.reviewer);
    assert.equal(await count('SELECT count(*) AS n FROM session'), before + 1);
    const newcomer = new ApiClient(server.url);
    await newcomer.get('/api/health');
    const registered = await newcomer.post('/api/auth/register', { email: 'newcomer@lab.test', displayName: 'Newcomer', password: 'tidal-orbit-lantern-93' });
    assert.equal(registered.status, 201, registered.text);
    assert.equal(await count('SELECT count(*) AS n FROM session'), before + 2);
  });

  test('the signed-out token is checked: missing, forged, or carried into a session, it is refused', async () => {
    const visitor = new ApiClient(server.url);
    await visitor.get('/api/health');
    const body = { email: DEMO.reader, password: 'sheetwise-demo' };
    assert.equal((await visitor.request('POST', '/api/auth/login', body, { csrf: false })).status, 403, 'no header');
    // Double submit alone is not enough: a token someone planted must carry the server's signature.
    const forged = new ApiClient(server.url);
    forged.cookies.set('XSRF-TOKEN', 'planted.by-someone-else');
    const res = await forged.request('POST', '/api/auth/login', body, { csrf: false, headers: { 'x-xsrf-token': 'planted.by-someone-else' } });
    assert.equal(res.status, 403);
    assert.match(res.json.error.message, /XSRF-TOKEN/);
    // After sign-in the signed-out token no longer works: the new one is bound to the session.
    const anonToken = visitor.cookies.get('XSRF-TOKEN')!;
    await visitor.login(DEMO.reader);
    assert.notEqual(visitor.cookies.get('XSRF-TOKEN'), anonToken);
    const stale = await visitor.request('POST', '/api/groups', { name: 'x' }, { csrf: false, headers: { 'x-xsrf-token': decodeURIComponent(anonToken), cookie: `sheetwise.sid=${visitor.cookies.get('sheetwise.sid')}; XSRF-TOKEN=${anonToken}` } });
    assert.equal(stale.status, 403);
    assert.equal((await visitor.post('/api/groups', { name: 'Reader group' })).status, 201);
  });
});

describe('a group always keeps an owner (finding 5)', () => {
  async function twoOwnerGroups(n: number, owner: ApiClient, otherId: number) {
    const ids: number[] = [];
    for (let i = 0; i < n; i++) {
      const made = await owner.post('/api/groups', { name: `Two owners ${i}` });
      assert.equal(made.status, 201);
      ids.push(made.json.group.id);
      await server.running.sequelize.query(`INSERT INTO memberships (group_id, user_id, role, created_at, updated_at) VALUES ($1, $2, 'owner', now(), now())`, {
        bind: [made.json.group.id, otherId],
      });
    }
    return ids;
  }

  test('10 groups, two owners demote each other at the same moment: every group keeps an owner', async () => {
    const a = new ApiClient(server.url);
    const b = new ApiClient(server.url);
    const aId = (await a.login(DEMO.owner)).id;
    const bId = (await b.login(DEMO.author)).id;
    const groups = await twoOwnerGroups(10, a, bId);
    const results = await Promise.all(
      groups.flatMap((g) => [a.patch(`/api/groups/${g}/members/${bId}`, { role: 'reader' }), b.patch(`/api/groups/${g}/members/${aId}`, { role: 'reader' })]),
    );
    for (let i = 0; i < groups.length; i++) {
      const pair = [results[2 * i], results[2 * i + 1]];
      assert.equal(pair.filter((r) => r.status === 200).length, 1, `one demotion wins in group ${groups[i]}: ${pair.map((r) => r.text).join(' | ')}`);
      const loser = pair.find((r) => r.status !== 200)!;
      assert.ok([403, 409].includes(loser.status), loser.text);
      assert.equal(typeof loser.json.error.message, 'string');
      assert.equal(await count(`SELECT count(*) AS n FROM memberships WHERE group_id = $1 AND role = 'owner'`, [groups[i]]), 1);
    }
  });

  test('two owners removing each other (or one leaving while demoted) still leave an owner', async () => {
    const a = new ApiClient(server.url);
    const b = new ApiClient(server.url);
    const aId = (await a.login(DEMO.owner)).id;
    const bId = (await b.login(DEMO.author)).id;
    const groups = await twoOwnerGroups(10, a, bId);
    await Promise.all(
      groups.flatMap((g, i) =>
        i % 2
          ? [a.delete(`/api/groups/${g}/members/${bId}`), b.delete(`/api/groups/${g}/members/${aId}`)]
          : [a.delete(`/api/groups/${g}/members/${aId}`), b.patch(`/api/groups/${g}/members/${aId}`, { role: 'reader' }), b.delete(`/api/groups/${g}/members/${bId}`)],
      ),
    );
    for (const g of groups) assert.ok((await count(`SELECT count(*) AS n FROM memberships WHERE group_id = $1 AND role = 'owner'`, [g])) >= 1, `group ${g} has an owner`);
    const last = await a.delete(`/api/groups/${groups[1]}/members/${aId}`);
    if (last.status !== 404) {
      assert.equal(last.status, 409);
      assert.match(last.json.error.message, /at least one owner/);
    }
  });
});

describe('members join by invitation only (finding 10)', () => {
  test('adding an address answers alike for an account and for no account, adds nobody, and mails an invitation', async () => {
    const owner = new ApiClient(server.url);
    await owner.login(DEMO.owner);
    const group = (await owner.post('/api/groups', { name: 'Invite only' })).json.group.id;
    const known = await owner.post(`/api/groups/${group}/members`, { email: DEMO.admin, role: 'reader' });
    const unknown = await owner.post(`/api/groups/${group}/members`, { email: 'not.registered@lab.test', role: 'reader' });
    assert.equal(known.status, 202, known.text);
    assert.equal(unknown.status, 202, unknown.text);
    assert.deepEqual(Object.keys(known.json).sort(), Object.keys(unknown.json).sort());
    assert.deepEqual(Object.keys(known.json.invitation).sort(), Object.keys(unknown.json.invitation).sort());
    assert.ok(!known.text.includes('Site Admin'), 'the display name of the account is not revealed');
    assert.equal(known.json.message.replace(DEMO.admin, 'X'), unknown.json.message.replace('not.registered@lab.test', 'X'));
    const members = (await owner.get(`/api/groups/${group}/members`)).json.members as { email: string }[];
    assert.deepEqual(members.map((m) => m.email), [DEMO.owner], 'nobody joined without accepting');
    // The account joins when it accepts.
    const token = tokenIn((await mailsTo(DEMO.admin, /invites you/))[0].text, 'invitations');
    const accepted = await admin.post(`/api/invitations/${token}/accept`, {});
    assert.equal(accepted.status, 200, accepted.text);
    assert.equal(accepted.json.groupId, group);
    const already = await owner.post(`/api/groups/${group}/members`, { email: DEMO.admin, role: 'author' });
    assert.equal(already.status, 409);
  });
});

describe('invitations are for the invited address (finding 6)', () => {
  test('another signed-in account is told the invitation is for someone else, and does not join', async () => {
    const owner = new ApiClient(server.url);
    await owner.login(DEMO.owner);
    const group = (await owner.post('/api/groups', { name: 'Bound invitations' })).json.group.id;
    assert.equal((await owner.post(`/api/groups/${group}/invitations`, { email: DEMO.reviewer, role: 'author' })).status, 201);
    const token = tokenIn((await mailsTo(DEMO.reviewer, /Bound invitations/))[0].text, 'invitations');
    const other = new ApiClient(server.url);
    await other.login(DEMO.reader);
    const res = await other.post(`/api/invitations/${token}/accept`, {});
    assert.equal(res.status, 403);
    assert.match(res.json.error.message, new RegExp(`This invitation is for ${DEMO.reviewer.replace(/\./g, '\\.')}`));
    assert.match(res.json.error.message, /signed in as reader@demo/);
    assert.equal(await count('SELECT count(*) AS n FROM memberships WHERE group_id = $1', [group]), 1);
    // The invited address still can.
    const invited = new ApiClient(server.url);
    await invited.login(DEMO.reviewer);
    assert.equal((await invited.post(`/api/invitations/${token}/accept`, {})).status, 200);
  });

  test('accepting signed out with the password goes through the lock: a locked account is not signed in', async () => {
    const owner = new ApiClient(server.url);
    await owner.login(DEMO.owner);
    const group = (await owner.post('/api/groups', { name: 'Locked invitee' })).json.group.id;
    await owner.post(`/api/groups/${group}/invitations`, { email: DEMO.author, role: 'reader' });
    const token = tokenIn((await mailsTo(DEMO.author, /Locked invitee/))[0].text, 'invitations');
    // A stranger's guesses from several addresses lock the account for addresses it never used.
    const guesser = new ApiClient(server.url);
    for (let n = 0; n < LIMITS.failedSignInsBeforeLock; n++) {
      await guesser.request('POST', '/api/auth/login', { email: DEMO.author, password: `guess-number-${n}` }, from(`198.51.100.${10 + (n % 4)}`));
    }
    const visitor = new ApiClient(server.url);
    await visitor.get('/api/health');
    const res = await visitor.request('POST', `/api/invitations/${token}/accept`, { password: 'sheetwise-demo' }, from('198.51.100.99'));
    assert.equal(res.status, 401, res.text);
    assert.match(res.json.error.message, /locked/);
    assert.equal((await visitor.get('/api/auth/me')).status, 401, 'not signed in around the lock');
    assert.equal(await count('SELECT count(*) AS n FROM memberships WHERE group_id = $1', [group]), 1);
    // The unlock link lets the invited person in.
    const unlock = tokenIn((await mailsTo(DEMO.author, /locked/))[0].text, 'unlock');
    assert.equal((await visitor.post('/api/auth/unlock', { token: unlock })).status, 200);
    const ok = await visitor.request('POST', `/api/invitations/${token}/accept`, { password: 'sheetwise-demo' }, from('198.51.100.99'));
    assert.equal(ok.status, 200, ok.text);
    assert.equal((await visitor.get('/api/auth/me')).json.user.email, DEMO.author);
  });

  test('a wrong password through an invitation counts like a failed sign-in', async () => {
    const owner = new ApiClient(server.url);
    await owner.login(DEMO.owner);
    const group = (await owner.post('/api/groups', { name: 'Counted guesses' })).json.group.id;
    await owner.post(`/api/groups/${group}/invitations`, { email: DEMO.reader, role: 'reader' });
    const token = tokenIn((await mailsTo(DEMO.reader, /Counted guesses/))[0].text, 'invitations');
    const visitor = new ApiClient(server.url);
    await visitor.get('/api/health');
    const wrong = await visitor.request('POST', `/api/invitations/${token}/accept`, { password: 'not-the-right-one' }, from('198.51.100.77'));
    assert.equal(wrong.status, 401);
    assert.match(wrong.json.error.message, /password is wrong/);
    assert.equal(await count(`SELECT failures AS n FROM sign_in_throttle WHERE scope = 'pair' AND key = $1`, [`${DEMO.reader}|198.51.100.77`]), 1);
  });
});
