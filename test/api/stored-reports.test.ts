// The stored report of a worksheet's latest version: GET serves it without evaluating and
// says whether this engine made it; POST evaluates (streamed on request) and stores it.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import pg from 'pg';
import { LIMITS } from '../../shared/api.js';
import { storedReportResponse } from '../../shared/report-api.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let author: ApiClient;
let admin: ApiClient;
let groupId: number;

before(async () => {
  server = await startTestServer();
  author = new ApiClient(server.url);
  await author.login(DEMO.author);
  admin = new ApiClient(server.url);
  await admin.login(DEMO.admin);
  groupId = (await author.get('/api/groups')).json.groups[0].id;
});
after(async () => server?.stop());

const evaluations = async () => (await admin.get('/api/admin/metrics')).json.evaluationWorkers.evaluations as number;

async function newSheet(source: string): Promise<number> {
  const res = await author.post(`/api/groups/${groupId}/worksheets`, { title: 'Stored', source });
  assert.equal(res.status, 201, res.text);
  return res.json.worksheet.id;
}

async function sql(text: string, bind: unknown[]) {
  const client = new pg.Client({ connectionString: server.databaseUrl });
  await client.connect();
  try {
    await client.query(text, bind);
  } finally {
    await client.end();
  }
}

test('GET before any evaluation: no report, not current, and nothing evaluated', async () => {
  const id = await newSheet('param k : positive\nnote "one"');
  const before = await evaluations();
  const res = await author.get(`/api/worksheets/${id}/report`);
  assert.equal(res.status, 200, res.text);
  const body = storedReportResponse.parse(res.json);
  assert.equal(body.version, 1);
  assert.equal(body.current, false);
  assert.equal(body.report, null);
  assert.ok(body.engine.length > 0);
  assert.equal(await evaluations(), before);
});

test('POST evaluates and stores; GET then serves the stored report without evaluating', async () => {
  const id = await newSheet('param k : positive\nnote "one"');
  const before = await evaluations();
  const posted = await author.post(`/api/worksheets/${id}/report`, {});
  assert.equal(posted.status, 200, posted.text);
  const made = storedReportResponse.parse(posted.json);
  assert.equal(made.current, true);
  assert.equal(made.report!.engine, made.engine);
  assert.equal(made.report!.statements.length, 2);
  assert.equal(await evaluations(), before + 1);

  const got = storedReportResponse.parse((await author.get(`/api/worksheets/${id}/report`)).json);
  assert.deepEqual(got, made);
  assert.equal(await evaluations(), before + 1, 'the stored report was served, not computed again');

  // A new version has no report of its own yet.
  assert.equal((await author.put(`/api/worksheets/${id}`, { source: 'param k : real', baseVersion: 1 })).status, 200);
  const next = storedReportResponse.parse((await author.get(`/api/worksheets/${id}/report`)).json);
  assert.deepEqual([next.version, next.current, next.report], [2, false, null]);
});

test('a report stored by another engine comes back with current false; POST replaces it', async () => {
  const id = await newSheet('param k : positive');
  assert.equal((await author.post(`/api/worksheets/${id}/report`, {})).status, 200);
  await sql(`UPDATE evaluations SET report = jsonb_set(report, '{engine}', '"an-older-engine"') WHERE worksheet_id = $1`, [id]);
  const old = storedReportResponse.parse((await author.get(`/api/worksheets/${id}/report`)).json);
  assert.equal(old.current, false);
  assert.equal(old.report!.engine, 'an-older-engine');
  const again = storedReportResponse.parse((await author.post(`/api/worksheets/${id}/report`, {})).json);
  assert.equal(again.current, true);
  const stored = storedReportResponse.parse((await author.get(`/api/worksheets/${id}/report`)).json);
  assert.equal(stored.current, true);
  assert.equal(stored.report!.engine, stored.engine);
});

test('POST streams progress events and then the report, and stores it', async () => {
  const id = await newSheet('note "one"\nnote "two"');
  const res = await author.request('POST', `/api/worksheets/${id}/report`, {}, { headers: { accept: 'text/event-stream' } });
  assert.equal(res.status, 200);
  assert.match(res.headers.get('content-type') ?? '', /^text\/event-stream/);
  const events = [...res.text.matchAll(/^event: (\w+)$/gm)].map((m) => m[1]);
  assert.deepEqual(events, ['progress', 'progress', 'report']);
  assert.match(res.text, /"total":2/);
  const stored = storedReportResponse.parse((await author.get(`/api/worksheets/${id}/report`)).json);
  assert.equal(stored.current, true);
  assert.equal(stored.report!.statements.length, 2);
});

test('POST needs the XSRF header', async () => {
  const id = await newSheet('note "one"');
  const res = await author.request('POST', `/api/worksheets/${id}/report`, {}, { csrf: false });
  assert.equal(res.status, 403, res.text);
});

test(`a symbolic integral over 9 variables is refused, naming the limit ${LIMITS.symbolicVariables}`, async () => {
  assert.equal(LIMITS.symbolicVariables, 8);
  const vars = ['x1', 'x2', 'x3', 'x4', 'x5', 'x6', 'x7', 'x8', 'x9'];
  const source = `param a, k : positive\nintegral Z = exp(-k*(${vars.map((v) => `${v}^2`).join(' + ')})) d(${vars.join(', ')})`;
  for (const res of [await author.post('/api/evaluate', { source }), await author.post(`/api/worksheets/${await newSheet(source)}/report`, {})]) {
    assert.equal(res.status, 422, res.text);
    assert.equal(res.json.error.code, 'too_many_variables');
    assert.match(res.json.error.message, /integrates over 9 variables; the limit is 8 for an integral with symbolic params/);
  }
  // Eight variables are within the limit; the same nine with numbers only too.
  const numeric = `integral Z = exp(-(${vars.map((v) => `${v}^2`).join(' + ')})) d(${vars.join(', ')})`;
  assert.notEqual((await author.post('/api/evaluate', { source: numeric })).status, 422);
});
