// Uploads (limits, types read from content, nothing half-stored), exports (.swk, JSON,
// LaTeX), referee links (one frozen version, nothing else; revocable; expiring) and the
// group's activity list.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { texSource } from '../../server/exports/latex.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let author: ApiClient;
let reader: ApiClient;
let groupId: number;
let worksheetId: number;

const SOURCE = 'param k : positive\nintegral Zk = exp(-k*q^2/2) d(q)\nexpect Zk = sqrt(2*pi/k)\n';
const PNG = Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 73, 72, 68, 82]);

before(async () => {
  server = await startTestServer();
  author = new ApiClient(server.url);
  reader = new ApiClient(server.url);
  await author.login(DEMO.author);
  await reader.login(DEMO.reader);
  groupId = (await author.get('/api/groups')).json.groups[0].id;
});
after(async () => server?.stop());

async function countRows(table: string) {
  const [rows] = await server.running.sequelize.query(`SELECT count(*)::int AS n FROM ${table}`);
  return (rows as { n: number }[])[0]!.n;
}

describe('import', () => {
  test('a .swk file is parsed and shown before it is saved', async () => {
    const before = await countRows('worksheets');
    const preview = await author.upload(`/api/groups/${groupId}/imports`, 'one-mode.swk', SOURCE);
    assert.equal(preview.status, 200, preview.text);
    assert.equal(preview.json.preview.title, 'one-mode');
    assert.equal(preview.json.preview.report.statements[1].result.text.length > 0, true);
    assert.equal(await countRows('worksheets'), before, 'a preview stores nothing');
    const saved = await author.upload(`/api/groups/${groupId}/imports?save=1`, 'one-mode.swk', SOURCE, { title: 'One mode, imported' });
    assert.equal(saved.status, 201, saved.text);
    worksheetId = saved.json.worksheet.id;
    assert.equal((await author.get(`/api/worksheets/${worksheetId}`)).json.worksheet.source, SOURCE);
  });

  test('limits and checks: too large 413, not UTF-8 415, wrong name 415, readers 403', async () => {
    const big = await author.upload(`/api/groups/${groupId}/imports`, 'big.swk', '#'.repeat(1024 * 1024 + 10));
    assert.equal(big.status, 413);
    assert.match(big.json.error.message, /larger than 1 MB/);
    const binary = await author.upload(`/api/groups/${groupId}/imports`, 'bad.swk', Uint8Array.from([0xff, 0xfe, 0x00, 0x41]));
    assert.equal(binary.status, 415);
    assert.match(binary.json.error.message, /not UTF-8 text/);
    assert.equal((await author.upload(`/api/groups/${groupId}/imports`, 'notes.txt', SOURCE)).status, 415);
    assert.equal((await reader.upload(`/api/groups/${groupId}/imports`, 'x.swk', SOURCE)).status, 403);
  });
});

describe('attachments', () => {
  test('types are read from the content; the wrong type gets 415 and nothing is stored', async () => {
    const before = await countRows('attachments');
    const fakePdf = await author.upload(`/api/worksheets/${worksheetId}/attachments`, 'paper.pdf', 'just text, not a PDF');
    assert.equal(fakePdf.status, 415);
    assert.match(fakePdf.json.error.message, /read from the content/);
    const disguised = await author.upload(`/api/worksheets/${worksheetId}/attachments`, 'figure.csv', PNG);
    assert.equal(disguised.status, 201, 'a PNG named .csv is stored as the PNG it is');
    assert.equal(disguised.json.attachment.mediaType, 'image/png');
    assert.equal(await countRows('attachments'), before + 1);

    for (const [name, body, type] of [
      ['notes.tex', '\\section{Check} done', 'application/x-tex'],
      ['table.csv', 'k,value\n1,6.28\n', 'text/csv'],
      ['plot.svg', '<?xml version="1.0"?><svg xmlns="http://www.w3.org/2000/svg"></svg>', 'image/svg+xml'],
      ['paper.pdf', '%PDF-1.4\n%%EOF', 'application/pdf'],
    ] as const) {
      const res = await author.upload(`/api/worksheets/${worksheetId}/attachments`, name, body);
      assert.equal(res.status, 201, `${name}: ${res.text}`);
      assert.equal(res.json.attachment.mediaType, type);
    }
    const tooBig = await author.upload(`/api/worksheets/${worksheetId}/attachments`, 'huge.pdf', '%PDF-' + 'x'.repeat(10 * 1024 * 1024));
    assert.equal(tooBig.status, 413);
    assert.equal(await countRows('attachments'), before + 5, 'nothing half-stored');
  });

  test('listed with size and uploader; downloaded by members only', async () => {
    const list = await reader.get(`/api/worksheets/${worksheetId}/attachments`);
    assert.equal(list.status, 200);
    const csv = list.json.attachments.find((a: { fileName: string }) => a.fileName === 'table.csv');
    assert.equal(csv.size, 'k,value\n1,6.28\n'.length);
    assert.equal(csv.uploadedBy, 'Tobiah Osei');
    const file = await reader.get(`/api/worksheets/${worksheetId}/attachments/${csv.id}`);
    assert.equal(file.text, 'k,value\n1,6.28\n');
    assert.match(file.headers.get('content-disposition') ?? '', /attachment/);
    const outsider = new ApiClient(server.url);
    await outsider.post('/api/auth/register', { email: 'stranger@files.test', displayName: 'Stranger', password: 'stranger-password' });
    assert.equal((await outsider.get(`/api/worksheets/${worksheetId}/attachments/${csv.id}`)).status, 404);
    assert.equal((await reader.upload(`/api/worksheets/${worksheetId}/attachments`, 'r.csv', 'a,b\n')).status, 403);
  });
});

