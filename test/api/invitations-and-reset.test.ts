// Invitations and password reset over the real PostgreSQL and the local fake SMTP
// server: the mail arrives, its link works once, not twice, and not after expiry.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let owner: ApiClient;
let admin: ApiClient;
let groupId: number;

before(async () => {
  server = await startTestServer();
  owner = new ApiClient(server.url);
  admin = new ApiClient(server.url);
  await owner.login(DEMO.owner);
  await admin.login(DEMO.admin);
  groupId = (await owner.get('/api/groups')).json.groups[0].id;
});
after(async () => server?.stop());

/** The newest captured mail to an address, after the queue has been delivered. */
async function mailTo(address: string) {
  await server.running.mailer.flush();
  for (let n = 0; n < 40; n++) {
    const outbox = await admin.get('/api/admin/outbox');
    assert.equal(outbox.status, 200);
    const found = outbox.json.messages.find((m: { to: string }) => m.to === address);
    if (found) return found as { to: string; subject: string; text: string; html: string; sentAt: string };
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail to ${address} arrived`);
}

const linkIn = (text: string, path: string) => {
  const match = new RegExp(`${server.url.replace(/[.]/g, '\\.')}/${path}/([A-Za-z0-9_-]+)`).exec(text);
  assert.ok(match, `the mail has a ${path} link: ${text}`);
  return match[1];
};

describe('invitations', () => {
  test('the mail arrives; its link signs a new person up once, and not twice', async () => {
    const invited = await owner.post(`/api/groups/${groupId}/invitations`, { email: 'new.reviewer@lab.test', role: 'reviewer' });
    assert.equal(invited.status, 201, invited.text);
    const mail = await mailTo('new.reviewer@lab.test');
    assert.match(mail.subject, /invites you to Lindqvist Lab/);
    assert.match(mail.html, /<a href="http:\/\/127\.0\.0\.1:\d+\/invitations\//);
    const token = linkIn(mail.text, 'invitations');

    const visitor = new ApiClient(server.url);
    const preview = await visitor.get(`/api/invitations/${token}`);
    assert.equal(preview.status, 200);
    assert.equal(preview.json.invitation.role, 'reviewer');
    assert.equal(preview.json.invitation.accountExists, false);

    const accepted = await visitor.post(`/api/invitations/${token}/accept`, { displayName: 'New Reviewer', password: 'a-good-long-password' });
    assert.equal(accepted.status, 201, accepted.text);
    const groups = await visitor.get('/api/groups');
    assert.deepEqual(groups.json.groups.map((g: { id: number; role: string }) => [g.id, g.role]), [[groupId, 'reviewer']]);

    const again = await new ApiClient(server.url).post(`/api/invitations/${token}/accept`, { displayName: 'X', password: 'another-long-password' });
    assert.equal(again.status, 410);
    assert.match(again.json.error.message, /used already/);
  });

  test('an existing account accepts with its password', async () => {
    const outsider = new ApiClient(server.url);
    await outsider.post('/api/auth/register', { email: 'has.account@lab.test', displayName: 'Has Account', password: 'has-account-password' });
    await owner.post(`/api/groups/${groupId}/invitations`, { email: 'has.account@lab.test', role: 'author' });
    const token = linkIn((await mailTo('has.account@lab.test')).text, 'invitations');
    const stranger = new ApiClient(server.url);
    assert.equal((await stranger.get(`/api/invitations/${token}`)).json.invitation.accountExists, true);
    const wrong = await stranger.post(`/api/invitations/${token}/accept`, { password: 'not-the-password' });
    assert.equal(wrong.status, 401);
    const ok = await stranger.post(`/api/invitations/${token}/accept`, { password: 'has-account-password' });
    assert.equal(ok.status, 200, ok.text);
    assert.equal((await stranger.get('/api/auth/me')).json.user.email, 'has.account@lab.test');
  });

  test('an expired or revoked link does not work', async () => {
    await owner.post(`/api/groups/${groupId}/invitations`, { email: 'late@lab.test', role: 'reader' });
    const token = linkIn((await mailTo('late@lab.test')).text, 'invitations');
    await server.running.sequelize.query(`UPDATE invitations SET expires_at = now() - interval '1 second' WHERE email = 'late@lab.test'`);
    const expired = await new ApiClient(server.url).post(`/api/invitations/${token}/accept`, { displayName: 'Late', password: 'late-but-long-password' });
    assert.equal(expired.status, 410);
    assert.match(expired.json.error.message, /expired/);

    const made = await owner.post(`/api/groups/${groupId}/invitations`, { email: 'withdrawn@lab.test', role: 'reader' });
    const revoked = await owner.delete(`/api/groups/${groupId}/invitations/${made.json.invitation.id}`);
    assert.equal(revoked.status, 204);
    const token2 = linkIn((await mailTo('withdrawn@lab.test')).text, 'invitations');
    assert.equal((await new ApiClient(server.url).get(`/api/invitations/${token2}`)).status, 410);
    const pending = await owner.get(`/api/groups/${groupId}/invitations`);
    assert.ok(!pending.json.invitations.some((i: { email: string }) => i.email === 'withdrawn@lab.test'));
  });

  test('an address already in the group is refused with a clear message', async () => {
    const res = await owner.post(`/api/groups/${groupId}/invitations`, { email: DEMO.reader, role: 'author' });
    assert.equal(res.status, 409);
    assert.match(res.json.error.message, /member of this group already/);
  });

  test('only owners invite', async () => {
    const author = new ApiClient(server.url);
    await author.login(DEMO.author);
    assert.equal((await author.post(`/api/groups/${groupId}/invitations`, { email: 'x@lab.test', role: 'reader' })).status, 403);
    assert.equal((await author.get(`/api/groups/${groupId}/invitations`)).status, 403);
  });
});

describe('password reset', () => {
  test('same answer for known and unknown addresses; the link works once', async () => {
    const anon = new ApiClient(server.url);
    const known = await anon.post('/api/auth/password-reset', { email: DEMO.reader });
    const unknown = await anon.post('/api/auth/password-reset', { email: 'nobody@lab.test' });
    assert.equal(known.status, 202);
    assert.equal(unknown.status, 202);
    assert.deepEqual(known.json, unknown.json, 'no hint whether the address has an account');

    const token = linkIn((await mailTo(DEMO.reader)).text, 'reset-password');
    const done = await anon.post('/api/auth/password-reset/confirm', { token, password: 'a-brand-new-password' });
    assert.equal(done.status, 204, done.text);
    const twice = await anon.post('/api/auth/password-reset/confirm', { token, password: 'yet-another-password' });
    assert.equal(twice.status, 400);
    assert.match(twice.json.error.message, /not valid any more/);

    const client = new ApiClient(server.url);
    assert.equal((await client.post('/api/auth/login', { email: DEMO.reader, password: 'sheetwise-demo' })).status, 401);
    await client.login(DEMO.reader, 'a-brand-new-password');
  });

  test('an expired reset link does not work', async () => {
    const anon = new ApiClient(server.url);
    await anon.post('/api/auth/password-reset', { email: DEMO.reviewer });
    const token = linkIn((await mailTo(DEMO.reviewer)).text, 'reset-password');
    await server.running.sequelize.query(`UPDATE password_resets SET expires_at = now() - interval '1 second'`);
    const res = await anon.post('/api/auth/password-reset/confirm', { token, password: 'too-late-password' });
    assert.equal(res.status, 400);
  });
});

describe('mail delivery', () => {
  test('the admin sees deliveries; others cannot read the outbox', async () => {
    const deliveries = await admin.get('/api/admin/mail-deliveries');
    assert.equal(deliveries.status, 200);
    assert.ok(deliveries.json.deliveries.length > 0);
    assert.ok(deliveries.json.deliveries.every((d: { status: string }) => d.status === 'sent'));
    assert.equal((await owner.get('/api/admin/outbox')).status, 403);
  });
});
