// Each evaluation limit is refused with 413/422 and a message that names the limit.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { LIMITS } from '../../shared/api.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let client: ApiClient;
before(async () => {
  server = await startTestServer();
  client = new ApiClient(server.url);
  await client.login(DEMO.author);
});
after(async () => server?.stop());

async function refused(source: string, status: number, pattern: RegExp) {
  const res = await client.post('/api/evaluate', { source });
  assert.equal(res.status, status, res.text.slice(0, 300));
  assert.match(res.json.error.message, pattern);
}

test('worksheet size', () => refused('# ' + 'y'.repeat(LIMITS.worksheetBytes), 413, /the limit is 200 kB/));
test('statements per worksheet', () =>
  refused(Array.from({ length: LIMITS.statementsPerWorksheet + 1 }, (_, n) => `note "n${n}"`).join('\n'), 422, new RegExp(`the limit is ${LIMITS.statementsPerWorksheet}`)));
test('statement length', () => refused(`let F = ${'1+'.repeat(LIMITS.statementLength / 2)}1`, 422, new RegExp(`the limit for one statement is ${LIMITS.statementLength}`)));
test('expression depth', () =>
  refused(`let F = ${'('.repeat(LIMITS.expressionDepth + 1)}1${')'.repeat(LIMITS.expressionDepth + 1)}`, 422, new RegExp(`the limit is ${LIMITS.expressionDepth}`)));
test('variables of a symbolic integral', () => {
  const vars = Array.from({ length: LIMITS.symbolicVariables + 1 }, (_, n) => `x${n}`);
  return refused(`param k : positive\nintegral Z = exp(-k*(${vars.map((v) => `${v}^2`).join(' + ')})) d(${vars.join(', ')})`, 422, new RegExp(`limit is ${LIMITS.symbolicVariables} for an integral with symbolic params`));
});
test('variables of a numeric integral', () => {
  const vars = Array.from({ length: LIMITS.numericVariables + 1 }, (_, n) => `x${n}`);
  return refused(`integral Z = exp(-(${vars.map((v) => `${v}^2`).join(' + ')})) d(${vars.join(', ')})`, 422, /limit is 400 for an integral with numbers only/);
});
