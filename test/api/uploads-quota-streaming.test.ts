// Attachments are streamed to storage and a group's files stay within a quota (issue 15,
// finding 8): beyond the quota an upload gets 413 with the figures and nothing is stored,
// also when uploads race; files are stored in chunks and come back byte for byte; text
// types are checked across chunk boundaries; and a server process receiving 96 MB at once
// does not grow by anything like that (its peak RSS is read from /proc).
import assert from 'node:assert/strict';
import { spawn, type ChildProcess } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { after, before, describe, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { createTestDatabase } from '../support/test-database.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

const KB = 1024;
const MB = 1024 * KB;
const QUOTA_MB = '1';

let server: TestServer;
let author: ApiClient;

before(async () => {
  // Through the environment as well, in case the app does not pass its config to the file routes.
  process.env['ATTACHMENT_QUOTA_MB'] = QUOTA_MB;
  server = await startTestServer({ ATTACHMENT_QUOTA_MB: QUOTA_MB });
  author = new ApiClient(server.url);
  await author.login(DEMO.author);
});
after(async () => server?.stop());

/** A PDF-looking file of `size` bytes whose content varies (so chunks differ). */
function pdf(size: number, seed = 1): Uint8Array {
  const bytes = new Uint8Array(size);
  let x = seed;
  for (let k = 0; k < size; k++) {
    x = (x * 1103515245 + 12345) & 0x7fffffff;
    bytes[k] = x >> 16;
  }
  bytes.set([0x25, 0x50, 0x44, 0x46, 0x2d], 0); // %PDF-
  return bytes;
}

async function freshWorksheet(owner: ApiClient, groupName: string) {
  const group = await owner.post('/api/groups', { name: groupName });
  assert.equal(group.status, 201, group.text);
  const groupId = group.json.group.id;
  const sheet = await owner.post(`/api/groups/${groupId}/worksheets`, { title: `${groupName} sheet`, source: 'note "files"' });
  assert.equal(sheet.status, 201, sheet.text);
  return { groupId, worksheetId: sheet.json.worksheet.id as number };
}

async function storedBytes(groupId: number) {
  const [rows] = await server.running.sequelize.query(
    `SELECT coalesce(sum(a.size), 0)::int AS n, (SELECT coalesce(sum(octet_length(c.data)), 0)::int FROM attachment_chunks c JOIN attachments a2 ON a2.id = c.attachment_id JOIN worksheets w2 ON w2.id = a2.worksheet_id WHERE w2.group_id = ${groupId}) AS chunks
     FROM attachments a JOIN worksheets w ON w.id = a.worksheet_id WHERE w.group_id = ${groupId}`,
  );
  return (rows as { n: number; chunks: number }[])[0]!;
}

describe('attachment quota per group', () => {
  test('an upload beyond the quota gets 413 with the figures; nothing is stored; other groups are not affected', async () => {
    const a = await freshWorksheet(author, 'Quota group A');
    const first = await author.upload(`/api/worksheets/${a.worksheetId}/attachments`, 'one.pdf', pdf(600 * KB));
    assert.equal(first.status, 201, first.text);
    const second = await author.upload(`/api/worksheets/${a.worksheetId}/attachments`, 'two.pdf', pdf(600 * KB, 2));
    assert.equal(second.status, 413, second.text);
    assert.equal(second.json.error.code, 'quota_exceeded');
    assert.match(second.json.error.message, /this group's 1 MB for attached files \(0\.6 MB in use\)/);
    assert.match(second.json.error.message, /0\.4 MB left/);
    assert.deepEqual(await storedBytes(a.groupId), { n: 600 * KB, chunks: 600 * KB });

    // A small file still fits; the quota counts every worksheet of the group.
    const other = await author.post(`/api/groups/${a.groupId}/worksheets`, { title: 'second sheet', source: 'note "x"' });
    const small = await author.upload(`/api/worksheets/${other.json.worksheet.id}/attachments`, 'small.csv', 'k,v\n1,2\n');
    assert.equal(small.status, 201, small.text);
    const third = await author.upload(`/api/worksheets/${other.json.worksheet.id}/attachments`, 'three.pdf', pdf(500 * KB, 3));
    assert.equal(third.status, 413, third.text);

    const b = await freshWorksheet(author, 'Quota group B');
    assert.equal((await author.upload(`/api/worksheets/${b.worksheetId}/attachments`, 'one.pdf', pdf(600 * KB))).status, 201);

    // Deleting makes room again; a second delete of the same file is 404, not 204 or 500.
    const removed = await author.delete(`/api/worksheets/${a.worksheetId}/attachments/${first.json.attachment.id}`);
    assert.equal(removed.status, 204);
    assert.equal((await author.delete(`/api/worksheets/${a.worksheetId}/attachments/${first.json.attachment.id}`)).status, 404);
    assert.equal((await author.upload(`/api/worksheets/${a.worksheetId}/attachments`, 'two.pdf', pdf(600 * KB, 2))).status, 201);
  });

  test('racing uploads cannot pass the quota together', async () => {
    const c = await freshWorksheet(author, 'Quota group C');
    const results = await Promise.all(
      Array.from({ length: 6 }, (_, k) => author.upload(`/api/worksheets/${c.worksheetId}/attachments`, `r${k}.pdf`, pdf(300 * KB, k + 10))),
    );
    const statuses = results.map((r) => r.status).sort();
    assert.deepEqual(statuses, [201, 201, 201, 413, 413, 413], results.map((r) => r.text).join('\n'));
    for (const r of results.filter((r) => r.status === 413)) assert.match(r.json.error.message, /1 MB for attached files/);
    assert.deepEqual(await storedBytes(c.groupId), { n: 900 * KB, chunks: 900 * KB });
  });
});

describe('chunked storage', () => {
  test('a file of several chunks comes back byte for byte, with its length', async () => {
    const d = await freshWorksheet(author, 'Chunks group');
    const bytes = pdf(700 * KB + 123, 7);
    const up = await author.upload(`/api/worksheets/${d.worksheetId}/attachments`, 'paper.pdf', bytes);
    assert.equal(up.status, 201, up.text);
    const [chunks] = await server.running.sequelize.query(`SELECT count(*)::int AS n FROM attachment_chunks WHERE attachment_id = ${up.json.attachment.id}`);
    assert.equal((chunks as { n: number }[])[0]!.n, 3, '256 kB chunks');
    const res = await fetch(`${server.url}/api/worksheets/${d.worksheetId}/attachments/${up.json.attachment.id}`, {
      headers: { cookie: [...author.cookies].map(([k, v]) => `${k}=${v}`).join('; ') },
    });
    assert.equal(res.status, 200);
    assert.equal(res.headers.get('content-length'), String(bytes.length));
    assert.deepEqual(new Uint8Array(await res.arrayBuffer()), bytes);
  });

  test('text types are checked over the whole file, across chunk boundaries', async () => {
    const e = await freshWorksheet(author, 'Text group');
    // Three-byte characters straddle every 64 kB read.
    const csv = `k,value\n${'1,€ä\n'.repeat(30_000)}`;
    const ok = await author.upload(`/api/worksheets/${e.worksheetId}/attachments`, 'table.csv', csv);
    assert.equal(ok.status, 201, ok.text);
    assert.equal(ok.json.attachment.mediaType, 'text/csv');
    assert.equal(ok.json.attachment.size, Buffer.byteLength(csv));
    const late = Buffer.concat([Buffer.from(`k,value\n${'1,2\n'.repeat(40_000)}`), Buffer.from([0x00, 0x01]), Buffer.from('3,4\n')]);
    const bad = await author.upload(`/api/worksheets/${e.worksheetId}/attachments`, 'late.csv', late);
    assert.equal(bad.status, 415, 'a binary byte after 160 kB is still found');
    const cut = Buffer.concat([Buffer.from(`k,value\n${'1,2\n'.repeat(40_000)}`), Buffer.from([0xe2, 0x82])]);
    assert.equal((await author.upload(`/api/worksheets/${e.worksheetId}/attachments`, 'cut.csv', cut)).status, 415, 'a cut UTF-8 sequence at the end');
  });
});

/** The server as its own process, in its own process group, so its memory can be read. */
async function startOwnServer(databaseUrl: string): Promise<{ child: ChildProcess; url: string; stop: () => Promise<void> }> {
  const port = 20000 + Math.floor(Math.random() * 20000);
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
    env: { ...process.env, DATABASE_URL: databaseUrl, PORT: String(port), SHEETWISE_SEED_DEMO: '1', LOG_LEVEL: 'silent', EVALUATION_WORKERS: '1', ATTACHMENT_QUOTA_MB: '2000' },
    stdio: ['ignore', 'ignore', 'inherit', 'ipc'],
    detached: true,
  });
  await new Promise<void>((resolve, reject) => {
    child.on('message', (m: { type?: string }) => m?.type === 'ready' && resolve());
    child.once('exit', (code) => reject(new Error(`the server exited with ${code} before it was ready`)));
  });
  return {
    child,
    url: `http://127.0.0.1:${port}`,
    stop: () =>
      new Promise((done) => {
        if (child.exitCode !== null || child.signalCode !== null) return done();
        const timer = setTimeout(() => process.kill(-child.pid!, 'SIGKILL'), 10_000);
        child.once('exit', () => {
          clearTimeout(timer);
          done();
        });
        process.kill(-child.pid!, 'SIGTERM');
      }),
  };
}

