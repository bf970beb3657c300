// A shutdown signal (SIGTERM) lets requests in flight finish, refuses new ones, and
// closes every database connection before the process exits with status 0.
import assert from 'node:assert/strict';
import pg from 'pg';
import { after, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { killServerProcesses, startServerProcess } from '../support/server-process.js';
import { createTestDatabase, testClusterUrl } from '../support/test-database.js';

after(killServerProcesses);

/** About a second of work: many three-variable symbolic integrals. */
function slowWorksheet(count: number): string {
  const lines = ['param k : positive', 'param g : real'];
  for (let j = 1; j <= count; j++) lines.push(`integral Z${j} = exp(-(k*x^2 + k*y^2 + k*z^2 + 2*i*g*x*y + 2*i*g*y*z + ${j}*i*g*x*z)/2) d(x, y, z)`);
  return lines.join('\n');
}

async function connectionsTo(database: string): Promise<number> {
  const c = new pg.Client({ connectionString: `${testClusterUrl()}/postgres` });
  await c.connect();
  const { rows } = await c.query('SELECT count(*)::int AS n FROM pg_stat_activity WHERE datname = $1', [database]);
  await c.end();
  return rows[0].n;
}

test('SIGTERM finishes the evaluation in flight, then closes the database and exits 0', async () => {
  const db = await createTestDatabase('shutdown');
  const server = await startServerProcess(db.url);
  const client = new ApiClient(server.url);
  await client.login(DEMO.author);
  assert.ok((await connectionsTo(db.name)) > 0, 'the running server holds connections');

  // The streamed variant says when the first statement has started: the request is in flight.
  const response = await client.stream('/api/evaluate', { source: slowWorksheet(30) });
  const reader = response.body!.getReader();
  const decoder = new TextDecoder();
  let text = '';
  while (!text.includes('event: progress')) {
    const chunk = await reader.read();
    assert.equal(chunk.done, false, 'the stream ended before any progress');
    text += decoder.decode(chunk.value, { stream: true });
  }

  const exited = server.stop();
  // New connections are refused once the signal has arrived.
  await new Promise((r) => setTimeout(r, 200));
  await assert.rejects(fetch(`${server.url}/api/health`), 'a new request after SIGTERM is refused');

  for (let chunk = await reader.read(); !chunk.done; chunk = await reader.read()) text += decoder.decode(chunk.value, { stream: true });
  assert.match(text, /event: report/, 'the evaluation in flight finished and its report arrived');
  const report = JSON.parse(text.split('event: report\ndata: ')[1]!.split('\n')[0]!);
  assert.equal(report.statements.length, 32);
  assert.ok(report.statements.every((s: { status: string }) => s.status === 'ok'), 'every statement finished');

  assert.equal(await exited, 0, 'the process exits with status 0');
  assert.equal(await connectionsTo(db.name), 0, 'no connection is left open');
  await db.drop();
});
