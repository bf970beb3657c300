// Review and sign-off: request (mail), verdicts (mail), threads (mail), queues, and a
// review that goes stale when its statement or something it uses changes.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
const c: Record<string, ApiClient> = {};
const ids: Record<string, number> = {};
let worksheetId: number;
let groupId: number;

const SOURCE = ['param k : positive', 'param g : real', 'integral Zmix = exp(-(k*u^2 + 2*i*g*u*v + k*v^2)/2) d(u, v)', 'integral Zone = exp(-k*q^2/2) d(q)', 'expect Zmix = 2*pi/sqrt(k^2 + g^2)'].join('\n');

before(async () => {
  server = await startTestServer();
  for (const who of ['owner', 'author', 'reviewer', 'reader', 'admin'] as const) {
    c[who] = new ApiClient(server.url);
    ids[who] = (await c[who].login(DEMO[who])).id;
  }
  groupId = (await c['author']!.get('/api/groups')).json.groups[0].id;
  worksheetId = (await c['author']!.post(`/api/groups/${groupId}/worksheets`, { title: 'Reviewed sheet', source: SOURCE })).json.worksheet.id;
});
after(async () => server?.stop());

async function outboxTo(address: string, subject: RegExp) {
  await server.running.mailer.flush();
  const messages = (await c['admin']!.get('/api/admin/outbox')).json.messages as { to: string; subject: string; text: string }[];
  return messages.filter((m) => m.to === address && subject.test(m.subject));
}

test('request, confirm, dispute with a thread; mails go to the right people', async () => {
  const statements = (await c['author']!.get(`/api/worksheets/${worksheetId}/reviews`)).json.statements;
  assert.deepEqual(statements.map((s: { key: string; status: string }) => [s.key, s.status]), [
    ['k', 'unreviewed'],
    ['g', 'unreviewed'],
    ['Zmix', 'unreviewed'],
    ['Zone', 'unreviewed'],
    ['expect Zmix = 2*pi/sqrt(k^2 + g^2)', 'unreviewed'],
  ]);
  const asked = await c['author']!.post(`/api/worksheets/${worksheetId}/reviews`, { statementKey: 'Zmix', reviewerIds: [ids['reviewer']] });
  assert.equal(asked.status, 201, asked.text);
  const zmixReview = asked.json.reviews[0].id;
  const second = await c['author']!.post(`/api/worksheets/${worksheetId}/reviews`, { statementKey: 'Zone', reviewerIds: [ids['reviewer']] });
  const zoneReview = second.json.reviews[0].id;
  const requested = await outboxTo(DEMO.reviewer, /Review requested: Zmix/);
  assert.equal(requested.length, 1);
  assert.match(requested[0]!.text, new RegExp(`/worksheets/${worksheetId}`));

  const queue = await c['reviewer']!.get('/api/review-queue');
  assert.deepEqual(queue.json.reviews.map((r: { statementKey: string }) => r.statementKey), ['Zmix', 'Zone']);

  // Only the asked reviewer decides; an author cannot confirm their own result.
  assert.equal((await c['author']!.post(`/api/reviews/${zmixReview}/verdict`, { verdict: 'confirmed' })).status, 403);
  assert.equal((await c['reviewer']!.post(`/api/reviews/${zoneReview}/verdict`, { verdict: 'disputed' })).status, 400, 'a dispute needs a comment');

  const confirmed = await c['reviewer']!.post(`/api/reviews/${zmixReview}/verdict`, { verdict: 'confirmed', comment: 'Checked the branch by hand.' });
  assert.equal(confirmed.status, 200, confirmed.text);
  const disputed = await c['reviewer']!.post(`/api/reviews/${zoneReview}/verdict`, { verdict: 'disputed', comment: 'The source term is missing.' });
  assert.equal(disputed.json.review.status, 'disputed');
  assert.equal((await outboxTo(DEMO.author, /confirmed Zmix/)).length, 1);
  assert.equal((await outboxTo(DEMO.author, /disputed Zone/)).length, 1);

  const reply = await c['author']!.post(`/api/reviews/${zoneReview}/comments`, { body: 'There is none in this statement; see line 4.' });
  assert.equal(reply.status, 201);
  assert.deepEqual(reply.json.review.comments.map((x: { author: string }) => x.author), ['Priya Ramaswamy', 'Tobiah Osei']);
  assert.equal((await outboxTo(DEMO.reviewer, /New comment on Zone/)).length, 1, 'the reviewer hears of the reply');
  assert.equal((await outboxTo(DEMO.author, /New comment on Zone/)).length, 0, 'the reply author is not mailed');
  assert.equal((await c['reader']!.post(`/api/reviews/${zoneReview}/comments`, { body: 'me too' })).status, 403);

  const now = (await c['reader']!.get(`/api/worksheets/${worksheetId}/reviews`)).json.statements;
  const status = Object.fromEntries(now.map((s: { key: string; status: string }) => [s.key, s.status]));
  assert.equal(status['Zmix'], 'confirmed');
  assert.equal(status['Zone'], 'disputed');
  assert.equal(status['k'], 'unreviewed');
  assert.equal((await c['reviewer']!.get('/api/review-queue')).json.reviews.length, 0);
  const group = await c['reader']!.get(`/api/groups/${groupId}/reviews`);
  assert.equal(group.json.reviews.length, 2);
});

