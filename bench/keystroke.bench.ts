// Keystroke to updated card in headless Chromium (a benchmark, not a test): 20 edits,
// each adding one integral at the end of a demo worksheet; the time runs from the edit
// to the moment that integral's card shows its result. Includes the editor's pause
// before evaluating (EVALUATE_DELAY_MS in the worksheet page) and the server round trip.
import { DEMO } from '../test/support/api-client.js';
import { launchBrowser, signIn } from '../test/support/browser.js';
import { startTestServer } from '../test/support/test-server.js';

const server = await startTestServer({ CLIENT_DIR: process.env['BENCH_CLIENT_DIR'] ?? 'dist/sheetwise/browser' });
const browser = await launchBrowser();
const times: number[] = [];
try {
  // bypassCSP only so that the measuring predicate can run; the app is unchanged.
  const page = await browser.newPage({ viewport: { width: 1366, height: 900 }, bypassCSP: true });
  await signIn(page, server.url, DEMO.author);
  await page.getByRole('link', { name: /Lindqvist Lab/ }).first().click();
  await page.getByRole('link', { name: 'Driven mode with a complex stiffness' }).click();
  await page.locator('[data-testid="editor"][data-ready="true"]').waitFor();
  await page.locator('[data-testid="finding-card"]').first().waitFor();
  await page.locator('[data-testid="editor"] .view-lines').click();
  await page.keyboard.press('Control+End');
  for (let n = 1; n <= 20; n++) {
    const name = `Wbench${n}`;
    // One edit, as a keystroke delivers it, then wait (polling every animation frame)
    // for that integral's card with its result. Plain JavaScript text for the page:
    // the TypeScript loader would add helpers the page lacks.
    const t0 = performance.now();
    await page.keyboard.insertText(`\nintegral ${name} = exp(-${n}*q^2/2) d(q)`);
    await page.waitForFunction(
      `[...document.querySelectorAll('[data-testid="finding-card"]')].some((c) => c.textContent.includes(${JSON.stringify(name)}) && c.querySelector('[data-testid="finding-result"]'))`,
      undefined,
      { polling: 'raf', timeout: 20_000 },
    );
    const ms = performance.now() - t0;
    times.push(ms);
    await page.waitForTimeout(200);
  }
} finally {
  await browser.close();
  await server.stop();
}
times.sort((a, b) => a - b);
const median = (times[9]! + times[10]!) / 2;
console.log(`keystroke to card, 20 edits: median ${median.toFixed(0)} ms, min ${times[0]!.toFixed(0)} ms, max ${times[19]!.toFixed(0)} ms`);
console.log(`BENCH_JSON ${JSON.stringify({ keystrokeToCard: { medianMs: median, allMs: times } })}`);
