// Every route, every role (and signed out): each gets what it should and nothing more.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

type Who = 'anon' | 'outsider' | 'admin' | 'reader' | 'reviewer' | 'author' | 'owner';
const EVERYONE: Who[] = ['anon', 'outsider', 'admin', 'reader', 'reviewer', 'author', 'owner'];

interface Fixture {
  groupId: number;
  worksheetId: number;
  ids: Record<string, number>;
  /** What a case's setup made (a link, an invitation, a file), by name. */
  made: Record<string, number>;
}

interface Case {
  name: string;
  method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
  path: (f: Fixture) => string;
  body?: (f: Fixture) => unknown;
  /** Made by the owner before the request, through the API. */
  setup?: (f: Fixture) => Promise<void>;
  expect: Record<Who, number>;
}

// Non-members get 404 on group resources: a group's existence is not revealed.
const read = { anon: 401, outsider: 404, admin: 404, reader: 200, reviewer: 200, author: 200, owner: 200 };
const ownerOnly = (ok: number) => ({ anon: 401, outsider: 404, admin: 404, reader: 403, reviewer: 403, author: 403, owner: ok });
const authors = (ok: number) => ({ anon: 401, outsider: 404, admin: 404, reader: 403, reviewer: 403, author: ok, owner: ok });

const CASES: Case[] = [
  { name: 'GET /api/auth/me', method: 'GET', path: () => '/api/auth/me', expect: { anon: 401, outsider: 200, admin: 200, reader: 200, reviewer: 200, author: 200, owner: 200 } },
  { name: 'GET /api/groups', method: 'GET', path: () => '/api/groups', expect: { anon: 401, outsider: 200, admin: 200, reader: 200, reviewer: 200, author: 200, owner: 200 } },
  { name: 'POST /api/groups', method: 'POST', path: () => '/api/groups', body: () => ({ name: 'Another group' }), expect: { anon: 401, outsider: 201, admin: 201, reader: 201, reviewer: 201, author: 201, owner: 201 } },
  { name: 'GET /api/groups/:id', method: 'GET', path: (f) => `/api/groups/${f.groupId}`, expect: read },
  { name: 'PATCH /api/groups/:id', method: 'PATCH', path: (f) => `/api/groups/${f.groupId}`, body: () => ({ name: 'Renamed' }), expect: ownerOnly(200) },
  { name: 'DELETE /api/groups/:id', method: 'DELETE', path: (f) => `/api/groups/${f.groupId}`, expect: ownerOnly(204) },
  { name: 'GET members', method: 'GET', path: (f) => `/api/groups/${f.groupId}/members`, expect: read },
  // Adding a member sends an invitation (202): nobody joins without accepting.
  { name: 'POST members', method: 'POST', path: (f) => `/api/groups/${f.groupId}/members`, body: () => ({ email: 'extra@matrix.test', role: 'reader' }), expect: ownerOnly(202) },
  { name: 'PATCH member', method: 'PATCH', path: (f) => `/api/groups/${f.groupId}/members/${f.ids['reader']}`, body: () => ({ role: 'reviewer' }), expect: ownerOnly(200) },
  { name: 'DELETE member', method: 'DELETE', path: (f) => `/api/groups/${f.groupId}/members/${f.ids['reader']}`, expect: ownerOnly(204) },
  { name: 'GET worksheets', method: 'GET', path: (f) => `/api/groups/${f.groupId}/worksheets`, expect: read },
  { name: 'POST worksheets', method: 'POST', path: (f) => `/api/groups/${f.groupId}/worksheets`, body: () => ({ title: 'New', source: 'note "x"' }), expect: authors(201) },
  { name: 'GET worksheet', method: 'GET', path: (f) => `/api/worksheets/${f.worksheetId}`, expect: read },
  { name: 'PUT worksheet', method: 'PUT', path: (f) => `/api/worksheets/${f.worksheetId}`, body: () => ({ source: 'note "changed"', baseVersion: 1 }), expect: authors(200) },
  { name: 'DELETE worksheet', method: 'DELETE', path: (f) => `/api/worksheets/${f.worksheetId}`, expect: authors(204) },
  { name: 'GET versions', method: 'GET', path: (f) => `/api/worksheets/${f.worksheetId}/versions`, expect: read },
  { name: 'GET /api/admin/users', method: 'GET', path: () => '/api/admin/users', expect: { anon: 401, outsider: 403, admin: 200, reader: 403, reviewer: 403, author: 403, owner: 403 } },
  { name: 'PATCH /api/admin/users/:id', method: 'PATCH', path: (f) => `/api/admin/users/${f.ids['outsider']}`, body: () => ({ disabled: false }), expect: { anon: 401, outsider: 403, admin: 200, reader: 403, reviewer: 403, author: 403, owner: 403 } },
  { name: 'GET /api/admin/outbox', method: 'GET', path: () => '/api/admin/outbox', expect: { anon: 401, outsider: 403, admin: 200, reader: 403, reviewer: 403, author: 403, owner: 403 } },
  { name: 'GET /api/admin/mail-deliveries', method: 'GET', path: () => '/api/admin/mail-deliveries', expect: { anon: 401, outsider: 403, admin: 200, reader: 403, reviewer: 403, author: 403, owner: 403 } },
  { name: 'GET /api/admin/metrics', method: 'GET', path: () => '/api/admin/metrics', expect: { anon: 401, outsider: 403, admin: 200, reader: 403, reviewer: 403, author: 403, owner: 403 } },
  { name: 'GET invitations', method: 'GET', path: (f) => `/api/groups/${f.groupId}/invitations`, expect: ownerOnly(200) },
  { name: 'POST invitations', method: 'POST', path: (f) => `/api/groups/${f.groupId}/invitations`, body: () => ({ email: 'invitee@matrix.test', role: 'reader' }), expect: ownerOnly(201) },
  { name: 'GET evaluation (none stored yet)', method: 'GET', path: (f) => `/api/worksheets/${f.worksheetId}/evaluation`, expect: { anon: 401, outsider: 404, admin: 404, reader: 404, reviewer: 404, author: 404, owner: 404 } },
  { name: 'POST evaluation', method: 'POST', path: (f) => `/api/worksheets/${f.worksheetId}/evaluation`, expect: read },
  { name: 'GET stored report', method: 'GET', path: (f) => `/api/worksheets/${f.worksheetId}/report`, expect: read },
  { name: 'POST stored report', method: 'POST', path: (f) => `/api/worksheets/${f.worksheetId}/report`, body: () => ({}), expect: read },
  { name: 'GET reviews of a worksheet', method: 'GET', path: (f) => `/api/worksheets/${f.worksheetId}/reviews`, expect: read },
  { name: 'POST review request', method: 'POST', path: (f) => `/api/worksheets/${f.worksheetId}/reviews`, body: (f) => ({ statementKey: 'k', reviewerIds: [f.ids['reviewer']] }), expect: authors(201) },
  { name: 'GET group reviews', method: 'GET', path: (f) => `/api/groups/${f.groupId}/reviews`, expect: read },
  { name: 'GET review queue', method: 'GET', path: () => '/api/review-queue', expect: { anon: 401, outsider: 200, admin: 200, reader: 200, reviewer: 200, author: 200, owner: 200 } },
  { name: 'GET attachments', method: 'GET', path: (f) => `/api/worksheets/${f.worksheetId}/attachments`, expect: read },
  { name: 'GET export', method: 'GET', path: (f) => `/api/worksheets/${f.worksheetId}/export?format=swk`, expect: read },
  { name: 'GET referee links', method: 'GET', path: (f) => `/api/worksheets/${f.worksheetId}/referee-links`, expect: authors(200) },
  { name: 'POST referee link', method: 'POST', path: (f) => `/api/worksheets/${f.worksheetId}/referee-links`, body: () => ({ days: 7 }), expect: authors(201) },
  { name: 'GET activity', method: 'GET', path: (f) => `/api/groups/${f.groupId}/activity`, expect: read },
  { name: 'GET head', method: 'GET', path: (f) => `/api/worksheets/${f.worksheetId}/head`, expect: read },
  { name: 'GET draft', method: 'GET', path: (f) => `/api/worksheets/${f.worksheetId}/draft`, expect: authors(200) },
  { name: 'PUT draft', method: 'PUT', path: (f) => `/api/worksheets/${f.worksheetId}/draft`, body: () => ({ title: 'Matrix sheet', source: 'note "draft"', baseVersion: 1 }), expect: authors(200) },
  { name: 'DELETE draft', method: 'DELETE', path: (f) => `/api/worksheets/${f.worksheetId}/draft`, expect: authors(204) },
  { name: 'GET milestone check', method: 'GET', path: (f) => `/api/worksheets/${f.worksheetId}/versions/1/milestone`, expect: read },
  // The fixture's version has no results, so an author is told there is nothing to sign off.
  { name: 'POST milestone', method: 'POST', path: (f) => `/api/worksheets/${f.worksheetId}/versions/1/milestone`, expect: authors(409) },
  { name: 'GET review queue count', method: 'GET', path: () => '/api/review-queue/count', expect: { anon: 401, outsider: 200, admin: 200, reader: 200, reviewer: 200, author: 200, owner: 200 } },
  {
    name: 'DELETE referee link',
    method: 'DELETE',
    setup: async (f) => {
      const res = await clients.get('owner')!.post(`/api/worksheets/${f.worksheetId}/referee-links`, { days: 7 });
      assert.equal(res.status, 201, res.text);
      f.made['link'] = res.json.link.id;
    },
    path: (f) => `/api/worksheets/${f.worksheetId}/referee-links/${f.made['link']}`,
    expect: authors(204),
  },
  {
    name: 'DELETE invitation',
    method: 'DELETE',
    setup: async (f) => {
      const res = await clients.get('owner')!.post(`/api/groups/${f.groupId}/invitations`, { email: 'revoked@matrix.test', role: 'reader' });
      assert.equal(res.status, 201, res.text);
      f.made['invitation'] = res.json.invitation.id;
    },
    path: (f) => `/api/groups/${f.groupId}/invitations/${f.made['invitation']}`,
    expect: ownerOnly(204),
  },
  // Only the reviewer a review was asked of gives its verdict; readers follow the thread without writing in it.
  { name: 'POST review verdict', method: 'POST', setup: askReview, path: (f) => `/api/reviews/${f.made['review']}/verdict`, body: () => ({ verdict: 'confirmed', comment: '' }), expect: { anon: 401, outsider: 404, admin: 404, reader: 403, reviewer: 200, author: 403, owner: 403 } },
  { name: 'POST review comment', method: 'POST', setup: askReview, path: (f) => `/api/reviews/${f.made['review']}/comments`, body: () => ({ body: 'Checked the sign of the coupling.' }), expect: { anon: 401, outsider: 404, admin: 404, reader: 403, reviewer: 201, author: 201, owner: 201 } },
  { name: 'GET attachment', method: 'GET', setup: attachFile, path: (f) => `/api/worksheets/${f.worksheetId}/attachments/${f.made['attachment']}`, expect: read },
  { name: 'DELETE attachment', method: 'DELETE', setup: attachFile, path: (f) => `/api/worksheets/${f.worksheetId}/attachments/${f.made['attachment']}`, expect: authors(204) },
  { name: 'POST /api/evaluate', method: 'POST', path: () => '/api/evaluate', body: () => ({ source: '# nothing' }), expect: { anon: 401, outsider: 200, admin: 200, reader: 200, reviewer: 200, author: 200, owner: 200 } },
];

