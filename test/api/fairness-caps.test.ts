// Fair evaluation (issue 15, findings 1, 2 and 13): a cap per account and per referee
// link on running and queued evaluations, counted in PostgreSQL (429 with Retry-After
// beyond it); one person's long evaluations do not hold another's small one; every
// route that evaluates stops the work when its caller goes away (referee page and
// exports included); GETs write nothing (exports and the referee page use the stored
// report, or compute one for that request only).
//
// No timing is asserted. The slow worksheet would run for minutes if nothing stopped it
// (100 high-precision verify lines, each using its 3.5 s numeric budget), so a test that
// depends on cancellation or fair turns would hang to its timeout instead of passing.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { EvaluationCancelled } from '../../server/evaluation/pool.js';
import { errorHandler } from '../../server/middleware/error-handler.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

const SLOW = [
  'param k : positive',
  'param g : real',
  'integral Z3 = exp(-(k*x^2 + k*y^2 + k*z^2 + 2*i*g*x*y + 2*i*g*y*z)/2) d(x, y, z)',
  ...Array.from({ length: 100 }, () => 'verify Z3 at k = 1.3, g = 0.4 with tolerance 1e-15'),
].join('\n');
const SMALL = 'param a : positive\nintegral W = exp(-a*x^2/2) d(x)';

let server: TestServer;
let author: ApiClient;
let editor: ApiClient;
let reader: ApiClient;
let admin: ApiClient;
let groupId: number;
let authorId: number;
const saved: Record<string, string | undefined> = {};
const ENV = {
  EVALUATION_CAP_PER_USER: '2',
  EVALUATION_CAP_PER_REFEREE_LINK: '1',
  EVALUATION_EXTRA_WORKERS: '1',
  EVALUATION_BUDGET_MS: '600000',
};

before(async () => {
  // the pool reads its fairness settings from the process environment
  for (const [k, v] of Object.entries(ENV)) {
    saved[k] = process.env[k];
    process.env[k] = v;
  }
  server = await startTestServer({ EVALUATION_WORKERS: '1' });
  author = new ApiClient(server.url);
  editor = new ApiClient(server.url);
  reader = new ApiClient(server.url);
  admin = new ApiClient(server.url);
  await author.login(DEMO.author);
  await editor.login(DEMO.owner);
  await reader.login(DEMO.reader);
  await admin.login(DEMO.admin);
  groupId = (await author.get('/api/groups')).json.groups[0].id;
  authorId = (await rows<{ id: number }>(`SELECT id FROM users WHERE email = '${DEMO.author}'`))[0]!.id;
});
after(async () => {
  await server?.stop();
  for (const [k, v] of Object.entries(saved)) {
    if (v === undefined) delete process.env[k];
    else process.env[k] = v;
  }
});

async function rows<T>(sql: string): Promise<T[]> {
  const [r] = await server.running.sequelize.query(sql);
  return r as T[];
}
const count = async (sql: string) => (await rows<{ n: number }>(sql))[0]!.n;
const slots = (owner: string) => count(`SELECT count(*)::int AS n FROM evaluation_slots WHERE owner LIKE '${owner}'`);
const evaluations = async () => (await admin.get('/api/admin/metrics')).json.evaluationWorkers.evaluations as number;

/** Polls until the condition holds (the test's own timeout bounds it). */
async function until(what: string, check: () => Promise<boolean>): Promise<void> {
  for (;;) {
    if (await check()) return;
    await new Promise((r) => setTimeout(r, 50));
  }
}

async function newSheet(title: string, source: string): Promise<number> {
  const res = await author.post(`/api/groups/${groupId}/worksheets`, { title, source });
  assert.equal(res.status, 201, res.text);
  return res.json.worksheet.id;
}

async function refereeToken(worksheetId: number): Promise<string> {
  const made = await author.post(`/api/worksheets/${worksheetId}/referee-links`, { days: 5 });
  assert.equal(made.status, 201, made.text);
  return /\/referee\/(.+)$/.exec(made.json.link.url)![1]!;
}

