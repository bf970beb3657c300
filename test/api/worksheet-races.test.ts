// Requests racing a delete answer 404 or 409, never 500 (issue 15, finding 9): saves
// racing the worksheet's delete, deletes racing each other, renames racing each other,
// evaluations and uploads racing the delete, and new worksheets racing the group's delete.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let sessions: ApiClient[];
let groupId: number;

before(async () => {
  server = await startTestServer();
  // one after another: a burst of sign-ins of one account from a new address meets its back-off by design
  sessions = [];
  for (let n = 0; n < 20; n++) {
    const client = new ApiClient(server.url);
    await client.login(n % 2 ? DEMO.author : DEMO.owner);
    sessions.push(client);
  }
  groupId = (await sessions[0]!.get('/api/groups')).json.groups[0].id;
});
after(async () => server?.stop());

const newSheet = async (title: string, source = 'note "start"') => {
  const created = await sessions[0]!.post(`/api/groups/${groupId}/worksheets`, { title, source });
  assert.equal(created.status, 201, created.text);
  return created.json.worksheet.id as number;
};

async function activityCount(action: string, subject: string) {
  const [rows] = await server.running.sequelize.query('SELECT count(*)::int AS n FROM activity WHERE action = $1 AND subject = $2', { bind: [action, subject] });
  return (rows as { n: number }[])[0]!.n;
}

/** Each answer is one of `allowed`, with an error sentence when it is not a success. */
function assertStatuses(results: { status: number; text: string; json: any }[], allowed: number[]) {
  for (const r of results) {
    assert.ok(allowed.includes(r.status), `${r.status}: ${r.text}`);
    if (r.status >= 400) assert.ok(typeof r.json?.error?.message === 'string' && r.json.error.message.length > 20, r.text);
  }
}

describe('races with a delete', () => {
  test('20 saves racing a delete of the same worksheet: 200, 409 or 404, never 500', async () => {
    const seen = new Set<number>();
    for (let round = 0; round < 5; round++) {
      const id = await newSheet(`Race ${round}`);
      const saves = sessions.map((client, n) => client.put(`/api/worksheets/${id}`, { source: `note "writer ${n}"`, baseVersion: 1 }));
      // The delete goes out while the saves are in flight (after a different number of them each round).
      const deletion = new Promise<Awaited<ReturnType<ApiClient['delete']>>>((resolve) => setTimeout(() => resolve(sessions[1]!.delete(`/api/worksheets/${id}`)), round * 3));
      const [deleted, ...results] = await Promise.all([deletion, ...saves]);
      assert.equal(deleted.status, 204, deleted.text);
      assertStatuses(results, [200, 404, 409]);
      for (const r of results) seen.add(r.status);
      assert.ok(results.filter((r) => r.status === 200).length <= 1, 'at most one save lands on version 1');
      for (const r of results.filter((r) => r.status === 404)) assert.match(r.json.error.message, /deleted|not found/);
      assert.equal((await sessions[0]!.get(`/api/worksheets/${id}`)).status, 404);
    }
    assert.ok(seen.has(404) || seen.has(409), 'the saves met the delete');
  });

  test('ten deletes of one worksheet: one 204, the rest 404, one activity line', async () => {
    const id = await newSheet('Deleted ten times');
    const results = await Promise.all(sessions.slice(0, 10).map((c) => c.delete(`/api/worksheets/${id}`)));
    assert.deepEqual(results.map((r) => r.status).sort(), [204, ...Array(9).fill(404)], results.map((r) => r.text).join('\n'));
    assertStatuses(results, [204, 404]);
    assert.equal(await activityCount('deleted worksheet', 'Deleted ten times'), 1);
  });

  test('ten renames on one base version: one lands, the others get 409 with the current worksheet', async () => {
    const id = await newSheet('Before rename');
    const results = await Promise.all(sessions.slice(0, 10).map((c, n) => c.put(`/api/worksheets/${id}`, { title: `Renamed ${n}`, source: 'note "start"', baseVersion: 1 })));
    assertStatuses(results, [200, 409]);
    const landed = results.filter((r) => r.status === 200);
    assert.equal(landed.length, 1);
    for (const r of results.filter((r) => r.status === 409)) assert.equal(r.json.current.title, landed[0]!.json.worksheet.title);
  });

  test('evaluations racing the delete: 200 or 404 (or the cap\'s 429)', async () => {
    const source = 'param k : positive\nintegral Z = exp(-k*q^2/2) d(q)\nexpect Z = sqrt(2*pi/k)\n';
    for (let round = 0; round < 3; round++) {
      const id = await newSheet(`Evaluated ${round}`, source);
      const evaluations = sessions.slice(0, 4).map((c) => c.post(`/api/worksheets/${id}/evaluation`));
      const deletion = new Promise<Awaited<ReturnType<ApiClient['delete']>>>((resolve) => setTimeout(() => resolve(sessions[1]!.delete(`/api/worksheets/${id}`)), 20 * round));
      const [deleted, ...results] = await Promise.all([deletion, ...evaluations]);
      assert.equal(deleted.status, 204);
      // 429 is the per-account cap on evaluations (a fair answer, not a race).
      assertStatuses(results, [200, 404, 429]);
    }
  });

  test('uploads racing the delete: 201 or 404, and nothing left behind', async () => {
    const id = await newSheet('Uploaded to');
    const uploads = sessions.slice(0, 6).map((c, n) => c.upload(`/api/worksheets/${id}/attachments`, `t${n}.csv`, `k,v\n${'1,2\n'.repeat(20_000)}`));
    const deletion = new Promise<Awaited<ReturnType<ApiClient['delete']>>>((resolve) => setTimeout(() => resolve(sessions[1]!.delete(`/api/worksheets/${id}`)), 5));
    const [deleted, ...results] = await Promise.all([deletion, ...uploads]);
    assert.equal(deleted.status, 204);
    assertStatuses(results, [201, 404]);
    const [rows] = await server.running.sequelize.query(`SELECT count(*)::int AS n FROM attachments WHERE worksheet_id = ${id}`);
    assert.equal((rows as { n: number }[])[0]!.n, 0);
  });

  test('new worksheets racing the delete of their group: 201 or 404', async () => {
    const owner = sessions[0]!;
    for (let round = 0; round < 3; round++) {
      const group = await owner.post('/api/groups', { name: `Doomed ${round}` });
      const id = group.json.group.id;
      const creates = Array.from({ length: 10 }, (_, n) => owner.post(`/api/groups/${id}/worksheets`, { title: `w${n}`, source: 'note "x"' }));
      const deletion = new Promise<Awaited<ReturnType<ApiClient['delete']>>>((resolve) => setTimeout(() => resolve(owner.delete(`/api/groups/${id}`)), 3 * round));
      const [deleted, ...results] = await Promise.all([deletion, ...creates]);
      assert.equal(deleted.status, 204, deleted.text);
      assertStatuses(results, [201, 404]);
    }
  });
});
