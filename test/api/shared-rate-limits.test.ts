// The rate limits on registration and password resets are counted in PostgreSQL, so two
// server processes on one database share them: a client alternating between two processes
// behind a proxy gets no more than the limit. The second server is a real child process.
import assert from 'node:assert/strict';
import { spawn, type ChildProcess } from 'node:child_process';
import { after, before, test } from 'node:test';
import { ApiClient } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

const REGISTRATIONS_PER_HOUR = 3; // LOGIN_RATE_LIMIT also sets the registration limit
let first: TestServer;
let second: ChildProcess;
let secondUrl: string;

before(async () => {
  first = await startTestServer({ LOGIN_RATE_LIMIT: String(REGISTRATIONS_PER_HOUR) });
  second = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
    env: { ...process.env, DATABASE_URL: first.databaseUrl, PORT: '0', LOG_LEVEL: 'silent', SHEETWISE_SEED_DEMO: '0', EVALUATION_WORKERS: '1', LOGIN_RATE_LIMIT: String(REGISTRATIONS_PER_HOUR) },
    stdio: ['ignore', 'ignore', 'inherit', 'ipc'],
    detached: true, // its own process group, stopped by its id
  });
  secondUrl = await new Promise<string>((resolve, reject) => {
    second.on('message', (m: { type?: string; url?: string }) => m?.type === 'ready' && resolve(m.url!));
    second.once('exit', (code) => reject(new Error(`the second server exited with ${code}`)));
  });
});

after(async () => {
  if (second?.pid && second.exitCode === null) {
    const exited = new Promise((r) => second.once('exit', r));
    process.kill(-second.pid, 'SIGTERM');
    await exited;
  }
  await first?.stop();
});

test('registrations from one address are counted across two server processes', async () => {
  const servers = [first.url, secondUrl];
  const statuses: number[] = [];
  for (let n = 0; n < REGISTRATIONS_PER_HOUR + 2; n++) {
    const client = new ApiClient(servers[n % 2]!);
    const res = await client.post('/api/auth/register', {
      email: `shared-limit-${n}@example.test`,
      displayName: `Shared limit ${n}`,
      password: `a long enough passphrase ${n} for the policy`,
    });
    statuses.push(res.status);
    if (res.status === 429) {
      assert.equal(res.json.error.code, 'rate_limited');
      assert.match(res.json.error.message, /Wait a while/);
      assert.ok(res.headers.get('ratelimit-policy'), 'the draft-8 policy header is sent');
    }
  }
  assert.deepEqual(statuses.slice(0, REGISTRATIONS_PER_HOUR).map((s) => s === 201 || s === 200), Array(REGISTRATIONS_PER_HOUR).fill(true), `statuses ${statuses}`);
  // each process alone has seen at most 2 of them, under the limit of 3: only a shared count refuses these
  assert.deepEqual(statuses.slice(REGISTRATIONS_PER_HOUR), [429, 429], `statuses ${statuses}`);
});

test('password reset requests share one limit across the two processes', async () => {
  const servers = [first.url, secondUrl];
  const statuses: number[] = [];
  for (let n = 0; n < 12; n++) {
    const res = await new ApiClient(servers[n % 2]!).post('/api/auth/password-reset', { email: `nobody-${n}@example.test` });
    statuses.push(res.status);
  }
  // 10 per 15 minutes per address: 6 went to each process, 12 in all
  assert.equal(statuses.filter((s) => s === 429).length, 2, `statuses ${statuses}`);
  assert.ok(statuses.slice(0, 10).every((s) => s !== 429), `statuses ${statuses}`);
});