/** A GET that the test abandons: started now, aborted later; its rejection is expected. */
function abandonedGet(path: string): AbortController {
  const aborter = new AbortController();
  fetch(server.url + path, { signal: aborter.signal }).catch(() => undefined);
  return aborter;
}

test('beyond the per-account cap: 429 with Retry-After; another account is served meanwhile; freed slots count again', { timeout: 120_000 }, async () => {
  const owner = `user:${authorId}`;
  const flood = [new AbortController(), new AbortController()];
  for (const a of flood) author.stream('/api/evaluate', { source: SLOW }, a.signal).catch(() => undefined);
  await until('two slots taken', async () => (await slots(owner)) === 2);

  const third = await author.post('/api/evaluate', { source: 'note "one more"' });
  assert.equal(third.status, 429, third.text);
  assert.equal(third.json.error.code, 'too_many_evaluations');
  assert.match(third.json.error.message, /You have 2 evaluations running or waiting/);
  const retryAfter = Number(third.headers.get('retry-after'));
  assert.ok(Number.isInteger(retryAfter) && retryAfter >= 1 && retryAfter <= 10, `Retry-After ${third.headers.get('retry-after')}`);
  assert.equal(await slots(owner), 2, 'a refused request takes no slot');

  // Another account's small evaluation is not queued behind the flood (it would wait minutes).
  const other = await editor.post('/api/evaluate', { source: SMALL });
  assert.equal(other.status, 200, other.text);
  assert.equal(other.json.statements[1].status, 'ok');

  for (const a of flood) a.abort();
  await until('slots released', async () => (await slots(owner)) === 0);
  const again = await author.post('/api/evaluate', { source: SMALL });
  assert.equal(again.status, 200, again.text);
});

test('the cap is shared by server processes: slots another process holds count, expired ones do not', async () => {
  const owner = `user:${authorId}`;
  await rows(`INSERT INTO evaluation_slots (owner, expires_at) VALUES ('${owner}', now() + interval '1 minute'), ('${owner}', now() + interval '1 minute')`);
  const refused = await author.post('/api/evaluate', { source: SMALL });
  assert.equal(refused.status, 429, refused.text);
  assert.ok(refused.headers.get('retry-after'));
  // the other process died: its slots are no longer renewed and run out
  await rows(`UPDATE evaluation_slots SET expires_at = now() - interval '1 second' WHERE owner = '${owner}'`);
  const served = await author.post('/api/evaluate', { source: SMALL });
  assert.equal(served.status, 200, served.text);
  assert.equal(await slots(owner), 0, 'expired slots are cleared, the new one released');
});

test('four abandoned referee requests stop their work and free their slots; small evaluations go on', { timeout: 120_000 }, async () => {
  const sheets = await Promise.all([1, 2, 3, 4].map((n) => newSheet(`Slow ${n}`, SLOW)));
  const tokens = await Promise.all(sheets.map(refereeToken));
  const stored = await count('SELECT count(*)::int AS n FROM evaluations');
  const activity = await count('SELECT count(*)::int AS n FROM activity');

  const abandoned = tokens.map((t) => abandonedGet(`/api/referee/${t}`));
  await until('four referee slots taken', async () => (await slots('referee:%')) === 4);
  // the link's cap (1 here): a second request on the same link while the first runs
  const second = await new ApiClient(server.url).get(`/api/referee/${tokens[0]}`);
  assert.equal(second.status, 429, second.text);
  assert.match(second.json.error.message, /This referee link has 1 evaluations running or waiting/);
  assert.ok(Number(second.headers.get('retry-after')) >= 1);

  for (const a of abandoned) a.abort();
  await until('referee slots released', async () => (await slots('referee:%')) === 0);
  // Had the abandoned evaluations kept running (minutes each), both workers would be
  // busy and these two would wait for them.
  const [mine, theirs] = await Promise.all([editor.post('/api/evaluate', { source: SMALL }), reader.post('/api/evaluate', { source: SMALL })]);
  assert.equal(mine.status, 200, mine.text);
  assert.equal(theirs.status, 200, theirs.text);

  assert.equal(await count('SELECT count(*)::int AS n FROM evaluations'), stored, 'a referee GET stores no report');
  assert.equal(await count('SELECT count(*)::int AS n FROM activity'), activity, 'a referee GET writes no activity');
});

