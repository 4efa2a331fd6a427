import type { Page } from 'playwright-core';
import { expect } from 'vitest';
import { expectAccessible } from './axe.js';

/** expect.poll with a timeout fit for a loaded two-core machine (the default is 1 s). */
export function poll<T>(fn: () => T | Promise<T>, options: { timeout?: number } = {}) {
  return expect.poll(fn, { timeout: 15_000, interval: 50, ...options });
}

/** Starts a code from the home page the way a recorder does (adult or child first), and returns its id. */
export async function startCodeFromHome(page: Page, category: 'adult' | 'child' = 'adult'): Promise<string> {
  await page.getByRole('button', { name: 'Start a code' }).click();
  await page.getByTestId(`start-${category}`).click();
  await page.waitForURL(/\/codes\/[^/]+\/record$/);
  await page.getByTestId('recorder-pad').waitFor();
  await expectAccessible(page, `recorder pad (${category})`);
  const match = /\/codes\/([^/]+)\/record$/.exec(new URL(page.url()).pathname);
  if (!match?.[1]) throw new Error(`no code id in ${page.url()}`);
  return decodeURIComponent(match[1]);
}

/** Ids of the rows in the latest-entries list, newest first. */
export async function recentIds(page: Page): Promise<string[]> {
  return page
    .locator('[data-testid="entry-row"]')
    .evaluateAll((rows) => rows.map((r) => r.getAttribute('data-entry-id') ?? ''));
}

/**
 * Taps a pad button and returns the id of the entry it recorded (the new top row).
 * The tap time is taken in the page, at the click, for the latency figure.
 */
export async function tap(page: Page, testId: string): Promise<{ id: string; tapAt: number }> {
  const before = new Set(await recentIds(page));
  await page.evaluate(() => {
    const w = window as unknown as { __tapAt?: number; __tapProbe?: boolean };
    if (!w.__tapProbe) {
      w.__tapProbe = true;
      document.addEventListener(
        'click',
        () => (w.__tapAt = performance.timeOrigin + performance.now()),
        true,
      );
    }
  });
  await page.getByTestId(testId).click();
  let id = '';
  const deadline = Date.now() + 5_000;
  while (Date.now() < deadline) {
    const ids = await recentIds(page);
    const fresh = ids.find((x) => !before.has(x));
    if (fresh) {
      id = fresh;
      break;
    }
    await page.waitForTimeout(10);
  }
  if (!id) throw new Error(`tapping ${testId} showed no new entry`);
  const tapAt = await page.evaluate(() => (window as unknown as { __tapAt: number }).__tapAt);
  return { id, tapAt };
}

/** Records, in the page, when each entry row first appears (for the second screen). */
export async function watchArrivals(page: Page): Promise<void> {
  await page.evaluate(() => {
    const w = window as unknown as { __seen: Record<string, number> };
    w.__seen = {};
    const look = () => {
      for (const el of document.querySelectorAll('[data-testid="entry-row"]')) {
        const id = el.getAttribute('data-entry-id');
        if (id && w.__seen[id] === undefined)
          w.__seen[id] = performance.timeOrigin + performance.now();
      }
    };
    look();
    new MutationObserver(look).observe(document.body, { subtree: true, childList: true });
  });
}

export async function arrivalOf(page: Page, id: string): Promise<number> {
  await page.locator(`[data-entry-id="${id}"]`).first().waitFor({ timeout: 10_000 });
  return page.evaluate(
    (entryId) => (window as unknown as { __seen: Record<string, number> }).__seen[entryId] ?? NaN,
    id,
  );
}

export interface StoredLog {
  code: { id: string; status: string; outcome: string | null };
  entries: {
    id: string;
    kind: string;
    target?: string;
    seq?: number;
    deviceId?: string;
    at: string;
    [k: string]: unknown;
  }[];
}

/** GET /api/codes/:id from inside the page (same session cookie). */
export async function storedLog(page: Page, codeId: string): Promise<StoredLog> {
  return page.evaluate(async (id) => {
    const res = await fetch(`/api/codes/${encodeURIComponent(id)}`, { credentials: 'same-origin' });
    if (!res.ok) throw new Error(`GET /api/codes/${id} answered ${res.status}`);
    return (await res.json()) as StoredLog;
  }, codeId);
}

/** Opens the code's details from the pad's header, sets a measured weight on the number pad, and closes the sheet. */
export async function setWeight(page: Page, kg: number): Promise<void> {
  if (!(await page.getByTestId('details-weight').isVisible())) await page.getByTestId('pad-details').click();
  await page.getByTestId('details-weight').click();
  await page.getByTestId('weight-source-measured').click();
  for (const digit of String(kg)) await page.getByTestId(digit === '.' ? 'numpad-dot' : `numpad-${digit}`).click();
  await page.getByTestId('number-save').click();
  await poll(() => page.getByTestId('header-weight').innerText()).toContain(`${kg} kg`);
  await page.getByTestId('details-close').click();
  await page.getByTestId('details-sheet').waitFor({ state: 'detached' });
}
