// End to end in Debian's Chromium: the keyboard on the worksheet page. Esc then Tab leaves the
// editor (and Esc then Shift+Tab goes back); Enter always ends the line, even with the
// completion list open; Tab accepts a completion; the cards, their badges and the diagram are
// reached with Tab and work with Enter and their keys; the keys sheet lists Esc, then Tab.
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
  await page.locator('[data-testid="finding-card"][data-line="6"]').waitFor({ timeout: 30_000 });
}

/** Where the focus is: inside the editor, or the element's test id / role / tag. */
function focusWhere(page: Page): Promise<{ inEditor: boolean; testid: string | null; tag: string; badge: string | null; panel: string | null; text: string }> {
  return page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null;
    return {
      inEditor: !!el?.closest('[data-testid="editor"]'),
      testid: el?.getAttribute('data-testid') ?? null,
      tag: el?.tagName.toLowerCase() ?? '',
      badge: el?.getAttribute('data-badge') ?? null,
      panel: el?.getAttribute('data-panel') ?? null,
      text: (el?.textContent ?? '').trim().slice(0, 60),
    };
  });
}

/** A new last line in the editor, the cursor on it. */
async function newLastLine(page: Page) {
  await page.locator('[data-testid="editor"] .view-lines').click();
  await page.keyboard.press('Control+End');
  if (!(await editorText(page)).endsWith('\n')) await page.keyboard.press('Enter');
}

const suggest = (page: Page) => page.locator('[data-testid="editor"] .suggest-widget.visible, .monaco-editor-overflowing-widgets .suggest-widget.visible, .suggest-widget.visible').first();

test('Esc then Tab leaves the editor, Esc then Shift+Tab goes back up; Tab alone stays in it', async () => {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  await openWorksheet(page, MIXING);
  await page.locator('[data-testid="editor"] .view-lines').click();
  assert.ok((await focusWhere(page)).inEditor, 'the editor has the focus');
  const before = await editorText(page);

  await page.keyboard.press('Escape');
  await page.keyboard.press('Tab');
  const out = await focusWhere(page);
  assert.equal(out.inEditor, false, `Esc, Tab leaves the editor (focus on ${JSON.stringify(out)})`);
  assert.equal(await editorText(page), before, 'no indent was typed');

  await page.locator('[data-testid="editor"] .view-lines').click();
  await page.keyboard.press('Escape');
  await page.keyboard.press('Shift+Tab');
  const up = await focusWhere(page);
  assert.equal(up.inEditor, false, 'Esc, Shift+Tab leaves the editor upwards');
  assert.equal(await editorText(page), before);

  // Tab alone still works inside the editor (it indents there).
  await page.locator('[data-testid="editor"] .view-lines').click();
  await page.keyboard.press('Control+End');
  await page.keyboard.press('Tab');
  assert.ok((await focusWhere(page)).inEditor, 'Tab alone keeps the focus in the editor');
  await page.keyboard.press('Control+z');

  // The keys sheet lists it.
  await page.keyboard.press('F1');
  const sheet = page.getByTestId('help-sheet');
  await sheet.waitFor();
  assert.match(await sheet.innerText(), /Esc, then Tab/);
  await page.keyboard.press('Escape');
  await context.close();
});

test('Enter always ends the line, even with the completion list open; Tab accepts a completion', async () => {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  await openWorksheet(page, MIXING);
  await newLastLine(page);
  const start = (await editorText(page)).split('\n').length - 1;

  // The case reported: "param g : real" + Enter gave "realintegral …".
  await page.keyboard.type('param q : rea', { delay: 20 });
  await page.keyboard.press('Control+Space');
  await suggest(page).waitFor({ timeout: 10_000 });
  await page.keyboard.type('l', { delay: 20 });
  await page.keyboard.press('Enter');
  await page.keyboard.type('integral Q = exp(-q^2*x^2) d(x)', { delay: 5 });
  await page.keyboard.press('Escape');
  let lines = (await editorText(page)).split('\n');
  assert.equal(lines[start]!.trim(), 'param q : real', `Enter ended the line: ${JSON.stringify(lines.slice(start))}`);
  assert.equal(lines[start + 1]!.trim(), 'integral Q = exp(-q^2*x^2) d(x)');

  // With a partial word and the list open, Enter still only ends the line.
  await page.keyboard.press('End');
  await page.keyboard.press('Enter');
  await page.keyboard.type('param r : posi', { delay: 20 });
  await page.keyboard.press('Control+Space');
  await suggest(page).waitFor({ timeout: 10_000 });
  await screenshot(page, 'keyboard-completion-open');
  await page.keyboard.press('Enter');
  lines = (await editorText(page)).split('\n');
  assert.equal(lines[start + 2]!.trim(), 'param r : posi', 'Enter did not accept the completion');

  // Tab accepts it.
  await page.keyboard.press('Backspace');
  await page.keyboard.press('Control+Space');
  await suggest(page).waitFor({ timeout: 10_000 });
  await page.keyboard.press('Tab');
  lines = (await editorText(page)).split('\n');
  assert.equal(lines[start + 2]!.trim(), 'param r : positive', `Tab accepted the completion: ${JSON.stringify(lines.slice(start))}`);
  await context.close();
});

test('cards, badges and the diagram are reached with Tab and work from the keyboard', async () => {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  await openWorksheet(page, MIXING);
  await page.locator('[data-testid="editor"] .view-lines').click();
  await page.keyboard.press('Escape');
  await page.keyboard.press('Tab');
  const seen: Awaited<ReturnType<typeof focusWhere>>[] = [];
  for (let k = 0; k < 40; k++) {
    const at = await focusWhere(page);
    seen.push(at);
    if (at.tag === 'svg') break;
    await page.keyboard.press('Tab');
  }
  assert.ok(seen.some((s) => s.testid === 'param-entry'), 'a parameter of the summary');
  assert.ok(seen.some((s) => s.tag === 'button' && s.text.includes('Line 6')), "a card's head");
  assert.ok(seen.some((s) => s.badge === 'convergence'), 'a verdict badge');
  assert.ok(seen.some((s) => s.testid === 'review-badge'), 'a review badge');
  assert.ok(seen.some((s) => s.tag === 'svg' && s.panel === 'spectral'), `the diagram: ${JSON.stringify(seen.map((s) => s.testid ?? s.tag))}`);

  // The diagram's keys: N steps to a mark and says what it is.
  await page.keyboard.press('n');
  const note = page.locator('section[data-panel="spectral"] [data-testid="diagram-mark"]');
  await note.filter({ hasText: /Mark 1 of \d+: Eigenvalue/ }).waitFor({ timeout: 5_000 });
  await page.keyboard.press('+');
  await page.locator('[data-testid="diagram-panel"] button', { hasText: 'Reset view' }).waitFor();
  await page.keyboard.press('0');

  // A badge works with Enter: its sentence shows under the badges.
  await page.locator('[data-testid="finding-card"][data-line="6"] button[data-badge="branch"]').focus();
  await page.keyboard.press('Enter');
  await page.locator('[data-testid="finding-card"][data-line="6"] [data-testid="badge-detail"]').waitFor();
  // A card's head works with Enter: the editor goes to its line.
  await page.locator('[data-testid="finding-card"][data-line="7"] button.goto').focus();
  await page.keyboard.press('Enter');
  assert.ok((await focusWhere(page)).inEditor, "Enter on a card's head puts the cursor on its line");
  await screenshot(page, 'keyboard-badge-detail');
  await context.close();
});
