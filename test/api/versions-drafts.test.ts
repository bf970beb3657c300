// Drafts and checkpoints (issue 14): autosave keeps the caller's draft in PostgreSQL, never a
// version or an activity line; a version is an explicit save (with an optional name) or at most
// one automatic version per ten minutes of editing; an open window learns of a newer version
// from the head; a whole version is signed off as a milestone only when every result in it is
// confirmed by a review.
import assert from 'node:assert/strict';
import { after, before, describe, test } from 'node:test';
import { ApiClient, DEMO } from '../support/api-client.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let author: ApiClient;
let owner: ApiClient;
let reviewer: ApiClient;
let reader: ApiClient;
let outsider: ApiClient;
let groupId: number;

const SOURCE = 'param k : positive\nintegral Z = exp(-k*x^2/2) d(x)\n';

before(async () => {
  server = await startTestServer();
  [author, owner, reviewer, reader, outsider] = Array.from({ length: 5 }, () => new ApiClient(server.url));
  await author.login(DEMO.author);
  await owner.login(DEMO.owner);
  await reviewer.login(DEMO.reviewer);
  await reader.login(DEMO.reader);
  await outsider.login(DEMO.admin); // the site admin is no member of the demo group
  groupId = (await author.get('/api/groups')).json.groups[0].id;
});
after(async () => server?.stop());

const sql = async <T>(query: string, bind: unknown[] = []) => (await server.running.sequelize.query(query, { bind }))[0] as T[];
const activityCount = async () => (await author.get(`/api/groups/${groupId}/activity`)).json.activity.length as number;
const versionsOf = async (id: number) => (await author.get(`/api/worksheets/${id}/versions`)).json.versions as { number: number; kind: string; name: string | null; source: string; milestone: { by: string } | null }[];

async function newSheet(title: string, source = SOURCE): Promise<number> {
  const created = await author.post(`/api/groups/${groupId}/worksheets`, { title, source });
  assert.equal(created.status, 201, created.text);
  return created.json.worksheet.id;
}

