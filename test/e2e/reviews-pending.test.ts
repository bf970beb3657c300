// End to end in Debian's Chromium (issue 14): a reviewer's pending reviews show on the home
// page and as a count in the top bar; the review sheet opens beside the card it reviews,
// not over it; a verdict brings the count down.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import type { Browser } from 'playwright-core';
import { ApiClient, DEMO } from '../support/api-client.js';
import { launchBrowser, screenshot, signIn } from '../support/browser.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let browser: Browser;

before(async () => {
  server = await startTestServer({ CLIENT_DIR: 'dist/sheetwise/browser' });
  browser = await launchBrowser();
});
after(async () => {
  await browser?.close();
  await server?.stop();
});

test('pending reviews on the home page and in the top bar; the sheet sits beside its card', async () => {
  const author = new ApiClient(server.url);
  await author.login(DEMO.author);
  const groupId = (await author.get('/api/groups')).json.groups[0].id;
  const id = (await author.post(`/api/groups/${groupId}/worksheets`, { title: 'Asked of the reviewer', source: 'param k : positive\nintegral Zrev = exp(-k*x^2/2) d(x)\nlet Frev = -log(Zrev)\n' })).json.worksheet.id;
  const members = (await author.get(`/api/groups/${groupId}/members`)).json.members as { userId: number; email: string }[];
  const reviewerId = members.find((m) => m.email === DEMO.reviewer)!.userId;
  for (const key of ['Zrev', 'Frev']) assert.equal((await author.post(`/api/worksheets/${id}/reviews`, { statementKey: key, reviewerIds: [reviewerId] })).status, 201);

  for (const width of [1440, 1024]) {
    const context = await browser.newContext({ viewport: { width, height: 900 } });
    const page = await context.newPage();
    await signIn(page, server.url, DEMO.reviewer);
    const panel = page.getByTestId('pending-reviews');
    await panel.waitFor();
    assert.match(await panel.innerText(), /Waiting for your review\s*2/);
    assert.match(await panel.innerText(), /Zrev in Asked of the reviewer/);
    await page.getByTestId('pending-count').filter({ hasText: '2' }).waitFor();
    assert.equal(await page.getByTestId('pending-count-link').getAttribute('aria-label'), 'Reviews: 2 waiting for you');
    if (width === 1440) await screenshot(page, 'reviews-pending-home');

    await panel.getByTestId('pending-review-link').filter({ hasText: 'Zrev' }).click();
    await page.waitForURL(/\/worksheets\/\d+\?review=Zrev/);
    const sheet = page.getByTestId('review-sheet');
    await sheet.waitFor({ state: 'visible', timeout: 30_000 });
    const cardBox = await page.locator('[data-testid="finding-card"][data-line="2"]').boundingBox();
    const sheetBox = await sheet.boundingBox();
    assert.ok(cardBox && sheetBox);
    const overlap = Math.max(0, Math.min(cardBox.x + cardBox.width, sheetBox.x + sheetBox.width) - Math.max(cardBox.x, sheetBox.x));
    assert.equal(overlap, 0, `at ${width} px the sheet (${sheetBox.x}..${sheetBox.x + sheetBox.width}) does not cover the card (${cardBox.x}..${cardBox.x + cardBox.width})`);
    await screenshot(page, `reviews-sheet-beside-${width}`);
    if (width === 1024) {
      await sheet.getByTestId('confirm-review').first().click();
      await sheet.getByTestId('review-submit').first().click();
      await page.getByTestId('pending-count').filter({ hasText: '1' }).waitFor({ timeout: 10_000 });
    }
    await context.close();
  }
});
