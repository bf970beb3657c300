// A statement that needs more memory than a worker may use ends with an error naming
// the memory limit, for that statement only; the worker that died is replaced, the
// other statements keep their results, and the server keeps answering.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let author: ApiClient;
let admin: ApiClient;
before(async () => {
  // The default heap limit (512 MB) is out of reach of any worksheet within the request
  // limits; a 24 MB limit is enough to load the computation core but not to evaluate the
  // largest numeric integral the limits allow (400 variables, measured at about 55 MB).
  // The generous time limit keeps the time limit out of the way.
  server = await startTestServer({ EVALUATION_WORKER_MEMORY_MB: '24', STATEMENT_TIME_LIMIT_MS: '120000' });
  author = new ApiClient(server.url);
  await author.login(DEMO.author);
  admin = new ApiClient(server.url);
  await admin.login(DEMO.admin);
});
after(async () => server?.stop());

function chainIntegral(name: string, n: number): string {
  const vars = Array.from({ length: n }, (_, j) => `x${j + 1}`);
  const terms = [...vars.map((v) => `3*${v}^2`), ...vars.slice(1).map((v, j) => `${vars[j]}*${v}`)];
  return `integral ${name} = exp(-(${terms.join(' + ')})) d(${vars.join(', ')})`;
}

test('the memory limit stops one statement; the worker is replaced; the rest keep their results', async () => {
  const started = (await admin.get('/api/admin/metrics')).json.evaluationWorkers.started;
  const source = ['note "before"', 'param k : positive', chainIntegral('Big', 400), 'integral Z = exp(-k*x^2/2) d(x)', 'note "after"'].join('\n');
  const res = await author.post('/api/evaluate', { source });
  assert.equal(res.status, 200, res.text);
  const [before, k, big, z, afterNote] = res.json.statements;
  assert.equal(big.status, 'error');
  assert.match(big.error.message, /needed more memory than the evaluation limit of 24 MB/);
  assert.doesNotMatch(big.error.message, /time limit/);
  assert.equal(big.error.line, 3);
  for (const s of [before, k, z, afterNote]) assert.equal(s.status, 'ok', JSON.stringify(s.error));
  assert.match(z.result.text, /sqrt/);

  const metrics = (await admin.get('/api/admin/metrics')).json.evaluationWorkers;
  assert.ok(metrics.started > started, 'a new worker replaced the one that ran out of memory');
  // The replacement works, and the server still serves everything else.
  const again = await author.post('/api/evaluate', { source: 'param a : positive\nintegral W = exp(-a*x^2/2) d(x)' });
  assert.equal(again.status, 200);
  assert.equal(again.json.statements[1].status, 'ok');
  assert.equal((await author.get('/api/groups')).status, 200);
});

test('after a worker dies, the new one resumes after the statement that cost it: no statement starts twice', async () => {
  // The comment makes every statement's reuse key new (server/evaluation/reuse.ts): the
  // first test's records of the same lines are not kept, so each statement starts here.
  const source = ['note "before the resume"', 'param k : positive # resume', 'integral Z = exp(-k*x^2/2) d(x)', chainIntegral('Big', 400), 'expect Z = sqrt(2*pi/k)', 'note "after"'].join('\n');
  const res = await author.stream('/api/evaluate', { source });
  assert.equal(res.status, 200);
  const text = await res.text();
  const starts = [...text.matchAll(/^event: progress\ndata: (.*)$/gm)].map((m) => JSON.parse(m[1]!).index);
  assert.deepEqual(starts, [0, 1, 2, 3, 4, 5], 'each statement started once (the finished ones were not run again)');
  const report = JSON.parse(/^event: report\ndata: (.*)$/m.exec(text)![1]!);
  const [before, k, z, big, expect, afterNote] = report.statements;
  assert.match(big.error.message, /needed more memory than the evaluation limit of 24 MB/);
  // Z's value was rebuilt in the new worker for the expect after it, without a new start
  for (const s of [before, k, z, expect, afterNote]) assert.equal(s.status, 'ok', JSON.stringify(s.error));
});
