// The worksheet list costs one query after the session lookup (which reads the account in
// the same query, server/auth/session-store.ts): membership, page and count together. Counted with Sequelize's
// logging hook on the in-process server; speed itself is measured by bench/api-load.bench.ts.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let author: ApiClient;
let groupId: number;

before(async () => {
  server = await startTestServer();
  author = new ApiClient(server.url);
  await author.login(DEMO.author);
  groupId = (await author.get('/api/groups')).json.groups[0].id;
});
after(async () => server?.stop());

/** The SQL the server's Sequelize ran while `work` did (background mail delivery left out). */
async function queriesDuring(work: () => Promise<unknown>): Promise<string[]> {
  // Sequelize reads `options.logging` at each query
  const sequelize = server.running.sequelize as unknown as { options: { logging: unknown } };
  const seen: string[] = [];
  const before = sequelize.options.logging;
  sequelize.options.logging = (sql: string) => void seen.push(sql);
  try {
    await work();
  } finally {
    sequelize.options.logging = before;
  }
  return seen.filter((sql) => !/mail_/i.test(sql));
}

test('the list takes one query after the session-and-account lookup (membership + page + count)', async () => {
  await author.get(`/api/groups/${groupId}/worksheets`); // warm
  for (const qs of ['', '?sort=title&direction=asc', '?search=mode&pageSize=2', '?sort=version&page=1&pageSize=1']) {
    let res: Awaited<ReturnType<ApiClient['get']>> | undefined;
    const sql = await queriesDuring(async () => (res = await author.get(`/api/groups/${groupId}/worksheets${qs}`)));
    assert.equal(res!.status, 200, res!.text);
    assert.ok(sql.length >= 1, 'the logging hook saw the queries');
    assert.equal(sql.length, 1, `list${qs} ran ${sql.length} queries:\n${sql.join('\n')}`);
  }
});

test('the list answers as before: count with the rows, order, search, pages, past the end, outsiders', async () => {
  const titles = ['Speed a_1', 'Speed b%2', 'Speed c 3'];
  for (const title of titles) assert.equal((await author.post(`/api/groups/${groupId}/worksheets`, { title, source: '' })).status, 201);
  const all = (await author.get(`/api/groups/${groupId}/worksheets?pageSize=100&sort=title&direction=asc`)).json;
  assert.equal(all.total, all.items.length);
  const sorted = [...all.items.map((w: { title: string }) => w.title)];
  assert.deepEqual(sorted, [...sorted].sort((a, b) => a.localeCompare(b, 'en')));
  for (const w of all.items) {
    assert.equal(typeof w.updatedBy, 'string');
    assert.ok(!Number.isNaN(Date.parse(w.updatedAt)));
    assert.equal(w.source, undefined);
  }

  const search = (await author.get(`/api/groups/${groupId}/worksheets?search=${encodeURIComponent('b%')}`)).json;
  assert.deepEqual(search.items.map((w: { title: string }) => w.title), ['Speed b%2']);
  assert.equal(search.total, 1);
  const underscore = (await author.get(`/api/groups/${groupId}/worksheets?search=${encodeURIComponent('a_')}`)).json;
  assert.deepEqual(underscore.items.map((w: { title: string }) => w.title), ['Speed a_1']);

  const page1 = (await author.get(`/api/groups/${groupId}/worksheets?search=speed&pageSize=2&page=1&sort=title&direction=desc`)).json;
  assert.equal(page1.total, 3);
  assert.deepEqual(page1.items.map((w: { title: string }) => w.title), ['Speed a_1']);
  const past = (await author.get(`/api/groups/${groupId}/worksheets?search=speed&pageSize=2&page=5`)).json;
  assert.equal(past.total, 3);
  assert.deepEqual(past.items, []);
  const none = (await author.get(`/api/groups/${groupId}/worksheets?search=nothing-like-this`)).json;
  assert.equal(none.total, 0);

  // newest first by default
  const recent = (await author.get(`/api/groups/${groupId}/worksheets`)).json;
  assert.equal(recent.items[0].title, 'Speed c 3');

  const outsider = new ApiClient(server.url); // the site admin is no member of the group
  await outsider.login(DEMO.admin);
  assert.equal((await outsider.get(`/api/groups/${groupId}/worksheets`)).status, 404);
  const anon = new ApiClient(server.url);
  assert.equal((await anon.get(`/api/groups/${groupId}/worksheets`)).status, 401);
  assert.equal((await author.get(`/api/groups/999999/worksheets`)).status, 404);
});