describe('drafts', () => {
  test('fifteen autosaves keep one draft: no version, no activity line, the saved text unchanged', async () => {
    const id = await newSheet('Drafted');
    const activityBefore = await activityCount();
    for (let n = 1; n <= 15; n++) {
      const res = await author.put(`/api/worksheets/${id}/draft`, { title: 'Drafted', source: `${SOURCE}note "pause ${n}"\n`, baseVersion: 1 });
      assert.equal(res.status, 200, res.text);
      assert.equal(res.json.autoVersion, null);
      assert.equal(res.json.worksheet.version, 1);
      assert.equal(res.json.draft.source, `${SOURCE}note "pause ${n}"\n`);
    }
    assert.deepEqual((await versionsOf(id)).map((v) => v.number), [1], 'still one version');
    assert.equal(await activityCount(), activityBefore, 'drafts leave no activity line');
    assert.equal((await author.get(`/api/worksheets/${id}`)).json.worksheet.source, SOURCE, 'others still read version 1');
    const rows = await sql<{ source: string }>('SELECT source FROM worksheet_drafts WHERE worksheet_id = $1', [id]);
    assert.equal(rows.length, 1, 'one row in PostgreSQL');
    assert.match(rows[0]!.source, /pause 15/);

    // The draft follows its author to another browser, and is nobody else's.
    const elsewhere = new ApiClient(server.url);
    await elsewhere.login(DEMO.author);
    assert.match((await elsewhere.get(`/api/worksheets/${id}/draft`)).json.draft.source, /pause 15/);
    assert.equal((await owner.get(`/api/worksheets/${id}/draft`)).json.draft, null);
    assert.equal((await reader.get(`/api/worksheets/${id}/draft`)).status, 403);
    assert.equal((await reader.put(`/api/worksheets/${id}/draft`, { title: 'x', source: 'x', baseVersion: 1 })).status, 403);
    assert.equal((await reviewer.put(`/api/worksheets/${id}/draft`, { title: 'x', source: 'x', baseVersion: 1 })).status, 403);

    // A draft back at its version's text is no draft.
    await author.put(`/api/worksheets/${id}/draft`, { title: 'Drafted', source: SOURCE, baseVersion: 1 });
    assert.equal((await author.get(`/api/worksheets/${id}/draft`)).json.draft, null);
    await author.put(`/api/worksheets/${id}/draft`, { title: 'Drafted', source: `${SOURCE}note "again"\n`, baseVersion: 1 });
    assert.equal((await author.delete(`/api/worksheets/${id}/draft`)).status, 204);
    assert.equal((await author.get(`/api/worksheets/${id}/draft`)).json.draft, null);
  });

  test('an explicit save is a checkpoint with its name; the draft it saved is used up; one activity line', async () => {
    const id = await newSheet('Checkpointed');
    const text = `${SOURCE}note "checkpoint"\n`;
    await author.put(`/api/worksheets/${id}/draft`, { title: 'Checkpointed', source: text, baseVersion: 1 });
    const before = await activityCount();
    const saved = await author.put(`/api/worksheets/${id}`, { source: text, baseVersion: 1, name: '  Before the rotation  ' });
    assert.equal(saved.status, 200, saved.text);
    assert.equal(saved.json.worksheet.version, 2);
    const versions = await versionsOf(id);
    assert.deepEqual(versions.map((v) => [v.number, v.kind, v.name]), [[2, 'saved', 'Before the rotation'], [1, 'created', null]]);
    assert.equal((await author.get(`/api/worksheets/${id}/draft`)).json.draft, null);
    assert.equal(await activityCount(), before + 1);
    const line = (await author.get(`/api/groups/${groupId}/activity`)).json.activity[0];
    assert.equal(line.subject, 'Checkpointed v2 “Before the rotation”');
    // A restore is a checkpoint of its own kind.
    const restored = await author.put(`/api/worksheets/${id}`, { source: SOURCE, baseVersion: 2, restoredFrom: 1 });
    assert.equal(restored.status, 200);
    assert.equal((await versionsOf(id))[0]!.kind, 'restored');
    const tooLong = await author.put(`/api/worksheets/${id}`, { source: SOURCE, baseVersion: 3, name: 'n'.repeat(121) });
    assert.equal(tooLong.status, 400);
  });

  test('at most one automatic version per ten minutes of editing (times are the database’s)', async () => {
    const id = await newSheet('Long session');
    const draft = (n: number) => author.put(`/api/worksheets/${id}/draft`, { title: 'Long session', source: `${SOURCE}note "minute ${n}"\n`, baseVersion: 1 });
    await draft(1);
    // Nine minutes of editing since the draft began and since version 1: still a draft.
    await sql(`UPDATE worksheet_drafts SET started_at = now() - interval '9 minutes' WHERE worksheet_id = $1`, [id]);
    await sql(`UPDATE worksheet_versions SET created_at = now() - interval '20 minutes' WHERE worksheet_id = $1`, [id]);
    assert.equal((await draft(9)).json.autoVersion, null);
    // Ten minutes: the draft becomes version 2, automatic, with no activity line.
    await sql(`UPDATE worksheet_drafts SET started_at = now() - interval '10 minutes 1 second' WHERE worksheet_id = $1`, [id]);
    const before = await activityCount();
    const auto = await draft(10);
    assert.equal(auto.json.autoVersion, 2);
    assert.equal(auto.json.draft, null);
    assert.equal(auto.json.worksheet.version, 2);
    assert.equal(await activityCount(), before);
    // Right after, even a draft that began long ago waits for ten minutes since version 2.
    const next = await author.put(`/api/worksheets/${id}/draft`, { title: 'Long session', source: `${SOURCE}note "minute 11"\n`, baseVersion: 2 });
    assert.equal(next.json.autoVersion, null);
    await sql(`UPDATE worksheet_drafts SET started_at = now() - interval '30 minutes' WHERE worksheet_id = $1`, [id]);
    assert.equal((await author.put(`/api/worksheets/${id}/draft`, { title: 'Long session', source: `${SOURCE}note "minute 12"\n`, baseVersion: 2 })).json.autoVersion, null);
    assert.deepEqual((await versionsOf(id)).map((v) => [v.number, v.kind]), [[2, 'auto'], [1, 'created']]);
    // A draft on an old base never becomes a version (it would overwrite the newer one).
    await sql(`UPDATE worksheet_versions SET created_at = now() - interval '20 minutes' WHERE worksheet_id = $1`, [id]);
    const stale = await author.put(`/api/worksheets/${id}/draft`, { title: 'Long session', source: `${SOURCE}note "old base"\n`, baseVersion: 1 });
    assert.equal(stale.json.autoVersion, null);
    assert.equal(stale.json.worksheet.version, 2, 'the answer names the newer version');
  });

  test('the head tells an open window at once that a newer version exists; GETs write nothing', async () => {
    const id = await newSheet('Two windows');
    const head = await owner.get(`/api/worksheets/${id}/head`);
    assert.equal(head.status, 200);
    assert.equal(head.json.version, 1);
    assert.equal(head.headers.get('cache-control'), 'no-store');
    await author.put(`/api/worksheets/${id}`, { source: `${SOURCE}note "newer"\n`, baseVersion: 1 });
    const after = (await owner.get(`/api/worksheets/${id}/head`)).json;
    assert.equal(after.version, 2);
    assert.equal(after.updatedBy, 'Tobiah Osei');
    assert.equal((await reader.get(`/api/worksheets/${id}/head`)).status, 200);
    assert.equal((await outsider.get(`/api/worksheets/${id}/head`)).status, 404);
    assert.equal((await new ApiClient(server.url).get(`/api/worksheets/${id}/head`)).status, 401);
    const drafts = await sql('SELECT 1 FROM worksheet_drafts WHERE worksheet_id = $1', [id]);
    assert.equal(drafts.length, 0);
  });
});

