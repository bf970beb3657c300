// GET requests write no activity (issue 15, finding 13): a cross-site link to an export
// (or to any page a member can open) cannot flood the group's activity feed. Every GET a
// member or a referee makes on a worksheet, its files and its exports leaves the activity
// table as it was; the writes that should record (a save, an upload) still do.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let author: ApiClient;

before(async () => {
  server = await startTestServer();
  author = new ApiClient(server.url);
  await author.login(DEMO.author);
});
after(async () => server?.stop());

async function activityRows() {
  const [rows] = await server.running.sequelize.query('SELECT count(*)::int AS n, coalesce(max(id), 0)::int AS last FROM activity');
  return (rows as { n: number; last: number }[])[0]!;
}

test('exports and every other GET leave the activity table unchanged', async () => {
  const groupId = (await author.get('/api/groups')).json.groups[0].id;
  const made = await author.post(`/api/groups/${groupId}/worksheets`, { title: 'Exported often', source: 'param k : positive\nintegral Z = exp(-k*q^2/2) d(q)\n' });
  assert.equal(made.status, 201, made.text);
  const id = made.json.worksheet.id;
  const file = await author.upload(`/api/worksheets/${id}/attachments`, 'table.csv', 'k,v\n1,2\n');
  assert.equal(file.status, 201, file.text);
  const link = await author.post(`/api/worksheets/${id}/referee-links`, { days: 5 });
  assert.equal(link.status, 201, link.text);
  const token = /\/referee\/(.+)$/.exec(link.json.link.url)![1]!;
  const before = await activityRows();

  const gets = [
    ...['swk', 'json', 'latex'].flatMap((format) => [`/api/worksheets/${id}/export?format=${format}`, `/api/worksheets/${id}/export?format=${format}&version=1`]),
    `/api/worksheets/${id}`,
    `/api/worksheets/${id}/versions`,
    `/api/worksheets/${id}/attachments`,
    `/api/worksheets/${id}/attachments/${file.json.attachment.id}`,
    `/api/worksheets/${id}/referee-links`,
    `/api/groups/${groupId}/worksheets`,
    `/api/groups/${groupId}/activity`,
  ];
  for (let round = 0; round < 3; round++) {
    for (const path of gets) {
      const res = await author.get(path);
      assert.equal(res.status, 200, `${path}: ${res.text}`);
    }
  }
  const anon = new ApiClient(server.url);
  assert.equal((await anon.get(`/api/referee/${token}`)).status, 200);
  assert.deepEqual(await activityRows(), before, 'no GET wrote an activity line');

  // Writes still record.
  const saved = await author.put(`/api/worksheets/${id}`, { source: 'note "v2"', baseVersion: 1 });
  assert.equal(saved.status, 200, saved.text);
  assert.equal((await activityRows()).n, before.n + 1);
});