async function attachFile(f: Fixture): Promise<void> {
  const res = await clients.get('owner')!.upload(`/api/worksheets/${f.worksheetId}/attachments`, 'table.csv', 'a,b\n1,2\n');
  assert.equal(res.status, 201, res.text);
  f.made['attachment'] = res.json.attachment.id;
}

async function askReview(f: Fixture): Promise<void> {
  const res = await clients.get('owner')!.post(`/api/worksheets/${f.worksheetId}/reviews`, { statementKey: 'k', reviewerIds: [f.ids['reviewer']] });
  assert.equal(res.status, 201, res.text);
  f.made['review'] = res.json.reviews[0].id;
}

let server: TestServer;
const clients = new Map<Who, ApiClient>();
const ids: Record<string, number> = {};

before(async () => {
  server = await startTestServer();
  for (const who of EVERYONE) clients.set(who, new ApiClient(server.url));
  const outsider = await clients.get('outsider')!.post('/api/auth/register', { email: 'outsider@matrix.test', displayName: 'Out Sider', password: 'outsider-password' });
  assert.equal(outsider.status, 201);
  ids['outsider'] = outsider.json.user.id;
  const extra = await new ApiClient(server.url).post('/api/auth/register', { email: 'extra@matrix.test', displayName: 'Extra', password: 'extra-password' });
  assert.equal(extra.status, 201);
  for (const who of ['admin', 'reader', 'reviewer', 'author', 'owner'] as const) {
    ids[who] = (await clients.get(who)!.login(DEMO[who])).id;
  }
});

