import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { DEMO_PASSWORD, REPO_ROOT } from './server.js';

export const SCREENSHOTS = path.join(REPO_ROOT, 'test-results', 'screenshots');

/** Debian's Chromium, headless, with a fresh temporary profile (playwright makes one); never a downloaded browser. */
export async function launchChromium(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-dev-shm-usage',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--no-first-run',
      '--disable-quic',
    ],
  });
}

/** A tablet in landscape, the recorder's usual device. */
export const TABLET = { width: 1180, height: 820 };

export async function newContext(browser: Browser, baseUrl: string, viewport = TABLET): Promise<BrowserContext> {
  return browser.newContext({ baseURL: baseUrl, viewport, locale: 'en-GB', timezoneId: 'UTC' });
}

export async function signInAs(page: Page, username: string, password = DEMO_PASSWORD): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('Username').fill(username);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('home-heading').waitFor();
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOTS, { recursive: true });
  const file = path.join(SCREENSHOTS, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}
