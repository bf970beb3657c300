// Bad input gets the right status and a sentence a person can act on.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let author: ApiClient;
let groupId: number;
let worksheetId: number;

before(async () => {
  server = await startTestServer({ LOGIN_RATE_LIMIT: '5' });
  author = new ApiClient(server.url);
  await author.login(DEMO.author);
  groupId = (await author.get('/api/groups')).json.groups[0].id;
  worksheetId = (await author.get(`/api/groups/${groupId}/worksheets`)).json.items[0].id;
});
after(async () => server?.stop());

function assertError(res: { status: number; json: any; text: string }, status: number, pattern?: RegExp) {
  assert.equal(res.status, status, res.text);
  assert.equal(typeof res.json?.error?.code, 'string');
  assert.equal(typeof res.json?.error?.message, 'string');
  assert.ok(!/at .*\.(ts|js):\d+/.test(res.text), 'no stack trace leaves the server');
  if (pattern) assert.match(res.json.error.message, pattern);
}

describe('bad input', () => {
  test('malformed JSON → 400', async () => {
    const res = await author.request('POST', `/api/groups/${groupId}/worksheets`, undefined, { raw: '{"title": "x",' });
    assertError(res, 400, /not valid JSON/);
  });

  test('missing fields → 400 naming the field', async () => {
    const res = await author.post(`/api/groups/${groupId}/worksheets`, {});
    assertError(res, 400, /title/);
  });

  test('too-long title → 400 with the limit', async () => {
    const res = await author.post(`/api/groups/${groupId}/worksheets`, { title: 'x'.repeat(201) });
    assertError(res, 400, /at most 200 characters/);
  });

  test('a worksheet over 200 kB → 413 naming the limit', async () => {
    const res = await author.put(`/api/worksheets/${worksheetId}`, { source: '# ' + 'x'.repeat(210_000), baseVersion: 1 });
    assertError(res, 413, /the limit is 200 kB/);
  });

  test('a body over 1 MB → 413', async () => {
    const res = await author.request('POST', `/api/groups/${groupId}/worksheets`, undefined, {
      raw: JSON.stringify({ title: 'big', source: 'x'.repeat(1_100_000) }),
    });
    assertError(res, 413, /larger than the limit/);
  });

  test('short password at registration → 400', async () => {
    const res = await new ApiClient(server.url).post('/api/auth/register', { email: 'short@x.test', displayName: 'S', password: 'short' });
    assertError(res, 400, /at least 12 characters/);
  });

  test('a taken e-mail at registration → 409', async () => {
    const res = await new ApiClient(server.url).post('/api/auth/register', { email: DEMO.reader, displayName: 'R', password: 'long-enough-password' });
    assertError(res, 409, /exists already/);
  });

  test('wrong password → 401 without saying which part was wrong', async () => {
    const res = await new ApiClient(server.url).post('/api/auth/login', { email: DEMO.reader, password: 'not-the-password' });
    assertError(res, 401, /e-mail address or the password is wrong/);
    const unknown = await new ApiClient(server.url).post('/api/auth/login', { email: 'nobody@x.test', password: 'not-the-password' });
    assert.equal(unknown.json.error.message, res.json.error.message);
  });

  test('repeated failed sign-ins → 429', async () => {
    const client = new ApiClient(server.url);
    const statuses: number[] = [];
    for (let n = 0; n < 7; n++) statuses.push((await client.post('/api/auth/login', { email: 'guess@x.test', password: 'wrong-guess-' + n })).status);
    assert.deepEqual(statuses.slice(0, 5), [401, 401, 401, 401, 401]);
    const limited = await client.post('/api/auth/login', { email: 'guess@x.test', password: 'again-wrong' });
    assertError(limited, 429, /Too many sign-in attempts/);
  });

  test('unknown ids → 404', async () => {
    assertError(await author.get('/api/worksheets/999999'), 404, /not found/);
    assertError(await author.get('/api/worksheets/abc'), 404);
    assertError(await author.get('/api/groups/999999/worksheets'), 404);
    assertError(await author.get('/api/no-such-route'), 404);
  });

  test('bad paging parameters → 400', async () => {
    assertError(await author.get(`/api/groups/${groupId}/worksheets?pageSize=1000`), 400, /pageSize/);
    assertError(await author.get(`/api/groups/${groupId}/worksheets?sort=password`), 400, /sort/);
  });

  test('a state-changing request without the XSRF header → 403', async () => {
    const res = await author.request('POST', `/api/groups/${groupId}/worksheets`, { title: 'x' }, { csrf: false });
    assertError(res, 403, /XSRF-TOKEN/);
  });

  test('the last owner cannot be demoted', async () => {
    const owner = new ApiClient(server.url);
    const me = await owner.login(DEMO.owner);
    const res = await owner.patch(`/api/groups/${groupId}/members/${me.id}`, { role: 'reader' });
    assertError(res, 409, /at least one owner/);
  });
});

