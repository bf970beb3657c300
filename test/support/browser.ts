import { mkdirSync } from 'node:fs';
import { join } from 'node:path';
import { chromium, type Browser, type Page } from 'playwright-core';

/** Debian's Chromium, headless, with the flags that keep it off the network. */
export function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env['SHEETWISE_CHROMIUM'] ?? '/usr/bin/chromium',
    args: [
      '--headless',
      '--no-sandbox',
      '--disable-gpu',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--no-first-run',
      '--disable-quic',
    ],
  });
}

export async function signIn(page: Page, baseUrl: string, email: string, password = 'sheetwise-demo') {
  await page.goto(`${baseUrl}/sign-in`);
  await page.fill('input[name="email"]', email);
  await page.fill('input[name="password"]', password);
  await page.click('button[type="submit"]');
  await page.waitForURL(/\/groups/);
}

/** Screenshots go under test-results/ (ignored by git) for a person to look at. */
export async function screenshot(page: Page, name: string) {
  const dir = process.env['TEST_OUTPUT_DIR'] ?? 'test-results';
  mkdirSync(dir, { recursive: true });
  await page.screenshot({ path: join(dir, `${name}.png`), fullPage: true });
}

/** The text of the editor model, through the hook the editor puts on its host element. */
export function editorText(page: Page): Promise<string> {
  return page.evaluate(() => (document.querySelector('[data-testid="editor"]') as unknown as { sheetwiseText(): string }).sheetwiseText());
}

/** From the signed-in start page: the demo group, then a worksheet by title, until its editor is ready; its id. */
export async function openDemoWorksheet(page: Page, title: string): Promise<string> {
  await page.getByRole('link', { name: /Lindqvist Lab/ }).first().click();
  await page.waitForURL(/\/groups\/\d+/);
  await page.getByRole('link', { name: title }).click();
  await page.waitForURL(/\/worksheets\/\d+/);
  await page.locator('[data-testid="editor"][data-ready="true"]').waitFor();
  return /\/worksheets\/(\d+)/.exec(page.url())![1]!;
}
