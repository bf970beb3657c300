// The referee page's PDF (issue 14): the standalone LaTeX record of the link's version,
// compiled by pdflatex on the server in a folder and process group of its own; review
// states without reviewers' names; a withdrawn link gets nothing; a missing pdflatex is a
// clear 503; a pdflatex over its time limit is killed with everything it started.
import assert from 'node:assert/strict';
import { spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { after, before, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { ensureTex } from '../support/tex.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let author: ApiClient;
let groupId: number;
const scratch = mkdtempSync(join(tmpdir(), 'sheetwise-referee-pdf-'));

before(async () => {
  ensureTex();
  server = await startTestServer();
  author = new ApiClient(server.url);
  await author.login(DEMO.author);
  groupId = (await author.get('/api/groups')).json.groups[0].id;
});
after(async () => {
  delete process.env['PDFLATEX'];
  delete process.env['PDF_TIME_LIMIT_MS'];
  rmSync(scratch, { recursive: true, force: true });
  await server?.stop();
});

const pdfTempFolders = () => readdirSync(tmpdir()).filter((f) => f.startsWith('sheetwise-pdf-'));

async function refereeLink(title: string, source: string): Promise<{ token: string; worksheetId: number }> {
  const created = await author.post(`/api/groups/${groupId}/worksheets`, { title, source });
  const id = created.json.worksheet.id;
  const link = await author.post(`/api/worksheets/${id}/referee-links`, { days: 7 });
  assert.equal(link.status, 201, link.text);
  return { token: link.json.link.url.split('/referee/')[1], worksheetId: id };
}

const getPdf = (token: string) => fetch(`${server.url}/api/referee/${token}/pdf`);

test('the referee downloads the record as a PDF: title, equations, remarks; reviewers not named', async () => {
  const source = 'param k : positive\nintegral Zref = exp(-k*x^2/2) d(x)\nnote "A note for the referee."\n';
  const { token, worksheetId } = await refereeLink('Refereed record', source);
  const members = (await author.get(`/api/groups/${groupId}/members`)).json.members as { userId: number; email: string; displayName: string }[];
  const reviewer = members.find((m) => m.email === DEMO.reviewer)!;
  assert.equal((await author.post(`/api/worksheets/${worksheetId}/reviews`, { statementKey: 'Zref', reviewerIds: [reviewer.userId] })).status, 201);
  const before = pdfTempFolders().length;

  const res = await getPdf(token);
  assert.equal(res.status, 200, await res.clone().text());
  assert.equal(res.headers.get('content-type'), 'application/pdf');
  assert.match(res.headers.get('content-disposition') ?? '', /attachment; filename="Refereed-record-v1\.pdf"/);
  const pdf = Buffer.from(await res.arrayBuffer());
  assert.equal(pdf.subarray(0, 5).toString('latin1'), '%PDF-');
  writeFileSync(join(scratch, 'r.pdf'), pdf);
  const text = spawnSync('pdftotext', ['-enc', 'UTF-8', join(scratch, 'r.pdf'), '-'], { encoding: 'utf8' }).stdout.replace(/\s+/g, ' ');
  assert.ok(text.includes('Refereed record'), text);
  assert.ok(text.includes('Remarks (line 2)'), 'the results part');
  assert.ok(text.includes('The record'), 'and the record');
  assert.ok(text.includes('review requested of 1 reviewer on'), text);
  assert.ok(!text.includes(reviewer.displayName), 'no reviewer is named to a referee');
  assert.equal(text.split('A note for the referee.').length - 1, 1, 'the note once');
  assert.equal(pdfTempFolders().length, before, 'the temporary folder is removed');
});

test('a withdrawn or unknown link gets no PDF', async () => {
  const { token, worksheetId } = await refereeLink('Withdrawn', 'param k : positive\n');
  const links = (await author.get(`/api/worksheets/${worksheetId}/referee-links`)).json.links;
  assert.equal((await author.delete(`/api/worksheets/${worksheetId}/referee-links/${links[0].id}`)).status, 204);
  assert.equal((await getPdf(token)).status, 410);
  assert.equal((await getPdf('not-a-token')).status, 404);
});

test('no pdflatex on the server: 503 with what to do instead', async () => {
  const { token } = await refereeLink('No TeX here', 'param k : positive\n');
  process.env['PDFLATEX'] = join(scratch, 'no-such-pdflatex');
  try {
    const res = await getPdf(token);
    assert.equal(res.status, 503);
    const body = (await res.json()) as { error: { code: string; message: string } };
    assert.equal(body.error.code, 'pdf_unavailable');
    assert.match(body.error.message, /pdflatex is not installed/);
    assert.match(body.error.message, /Download the LaTeX file/);
  } finally {
    delete process.env['PDFLATEX'];
  }
});

test('a pdflatex over its time limit is killed with its whole process group', async () => {
  const { token } = await refereeLink('Slow TeX', 'param k : positive\n');
  const pidFile = join(scratch, 'child.pid');
  const fake = join(scratch, 'slow-pdflatex');
  // Starts a grandchild that would outlive a kill of the direct child alone.
  writeFileSync(fake, `#!/bin/sh\nsleep 300 &\necho $! > ${pidFile}\nwait\n`);
  chmodSync(fake, 0o755);
  process.env['PDFLATEX'] = fake;
  process.env['PDF_TIME_LIMIT_MS'] = '1500';
  try {
    const res = await getPdf(token);
    assert.equal(res.status, 504);
    assert.equal(((await res.json()) as { error: { code: string } }).error.code, 'pdf_timeout');
    assert.ok(existsSync(pidFile));
    const pid = Number(readFileSync(pidFile, 'utf8'));
    let alive = true;
    for (let i = 0; i < 20 && alive; i++) {
      // Gone, or a zombie waiting for whoever adopted it to reap it.
      const status = existsSync(`/proc/${pid}/status`) ? readFileSync(`/proc/${pid}/status`, 'utf8') : '';
      alive = status !== '' && !/^State:\s+Z/m.test(status);
      if (alive) await new Promise((r) => setTimeout(r, 100));
    }
    assert.equal(alive, false, 'the grandchild died with the group');
  } finally {
    delete process.env['PDFLATEX'];
    delete process.env['PDF_TIME_LIMIT_MS'];
  }
});
