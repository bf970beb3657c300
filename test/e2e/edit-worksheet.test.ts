// End to end in Debian's Chromium: an author edits and saves; a reader cannot.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import type { Browser } from 'playwright-core';
import { DEMO } from '../support/api-client.js';
import { launchBrowser, screenshot, signIn, editorText } from '../support/browser.js';
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

test('the sign-in page explains a wrong password', async () => {
  const page = await browser.newPage();
  await page.goto(`${server.url}/sign-in`);
  await page.fill('input[name="email"]', DEMO.author);
  await page.fill('input[name="password"]', 'not-the-password');
  await page.click('button[type="submit"]');
  await page.getByText('The e-mail address or the password is wrong').waitFor();
  await screenshot(page, 'sign-in-error');
  await page.close();
});

test('the demo author opens a worksheet, changes it, saves, reloads and sees the change', async () => {
  const context = await browser.newContext({ viewport: { width: 1366, height: 850 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  await screenshot(page, 'groups');
  await page.getByRole('link', { name: /Lindqvist Lab/ }).first().click();
  await page.waitForURL(/\/groups\/\d+/);
  await page.getByRole('link', { name: 'Driven mode with a complex stiffness' }).click();
  await page.waitForURL(/\/worksheets\/\d+/);
  await page.locator('[data-testid="editor"][data-ready="true"]').waitFor();
  assert.match(await editorText(page), /integral Zdrive/);
  const added = `note "Checked on ${Date.now()}"`;
  // Type through Monaco at the end of the source, on a line of its own.
  await page.locator('[data-testid="editor"] .view-lines').click();
  await page.keyboard.press('Control+End');
  if (!(await editorText(page)).endsWith('\n')) await page.keyboard.press('Enter');
  await page.keyboard.type(added, { delay: 5 });
  await page.keyboard.press('Escape');
  await page.keyboard.press('Control+s');
  await page.getByTestId('save-status').filter({ hasText: /Saved · version/ }).waitFor();
  await screenshot(page, 'worksheet-saved');
  await page.reload();
  await page.locator('[data-testid="editor"][data-ready="true"]').waitFor();
  assert.ok((await editorText(page)).includes(added), 'the saved text is there after a reload');
  await context.close();
});

test('the demo reader sees no edit control, and a direct PUT is refused', async () => {
  const context = await browser.newContext();
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.reader);
  await page.getByRole('link', { name: /Lindqvist Lab/ }).first().click();
  await page.getByRole('link', { name: 'Two modes with an imaginary mixing term' }).click();
  await page.waitForURL(/\/worksheets\/(\d+)/);
  const id = /\/worksheets\/(\d+)/.exec(page.url())![1];
  await page.locator('[data-testid="editor"][data-ready="true"]').waitFor();
  assert.equal(await page.getByTestId('save-worksheet').count(), 0, 'no save button for a reader');
  const before = await editorText(page);
  await page.locator('[data-testid="editor"] .view-lines').click();
  await page.keyboard.type('vandal');
  assert.equal(await editorText(page), before, 'the source is read-only for a reader');
  const status = await page.evaluate(async (worksheetId) => {
    const token = decodeURIComponent(document.cookie.split('; ').find((c) => c.startsWith('XSRF-TOKEN='))?.split('=')[1] ?? '');
    const res = await fetch(`/api/worksheets/${worksheetId}`, {
      method: 'PUT',
      headers: { 'content-type': 'application/json', 'x-xsrf-token': token },
      body: JSON.stringify({ source: 'note "vandal"', baseVersion: 1 }),
    });
    return res.status;
  }, id);
  assert.equal(status, 403);
  await screenshot(page, 'worksheet-reader');
  await context.close();
});