after(async () => {
  await server?.stop();
});

/** A fresh group with one member per role and one worksheet, so destructive cases start clean. */
async function freshFixture(): Promise<Fixture> {
  const owner = clients.get('owner')!;
  const group = await owner.post('/api/groups', { name: 'Matrix group' });
  assert.equal(group.status, 201);
  const groupId = group.json.group.id;
  // Members join by invitation; the fixture puts them in directly.
  for (const role of ['author', 'reviewer', 'reader'] as const) {
    await server.running.sequelize.query('INSERT INTO memberships (group_id, user_id, role, created_at, updated_at) VALUES ($1, $2, $3, now(), now())', {
      bind: [groupId, ids[role], role],
    });
  }
  const sheet = await owner.post(`/api/groups/${groupId}/worksheets`, { title: 'Matrix sheet', source: 'param k : positive\nnote "v1"' });
  assert.equal(sheet.status, 201);
  return { groupId, worksheetId: sheet.json.worksheet.id, ids, made: {} };
}

describe('role matrix', () => {
  for (const c of CASES) {
    for (const who of EVERYONE) {
      test(`${c.name} as ${who} → ${c.expect[who]}`, async () => {
        const fixture = await freshFixture();
        await c.setup?.(fixture);
        const res = await clients.get(who)!.request(c.method, c.path(fixture), c.body?.(fixture));
        assert.equal(res.status, c.expect[who], `${c.method} ${c.path(fixture)} as ${who}: ${res.text}`);
        if (res.status >= 400) {
          assert.equal(typeof res.json?.error?.message, 'string', 'every error carries a message');
          assert.ok(res.json.error.message.length > 10);
        }
      });
    }
  }
});

