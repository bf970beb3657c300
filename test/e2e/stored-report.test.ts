// End to end in Debian's Chromium: opening a worksheet shows its stored report. A current
// stored report is shown without any evaluation request; a missing one shows a "Recomputing"
// mark while the server evaluates the saved version, then the results.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import type { Browser, Page, Request } from 'playwright-core';
import { ApiClient, DEMO } from '../support/api-client.js';
import { launchBrowser, screenshot, signIn } from '../support/browser.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let browser: Browser;
let api: ApiClient;
let groupId: number;

before(async () => {
  server = await startTestServer({ CLIENT_DIR: 'dist/sheetwise/browser' });
  browser = await launchBrowser();
  api = new ApiClient(server.url);
  await api.login(DEMO.author);
  groupId = (await api.request('GET', '/api/groups')).json.groups[0].id;
});
after(async () => {
  await browser?.close();
  await server?.stop();
});

/** Every evaluation the page asks for: live (POST /api/evaluate) or of the saved version (POST …/report). */
function countEvaluations(page: Page): Request[] {
  const seen: Request[] = [];
  page.on('request', (r) => {
    const path = new URL(r.url()).pathname;
    if (r.method() === 'POST' && (path === '/api/evaluate' || /^\/api\/worksheets\/\d+\/report$/.test(path))) seen.push(r);
  });
  return seen;
}

async function newWorksheet(title: string, source: string): Promise<number> {
  const created = await api.request('POST', `/api/groups/${groupId}/worksheets`, { title, source });
  assert.equal(created.status, 201, created.text);
  return created.json.worksheet.id as number;
}

test('a worksheet whose stored report is current opens with its results and no evaluation', async () => {
  const id = await newWorksheet('Stored report, current', 'param k : positive\nintegral Z = exp(-k*x^2/2) d(x)\n');
  // Evaluate the saved version once, so its report is stored by this engine.
  const made = await api.request('POST', `/api/worksheets/${id}/report`, {});
  assert.equal(made.status, 200, made.text);
  const stored = await api.request('GET', `/api/worksheets/${id}/report`);
  assert.equal(stored.json.current, true, stored.text);

  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  const evaluations = countEvaluations(page);
  await page.goto(`${server.url}/worksheets/${id}`);
  await page.locator('[data-testid="finding-card"][data-line="2"] [data-testid="finding-result"]').waitFor({ timeout: 10_000 });
  assert.equal(await page.getByTestId('recomputing').count(), 0);
  assert.doesNotMatch((await page.getByTestId('evaluation-status').textContent()) ?? '', /Evaluating/);
  // Longer than the typing pause: nothing is evaluated behind the results either.
  await page.waitForTimeout(1500);
  assert.deepEqual(evaluations.map((r) => r.url()), []);
  await screenshot(page, 'stored-report-current');
  await context.close();
});

test('a worksheet with no stored report shows "Recomputing" and then its results', async () => {
  const id = await newWorksheet('Stored report, missing', 'param k : positive\nintegral Z = exp(-k*x^2/2) d(x)\n');
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  const evaluations = countEvaluations(page);
  // Hold the recomputation back a moment, so the mark can be seen however fast the server is.
  await page.route(`**/api/worksheets/${id}/report`, async (route) => {
    if (route.request().method() === 'POST') await new Promise((r) => setTimeout(r, 1200));
    await route.continue();
  });
  await page.goto(`${server.url}/worksheets/${id}`);
  await page.getByTestId('recomputing').waitFor({ timeout: 10_000 });
  assert.match((await page.getByTestId('recomputing').textContent()) ?? '', /Recomputing/);
  await screenshot(page, 'stored-report-recomputing');
  await page.locator('[data-testid="finding-card"][data-line="2"] [data-testid="finding-result"]').waitFor({ timeout: 30_000 });
  await page.getByTestId('recomputing').waitFor({ state: 'detached', timeout: 30_000 });
  const paths = evaluations.map((r) => new URL(r.url()).pathname);
  assert.deepEqual(paths, [`/api/worksheets/${id}/report`], 'one evaluation, of the saved version');
  // The recomputed report is now stored and current.
  assert.equal((await api.request('GET', `/api/worksheets/${id}/report`)).json.current, true);
  await context.close();
});
