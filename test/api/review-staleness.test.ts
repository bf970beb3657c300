// A confirmed review stays valid exactly as long as what its statement computes with:
// the statement itself and the definition of every name it uses, read from the parse.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { reviewableStatements } from '../../server/reviews/fingerprint.js';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
const c: Record<string, ApiClient> = {};
const ids: Record<string, number> = {};
let groupId: number;

const fingerprint = (source: string, key: string) => reviewableStatements(source).find((s) => s.key === key)?.fingerprint;

test('fingerprints follow each name on a multi-name param line, and nothing unrelated', () => {
  const base = 'param a, b : positive\nparam c : real\nintegral Z = exp(-b*x^2) d(x)\nnote "first"';
  const z = fingerprint(base, 'Z');
  assert.ok(z);
  assert.notEqual(fingerprint(base.replace('param a, b : positive', 'param a, b : real'), 'Z'), z, "b's domain changed");
  assert.notEqual(fingerprint(base.replace('param a, b : positive', 'param a : positive\nparam b : negative'), 'Z'), z, "b's domain changed on a line of its own");
  assert.equal(fingerprint(base.replace('param a, b : positive', 'param a : positive\nparam b : positive'), 'Z'), z, 'the same domain, split over two lines');
  assert.equal(fingerprint(base.replace('param c : real', 'param c : positive'), 'Z'), z, 'c is not used');
  assert.equal(fingerprint(base.replace('note "first"', 'note "second"'), 'Z'), z, 'notes change nothing');
  assert.equal(fingerprint(base.replace('integral Z = exp(-b*x^2) d(x)', 'integral   Z = exp( -b * x^2 )  d(x)   # a comment'), 'Z'), z, 'spacing and comments change nothing');
  // A line that does not parse is keyed by its text; the statements using a name it no longer defines change.
  const broken = base.replace('param a, b : positive', 'param a, b : positve');
  assert.ok(reviewableStatements(broken).some((s) => s.key === 'param a, b : positve'));
  assert.notEqual(fingerprint(broken, 'Z'), z);
});

before(async () => {
  server = await startTestServer();
  for (const who of ['author', 'reviewer'] as const) {
    c[who] = new ApiClient(server.url);
    ids[who] = (await c[who].login(DEMO[who])).id;
  }
  groupId = (await c['author']!.get('/api/groups')).json.groups[0].id;
});
after(async () => server?.stop());

/** A worksheet whose Z, using b of a two-name param line, has a confirmed review. */
async function confirmedZ(source: string) {
  const sheet = await c['author']!.post(`/api/groups/${groupId}/worksheets`, { title: 'Staleness', source });
  assert.equal(sheet.status, 201, sheet.text);
  const id = sheet.json.worksheet.id;
  const asked = await c['author']!.post(`/api/worksheets/${id}/reviews`, { statementKey: 'Z', reviewerIds: [ids['reviewer']] });
  assert.equal(asked.status, 201, asked.text);
  const verdict = await c['reviewer']!.post(`/api/reviews/${asked.json.reviews[0].id}/verdict`, { verdict: 'confirmed', comment: 'Checked.' });
  assert.equal(verdict.status, 200, verdict.text);
  let version = 1;
  const save = async (next: string) => {
    const saved = await c['author']!.put(`/api/worksheets/${id}`, { source: next, baseVersion: version });
    assert.equal(saved.status, 200, saved.text);
    version = saved.json.worksheet.version;
  };
  const statusOfZ = async () => {
    const statements = (await c['author']!.get(`/api/worksheets/${id}/reviews`)).json.statements as { key: string; status: string; reviews: { stale: boolean }[] }[];
    const z = statements.find((s) => s.key === 'Z')!;
    return { status: z.status, stale: z.reviews[0]!.stale };
  };
  return { save, statusOfZ };
}

const SOURCE = ['param a, b : positive', 'param c : real', 'integral Z = exp(-b*x^2) d(x)', 'note "first"'].join('\n');

test('a confirmed review of Z stays confirmed when an unrelated statement or a note changes', async () => {
  const z = await confirmedZ(SOURCE);
  assert.deepEqual(await z.statusOfZ(), { status: 'confirmed', stale: false });
  await z.save(SOURCE.replace('param c : real', 'param c : positive').replace('note "first"', 'note "second"'));
  assert.deepEqual(await z.statusOfZ(), { status: 'confirmed', stale: false });
});

test('a confirmed review of Z goes stale when the domain of the second name on a multi-name param line changes', async () => {
  const z = await confirmedZ(SOURCE);
  await z.save(SOURCE.replace('param a, b : positive', 'param a, b : real'));
  assert.deepEqual(await z.statusOfZ(), { status: 'unreviewed', stale: true });
});

test('a confirmed review of Z goes stale when the first name it uses on a multi-name param line changes domain', async () => {
  const source = SOURCE.replace('exp(-b*x^2)', 'exp(-a*x^2)');
  const z = await confirmedZ(source);
  await z.save(source.replace('param a, b : positive', 'param a, b : nonzero'));
  assert.deepEqual(await z.statusOfZ(), { status: 'unreviewed', stale: true });
});
