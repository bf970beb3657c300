// Keystroke to updated card in headless Chromium (a benchmark, not a test): 20 edits,
// each adding one integral at the end of a demo worksheet; the time runs from the edit
// to the moment that integral's card shows its result. Includes the editor's pause
// before evaluating (EVALUATE_DELAY_MS in the worksheet page) and the server round trip.
import { DEMO } from '../test/support/api-client.js';
import { launchBrowser, signIn } from '../test/support/browser.js';
import { startTestServer } from '../test/support/test-server.js';

const server = await startTestServer({ CLIENT_DIR: 'dist/sheetwise/browser' });
const browser = await launchBrowser();
const times: number[] = [];
try {
  const page = await browser.newPage({ viewport: { width: 1366, height: 900 } });
  await signIn(page, server.url, DEMO.author);
  await page.getByRole('link', { name: /Lindqvist Lab/ }).first().click();
  await page.getByRole('link', { name: 'Driven mode with a complex stiffness' }).click();
  await page.locator('[data-testid="editor"][data-ready="true"]').waitFor();
  await page.locator('[data-testid="finding-card"]').first().waitFor();
  await page.locator('[data-testid="editor"] .view-lines').click();
  await page.keyboard.press('Control+End');
  for (let n = 1; n <= 20; n++) {
    const name = `Wbench${n}`;
    const ms = await page.evaluate(async (resultName) => {
      const cardFor = () =>
        [...document.querySelectorAll('[data-testid="finding-card"]')].find(
          (c) => c.textContent?.includes(resultName) && c.querySelector('[data-testid="finding-result"]'),
        );
      const t0 = performance.now();
      await new Promise<void>((resolve) => {
        const observer = new MutationObserver(() => {
          if (cardFor()) {
            observer.disconnect();
            resolve();
          }
        });
        observer.observe(document.body, { subtree: true, childList: true, characterData: true });
        // One edit, as a keystroke delivers it: the editor's own input path.
        document.execCommand('insertText', false, `\nintegral ${resultName} = exp(-${resultName.length}*q^2/2) d(q)`);
      });
      return performance.now() - t0;
    }, name);
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