describe('milestones', () => {
  test('a version is signed off only when every result in it is confirmed by a review', async () => {
    const id = await newSheet('Milestone', `${SOURCE}let F = -log(Z)\nnote "n"\n`);
    const check = await reader.get(`/api/worksheets/${id}/versions/1/milestone`);
    assert.equal(check.status, 200);
    assert.equal(check.json.ready, false);
    assert.deepEqual(check.json.results.map((r: { key: string; status: string }) => [r.key, r.status]), [['Z', 'unreviewed'], ['F', 'unreviewed']], 'parameter lines and notes are not results');

    const early = await author.post(`/api/worksheets/${id}/versions/1/milestone`, {});
    assert.equal(early.status, 409);
    assert.equal(early.json.error.code, 'milestone_not_ready');
    assert.match(early.json.error.message, /2 results are not confirmed by a review: Z \(line 2, unreviewed\), F \(line 3, unreviewed\)/);

    const members = (await author.get(`/api/groups/${groupId}/members`)).json.members as { userId: number; email: string }[];
    const reviewerId = members.find((m) => m.email === DEMO.reviewer)!.userId;
    for (const key of ['Z', 'F']) {
      const asked = await author.post(`/api/worksheets/${id}/reviews`, { statementKey: key, reviewerIds: [reviewerId] });
      assert.equal(asked.status, 201, asked.text);
      if (key === 'Z') assert.equal((await reviewer.post(`/api/reviews/${asked.json.reviews[0].id}/verdict`, { verdict: 'confirmed' })).status, 200);
    }
    const half = await author.post(`/api/worksheets/${id}/versions/1/milestone`, {});
    assert.equal(half.status, 409);
    assert.match(half.json.error.message, /1 result is not confirmed by a review: F \(line 3, requested\)/);

    const pending = (await reviewer.get('/api/review-queue')).json.reviews.find((r: { worksheetId: number }) => r.worksheetId === id);
    assert.equal((await reviewer.post(`/api/reviews/${pending.id}/verdict`, { verdict: 'confirmed' })).status, 200);
    assert.equal((await reader.post(`/api/worksheets/${id}/versions/1/milestone`, {})).status, 403);
    assert.equal((await reviewer.post(`/api/worksheets/${id}/versions/1/milestone`, {})).status, 403);
    const before = await activityCount();
    const signed = await author.post(`/api/worksheets/${id}/versions/1/milestone`, {});
    assert.equal(signed.status, 200, signed.text);
    assert.equal(signed.json.version.milestone.by, 'Tobiah Osei');
    assert.equal(await activityCount(), before + 1);
    assert.equal((await versionsOf(id))[0]!.milestone!.by, 'Tobiah Osei');
    // Once signed, again is a no-op; a version that does not exist is 404.
    assert.equal((await author.post(`/api/worksheets/${id}/versions/1/milestone`, {})).status, 200);
    assert.equal(await activityCount(), before + 1);
    assert.equal((await author.post(`/api/worksheets/${id}/versions/9/milestone`, {})).status, 404);
  });
});
