import { DEFAULT_PROTOCOL } from '@steadyhand/shared';
import { describe, expect, it } from 'vitest';
import { newContext, screenshot, signInAs, signInAsAdmin, useServerAndBrowser } from './support/browser.js';

describe('protocol settings, in Chromium', () => {
  const run = useServerAndBrowser({ timeoutMs: 60_000 });

  it('lets the admin change the compression cycle; the change survives a reload and nothing else moves', async () => {
    const context = await newContext(run.browser, run.server.baseUrl);
    const page = await context.newPage();
    await signInAsAdmin(page);
    await page.goto('/');
    await page.getByTestId('home-panel-admin').getByRole('link', { name: 'Protocol settings' }).click();
    await page.waitForURL(/\/admin\/protocol$/);
    await page.getByTestId('protocol-caution').waitFor();
    expect(await page.getByTestId('protocol-caution').innerText()).toContain('do not replace, the team leader');

    const cycle = page.getByLabel(/^Compression cycle/);
    expect(await cycle.inputValue()).toBe('120');
    await cycle.fill('150');
    await expect.poll(() => page.getByTestId('mmss-cprCycleSeconds').innerText()).toContain('2:30');
    await page.getByRole('button', { name: 'Save protocol' }).click();
    await expect.poll(() => page.getByTestId('protocol-notice').innerText()).toContain('Last changed by Sofia Delacroix');

    await page.reload();
    await page.getByTestId('protocol-caution').waitFor();
    expect(await page.getByLabel(/^Compression cycle/).inputValue()).toBe('150');
    expect(await page.getByTestId('protocol-last-changed').innerText()).toContain('Sofia Delacroix');

    // What the browser sent is exactly what was shown: the one edit, every other value (units, routes, doses) intact.
    const stored = await page.evaluate(async () => (await fetch('/api/protocol')).json() as Promise<{ protocol: unknown }>);
    expect(stored.protocol).toEqual({ ...DEFAULT_PROTOCOL, cprCycleSeconds: 150 });
    await screenshot(page, 'protocol-admin');
    await context.close();
    // Setting up the admin's authenticator first adds a few page loads.
  }, 120_000);

  it('tells a recorder the page needs the administrator role', async () => {
    const context = await newContext(run.browser, run.server.baseUrl);
    const page = await context.newPage();
    await signInAs(page, 'maren.holt');
    await page.goto('/admin/protocol');
    await page.getByTestId('protocol-needs-admin').waitFor();
    expect(await page.getByTestId('protocol-needs-admin').innerText()).toContain('This page needs the administrator role.');
    expect(await page.getByTestId('protocol-caution').count()).toBe(0);
    await screenshot(page, 'protocol-refused-recorder');
    await context.close();
  });
});