describe('exports', () => {
  test('.swk, JSON record and a standalone LaTeX appendix', async () => {
    const swk = await reader.get(`/api/worksheets/${worksheetId}/export?format=swk`);
    assert.equal(swk.text, SOURCE);
    const json = await reader.get(`/api/worksheets/${worksheetId}/export?format=json`);
    assert.equal(json.json.worksheet.version, 1);
    assert.equal(json.json.report.statements.length, 3);
    assert.equal(json.json.reviews.find((r: { key: string }) => r.key === 'Zk').status, 'unreviewed');
    const tex = await reader.get(`/api/worksheets/${worksheetId}/export?format=latex`);
    assert.match(tex.text, /^\\documentclass\{article\}\n\\usepackage\{amsmath\}\n\\usepackage\{amssymb\}\n\\begin\{document\}/);
    // The source is typewriter text with every mark escaped (test/api/export-latex-escaping.test.ts compiles it).
    assert.ok(tex.text.includes(texSource('integral Zk = exp(-k*q^2/2) d(q)').split('\n')[1]!));
    assert.match(tex.text, /\\begin\{enumerate\}/);
    assert.match(tex.text, /Review: not reviewed/);
    assert.match(tex.text, /\\end\{document\}\n$/);
    assert.equal((await reader.get(`/api/worksheets/${worksheetId}/export?format=docx`)).status, 400);
  });
});

describe('referee links', () => {
  test('shows exactly one frozen version and nothing else; revocable; expiring', async () => {
    const made = await author.post(`/api/worksheets/${worksheetId}/referee-links`, { days: 30 });
    assert.equal(made.status, 201, made.text);
    const token = /\/referee\/([A-Za-z0-9_-]{40,})$/.exec(made.json.link.url)![1]!;
    // A later save does not change what the referee sees.
    await author.put(`/api/worksheets/${worksheetId}`, { source: SOURCE + 'note "after the link"\n', baseVersion: 1 });
    const anon = new ApiClient(server.url);
    const view = await anon.get(`/api/referee/${token}`);
    assert.equal(view.status, 200);
    assert.deepEqual(Object.keys(view.json).sort(), ['expiresAt', 'report', 'worksheet']);
    assert.deepEqual(Object.keys(view.json.worksheet).sort(), ['savedAt', 'source', 'title', 'version']);
    assert.equal(view.json.worksheet.version, 1);
    assert.equal(view.json.worksheet.source, SOURCE);
    assert.equal((await anon.get(`/api/worksheets/${worksheetId}`)).status, 401, 'the link opens nothing else');

    const [stored] = await server.running.sequelize.query('SELECT token_hash FROM referee_links');
    assert.notEqual((stored as { token_hash: string }[])[0]!.token_hash, token, 'the token is stored hashed');

    assert.equal((await author.post(`/api/worksheets/${worksheetId}/referee-links`, { days: 91 })).status, 400);
    assert.equal((await reader.post(`/api/worksheets/${worksheetId}/referee-links`, { days: 5 })).status, 403);

    await author.delete(`/api/worksheets/${worksheetId}/referee-links/${made.json.link.id}`);
    assert.equal((await anon.get(`/api/referee/${token}`)).status, 410);

    const second = await author.post(`/api/worksheets/${worksheetId}/referee-links`, { days: 1, version: 1 });
    const token2 = /\/referee\/(.+)$/.exec(second.json.link.url)![1]!;
    await server.running.sequelize.query(`UPDATE referee_links SET expires_at = now() - interval '1 second' WHERE id = ${second.json.link.id}`);
    const expired = await anon.get(`/api/referee/${token2}`);
    assert.equal(expired.status, 410);
    assert.match(expired.json.error.message, /expired/);
    assert.equal((await anon.get('/api/referee/not-a-real-token')).status, 404);
  });
});

describe('activity', () => {
  test('members see who did what; outsiders do not', async () => {
    const list = await reader.get(`/api/groups/${groupId}/activity`);
    assert.equal(list.status, 200);
    const actions = list.json.activity.map((a: { action: string }) => a.action);
    for (const a of ['imported worksheet', 'attached file', 'created referee link', 'revoked referee link', 'saved worksheet']) {
      assert.ok(actions.includes(a), `activity has "${a}"`);
    }
    // an export is a GET: it leaves no line (a cross-site link cannot flood the feed)
    assert.ok(!actions.includes('exported'), 'exports leave no activity line');
    assert.equal(list.json.activity[0].who.length > 0, true);
  });
});
