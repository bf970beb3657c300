// Fuzzing POST /api/evaluate with fast-check: 5,000 generated worksheets (random text,
// mutated demo worksheets, random statements) get no 5xx and no hang, and every error
// carries a message. Bounded in time: the run stops generating after 240 s.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import fc from 'fast-check';
import { DEMO_WORKSHEETS } from '../../server/db/seeders/demo-data.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let client: ApiClient;
const savedCap = process.env['EVALUATION_CAP_PER_USER'];
before(async () => {
  // eight requests at once from one account: above the default cap per account
  process.env['EVALUATION_CAP_PER_USER'] = '8';
  server = await startTestServer({ EVALUATION_WORKERS: '2', STATEMENT_TIME_LIMIT_MS: '3000' });
  client = new ApiClient(server.url);
  await client.login(DEMO.author);
});
after(async () => {
  await server?.stop();
  if (savedCap === undefined) delete process.env['EVALUATION_CAP_PER_USER'];
  else process.env['EVALUATION_CAP_PER_USER'] = savedCap;
});

const name = fc.constantFrom('k', 'lam', 'x', 'y', 'Z', 'W', 'a_1', 'q');
const atom = fc.oneof(name, fc.constantFrom('i', 'pi', 'e', '2', '3/2', '0.5', '0', '-1'));
const expr: fc.Arbitrary<string> = fc.letrec((tie) => ({
  e: fc.oneof(
    { depthSize: 'small' },
    atom,
    fc.tuple(tie('e'), fc.constantFrom('+', '-', '*', '/', '^'), tie('e')).map(([a, op, b]) => `${a} ${op} ${b}`),
    fc.tuple(fc.constantFrom('exp', 'sqrt', 'log', 'sin', 'cosh'), tie('e')).map(([f, a]) => `${f}(${a})`),
    tie('e').map((a) => `(${a})`),
  ),
})).e as fc.Arbitrary<string>;
const statement = fc.oneof(
  fc.tuple(name, fc.constantFrom('positive', 'negative', 'real', 'complex', 'nonzero', 'purple')).map(([n, d]) => `param ${n} : ${d}`),
  fc.tuple(name, expr, fc.uniqueArray(name, { minLength: 1, maxLength: 3 })).map(([n, e, v]) => `integral ${n} = exp(${e}) d(${v.join(', ')})`),
  fc.tuple(name, expr).map(([n, e]) => `expect ${n} = ${e}`),
  fc.string({ maxLength: 30 }).map((s) => `note "${s.replace(/"/g, '')}"`),
  fc.string({ maxLength: 60 }),
);
const generated = fc.array(statement, { maxLength: 6 }).map((lines) => lines.join('\n'));
const mutated = fc
  .tuple(fc.constantFrom(...DEMO_WORKSHEETS.map((w) => w.source)), fc.array(fc.tuple(fc.nat(), fc.nat(3), fc.string({ maxLength: 3 })), { maxLength: 5 }))
  .map(([source, edits]) => edits.reduce((s, [at, cut, insert]) => s.slice(0, at % (s.length + 1)) + insert + s.slice((at % (s.length + 1)) + cut), source));
const worksheet = fc.oneof(generated, mutated, fc.string({ maxLength: 200 }), fc.string({ unit: 'grapheme', maxLength: 100 }));

test('5,000 generated worksheets: no 5xx, no hang, every error has a message', { timeout: 400_000 }, async () => {
  const inputs = fc.sample(worksheet, { numRuns: 5000, seed: 20261201 });
  const deadline = Date.now() + 240_000;
  let done = 0;
  const failures: string[] = [];
  const worker = async () => {
    while (inputs.length && Date.now() < deadline) {
      const source = inputs.pop()!;
      const res = await client.post('/api/evaluate', { source });
      done++;
      if (res.status >= 500 || ![200, 400, 413, 422].includes(res.status)) failures.push(`${res.status} for ${JSON.stringify(source)}: ${res.text.slice(0, 200)}`);
      else if (res.status !== 200) {
        if (!res.json?.error?.message) failures.push(`no message for ${JSON.stringify(source)}`);
      } else {
        for (const s of res.json.statements) {
          if (s.status === 'error' && !(s.error?.message?.length > 5)) failures.push(`statement error without a message: ${JSON.stringify(source)}`);
          if (s.status === 'error' && !(s.error.line >= 1 && s.error.column >= 1)) failures.push(`error without a position: ${JSON.stringify(source)}`);
        }
      }
    }
  };
  await Promise.all(Array.from({ length: 8 }, worker));
  assert.deepEqual(failures.slice(0, 5), []);
  assert.equal(done, 5000, `all 5,000 inputs ran within the 240 s bound (ran ${done})`);
  console.log(`evaluate fuzz: ${done} inputs`);
});

// The routes that show a report without being asked to evaluate: the export (JSON and
// LaTeX) and the referee page, over saved versions of generated worksheets (none has a
// stored report, so each is computed for the request, under the caps).
test('exports and referee pages of 150 generated worksheets: no 5xx, every error has a message', { timeout: 400_000 }, async () => {
  const inputs = fc.sample(worksheet, { numRuns: 150, seed: 20261215 });
  const groupId = (await client.get('/api/groups')).json.groups[0].id;
  const made = await client.post(`/api/groups/${groupId}/worksheets`, { title: 'Fuzzed', source: 'note "start"' });
  assert.equal(made.status, 201, made.text);
  const id = made.json.worksheet.id;
  let version = made.json.worksheet.version;
  const failures: string[] = [];
  const check = (what: string, source: string, res: { status: number; json: any; text: string }) => {
    if (res.status >= 500 || ![200, 413, 422].includes(res.status)) failures.push(`${what}: ${res.status} for ${JSON.stringify(source)}: ${res.text.slice(0, 200)}`);
    else if (res.status !== 200 && !res.json?.error?.message) failures.push(`${what}: no message for ${JSON.stringify(source)}`);
  };
  const anonymous = new ApiClient(server.url);
  let ran = 0;
  for (const source of inputs) {
    const saved = await client.put(`/api/worksheets/${id}`, { source, baseVersion: version });
    if (saved.status !== 200) {
      // refused at save (too large, or not valid input): the same rules as evaluation
      if (saved.status >= 500 || !saved.json?.error?.message) failures.push(`save: ${saved.status} for ${JSON.stringify(source)}`);
      continue;
    }
    version = saved.json.worksheet.version;
    const link = await client.post(`/api/worksheets/${id}/referee-links`, { days: 1, version });
    assert.equal(link.status, 201, link.text);
    const token = /\/referee\/(.+)$/.exec(link.json.link.url)![1]!;
    const [json, latex, referee] = await Promise.all([
      client.get(`/api/worksheets/${id}/export?format=json&version=${version}`),
      client.get(`/api/worksheets/${id}/export?format=latex&version=${version}`),
      anonymous.get(`/api/referee/${token}`),
    ]);
    check('export json', source, json);
    check('export latex', source, latex);
    check('referee', source, referee);
    if (json.status === 200) assert.equal(json.json.report.statements.length >= 0, true);
    ran++;
  }
  assert.deepEqual(failures.slice(0, 5), []);
  assert.ok(ran > 100, `most inputs were saved and shown (${ran})`);
  const [stored] = await server.running.sequelize.query(`SELECT count(*)::int AS n FROM evaluations WHERE worksheet_id = ${id}`);
  assert.equal((stored as { n: number }[])[0]!.n, 0, 'showing a report stores none');
  console.log(`export and referee fuzz: ${ran} versions`);
});
