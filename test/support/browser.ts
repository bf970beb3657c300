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