// Multipart routes, every role: an upload of a small valid file.
describe('role matrix: uploads', () => {
  const uploads: { name: string; path: (f: Fixture) => string; file: [string, string]; expect: Record<Who, number> }[] = [
    { name: 'POST import preview', path: (f) => `/api/groups/${f.groupId}/imports`, file: ['x.swk', 'note "imported"'], expect: authors(200) },
    { name: 'POST attachment', path: (f) => `/api/worksheets/${f.worksheetId}/attachments`, file: ['t.csv', 'a,b\n1,2\n'], expect: authors(201) },
  ];
  for (const u of uploads) {
    for (const who of EVERYONE) {
      test(`${u.name} as ${who} → ${u.expect[who]}`, async () => {
        const fixture = await freshFixture();
        const res = await clients.get(who)!.upload(u.path(fixture), ...u.file);
        assert.equal(res.status, u.expect[who], res.text);
      });
    }
  }
});

describe('what a role sees', () => {
  test('the demo group is the first group each demo member sees', async () => {
    for (const who of ['reader', 'reviewer', 'author', 'owner'] as const) {
      const res = await clients.get(who)!.get('/api/groups');
      assert.equal(res.json.groups[0].name, 'Lindqvist Lab — mode integrals');
      assert.equal(res.json.groups[0].role, who);
    }
  });

  test('an outsider does not see the demo group in the list', async () => {
    const res = await clients.get('outsider')!.get('/api/groups');
    assert.ok(!res.json.groups.some((g: { name: string }) => g.name.startsWith('Lindqvist')));
  });
});

describe('stored evaluations', () => {
  test('a reader evaluates the current version once; reopening gets the stored report', async () => {
    const fixture = await freshFixture();
    const reader = clients.get('reader')!;
    assert.equal((await reader.get(`/api/worksheets/${fixture.worksheetId}/evaluation`)).status, 404);
    const made = await reader.post(`/api/worksheets/${fixture.worksheetId}/evaluation`);
    assert.equal(made.status, 200);
    assert.equal(made.json.version, 1);
    assert.deepEqual(made.json.report.statements.map((s: { kind: string }) => s.kind), ['param', 'note']);
    const stored = await reader.get(`/api/worksheets/${fixture.worksheetId}/evaluation`);
    assert.deepEqual(stored.json, made.json);
    // A new version has no stored report until it is evaluated.
    await clients.get('author')!.put(`/api/worksheets/${fixture.worksheetId}`, { source: 'note "v2"', baseVersion: 1 });
    assert.equal((await reader.get(`/api/worksheets/${fixture.worksheetId}/evaluation`)).status, 404);
  });
});
