// Every save keeps a version; a save based on an old version gets 409, never a silent overwrite.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let author: ApiClient;
let owner: ApiClient;
let worksheetId: number;

before(async () => {
  server = await startTestServer();
  author = new ApiClient(server.url);
  owner = new ApiClient(server.url);
  await author.login(DEMO.author);
  await owner.login(DEMO.owner);
  const groupId = (await author.get('/api/groups')).json.groups[0].id;
  const created = await author.post(`/api/groups/${groupId}/worksheets`, { title: 'Versioned', source: 'note "one"' });
  worksheetId = created.json.worksheet.id;
});
after(async () => server?.stop());

test('saves make versions and a stale save gets 409 with the current version', async () => {
  const first = await author.put(`/api/worksheets/${worksheetId}`, { source: 'note "two"', baseVersion: 1 });
  assert.equal(first.status, 200);
  assert.equal(first.json.worksheet.version, 2);

  // The owner still has version 1 open and saves on top of it.
  const stale = await owner.put(`/api/worksheets/${worksheetId}`, { source: 'note "owner text"', baseVersion: 1 });
  assert.equal(stale.status, 409);
  assert.equal(stale.json.error.code, 'version_conflict');
  assert.match(stale.json.error.message, /saved version 2/);
  assert.equal(stale.json.current.version, 2);
  assert.equal(stale.json.current.source, 'note "two"');
  assert.equal(stale.json.current.updatedBy, 'Tobiah Osei');

  const unchanged = await owner.get(`/api/worksheets/${worksheetId}`);
  assert.equal(unchanged.json.worksheet.source, 'note "two"', 'the stale save changed nothing');

  const versions = await owner.get(`/api/worksheets/${worksheetId}/versions`);
  assert.deepEqual(
    versions.json.versions.map((v: { number: number; source: string }) => [v.number, v.source]),
    [
      [2, 'note "two"'],
      [1, 'note "one"'],
    ],
  );
});

test('concurrent saves on one base: exactly one lands, the rest get 409, numbers have no gaps', async () => {
  const base = (await author.get(`/api/worksheets/${worksheetId}`)).json.worksheet.version;
  const results = await Promise.all(
    Array.from({ length: 10 }, (_, n) => (n % 2 ? author : owner).put(`/api/worksheets/${worksheetId}`, { source: `note "racer ${n}"`, baseVersion: base })),
  );
  const statuses = results.map((r) => r.status).sort();
  assert.deepEqual(statuses, [200, ...Array(9).fill(409)]);
  const versions = (await author.get(`/api/worksheets/${worksheetId}/versions`)).json.versions.map((v: { number: number }) => v.number);
  assert.deepEqual(versions, Array.from({ length: base + 1 }, (_, n) => base + 1 - n));
});
