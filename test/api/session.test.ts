// Sessions live in PostgreSQL: a signed-in session survives a restart of the server process.
import assert from 'node:assert/strict';
import { after, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { killServerProcesses, randomPort, startServerProcess } from '../support/server-process.js';
import { createTestDatabase } from '../support/test-database.js';

after(killServerProcesses);

test('a session survives a server restart', async () => {
  const db = await createTestDatabase('session');
  const port = randomPort();
  let server = await startServerProcess(db.url, port);
  const client = new ApiClient(`http://127.0.0.1:${port}`);
  await client.login(DEMO.reviewer);
  assert.equal((await client.get('/api/auth/me')).status, 200);

  await server.stop();
  server = await startServerProcess(db.url, port);
  const me = await client.get('/api/auth/me');
  assert.equal(me.status, 200);
  assert.equal(me.json.user.email, DEMO.reviewer);
  // A state-changing request still works with the same session's XSRF token.
  const group = await client.post('/api/groups', { name: 'After restart' });
  assert.equal(group.status, 201);

  const signedOut = await client.post('/api/auth/logout');
  assert.equal(signedOut.status, 204);
  assert.equal((await client.get('/api/auth/me')).status, 401);
  await server.stop();
  await db.drop();
});

test('sign-in gives a new session id (no session fixation)', async () => {
  const db = await createTestDatabase('fixation');
  const port = randomPort();
  const server = await startServerProcess(db.url, port);
  const client = new ApiClient(`http://127.0.0.1:${port}`);
  await client.get('/api/health');
  assert.equal(client.cookies.get('sheetwise.sid'), undefined, 'no session before sign-in (the XSRF token is a signed cookie)');
  assert.ok(client.cookies.get('XSRF-TOKEN'));
  // A session id planted before sign-in (by someone else) is not the one signed in.
  const planted = 's%3Aplanted-session-id.c2lnbmF0dXJl';
  client.cookies.set('sheetwise.sid', planted);
  await client.login(DEMO.reader);
  assert.ok(client.cookies.get('sheetwise.sid'));
  assert.notEqual(client.cookies.get('sheetwise.sid'), planted);
  await server.stop();
  await db.drop();
});