/** Resident and peak resident memory of a process, in bytes. */
function memoryOf(pid: number): { rss: number; peak: number } {
  const status = readFileSync(`/proc/${pid}/status`, 'utf8');
  const kb = (key: string) => Number(new RegExp(`^${key}:\\s+(\\d+) kB`, 'm').exec(status)![1]) * 1024;
  return { rss: kb('VmRSS'), peak: kb('VmHWM') };
}

describe('memory', () => {
  test('12 concurrent uploads of 8 MB do not grow the server by their size', async (t) => {
    const db = await createTestDatabase('upmem');
    const own = await startOwnServer(db.url);
    try {
      const client = new ApiClient(own.url);
      await client.login(DEMO.author);
      const groupId = (await client.get('/api/groups')).json.groups[0].id;
      const sheet = await client.post(`/api/groups/${groupId}/worksheets`, { title: 'Memory', source: 'note "m"' });
      const path = `/api/worksheets/${sheet.json.worksheet.id}/attachments`;
      // Warm up: every module an upload uses is loaded before the baseline.
      assert.equal((await client.upload(path, 'warm.pdf', pdf(1 * MB))).status, 201);
      const baseline = memoryOf(own.child.pid!);
      const size = 8 * MB;
      const body = pdf(size, 5);
      const results = await Promise.all(Array.from({ length: 12 }, (_, k) => client.upload(path, `big${k}.pdf`, body)));
      assert.deepEqual(results.map((r) => r.status), Array(12).fill(201), results.map((r) => r.text).join('\n'));
      const afterUploads = memoryOf(own.child.pid!);
      const growth = afterUploads.peak - baseline.rss;
      t.diagnostic(`server RSS ${(baseline.rss / MB).toFixed(0)} MB before, peak ${(afterUploads.peak / MB).toFixed(0)} MB during 96 MB of uploads`);
      // Held in memory, 96 MB of uploads grew the server by more than their size; streamed,
      // the peak grows by buffers and chunks in flight only.
      assert.ok(growth < 48 * MB, `peak RSS grew by ${(growth / MB).toFixed(1)} MB for ${(12 * size) / MB} MB uploaded`);
    } finally {
      await own.stop();
      await db.drop();
    }
  });
});