test('a review goes stale when its statement or a param it uses changes; notes change nothing', async () => {
  const sheet = (await c['author']!.get(`/api/worksheets/${worksheetId}`)).json.worksheet;
  // A note and a comment: the reviews stay fresh.
  const v2 = await c['author']!.put(`/api/worksheets/${worksheetId}`, { source: `${SOURCE}\nnote "checked"\n# a comment`, baseVersion: sheet.version });
  let status = Object.fromEntries(
    (await c['author']!.get(`/api/worksheets/${worksheetId}/reviews`)).json.statements.map((s: { key: string; status: string }) => [s.key, s.status]),
  );
  assert.equal(status['Zmix'], 'confirmed');
  // g's domain changes: Zmix uses g, so its review goes stale; Zone does not use g.
  await c['author']!.put(`/api/worksheets/${worksheetId}`, { source: SOURCE.replace('param g : real', 'param g : positive'), baseVersion: v2.json.worksheet.version });
  const statements = (await c['author']!.get(`/api/worksheets/${worksheetId}/reviews`)).json.statements;
  status = Object.fromEntries(statements.map((s: { key: string; status: string }) => [s.key, s.status]));
  assert.equal(status['Zmix'], 'unreviewed', 'a stale review no longer counts');
  assert.equal(status['Zone'], 'disputed');
  const zmix = statements.find((s: { key: string }) => s.key === 'Zmix');
  assert.equal(zmix.reviews[0].stale, true, 'the old verdict stays visible, marked stale');
  assert.equal(zmix.reviews[0].status, 'confirmed');
  assert.equal(zmix.reviews[0].version, 1, 'linked to the version it was given on');
});

test('only reviewers and owners can be asked; unknown statements are refused', async () => {
  const notReviewer = await c['author']!.post(`/api/worksheets/${worksheetId}/reviews`, { statementKey: 'Zone', reviewerIds: [ids['reader']] });
  assert.equal(notReviewer.status, 400);
  assert.match(notReviewer.json.error.message, /must be a reviewer/);
  const unknown = await c['author']!.post(`/api/worksheets/${worksheetId}/reviews`, { statementKey: 'Nope', reviewerIds: [ids['reviewer']] });
  assert.equal(unknown.status, 400);
  assert.equal((await c['reader']!.post(`/api/worksheets/${worksheetId}/reviews`, { statementKey: 'Zone', reviewerIds: [ids['reviewer']] })).status, 403);
});
