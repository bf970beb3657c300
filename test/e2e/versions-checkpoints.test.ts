// End to end in Debian's Chromium (issue 14): typing keeps a draft on the server, never a
// version; a version is a checkpoint with an optional name; history compares two versions
// line by line; another window is told at once of a newer version and its conflict view
// has the safe choice as the primary button; the language reference opens by F1 and from
// the keys sheet, with every statement's example evaluated by the server.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { ApiClient, DEMO } from '../support/api-client.js';
import { editorText, launchBrowser, screenshot, signIn } from '../support/browser.js';
import { startTestServer, type TestServer } from '../support/test-server.js';
import { STATEMENT_KEYWORDS } from '../../shared/language.js';

let server: TestServer;
let browser: Browser;
let api: ApiClient;
let groupId: number;

before(async () => {
  server = await startTestServer({ CLIENT_DIR: 'dist/sheetwise/browser' });
  browser = await launchBrowser();
  api = new ApiClient(server.url);
  await api.login(DEMO.author);
  groupId = (await api.get('/api/groups')).json.groups[0].id;
});
after(async () => {
  await browser?.close();
  await server?.stop();
});

async function openSheet(page: Page, id: number) {
  await page.goto(`${server.url}/worksheets/${id}`);
  await page.locator('[data-testid="editor"][data-ready="true"]').waitFor({ timeout: 30_000 });
}

/** Types a line at the end of the source, then leaves the completion popup. */
async function typeLine(page: Page, line: string) {
  await page.locator('[data-testid="editor"] .view-lines').click();
  await page.keyboard.press('Control+End');
  if (!(await editorText(page)).endsWith('\n')) await page.keyboard.press('Enter');
  await page.keyboard.press('Home');
  await page.keyboard.type(line, { delay: 5 });
  await page.keyboard.press('Escape');
}

const draftKept = (page: Page) => page.getByTestId('save-status').filter({ hasText: /Draft kept/ }).waitFor({ timeout: 15_000 });
const versionsOf = async (id: number) => (await api.get(`/api/worksheets/${id}/versions`)).json.versions as { number: number; name: string | null; kind: string }[];
const activityCount = async () => (await api.get(`/api/groups/${groupId}/activity`)).json.activity.length as number;

test('pauses keep a draft (no version, no activity); Save with a name makes one version; history shows the difference', async () => {
  const id = (await api.post(`/api/groups/${groupId}/worksheets`, { title: 'Checkpoints in the browser', source: 'param k : positive\n' })).json.worksheet.id;
  const activityBefore = await activityCount();
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  await openSheet(page, id);
  for (const line of ['integral Z = exp(-k*x^2/2) d(x)', 'note "first pause"', 'note "second pause"']) {
    await typeLine(page, line);
    await draftKept(page);
  }
  assert.deepEqual((await versionsOf(id)).map((v) => v.number), [1], 'three pauses, still one version');
  assert.equal(await activityCount(), activityBefore, 'and no activity line');
  // The author's draft is on the server (read as the author, through the API).
  let draft = null;
  for (let i = 0; i < 50 && !draft?.source.includes('second pause'); i++) {
    draft = (await api.get(`/api/worksheets/${id}/draft`)).json.draft;
    if (!draft?.source.includes('second pause')) await new Promise((r) => setTimeout(r, 200));
  }
  assert.match(draft.source, /second pause/, 'the draft is on the server');

  // A reload (a new page) brings the draft back from the server even without this browser's copy.
  await page.evaluate(() => localStorage.clear());
  await page.reload();
  await page.locator('[data-testid="editor"][data-ready="true"]').waitFor();
  await page.waitForFunction(() => (document.querySelector('[data-testid="editor"]') as unknown as { sheetwiseText(): string }).sheetwiseText().includes('second pause'));

  await page.getByTestId('open-history').click();
  await page.getByTestId('version-name').fill('Gaussian in place');
  await page.getByTestId('make-version').click();
  await page.getByTestId('save-status').filter({ hasText: /Saved · version 2/ }).waitFor({ timeout: 15_000 });
  assert.deepEqual((await versionsOf(id)).map((v) => [v.number, v.name, v.kind]), [[2, 'Gaussian in place', 'saved'], [1, null, 'created']]);
  assert.equal(await activityCount(), activityBefore + 1, 'one activity line for the checkpoint');
  const sheet = page.getByTestId('history-sheet');
  await sheet.getByTestId('version-name-shown').filter({ hasText: 'Gaussian in place' }).waitFor();
  // version 1 ends with an empty line, which the first typed line took the place of
  await sheet.getByTestId('diff-summary').filter({ hasText: '3 lines added, 1 removed' }).waitFor();
  const added = await sheet.locator('[data-testid="version-diff"] .added .text').allInnerTexts();
  assert.deepEqual(added, ['integral Z = exp(-k*x^2/2) d(x)', 'note "first pause"', 'note "second pause"']);
  // The other way round: from version 2 to version 1 the same lines are removed.
  await sheet.getByTestId('diff-from').selectOption('2');
  await sheet.getByTestId('diff-to').selectOption('1');
  await sheet.getByTestId('diff-summary').filter({ hasText: '1 line added, 3 removed' }).waitFor();
  await sheet.getByTestId('diff-from').selectOption('1');
  await sheet.getByTestId('diff-to').selectOption('2');
  await screenshot(page, 'versions-history-diff');
  await context.close();
});

