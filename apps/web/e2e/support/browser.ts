import { mkdirSync } from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { afterAll, beforeAll } from 'vitest';
import { expectAccessible } from './axe.js';
import { DEMO_PASSWORD, REPO_ROOT, startServer, type RunningServer } from './server.js';

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
  await page.getByLabel('Username').waitFor();
  await expectAccessible(page, 'sign-in');
  await page.getByLabel('Username').fill(username);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('home-heading').waitFor();
  await expectAccessible(page, 'home');
}

// otplib is the server's dependency; the tests compute codes with it exactly as a phone would.
const otplib = createRequire(path.join(REPO_ROOT, 'apps/server/package.json'))('otplib') as {
  generate(options: { secret: string; epoch?: number }): Promise<string>;
};
/** Authenticator secrets enrolled by the tests, per server and person, with the last time step used. */
const authenticators = new Map<string, { secret: string; lastStep: number }>();

/** A code as the phone would show it; the server takes each 30-second step once, so wait for a fresh one if needed. */
export async function authenticatorCode(page: Page, username: string): Promise<string> {
  const auth = authenticators.get(`${new URL(page.url()).origin}|${username}`);
  if (!auth) throw new Error(`No authenticator enrolled by the tests for ${username}`);
  const now = Math.floor(Date.now() / 30_000);
  const step = Math.max(now, auth.lastStep + 1);
  // The server accepts one step ahead of its clock; further ahead, wait for time to catch up.
  if (step > now + 1) await page.waitForTimeout((step - 1) * 30_000 - Date.now() + 100);
  auth.lastStep = step;
  return otplib.generate({ secret: auth.secret, epoch: step * 30 });
}

/** Sets up the authenticator on the enrolment page with the secret it shows in text; returns the recovery codes. */
export async function enrolAuthenticator(page: Page, username: string): Promise<string[]> {
  if (!(await page.getByTestId('totp-secret').isVisible())) await page.getByRole('button', { name: 'Set up an authenticator' }).click();
  const secret = await page.getByTestId('totp-secret').getAttribute('data-secret');
  if (!secret) throw new Error('The enrolment page shows no secret');
  authenticators.set(`${new URL(page.url()).origin}|${username}`, { secret, lastStep: 0 });
  await page.getByLabel('Code from the app').fill(await authenticatorCode(page, username));
  await page.getByRole('button', { name: 'Turn on' }).click();
  await page.getByTestId('recovery-codes').waitFor();
  return page.getByTestId('recovery-codes').locator('li').allInnerTexts();
}

/**
 * Signs in an admin so the admin pages open: the password, then the authenticator code when one
 * is set up; without one, the set-up the admin pages ask for first (as a new admin would).
 */
export async function signInAsAdmin(page: Page, username = 'sofia.delacroix', password = DEMO_PASSWORD): Promise<void> {
  await page.goto('/sign-in');
  await page.getByLabel('Username').fill(username);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  if (authenticators.has(`${new URL(page.url()).origin}|${username}`)) {
    await page.getByLabel('Authenticator code').fill(await authenticatorCode(page, username));
    await page.getByRole('button', { name: 'Confirm' }).click();
    await page.getByTestId('home-heading').waitFor();
    return;
  }
  await page.getByTestId('home-heading').waitFor();
  await page.goto('/account/second-factor?next=/admin');
  await enrolAuthenticator(page, username);
  await page.getByRole('button', { name: 'I have saved them' }).click();
  await page.getByTestId('admin-heading').waitFor();
}

export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOTS, { recursive: true });
  const file = path.join(SCREENSHOTS, `${name}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

/**
 * One built server and one Chromium for a test file: started before its tests, stopped after.
 * Read `run.server` and `run.browser` inside the tests.
 */
export function useServerAndBrowser(options: { env?: Record<string, string>; timeoutMs?: number } = {}): {
  readonly server: RunningServer;
  readonly browser: Browser;
} {
  let server: RunningServer | undefined;
  let browser: Browser | undefined;
  beforeAll(async () => {
    server = await startServer(options.env);
    browser = await launchChromium();
  }, options.timeoutMs ?? 90_000);
  afterAll(async () => {
    await browser?.close();
    await server?.stop();
  });
  return {
    get server() {
      if (!server) throw new Error('the server has not started');
      return server;
    },
    get browser() {
      if (!browser) throw new Error('the browser has not started');
      return browser;
    },
  };
}
