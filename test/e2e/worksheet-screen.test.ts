// End to end in Debian's Chromium: the worksheet screen with Monaco, live findings, the
// complex-plane diagram, autosave, the conflict view, accessibility and both themes.
import assert from 'node:assert/strict';
import { copyFileSync, mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { after, before, test } from 'node:test';
import type { Browser, Page } from 'playwright-core';
import { DEMO } from '../support/api-client.js';
import { launchBrowser, screenshot, signIn, editorText, openDemoWorksheet } from '../support/browser.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let browser: Browser;
const outDir = process.env['TEST_OUTPUT_DIR'] ?? 'test-results';

before(async () => {
  server = await startTestServer({ CLIENT_DIR: 'dist/sheetwise/browser' });
  browser = await launchBrowser();
});
after(async () => {
  await browser?.close();
  await server?.stop();
});

const MIXING = 'Two modes with an imaginary mixing term';

async function openWorksheet(page: Page, title: string): Promise<string> {
  return openDemoWorksheet(page, title);
}

function editorMarkers(page: Page): Promise<{ line: number; column: number; message: string }[]> {
  return page.evaluate(() =>
    (document.querySelector('[data-testid="editor"]') as unknown as { sheetwiseMarkers(): { line: number; column: number; message: string }[] }).sheetwiseMarkers(),
  );
}

/** Type lines at the end of the source, as a person would (closing any completion list first). */
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

/** Replace the text of one line (1-based): its card's head puts the editor's cursor there. */
async function replaceLine(page: Page, line: number, text: string) {
  await card(page, line).locator('button.goto').click();
  await page.keyboard.press('Home');
  await page.keyboard.press('Shift+End');
  await page.keyboard.type(text, { delay: 5 });
  await page.keyboard.press('Escape');
}

const card = (page: Page, line: number) => page.locator(`[data-testid="finding-card"][data-line="${line}"]`);

/** The text is kept: saved as a version, or (autosave) kept as a draft on the server. */
async function waitSaved(page: Page) {
  await page.getByTestId('save-status').filter({ hasText: /^\s*\S*\s*(Saved · version|Draft kept)/ }).waitFor({ timeout: 15_000 });
}

/** Save a version now (autosave keeps drafts; a version is a checkpoint). */
async function saveVersion(page: Page) {
  await page.getByTestId('save-worksheet').click();
  await page.getByTestId('save-status').filter({ hasText: /^\s*\S*\s*Saved · version/ }).waitFor({ timeout: 15_000 });
}

test('the demo author sees the findings, types an integral and gets its KaTeX result and steps', async () => {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  await openWorksheet(page, MIXING);
  assert.match(await editorText(page), /integral Zmix/);
  // The findings of the saved version, one card per statement in source order.
  await card(page, 6).waitFor({ timeout: 30_000 });
  const lines = await page.getByTestId('finding-card').evaluateAll((els) => els.map((e) => Number(e.getAttribute('data-line'))));
  assert.deepEqual(lines, [...lines].sort((a, b) => a - b));

  const before = (await editorText(page)).split('\n').filter((l, i, all) => i < all.length - 1 || l).length;
  await typeAtEnd(page, ['integral Zone = exp(-m*s^2/2) d(s)']);
  const newLine = before + 1;
  const fresh = card(page, newLine);
  await fresh.waitFor({ timeout: 30_000 });
  await fresh.locator('[data-testid="finding-result"] .katex').waitFor({ timeout: 15_000 });
  await fresh.locator('button.goto').click();
  assert.ok((await fresh.getByTestId('finding-step').count()) >= 2, 'the steps of the record are listed');
  assert.match(await fresh.locator('[data-badge="convergence"]').innerText(), /Converges absolutely/);
  // The plane shows only what the report's diagram data gives (the client draws nothing of its
  // own); an integral's record carries the principal cut and the eigenvalues of A.
  await page.getByTestId('diagram').locator('[data-panel="spectral"] [data-role="cut"]').first().waitFor({ state: 'attached' });
  await waitSaved(page);
  await screenshot(page, 'worksheet-screen-light');
  mkdirSync('docs', { recursive: true });
  copyFileSync(join(outDir, 'worksheet-screen-light.png'), 'docs/worksheet-screen.png');

  // Dark theme.
  await page.getByTestId('theme-toggle').click();
  await page.waitForFunction(() => document.documentElement.classList.contains('sw-dark'));
  await screenshot(page, 'worksheet-screen-dark');
  await page.getByTestId('theme-toggle').click();
  await context.close();
});

test('a syntax error shows as a marker and on its card; the other cards stay; fixed, it goes; reload keeps the text', async () => {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  await openWorksheet(page, 'Driven mode with a complex stiffness');
  await card(page, 5).waitFor({ timeout: 30_000 });
  const text = await editorText(page);
  const lineCount = text.endsWith('\n') ? text.split('\n').length - 1 : text.split('\n').length;
  const errLine = lineCount + 1;
  await typeAtEnd(page, ['param q : sideways']);
  const bad = card(page, errLine);
  await bad.getByTestId('finding-error').waitFor({ timeout: 30_000 });
  assert.ok((await bad.getByTestId('finding-error').innerText()).length > 10, 'the error is in words');
  assert.ok((await page.getByTestId('finding-card').count()) > 1, 'the other cards stay');
  const markers = await editorMarkers(page);
  assert.ok(markers.some((m) => m.line === errLine), `a marker on line ${errLine}: ${JSON.stringify(markers)}`);
  await page.locator('[data-testid="editor"] .squiggly-error').first().waitFor();
  await screenshot(page, 'worksheet-syntax-error');

  await replaceLine(page, errLine, 'param q : real');
  // Fixed, the line is a parameter: it joins the summary of the declared domains.
  await page.waitForFunction(
    (l) => !document.querySelector(`[data-testid="finding-card"][data-line="${l}"]`) &&
      !!document.querySelector(`[data-testid="param-summary"] [data-testid="param-entry"][data-line="${l}"]`),
    errLine,
    { timeout: 30_000 },
  );
  assert.equal((await editorMarkers(page)).filter((m) => m.line === errLine).length, 0);
  await waitSaved(page);
  await page.reload();
  await page.locator('[data-testid="editor"][data-ready="true"]').waitFor();
  assert.ok((await editorText(page)).includes('param q : real'), 'the text is saved');
  await context.close();
});

test('a second browser saves meanwhile: the first sees both versions and keeps its own', async () => {
  const ctxA = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const ctxB = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const a = await ctxA.newPage();
  const b = await ctxB.newPage();
  await signIn(a, server.url, DEMO.author);
  await signIn(b, server.url, DEMO.owner);
  await openWorksheet(a, 'Free particle in three time slices');
  await openWorksheet(b, 'Free particle in three time slices');
  await typeAtEnd(b, ['note "Saved by the second browser"']);
  await saveVersion(b);
  await typeAtEnd(a, ['note "Typed in the first browser"']);
  await a.getByTestId('save-worksheet').click();
  await a.getByTestId('save-conflict').waitFor({ timeout: 15_000 });
  await a.locator('[data-testid="conflict-diff"][data-ready="true"]').waitFor();
  await a.getByTestId('conflict-diff').getByText('Saved by the second browser').first().waitFor();
  await screenshot(a, 'worksheet-conflict');
  await a.getByTestId('keep-mine').click();
  await waitSaved(a);
  assert.equal(await a.getByTestId('save-conflict').count(), 0);
  assert.match(await editorText(a), /Typed in the first browser/);
  await ctxA.close();
  await ctxB.close();
});

test('a continuation draws its path with numbered events on the diagram', async () => {
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  await openWorksheet(page, MIXING);
  await card(page, 6).waitFor({ timeout: 30_000 });
  const text = await editorText(page);
  const lineCount = text.endsWith('\n') ? text.split('\n').length - 1 : text.split('\n').length;
  // Round the branch point at g = i*m on its right (a straight path would run into it).
  await typeAtEnd(page, ['continue Zmix : g along 0 -> m/2 + i*m -> 2*i*m at m = 1']);
  const cont = card(page, lineCount + 1);
  await cont.waitFor({ timeout: 30_000 });
  await cont.locator('button.goto').click();
  const diagram = page.getByTestId('diagram');
  // Two planes, each on its own axes with its title: the parameter plane and the eigenvalue / det A plane.
  const param = diagram.locator('section[data-panel="parameter"]');
  const spectral = diagram.locator('section[data-panel="spectral"]');
  await param.locator('[data-role="continuation"]').waitFor({ state: 'attached', timeout: 15_000 });
  assert.match(await param.locator('h3').innerText(), /Parameter plane of g/);
  assert.match(await spectral.locator('h3').innerText(), /eigenvalues of A and of det A/);
  assert.match(await spectral.getByTestId('panel-subtitle').innerText(), /eigenvalues at the end point, .*g/);
  assert.equal(await spectral.locator('[data-role="continuation"]').count(), 0, 'the path is not drawn in the eigenvalue plane');
  assert.equal(await param.locator('[data-role="track"]').count(), 0, 'the tracks are not drawn in the parameter plane');
  assert.ok((await spectral.locator('[data-role="track"]').count()) >= 2, 'eigenvalue tracks');
  assert.equal(await spectral.locator('[data-role="det-track"]').count(), 1, "det A's own track");
  assert.equal(await spectral.locator('[data-role="cut"]').count(), 1, 'the principal cut');
  // Events carry the numbers of the card's steps, never one beyond them.
  const steps = await cont.getByTestId('finding-step').count();
  const numbers = (await param.locator('[data-role="event"]').evaluateAll((els) => els.map((e) => e.getAttribute('data-step') ?? '')))
    .flatMap((s) => s.split(',').filter(Boolean).map(Number));
  assert.ok(numbers.length >= 1, 'events are marked');
  assert.ok(numbers.every((n) => n >= 2 && n <= steps), `event numbers ${numbers} within the ${steps} steps`);
  // The legend is outside the plots.
  assert.equal(await diagram.locator('svg [data-role="legend-item"]').count(), 0);
  assert.ok((await spectral.locator('ul.legend [data-role="legend-item"]').count()) >= 3);
  // Overlapping eigenvalue labels are merged: no two eigenvalue marks closer than the merge radius.
  const marks = await spectral.locator('[data-role="eigenvalue"]').evaluateAll((els) => els.map((e) => e.getAttribute('transform')));
  assert.equal(new Set(marks).size, marks.length);
  const description = await param.getByTestId('diagram-description').textContent();
  assert.match(description ?? '', /Step \d+/);
  await diagram.scrollIntoViewIfNeeded();
  await screenshot(page, 'worksheet-continuation');
  await context.close();
});

// A worksheet of its own per width, untouched by the other tests (no draft of theirs restored).
const LAYOUTS: [number, string][] = [
  [1440, 'Continuing the mixing past its branch point'],
  [1024, 'Three damped modes where the principal root fails'],
  [800, 'Rotating an oscillatory mode onto a decaying one'],
];
for (const [width, title] of LAYOUTS) {
  test(`at ${width} px the findings are beside the source, the page ends with its content, and the save state moves nothing`, async () => {
    const context = await browser.newContext({ viewport: { width, height: 900 } });
    const page = await context.newPage();
    await signIn(page, server.url, DEMO.author);
    await openWorksheet(page, title);
    await page.locator('[data-testid="finding-card"] [data-testid="finding-result"] .katex').first().waitFor({ timeout: 30_000 });
    // The last statement with a plane is drawn (a continuation shows both of its planes).
    const last = page.locator('[data-testid="finding-card"]').last();
    await last.locator('button.goto').click();
    const box = async (sel: string) => (await page.locator(sel).first().boundingBox())!;
    const editor = await box('[data-testid="editor"]');
    const findings = await box('section.findings');
    const beside = findings.x >= editor.x + editor.width - 1 && findings.y < editor.y + editor.height;
    const above = findings.y + findings.height <= editor.y + 1;
    assert.ok(beside || above, `findings ${JSON.stringify(findings)} beside or above the editor ${JSON.stringify(editor)}`);
    // No blank scroll area: the page is as tall as what is on it.
    const { scroll, content } = await page.evaluate(() => {
      let bottom = 0;
      // The boxes that make the page: its head and the three parts of the columns.
      for (const el of document.querySelectorAll('.sw-page > .head, .columns > section')) bottom = Math.max(bottom, el.getBoundingClientRect().bottom + window.scrollY);
      return { scroll: document.documentElement.scrollHeight, content: bottom };
    });
    assert.ok(scroll - content < 120, `page ${scroll}px tall for content ending at ${Math.round(content)}px`);
    // The save state appears without moving the page.
    // Measured in the document (not the viewport), so that a scroll is not taken for a shift.
    const columnsTop = () =>
      page.evaluate(() => {
        let y = 0;
        for (let e = document.querySelector<HTMLElement>('.columns'); e; e = e.offsetParent as HTMLElement | null) y += e.offsetTop;
        return y;
      });
    const top = await columnsTop();
    await page.locator('[data-testid="editor"] .view-lines').click();
    await page.keyboard.press('Control+End');
    await page.keyboard.type(' ');
    await page.getByTestId('save-status').filter({ hasText: /Unsaved|Saving|Saved|draft/i }).waitFor({ timeout: 10_000 });
    await screenshot(page, `worksheet-layout-${width}`);
    assert.equal(await columnsTop(), top, 'the columns did not move');
    await page.keyboard.press('Backspace');
    await context.close();
  });
}

test('the worksheet page has no serious or critical accessibility violation (axe-core), light and dark', async () => {
  // bypassCSP only so that the test can inject axe-core; the page itself runs under its CSP.
  const context = await browser.newContext({ viewport: { width: 1440, height: 900 }, bypassCSP: true });
  const page = await context.newPage();
  await signIn(page, server.url, DEMO.author);
  await openWorksheet(page, MIXING);
  await page.getByTestId('evaluation-status').filter({ hasText: /\S/ }).waitFor({ timeout: 30_000 });
  await page.addScriptTag({ path: 'node_modules/axe-core/axe.min.js' });
  for (const dark of [false, true]) {
    if (dark) {
      await page.getByTestId('theme-toggle').click();
      await page.waitForFunction(() => document.documentElement.classList.contains('sw-dark'));
      // Let the colour transitions finish: read mid-way, a label has neither theme's contrast.
      await page.waitForTimeout(800);
    }
    const violations = await page.evaluate(async () => {
      const axe = (window as unknown as { axe: { run(ctx: unknown, opts: unknown): Promise<{ violations: { id: string; impact: string; nodes: { target: string[] }[] }[] }> } }).axe;
      // Monaco's own internals are excluded: its text area and widgets are its accessibility surface.
      const result = await axe.run({ exclude: [['.monaco-editor .view-lines'], ['.monaco-editor .margin']] }, { resultTypes: ['violations'] });
      return result.violations.map((v) => ({ id: v.id, impact: v.impact, nodes: v.nodes.slice(0, 3).map((n) => n.target.join(' ')) }));
    });
    const serious = violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
    assert.deepEqual(serious, [], `${dark ? 'dark' : 'light'}: ${JSON.stringify(serious, null, 1)}`);
  }
  await context.close();
});
