// The server survives database restarts: requests in the gap get 503 with a message,
// nothing else; the server process stays up and reconnects by itself; sessions (kept in
// PostgreSQL) and saves work again afterwards.
//
// The server runs in a child process, as `npm start` runs it, so a crash shows as the
// process exiting. It uses a private cluster of its own: stopping the shared test
// cluster would disturb the other test files running at the same time.
import assert from 'node:assert/strict';
import { rmSync } from 'node:fs';
import { after, before, test } from 'node:test';
import { startCluster, ensureDatabase, type Cluster } from '../../scripts/lib/postgres.mjs';
import { ApiClient, DEMO } from '../support/api-client.js';
import { killServerProcesses, startServerProcess, type ServerProcess } from '../support/server-process.js';

let cluster: Cluster;
let server: ServerProcess;
const clusterName = (port: number) => `postgres-restart-${port}`;

before(async () => {
  const port = 40000 + Math.floor(Math.random() * 10000);
  cluster = startCluster({ projectDir: process.cwd(), name: clusterName(port), port });
  ensureDatabase(cluster, 'sheetwise');
  server = await startServerProcess(cluster.url('sheetwise'));
});
after(async () => {
  await server?.stop();
  killServerProcesses();
  cluster?.stop();
  // A throwaway cluster: leave no data folder behind.
  if (cluster) rmSync(cluster.dataDir, { recursive: true, force: true });
});

const pause = (ms: number) => new Promise((r) => setTimeout(r, ms));

async function untilOk(client: ApiClient, path: string): Promise<number> {
  let status = 0;
  for (let attempt = 0; attempt < 40 && status !== 200; attempt++) {
    status = (await client.get(path)).status;
    if (status !== 200) await pause(250);
  }
  return status;
}

test('three restarts under steady traffic: only 200 or 503, then normal service', async () => {
  const client = new ApiClient(server.url);
  await client.login(DEMO.author);
  const groups = await client.get('/api/groups');
  assert.equal(groups.status, 200);
  const groupId = groups.json.groups[0].id;
  const created = await client.post(`/api/groups/${groupId}/worksheets`, { title: 'Restart', source: 'note "v1"' });
  assert.equal(created.status, 201, created.text);
  const id = created.json.worksheet.id;
  let version = 1;

  for (let round = 1; round <= 3; round++) {
    // Traffic that keeps connections opening and closing while the database goes away:
    // the moment a fresh connection meets the shutdown is where a crash used to hide.
    const statuses: number[] = [];
    const messages = new Set<string>();
    let traffic = true;
    const load = (async () => {
      while (traffic) {
        const res = await Promise.all([client.get('/api/groups'), client.get(`/api/worksheets/${id}`)]);
        for (const r of res) {
          statuses.push(r.status);
          if (r.status === 503) messages.add(r.json?.error?.message);
        }
      }
    })();
    await pause(150);
    cluster.stop();
    const during = await client.get('/api/groups');
    assert.equal(during.status, 503, during.text);
    assert.match(during.json.error.message, /database is not reachable/);
    await pause(300);
    startCluster({ projectDir: process.cwd(), name: clusterName(cluster.port), port: cluster.port });
    assert.equal(await untilOk(client, '/api/groups'), 200, `round ${round}: the server reconnected and the session is still valid`);
    traffic = false;
    await load;

    assert.equal(server.exited(), null, `round ${round}: the server process is still running`);
    const unexpected = statuses.filter((s) => s !== 200 && s !== 503);
    assert.deepEqual(unexpected, [], `round ${round}: no status other than 200 and 503`);
    assert.ok(statuses.includes(503), `round ${round}: some requests met the gap`);
    for (const m of messages) assert.match(m, /database is not reachable.*try again/);

    // A save after the restart lands as the next version.
    const saved = await client.put(`/api/worksheets/${id}`, { source: `note "v${version + 1}"`, baseVersion: version });
    assert.equal(saved.status, 200, saved.text);
    version += 1;
  }
  const versions = (await client.get(`/api/worksheets/${id}/versions`)).json.versions as { number: number }[];
  assert.deepEqual(versions.map((v) => v.number).sort((a, b) => a - b), [1, 2, 3, 4]);
});
