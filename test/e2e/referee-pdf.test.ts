// End to end in Debian's Chromium (issue 14): the referee page wraps long source lines
// (nothing is cut, the page does not scroll sideways), shows the complex-plane diagram,
// and offers the record as a PDF made by the server's pdflatex.
import assert from 'node:assert/strict';
import { readFileSync } from 'node:fs';
import { after, before, test } from 'node:test';
import type { Browser } from 'playwright-core';
import { ApiClient, DEMO } from '../support/api-client.js';
import { launchBrowser, screenshot } from '../support/browser.js';
import { ensureTex } from '../support/tex.js';
import { startTestServer, type TestServer } from '../support/test-server.js';

let server: TestServer;
let browser: Browser;

before(async () => {
  ensureTex();
  server = await startTestServer({ CLIENT_DIR: 'dist/sheetwise/browser' });
  browser = await launchBrowser();
});
after(async () => {
  await browser?.close();
  await server?.stop();
});

test('long lines wrap, the diagram shows, the PDF downloads', async () => {
  const author = new ApiClient(server.url);
  await author.login(DEMO.author);
  const groupId = (await author.get('/api/groups')).json.groups[0].id;
  const longNote = `note "${'A long remark that a referee must be able to read to its very end without scrolling sideways; '.repeat(3)}THE-END"`;
  const source = `param m : positive\nparam g : real\nintegral Zmix = exp(-(m*u^2 + 2*i*g*u*v + m*v^2)/2) d(u, v)\n${longNote}\n`;
  const id = (await author.post(`/api/groups/${groupId}/worksheets`, { title: 'For the referee', source })).json.worksheet.id;
  const link = (await author.post(`/api/worksheets/${id}/referee-links`, { days: 7 })).json.link;

  for (const width of [1440, 800]) {
    const context = await browser.newContext({ viewport: { width, height: 900 }, acceptDownloads: true });
    const page = await context.newPage();
    await page.goto(link.url.replace(/^https?:\/\/[^/]+/, server.url));
    await page.getByTestId('referee-title').waitFor();
    const src = page.getByTestId('referee-source');
    const fits = await src.evaluate((el) => el.scrollWidth <= el.clientWidth + 1);
    assert.ok(fits, `at ${width} px the source does not scroll sideways`);
    const lineHeights = await src.locator('.ln').evaluateAll((els) => els.map((e) => e.getBoundingClientRect().height));
    assert.ok(lineHeights[3]! > lineHeights[0]! * 1.8, 'the long line wraps onto more than one row');
    assert.ok((await src.innerText()).includes('THE-END'), 'nothing is cut');
    assert.equal(await page.evaluate(() => document.documentElement.scrollWidth <= window.innerWidth + 1), true, 'the page does not scroll sideways');
    // The diagram of the integral (the existing component, fed the referee's report).
    const diagram = page.getByTestId('referee-diagram').getByTestId('diagram');
    await diagram.waitFor({ timeout: 30_000 });
    assert.ok((await diagram.locator('svg').count()) > 0, 'the plane is drawn');
    await screenshot(page, `referee-page-${width}`);

    if (width === 1440) {
      const [download] = await Promise.all([page.waitForEvent('download', { timeout: 60_000 }), page.getByTestId('referee-pdf').click()]);
      assert.equal(download.suggestedFilename(), `For-the-referee-v1.pdf`);
      const bytes = readFileSync((await download.path())!);
      assert.equal(bytes.subarray(0, 5).toString('latin1'), '%PDF-');
    }
    await context.close();
  }
});
