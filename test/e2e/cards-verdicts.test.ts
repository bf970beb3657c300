// End to end in Debian's Chromium: what a card's head says (a rotation that is not allowed, a
// check that agrees), the problem count, the compact parameter summary, review badges only on
// findings, and the one-click numeric check that adds a verify line for a result.
import assert from 'node:assert/strict';
import { after, before, test } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { DEMO } from '../support/api-client.js';
import { launchBrowser, screenshot, signIn, editorText, openDemoWorksheet } from '../support/browser.js';
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

const MIXING = 'Two modes with an imaginary mixing term';

async function openWorksheet(page: Page, title: string): Promise<void> {
  await openDemoWorksheet(page, title);
}

async function typeAtEnd(page: Page, lines: string[]) {
  await page.locator('[data-testid="editor"] .view-lines').click();
  await page.keyboard.press('Control+End');
  for (const line of lines) {
    if (!(await editorText(page)).endsWith('\n')) {
      await page.keyboard.press('Escape');
      await page.keyboard.press('End');
      await page.keyboard.press('Enter');
      await page.keyboard.press('Home');
    }
    await page.keyboard.type(line, { delay: 5 });
    await page.keyboard.press('Escape');
  }
}

const card = (page: Page, line: number) => page.locator(`[data-testid="finding-card"][data-line="${line}"]`);
const lineCount = (text: string) => (text.endsWith('\n') ? text.split('\n').length - 1 : text.split('\n').length);

test('a rotation that is not allowed says so in its head and counts as a problem; parameters are one summary; review badges only on findings', async () => {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  await openWorksheet(page, MIXING);
  await card(page, 6).waitFor({ timeout: 30_000 });

  // The two parameter lines are one compact summary, not a card each.
  const entries = page.getByTestId('param-summary').getByTestId('param-entry');
  assert.deepEqual(await entries.evaluateAll((els) => els.map((e) => e.getAttribute('data-line'))), ['4', '5']);
  assert.equal(await page.locator('[data-testid="finding-card"][data-kind="param"]').count(), 0);
  await entries.first().locator('.katex').waitFor();
  const summaryBox = (await page.getByTestId('param-summary').boundingBox())!;
  assert.ok(summaryBox.height < 90, `the summary is compact (${summaryBox.height}px)`);

  // Review badges on the integral and the expectation, none on the note.
  assert.equal(await card(page, 6).getByTestId('review-badge').count(), 1);
  assert.equal(await card(page, 7).getByTestId('review-badge').count(), 1);
  assert.equal(await card(page, 8).getByTestId('review-badge').count(), 0);
  assert.equal(await page.getByTestId('param-summary').getByTestId('review-badge').count(), 0);

  // The result's name is set by KaTeX, a many-letter name upright as one word.
  const latex = await card(page, 6).getByTestId('finding-result').getAttribute('data-latex');
  assert.match(latex ?? '', /^\\mathrm\{Zmix\} = /);

  const n = lineCount(await editorText(page));
  await typeAtEnd(page, ['integral G = exp(-x^2) d(x)', 'rotate G : x -> exp(i*pi/3)*x as GB']);
  const rot = card(page, n + 2);
  await rot.getByTestId('card-verdict').filter({ hasText: 'Not allowed' }).waitFor({ timeout: 30_000 });
  const head = await rot.getByTestId('card-verdict').innerText();
  assert.doesNotMatch(head, /Done/);
  assert.equal(await rot.getByTestId('card-verdict').locator('.material-symbols-outlined').innerText(), 'block');
  assert.match(await rot.getAttribute('class') ?? '', /\bproblem\b/);
  await page.getByTestId('evaluation-status').filter({ hasText: '1 problem' }).waitFor({ timeout: 15_000 });
  assert.match(await page.getByTestId('findings-summary').textContent() ?? '', /1 problem \(line \d+: Rotation GB, not allowed\)/);
  // The editor marks the line with the legality sentence of the record.
  await rot.locator('button.goto').click();
  await screenshot(page, 'cards-rotation-not-allowed');
  await context.close();
});

test("one click adds a numeric check under a result, and the result's badge then reads it", async () => {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  await openWorksheet(page, MIXING);
  const z = card(page, 6);
  await z.waitFor({ timeout: 30_000 });
  assert.match(await z.locator('[data-badge="numeric"]').innerText(), /Numeric check not run/);
  await z.getByTestId('check-numerically').click();
  await page.waitForFunction(() => {
    const text = (document.querySelector('[data-testid="editor"]') as unknown as { sheetwiseText(): string }).sheetwiseText();
    return text.split('\n')[6] === 'verify Zmix at m = 1, g = 1/2';
  }, undefined, { timeout: 10_000 });
  // The verify line is evaluated, and the integral's own badge reads it.
  await card(page, 7).getByTestId('card-verdict').filter({ hasText: 'Agrees' }).waitFor({ timeout: 60_000 });
  await z.locator('[data-badge="numeric"]').filter({ hasText: 'Numeric check agrees' }).waitFor({ timeout: 15_000 });
  assert.equal(await z.getByTestId('check-numerically').count(), 0);
  // The badge's sentence names the line of the check.
  await z.locator('button[data-badge="numeric"]').click();
  assert.match(await z.getByTestId('badge-detail').innerText(), /verify on line 7/);
  await screenshot(page, 'cards-numeric-check');
  await context.close();
});
