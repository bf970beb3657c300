// 50 concurrent saves of one worksheet from different sessions: each lands as a new
// version or gets 409; version numbers have no gaps or duplicates; no landed text is lost.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
before(async () => {
  server = await startTestServer();
});
after(async () => server?.stop());

test('50 concurrent saves from 50 sessions', async () => {
  // Signed in one after another: 25 sign-ins of one account at once from an address it never
  // used would meet the account's back-off (every try counts until its password is checked).
  const sessions: ApiClient[] = [];
  for (let n = 0; n < 50; n++) {
    const client = new ApiClient(server.url);
    await client.login(n % 2 ? DEMO.author : DEMO.owner);
    sessions.push(client);
  }
  const groupId = (await sessions[0].get('/api/groups')).json.groups[0].id;
  const created = await sessions[0].post(`/api/groups/${groupId}/worksheets`, { title: 'Race', source: 'note "start"' });
  const id = created.json.worksheet.id;

  // Each session saves on the newest version it knows; a 409 hands it the current one.
  const landed: string[] = [];
  const outcomes = await Promise.all(
    sessions.map(async (client, n) => {
      const text = `note "writer ${n}"`;
      const res = await client.put(`/api/worksheets/${id}`, { source: text, baseVersion: 1 });
      if (res.status === 200) landed.push(text);
      else assert.equal(res.status, 409, res.text);
      if (res.status === 409) {
        // Retry once on top of what the server said is current.
        const retry = await client.put(`/api/worksheets/${id}`, { source: text, baseVersion: res.json.current.version });
        assert.ok([200, 409].includes(retry.status), retry.text);
        if (retry.status === 200) landed.push(text);
      }
      return res.status;
    }),
  );
  assert.equal(outcomes.filter((s) => s === 200).length, 1, 'exactly one first-round save lands on version 1');

  const versions = (await sessions[0].get(`/api/worksheets/${id}/versions`)).json.versions as { number: number; source: string }[];
  const numbers = versions.map((v) => v.number).sort((a, b) => a - b);
  assert.deepEqual(numbers, Array.from({ length: numbers.length }, (_, k) => k + 1), 'no gaps, no duplicates');
  assert.equal(numbers.length, landed.length + 1);
  const stored = new Set(versions.map((v) => v.source));
  for (const text of landed) assert.ok(stored.has(text), `landed text kept: ${text}`);
});
