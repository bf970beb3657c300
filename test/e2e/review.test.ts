// End to end in Debian's Chromium: the demo author asks the demo reviewer to review two
// results; the reviewer, in a browser of their own, confirms one and disputes the other;
// the author sees both on the cards, attaches a file, exports the LaTeX appendix and
// makes a referee link that opens in a fresh browser without an account.
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { after, before, test } from 'node:test';
import type { Browser, BrowserContext, Locator, Page } from 'playwright-core';
import { DEMO } from '../support/api-client.js';
import { texSource } from '../../server/exports/latex.js';
import { launchBrowser, screenshot, signIn } from '../support/browser.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let browser: Browser;
let author: BrowserContext;
let reviewer: BrowserContext;
let worksheetUrl = '';

const MIXING = 'Two modes with an imaginary mixing term';
const EXPECT_KEY = 'expect Zmix = 2*pi/sqrt(m^2 + g^2)';

before(async () => {
  server = await startTestServer({ CLIENT_DIR: 'dist/sheetwise/browser' });
  browser = await launchBrowser();
  author = await browser.newContext({ viewport: { width: 1440, height: 900 }, acceptDownloads: true });
  reviewer = await browser.newContext({ viewport: { width: 1440, height: 900 } });
});
after(async () => {
  await browser?.close();
  await server?.stop();
});

const card = (page: Page, kind: 'integral' | 'expect'): Locator => page.locator(`[data-testid="finding-card"][data-kind="${kind}"]`).first();
const badgeOf = (page: Page, kind: 'integral' | 'expect') => card(page, kind).getByTestId('review-badge');

async function waitForStatus(page: Page, kind: 'integral' | 'expect', status: string) {
  await page.locator(`[data-testid="finding-card"][data-kind="${kind}"] [data-testid="review-badge"][data-status="${status}"]`).first().waitFor();
}

async function askReview(page: Page, kind: 'integral' | 'expect') {
  await badgeOf(page, kind).click();
  const sheet = page.getByTestId('review-sheet');
  await sheet.getByTestId('ask-review').click();
  const choice = sheet.getByTestId('reviewer-choice').filter({ hasText: 'Priya Ramaswamy' });
  await choice.locator('input[type="checkbox"]').check();
  assert.equal(await sheet.getByTestId('reviewer-choice').filter({ hasText: 'Élodie Marchetti' }).count(), 0, 'readers are not offered as reviewers');
  await sheet.getByTestId('send-review-request').click();
  await sheet.getByTestId('review-entry').first().waitFor();
  await sheet.locator('[data-testid="thread-status"][data-status="requested"]').waitFor();
  await page.keyboard.press('Escape');
  await waitForStatus(page, kind, 'requested');
}

test('the author asks the reviewer to review two results of a demo worksheet', async () => {
  const page = await author.newPage();
  await signIn(page, server.url, DEMO.author);
  await page.getByRole('link', { name: /Lindqvist Lab/ }).first().click();
  await page.waitForURL(/\/groups\/\d+/);
  await page.getByRole('link', { name: MIXING }).click();
  await page.waitForURL(/\/worksheets\/\d+/);
  worksheetUrl = page.url();
  await page.locator('[data-testid="editor"][data-ready="true"]').waitFor();
  await waitForStatus(page, 'integral', 'unreviewed');
  await askReview(page, 'integral');
  await askReview(page, 'expect');
  await screenshot(page, 'review-requested');
  await page.close();
});

test('the reviewer confirms one from the queue and disputes the other with a comment', async () => {
  const page = await reviewer.newPage();
  await signIn(page, server.url, DEMO.reviewer);
  await page.getByTestId('account-menu').click();
  await page.getByTestId('review-queue-link').click();
  await page.waitForURL(/\/reviews$/);
  const rows = page.getByTestId('queue-row');
  await rows.first().waitFor();
  assert.equal(await rows.count(), 2);
  assert.match((await rows.first().textContent()) ?? '', /Zmix.*Tobiah Osei/s);
  await screenshot(page, 'review-queue');

  // From the queue to the worksheet, with the thread already open.
  await rows.first().getByTestId('review-worksheet-link').click();
  await page.waitForURL(/\/worksheets\/\d+\?review=Zmix/);
  const sheet = page.getByTestId('review-sheet');
  await sheet.getByTestId('confirm-review').waitFor();
  await sheet.getByTestId('confirm-review').click();
  await sheet.getByTestId('review-comment').fill('Checked the square root branch by hand.');
  await sheet.getByTestId('review-submit').click();
  await sheet.locator('[data-testid="thread-status"][data-status="confirmed"]').waitFor();
  await screenshot(page, 'review-thread-confirmed');
  await page.keyboard.press('Escape');
  await waitForStatus(page, 'integral', 'confirmed');

  // The second one from its card: a dispute needs a comment.
  await badgeOf(page, 'expect').click();
  await sheet.getByTestId('dispute-review').click();
  await sheet.getByTestId('review-submit').click();
  await sheet.getByText('Say what is wrong when you dispute a result.').waitFor();
  await sheet.getByTestId('review-comment').fill('The expectation ignores the sign of g for the branch.');
  await sheet.getByTestId('review-submit').click();
  await sheet.locator('[data-testid="thread-status"][data-status="disputed"]').waitFor();
  assert.match((await sheet.getByTestId('review-entry').first().textContent()) ?? '', /ignores the sign of g/);
  await page.keyboard.press('Escape');
  await waitForStatus(page, 'expect', 'disputed');

  await page.goto(`${server.url}/reviews`);
  await page.getByText('Nothing is waiting for your review.').waitFor();
  await page.close();
});