describe('worksheet list', () => {
  test('search, sort and paging', async () => {
    const all = await author.get(`/api/groups/${groupId}/worksheets?sort=title&direction=asc&pageSize=100`);
    assert.equal(all.status, 200);
    const titles = all.json.items.map((w: { title: string }) => w.title);
    assert.deepEqual(titles, [...titles].sort((a: string, b: string) => a.localeCompare(b, 'en', { sensitivity: 'base' }) || (a < b ? -1 : 1)));
    const page = await author.get(`/api/groups/${groupId}/worksheets?sort=title&direction=asc&pageSize=2&page=1`);
    assert.deepEqual(page.json.items.map((w: { title: string }) => w.title), titles.slice(2, 4));
    assert.equal(page.json.total, titles.length);
    const found = await author.get(`/api/groups/${groupId}/worksheets?search=${encodeURIComponent('time slices')}`);
    assert.deepEqual(found.json.items.map((w: { title: string }) => w.title), ['Free particle in three time slices']);
    const literal = await author.get(`/api/groups/${groupId}/worksheets?search=${encodeURIComponent('%')}`);
    assert.equal(literal.json.total, 0, 'a % in the search box is a literal, not a wildcard');
  });
});

describe('NUL characters (U+0000)', () => {
  const nulMessage = /NUL character \(U\+0000\).*cannot be stored.*delete it/;

  test('a save, a new worksheet and a title with NUL → 400 saying where and what to do; nothing stored', async () => {
    const sheet = (await author.get(`/api/worksheets/${worksheetId}`)).json.worksheet;
    const save = await author.put(`/api/worksheets/${worksheetId}`, { source: 'note "one"\nnote "t\u0000wo"', baseVersion: sheet.version });
    assertError(save, 400, nulMessage);
    assert.equal(save.json.error.code, 'nul_character');
    assert.match(save.json.error.message, /^source: .*at line 2, column 8/);
    const rename = await author.put(`/api/worksheets/${worksheetId}`, { title: 'a\u0000b', source: sheet.source, baseVersion: sheet.version });
    assertError(rename, 400, /^title: .*NUL character/);
    const created = await author.post(`/api/groups/${groupId}/worksheets`, { title: 'nul\u0000title', source: 'note "x"' });
    assertError(created, 400, nulMessage);
    const after = (await author.get(`/api/worksheets/${worksheetId}`)).json.worksheet;
    assert.equal(after.version, sheet.version, 'no version was saved');
    const [rows] = await server.running.sequelize.query(`SELECT count(*)::int AS n FROM worksheets WHERE title LIKE 'nul%'`);
    assert.equal((rows as { n: number }[])[0]!.n, 0);
  });

  test('an imported .swk with a NUL byte, and an import title with one → 400', async () => {
    const file = await author.upload(`/api/groups/${groupId}/imports`, 'nul.swk', Buffer.from('note "a"\nnote "b\u0000"\n'));
    assertError(file, 400, nulMessage);
    assert.match(file.json.error.message, /at line 2, column 8/);
    const title = await author.upload(`/api/groups/${groupId}/imports`, 'ok.swk', 'note "a"\n', { title: 'x\u0000y' });
    assertError(title, 400, /^title: .*NUL character/);
  });

  test('a search with NUL → 400, not a query', async () => {
    assertError(await author.get(`/api/groups/${groupId}/worksheets?search=a%00b`), 400, /^search: .*NUL character/);
  });
});