test('a newer version saved elsewhere is announced at once; the conflict view offers the safe choice first', async () => {
  const id = (await api.post(`/api/groups/${groupId}/worksheets`, { title: 'Two windows', source: 'param k : positive\n' })).json.worksheet.id;
  const ctxA = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const ctxB = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const a = await ctxA.newPage();
  const b = await ctxB.newPage();
  await signIn(a, server.url, DEMO.author);
  await signIn(b, server.url, DEMO.owner);
  await openSheet(a, id);
  await openSheet(b, id);
  await typeLine(a, 'note "typed in window A"');
  await draftKept(a);
  // B saves a version: A is told within one poll, while it still has its own draft.
  await typeLine(b, 'note "saved in window B"');
  await b.keyboard.press('Control+s');
  await b.getByTestId('save-status').filter({ hasText: /Saved · version 2/ }).waitFor({ timeout: 15_000 });
  const t0 = Date.now();
  await a.getByTestId('newer-version').waitFor({ timeout: 12_000 });
  assert.ok(Date.now() - t0 < 12_000);
  assert.match(await a.getByTestId('newer-version').innerText(), /Maren Lindqvist saved version 2; your text is based on version 1/);
  await screenshot(a, 'versions-newer-announced');
  await a.getByTestId('compare-newer').click();
  await a.getByTestId('save-conflict').waitFor();
  await a.locator('[data-testid="conflict-diff"][data-ready="true"]').waitFor();
  // The primary (filled) button is the safe one: take theirs, keeping mine aside; it has the focus.
  const primary = a.locator('mat-dialog-actions .mat-mdc-unelevated-button');
  assert.equal(await primary.count(), 1);
  assert.equal(await primary.getAttribute('data-testid'), 'take-theirs');
  // the dialog moves the focus to its initial element once it has opened
  await a.waitForFunction(() => document.activeElement?.getAttribute('data-testid') === 'take-theirs', null, { timeout: 5_000 });
  await screenshot(a, 'versions-conflict');
  await primary.click();
  await a.getByTestId('bring-back-mine').waitFor();
  assert.match(await editorText(a), /saved in window B/);
  assert.ok(!(await editorText(a)).includes('typed in window A'), 'their text is in the editor');
  await a.getByTestId('bring-back-mine').click();
  await a.waitForFunction(() => (document.querySelector('[data-testid="editor"]') as unknown as { sheetwiseText(): string }).sheetwiseText().includes('typed in window A'), null, { timeout: 5_000 });
  assert.match(await editorText(a), /typed in window A/, 'mine comes back');

  // A window with nothing unsaved simply shows the newer version.
  await b.reload();
  await b.locator('[data-testid="editor"][data-ready="true"]').waitFor();
  await a.keyboard.press('Control+s');
  await a.getByTestId('save-status').filter({ hasText: /Saved · version 3/ }).waitFor({ timeout: 15_000 });
  await b.getByTestId('loaded-newer').waitFor({ timeout: 12_000 });
  assert.match(await editorText(b), /typed in window A/);
  await ctxA.close();
  await ctxB.close();
});

test('the language reference: F1 opens it, the keys sheet links to it, every statement has its example evaluated, search filters', async () => {
  const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.reader);
  await page.getByTestId('pending-count-link').waitFor(); // the signed-in top bar is there
  await page.keyboard.press('F1');
  await page.waitForURL(/\/language$/);
  const entries = page.getByTestId('language-entry');
  await entries.first().waitFor();
  assert.deepEqual(await entries.evaluateAll((els) => els.map((e) => e.getAttribute('data-keyword'))), STATEMENT_KEYWORDS);
  // Each example's output is the server's evaluation of it: one card per statement.
  await page.waitForFunction((n) => document.querySelectorAll('[data-testid="language-output"] [data-testid="finding-card"]').length === n, STATEMENT_KEYWORDS.length, { timeout: 60_000 });
  assert.equal(await page.locator('[data-keyword] .sw-error').count(), 0, 'no example failed');
  assert.match(await page.locator('[data-keyword="integral"] [data-testid="language-output"]').innerText(), /2/);
  await screenshot(page, 'language-reference');
  await page.getByTestId('language-search').fill('Wick');
  await page.getByTestId('language-count').filter({ hasText: `1 of ${STATEMENT_KEYWORDS.length} statements match` }).waitFor();
  assert.deepEqual(await entries.evaluateAll((els) => els.map((e) => e.getAttribute('data-keyword'))), ['moment']);
  assert.match(page.url(), /q=Wick/);

  // On a worksheet page F1 shows the keys, and the keys sheet links to the reference.
  const id = (await api.get(`/api/groups/${groupId}/worksheets`)).json.items[0].id;
  await openSheet(page, id);
  await page.keyboard.press('F1');
  await page.getByTestId('help-sheet').waitFor();
  assert.equal(await page.getByTestId('open-language-reference').getAttribute('href'), '/language');
  await context.close();
});