test('the author sees both verdicts on the cards and in the thread', async () => {
  const page = await author.newPage();
  await page.goto(worksheetUrl);
  await page.locator('[data-testid="editor"][data-ready="true"]').waitFor();
  await waitForStatus(page, 'integral', 'confirmed');
  await waitForStatus(page, 'expect', 'disputed');
  assert.match((await badgeOf(page, 'integral').textContent()) ?? '', /Confirmed/);
  assert.match((await badgeOf(page, 'expect').textContent()) ?? '', /Disputed/);
  await screenshot(page, 'review-cards');
  await badgeOf(page, 'expect').click();
  const sheet = page.getByTestId('review-sheet');
  assert.match((await sheet.textContent()) ?? '', /Priya Ramaswamy/);
  assert.match((await sheet.textContent()) ?? '', /ignores the sign of g/);
  // The author replies in the thread.
  await sheet.getByTestId('review-comment').first().fill('The expectation holds for every real g; see the branch step.');
  await sheet.getByTestId('review-submit').first().click();
  await sheet.getByText('see the branch step').waitFor();
  await screenshot(page, 'review-thread-author');
  await page.keyboard.press('Escape');
  await page.close();
});

test('files: a CSV is attached and listed; a fake PDF is refused in plain words', async () => {
  const page = await author.newPage();
  await page.goto(worksheetUrl);
  await page.getByTestId('open-files').click();
  const sheet = page.getByTestId('files-sheet');
  await sheet.getByTestId('attach-file').setInputFiles({ name: 'table.csv', mimeType: 'text/csv', buffer: Buffer.from('g,value\n0,6.28\n') });
  await sheet.getByTestId('attachment-row').filter({ hasText: 'table.csv' }).waitFor();
  await sheet.getByTestId('attach-file').setInputFiles({ name: 'paper.pdf', mimeType: 'application/pdf', buffer: Buffer.from('not a pdf at all') });
  await sheet.getByTestId('upload-error').filter({ hasText: /read from the content/ }).waitFor();
  await screenshot(page, 'files-sheet');
  await page.keyboard.press('Escape');
  await page.close();
});

test('the LaTeX export downloads and contains the statements and their review status', async () => {
  const page = await author.newPage();
  await page.goto(worksheetUrl);
  await page.getByTestId('export-menu').click();
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-latex').click()]);
  assert.match(download.suggestedFilename(), /\.tex$/);
  const tex = readFileSync((await download.path())!, 'utf8');
  assert.match(tex, /\\documentclass\{article\}/);
  // statement lines are written character by character in typewriter type, so they cannot break out of the appendix
  assert.ok(tex.includes(texSource('integral Zmix = exp(-(m*u^2 + 2*i*g*u*v + m*v^2)/2) d(u, v)')), 'the integral is in the appendix');
  assert.ok(tex.includes(texSource(EXPECT_KEY)), 'the expectation is in the appendix');
  assert.match(tex, /confirmed/i);
  assert.match(tex, /disputed/i);
  await page.close();
});

test('a referee link opens in a fresh browser without an account and shows the findings', async () => {
  const page = await author.newPage();
  await page.goto(worksheetUrl);
  await page.getByTestId('open-referee').click();
  const sheet = page.getByTestId('referee-sheet');
  await sheet.getByTestId('referee-create').click();
  const url = await sheet.getByTestId('referee-url').inputValue();
  assert.match(url, /\/referee\/[A-Za-z0-9_-]{40,}$/);
  await sheet.getByTestId('referee-link-row').first().waitFor();
  await screenshot(page, 'referee-links');
  await page.close();

  const stranger = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const ref = await stranger.newPage();
  // The test server's public address has port 0; the path is what matters.
  await ref.goto(`${server.url}${new URL(url).pathname}`);
  await ref.getByTestId('referee-title').filter({ hasText: MIXING }).waitFor();
  assert.match((await ref.getByTestId('referee-source').textContent()) ?? '', /integral Zmix/);
  await ref.locator('[data-testid="finding-card"][data-kind="integral"] [data-testid="finding-result"][data-rendered="true"]').waitFor();
  assert.ok((await ref.getByTestId('finding-card').count()) >= 3);
  assert.equal(await ref.getByTestId('review-badge').count(), 0, 'the referee view has no review controls');
  assert.equal(await ref.getByTestId('account-menu').count(), 0);
  assert.equal(await ref.locator('.monaco-editor').count(), 0, 'no editor on the referee page');
  await screenshot(ref, 'referee-page');

  await ref.goto(`${server.url}/referee/not-a-real-token`);
  await ref.getByTestId('referee-error').filter({ hasText: 'not valid' }).waitFor();
  await screenshot(ref, 'referee-page-unknown');
  await stranger.close();
});

test('the group page lists the reviews and the activity', async () => {
  const page = await author.newPage();
  await page.goto(worksheetUrl);
  await page.getByTestId('back-to-group').click();
  await page.waitForURL(/\/groups\/\d+$/);
  await page.getByRole('tab', { name: 'Reviews' }).click();
  await page.getByTestId('queue-row').first().waitFor();
  assert.equal(await page.getByTestId('queue-row').count(), 2);
  await screenshot(page, 'group-reviews');
  await page.getByRole('tab', { name: 'Activity' }).click();
  await page.getByTestId('activity-row').first().waitFor();
  const text = (await page.locator('[data-testid="activity-row"]').allTextContents()).join('\n');
  for (const what of ['requested review', 'confirmed', 'disputed', 'attached file', 'created referee link']) {
    assert.ok(text.includes(what), `activity has "${what}"`);
  }
  // downloading an export is a GET and leaves no trace in the activity feed
  assert.ok(!text.includes('exported'), 'an export is not an activity entry');
  await screenshot(page, 'group-activity');
  await page.close();
});
