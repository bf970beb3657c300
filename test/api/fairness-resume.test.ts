// Evaluation that no worksheet can stall (issue 15, findings 1, 2 and 14): a statement
// stopped at its limit is stopped inside the worker, which goes on with the next one
// (no statement starts twice, counted by the streamed progress events); a worksheet has
// a total time budget; the worker reads the worksheet (limits found there still answer
// 422, streamed or not); a report is capped in size with a message in the record.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { LIMITS } from '../../shared/api.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

const ENV = {
  EVALUATION_BUDGET_MS: '4000',
  REPORT_STATEMENT_BYTES: '65536',
  REPORT_BYTES: '200000',
};
const saved: Record<string, string | undefined> = {};
let server: TestServer;
let author: ApiClient;

before(async () => {
  for (const [k, v] of Object.entries(ENV)) {
    saved[k] = process.env[k];
    process.env[k] = v;
  }
  // verify's quadrature keeps its own 3.5 s budget and never checks the statement's
  // deadline: with a 1 s limit, only a hard stop ends it.
  server = await startTestServer({ STATEMENT_TIME_LIMIT_MS: '1000' });
  author = new ApiClient(server.url);
  await author.login(DEMO.author);
});
after(async () => {
  await server?.stop();
  for (const [k, v] of Object.entries(saved)) {
    if (v === undefined) delete process.env[k];
    else process.env[k] = v;
  }
});

const Z3 = 'integral Z3 = exp(-(k*x^2 + k*y^2 + k*z^2 + 2*i*g*x*y + 2*i*g*y*z)/2) d(x, y, z)';
const VERIFY = 'verify Z3 at k = 1.3, g = 0.4 with tolerance 1e-15';

function chainIntegral(name: string, n: number): string {
  const vars = Array.from({ length: n }, (_, j) => `x${j + 1}`);
  const terms = [...vars.map((v) => `3*${v}^2`), ...vars.slice(1).map((v, j) => `${vars[j]}*${v}`)];
  return `integral ${name} = exp(-(${terms.join(' + ')})) d(${vars.join(', ')})`;
}

/** A streamed evaluation: its events in order, with their data. */
async function streamed(source: string): Promise<{ event: string; data: any }[]> {
  const res = await author.stream('/api/evaluate', { source });
  assert.equal(res.status, 200);
  const text = await res.text();
  return [...text.matchAll(/^event: (\w+)\ndata: (.*)$/gm)].map((m) => ({ event: m[1]!, data: JSON.parse(m[2]!) }));
}

test('statements stopped at the limit: the worker goes on with the next; every statement starts once', { timeout: 60_000 }, async () => {
  const source = ['note "before"', 'param k : positive', 'param g : real', Z3, VERIFY, VERIFY, 'note "after"'].join('\n');
  const events = await streamed(source);
  const starts = events.filter((e) => e.event === 'progress').map((e) => e.data.index);
  assert.deepEqual(starts, [0, 1, 2, 3, 4, 5, 6], 'each statement started exactly once, in order');
  const report = events.find((e) => e.event === 'report')!.data;
  const [beforeNote, k, g, z3, v1, v2, afterNote] = report.statements;
  for (const s of [beforeNote, k, g, z3, afterNote]) assert.equal(s.status, 'ok', JSON.stringify(s.error));
  for (const v of [v1, v2]) {
    assert.equal(v.status, 'error');
    assert.match(v.error.message, /time limit of 1 s/);
  }
});

test('the worksheet budget: statements after it is used up are reported as not evaluated; notes and params still run', { timeout: 60_000 }, async () => {
  const source = ['param k : positive', 'param g : real', Z3, ...Array.from({ length: 8 }, () => VERIFY), 'note "end"'].join('\n');
  const events = await streamed(source);
  const report = events.find((e) => e.event === 'report')!.data;
  const verifies = report.statements.slice(3, 11);
  const stopped = verifies.filter((s: any) => /time limit of 1 s/.test(s.error?.message ?? ''));
  const budget = verifies.filter((s: any) => /time budget of 4 s/.test(s.error?.message ?? ''));
  assert.ok(stopped.length >= 1, 'the first ones stop at their own limit');
  assert.ok(budget.length >= 4, `the rest are cut by the budget (${budget.length})`);
  assert.equal(stopped.length + budget.length, 8);
  assert.ok(verifies.slice(-1)[0].error.message.includes('not evaluated'), 'the last never started');
  const starts = events.filter((e) => e.event === 'progress').map((e) => e.data.index);
  assert.ok(!starts.includes(10), 'a statement cut by the budget never starts');
  assert.equal(report.statements[11].status, 'ok', 'a note still runs');
});

test('a record over the per-statement cap is replaced by a message; the rest keep theirs', async () => {
  const source = ['param k : positive', chainIntegral('Big', 80), 'integral W = exp(-k*x^2/2) d(x)'].join('\n');
  const res = await author.post('/api/evaluate', { source });
  assert.equal(res.status, 200, res.text);
  const [, big, w] = res.json.statements;
  assert.equal(big.status, 'error');
  assert.match(big.error.message, /This statement's record is \d+ kB, more than the limit of 64 kB for one statement/);
  assert.deepEqual(big.steps, []);
  assert.equal(w.status, 'ok');
  assert.ok(res.text.length < 64 * 1024, `the answer is small (${res.text.length} characters)`);
});

test('a report over the total cap: later records are replaced by a message naming the cap', async () => {
  const source = Array.from({ length: 8 }, (_, n) => chainIntegral(`C${n}`, 35)).join('\n');
  const res = await author.post('/api/evaluate', { source });
  assert.equal(res.status, 200, res.text);
  const capped = res.json.statements.filter((s: any) => /the worksheet's report reached its limit of 196 kB/.test(s.error?.message ?? ''));
  assert.ok(capped.length >= 1, 'some records are cut');
  assert.equal(res.json.statements[0].status, 'ok');
  assert.ok(res.text.length < 200_000 + 20_000, `the answer stays near the cap (${res.text.length})`);
});

test('limits read from the parse (in the worker) still answer 422, also when a stream was asked for', async () => {
  const vars = Array.from({ length: LIMITS.symbolicVariables + 1 }, (_, j) => `y${j}`);
  const source = `param k : positive\nintegral Z = exp(-k*(${vars.map((v) => `${v}^2`).join(' + ')})) d(${vars.join(', ')})`;
  const res = await author.stream('/api/evaluate', { source });
  assert.equal(res.status, 422);
  const body = await res.json();
  assert.equal(body.error.code, 'too_many_variables');
  const many = await author.stream('/api/evaluate', { source: Array.from({ length: LIMITS.statementsPerWorksheet + 1 }, (_, n) => `note "n${n}"`).join('\n') });
  assert.equal(many.status, 422);
  assert.equal((await many.json()).error.code, 'too_many_statements');
});