test('an export GET writes nothing: no activity line, no stored report; it uses a stored report when there is one', async () => {
  const id = await newSheet('Exported', SMALL);
  const stored = await count('SELECT count(*)::int AS n FROM evaluations');
  const activity = await count('SELECT count(*)::int AS n FROM activity');
  const before = await evaluations();
  for (const format of ['swk', 'json', 'latex']) {
    const res = await reader.get(`/api/worksheets/${id}/export?format=${format}`);
    assert.equal(res.status, 200, res.text);
  }
  const json = await reader.get(`/api/worksheets/${id}/export?format=json`);
  assert.equal(json.json.report.statements[1].status, 'ok', 'computed for the request when none is stored');
  assert.equal(await count('SELECT count(*)::int AS n FROM evaluations'), stored, 'no report stored by a GET');
  assert.equal(await count('SELECT count(*)::int AS n FROM activity'), activity, 'no activity line by a GET');
  assert.equal(await evaluations(), before + 3, 'JSON and LaTeX computed (the .swk needs no report)');

  // once a report is stored (POST), exports read it and evaluate nothing
  assert.equal((await author.post(`/api/worksheets/${id}/report`, {})).status, 200);
  const afterStore = await evaluations();
  assert.equal((await reader.get(`/api/worksheets/${id}/export?format=json`)).status, 200);
  assert.equal((await reader.get(`/api/worksheets/${id}/export?format=latex`)).status, 200);
  assert.equal(await evaluations(), afterStore);
});

test('an abandoned export stops its evaluation and frees its slot', { timeout: 120_000 }, async () => {
  const id = await newSheet('Slow export', SLOW);
  const owner = `user:${authorId}`;
  const cookie = [...author.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  const aborter = new AbortController();
  fetch(`${server.url}/api/worksheets/${id}/export?format=json`, { headers: { cookie }, signal: aborter.signal }).catch(() => undefined);
  await until('export slot taken', async () => (await slots(owner)) === 1);
  aborter.abort();
  await until('export slot released', async () => (await slots(owner)) === 0);
  // the worker is free for the next evaluation of the same account (one runs at a time per account)
  const next = await author.post('/api/evaluate', { source: SMALL });
  assert.equal(next.status, 200, next.text);
});

test('an abandoned, non-streamed report POST is not an error: the cancellation is logged at debug level', { timeout: 120_000 }, async () => {
  const id = await newSheet('Left', SLOW);
  const owner = `user:${authorId}`;
  const cookie = [...author.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
  const xsrf = decodeURIComponent(author.cookies.get('XSRF-TOKEN')!);
  const aborter = new AbortController();
  fetch(`${server.url}/api/worksheets/${id}/report`, { method: 'POST', headers: { cookie, 'x-xsrf-token': xsrf, 'content-type': 'application/json' }, body: '{}', signal: aborter.signal }).catch(() => undefined);
  await until('slot taken', async () => (await slots(owner)) === 1);
  aborter.abort();
  await until('slot released', async () => (await slots(owner)) === 0);
  assert.equal(await count(`SELECT count(*)::int AS n FROM evaluations WHERE worksheet_id = ${id}`), 0, 'nothing stored for a cancelled evaluation');

  // and should an EvaluationCancelled reach the error handler, it is debug, not error
  const logged: string[] = [];
  const logger = { debug: () => logged.push('debug'), error: () => logged.push('error'), warn: () => logged.push('warn') };
  let ended = false;
  const res = { headersSent: false, writableEnded: false, end: () => (ended = true), status: () => assert.fail('no answer to a caller who left') };
  errorHandler(logger as never)(new EvaluationCancelled(), { originalUrl: '/x' } as never, res as never, () => undefined);
  assert.deepEqual(logged, ['debug']);
  assert.ok(ended);
});
