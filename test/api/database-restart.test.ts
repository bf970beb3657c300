// The server survives a database restart: requests in the gap get 503 with a message,
// and it reconnects by itself afterwards. Runs on a private cluster of its own, so
// stopping it does not disturb the other test files.
import assert from 'node:assert/strict';
import { rmSync } from 'node:fs';
import { after, before, test } from 'node:test';
import { startCluster, ensureDatabase, type Cluster } from '../../scripts/lib/postgres.mjs';
import { startServer, type RunningServer } from '../../server/main.js';
import { ApiClient, DEMO } from '../support/api-client.js';

let cluster: Cluster;
let server: RunningServer;

before(async () => {
  const port = 40000 + Math.floor(Math.random() * 10000);
  cluster = startCluster({ projectDir: process.cwd(), name: `postgres-restart-${port}`, port });
  ensureDatabase(cluster, 'sheetwise');
  server = await startServer({ ...process.env, PORT: '0', DATABASE_URL: cluster.url('sheetwise'), SHEETWISE_SEED_DEMO: '1', LOG_LEVEL: 'silent' });
});
after(async () => {
  await server?.stop().catch(() => {});
  cluster?.stop();
  // A throwaway cluster: leave no data folder behind.
  if (cluster) rmSync(cluster.dataDir, { recursive: true, force: true });
});

test('503 while the database is down, normal service after it is back', async () => {
  const client = new ApiClient(server.url);
  await client.login(DEMO.author);
  assert.equal((await client.get('/api/groups')).status, 200);

  cluster.stop();
  const during = await client.get('/api/groups');
  assert.equal(during.status, 503, during.text);
  assert.match(during.json.error.message, /database is not reachable/);

  startCluster({ projectDir: process.cwd(), name: cluster.dataDir.split('/').pop()!, port: cluster.port });
  let status = 0;
  for (let attempt = 0; attempt < 20 && status !== 200; attempt++) {
    status = (await client.get('/api/groups')).status;
    if (status !== 200) await new Promise((r) => setTimeout(r, 250));
  }
  assert.equal(status, 200, 'the server reconnected and the session (kept in PostgreSQL) is still valid');
});
