import type { Page } from 'playwright-core';
import { describe, it } from 'vitest';
import { expectAccessible } from './support/axe.js';
import { newContext, signInAs, signInAsAdmin, useServerAndBrowser } from './support/browser.js';

/** Opens a screen, waits for its main heading, and runs axe-core on it. */
async function visit(page: Page, url: string): Promise<void> {
  await page.goto(url);
  await page.locator('main h1, main [role="heading"][aria-level="1"]').first().waitFor();
  await page.waitForLoadState('networkidle');
  await expectAccessible(page, url);
}

/** The id of the demo's ended code, as the records list gives it. */
async function demoCodeId(page: Page): Promise<string> {
  await page.goto('/records');
  const href = await page.locator('a[href$="/review"]').first().getAttribute('href');
  const id = /\/codes\/([^/]+)\/review/.exec(href ?? '')?.[1];
  if (!id) throw new Error('no record in the demo list');
  return id;
}

describe('every screen, checked by axe-core in Chromium (no serious or critical violation)', () => {
  const run = useServerAndBrowser({ timeoutMs: 90_000 });

  it('the recorder and leader screens: records, review, walls, account', async () => {
    const ctx = await newContext(run.browser, run.server.baseUrl);
    const page = await ctx.newPage();
    await signInAs(page, 'kofi.asante');
    const id = await demoCodeId(page);
    for (const url of [
      '/records',
      `/codes/${id}/review`,
      '/records/verify',
      '/account',
      '/account/password',
      '/account/second-factor',
    ])
      await visit(page, url);
    await page.goto(`/codes/${id}/wall`);
    await page.getByTestId('wall-arrest-clock').waitFor();
    await expectAccessible(page, 'code wall');
    await ctx.close();
  }, 180_000);

  it('the quality, pharmacy and admin screens', async () => {
    const ctx = await newContext(run.browser, run.server.baseUrl);
    const page = await ctx.newPage();
    await signInAs(page, 'ewan.trelawny');
    const id = await demoCodeId(page);
    for (const url of ['/quality', '/quality/stats', '/quality/follow-up', `/quality/codes/${id}`])
      await visit(page, url);
    await ctx.close();

    const pharmCtx = await newContext(run.browser, run.server.baseUrl);
    const pharm = await pharmCtx.newPage();
    await signInAs(pharm, 'priya.venkat');
    for (const url of ['/pharmacy', `/pharmacy/codes/${id}`, '/pharmacy/trays'])
      await visit(pharm, url);
    await pharmCtx.close();

    const adminCtx = await newContext(run.browser, run.server.baseUrl);
    const admin = await adminCtx.newPage();
    await signInAsAdmin(admin);
    for (const url of [
      '/admin/people',
      '/admin/places',
      '/admin/sessions',
      '/admin/audit',
      '/admin/protocol',
      '/admin/backups',
      '/admin/outbox',
    ])
      await visit(admin, url);
    await adminCtx.close();
  }, 240_000);
});
