// Sessions live in PostgreSQL: a signed-in session survives a restart of the server process.
import assert from 'node:assert/strict';
import { spawn, type ChildProcess } from 'node:child_process';
import { after, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { createTestDatabase } from '../support/test-database.js';

const children: ChildProcess[] = [];
after(() => children.forEach((c) => c.kill('SIGKILL')));

function startProcess(databaseUrl: string, port: number): Promise<ChildProcess> {
  const child = spawn('node_modules/.bin/tsx', ['server/main.ts'], {
    env: { ...process.env, DATABASE_URL: databaseUrl, PORT: String(port), SHEETWISE_SEED_DEMO: '1', LOG_LEVEL: 'silent' },
    stdio: ['ignore', 'ignore', 'inherit', 'ipc'],
  });
  children.push(child);
  return new Promise((resolve, reject) => {
    child.on('message', (m: { type?: string }) => m?.type === 'ready' && resolve(child));
    child.on('exit', (code) => reject(new Error(`server exited with ${code}`)));
  });
}

function stopProcess(child: ChildProcess): Promise<void> {
  return new Promise((resolve) => {
    child.removeAllListeners('exit');
    child.once('exit', () => resolve());
    child.kill('SIGTERM');
  });
}

test('a session survives a server restart', async () => {
  const db = await createTestDatabase('session');
  const port = 20000 + Math.floor(Math.random() * 20000);
  let server = await startProcess(db.url, port);
  const client = new ApiClient(`http://127.0.0.1:${port}`);
  await client.login(DEMO.reviewer);
  assert.equal((await client.get('/api/auth/me')).status, 200);

  await stopProcess(server);
  server = await startProcess(db.url, port);
  const me = await client.get('/api/auth/me');
  assert.equal(me.status, 200);
  assert.equal(me.json.user.email, DEMO.reviewer);
  // A state-changing request still works with the same session's XSRF token.
  const group = await client.post('/api/groups', { name: 'After restart' });
  assert.equal(group.status, 201);

  const signedOut = await client.post('/api/auth/logout');
  assert.equal(signedOut.status, 204);
  assert.equal((await client.get('/api/auth/me')).status, 401);
  await stopProcess(server);
  await db.drop();
});

test('sign-in gives a new session id (no session fixation)', async () => {
  const db = await createTestDatabase('fixation');
  const port = 20000 + Math.floor(Math.random() * 20000);
  const server = await startProcess(db.url, port);
  const client = new ApiClient(`http://127.0.0.1:${port}`);
  await client.get('/api/health');
  const before = client.cookies.get('sheetwise.sid');
  assert.ok(before, 'an anonymous session exists before sign-in (it holds the XSRF token)');
  await client.login(DEMO.reader);
  assert.notEqual(client.cookies.get('sheetwise.sid'), before);
  await stopProcess(server);
  await db.drop();
});
