import { describe, expect, it } from 'vitest';
import { newContext, screenshot, signInAs, useServerAndBrowser } from './support/browser.js';
import { poll, recentIds, startCodeFromHome, storedLog, tap } from './support/pad.js';

describe('taps while the tablet is offline, in Chromium', () => {
  const run = useServerAndBrowser({ timeoutMs: 90_000 });

  it('keeps every tap through going offline and a reload, then stores each exactly once, in order', async () => {
    const ctx = await newContext(run.browser, run.server.baseUrl);
    const pad = await ctx.newPage();
    await signInAs(pad, 'maren.holt');
    const codeId = await startCodeFromHome(pad);
    // The app shell is cached by the service worker before the network goes.
    await pad.waitForFunction(() => navigator.serviceWorker?.controller !== null, undefined, {
      timeout: 20_000,
    });
    await poll(() => pad.evaluate(async () => (await caches.match('/api/auth/me')) !== undefined), {
      timeout: 10_000,
    }).toBe(true);
    await poll(() => pad.getByTestId('sync-state').getAttribute('data-connected')).toBe('true');

    const online1 = await tap(pad, 'cpr-start');
    const online2 = await tap(pad, 'cpr-pause-rhythm-check');
    await poll(() => pad.getByTestId('sync-tile').innerText()).toContain('All saved');

    await ctx.setOffline(true);
    await poll(() => pad.getByTestId('sync-state').getAttribute('data-connected')).toBe('false');
    const offline = [];
    for (const step of ['rhythm-vf', 'shock-200', 'cpr-start', 'drug-epinephrine'])
      offline.push(await tap(pad, step));
    await poll(() => pad.getByTestId('sync-tile').innerText()).toContain('4 waiting');
    expect(await pad.getByTestId('sync-tile').innerText()).toContain(
      'Offline — taps are kept on this tablet',
    );
    expect(await pad.locator('[data-pending="true"]').count()).toBe(4);

    // Sign-out is refused while taps wait.
    await pad.getByRole('button', { name: 'Sign out' }).click();
    await pad
      .getByText(
        '4 entries are still waiting to reach the server; stay signed in until they are saved.',
      )
      .waitFor();
    expect(pad.url()).toContain(`/codes/${codeId}/record`);
    console.warn(`[screenshot] ${await screenshot(pad, 'recorder-pad-offline')}`);

    // A reload with no network: the pad opens from the device (service worker + IndexedDB).
    await pad.reload();
    try {
      await pad.getByTestId('recorder-pad').waitFor({ timeout: 20_000 });
    } catch (err) {
      console.warn(
        `[offline reload] page shows: ${(await pad.locator('body').innerText()).slice(0, 500)}`,
      );
      await screenshot(pad, 'recorder-pad-offline-reload-failed');
      throw err;
    }
    await poll(() => pad.locator('[data-testid="entry-row"]').count()).toBe(6);
    await poll(() => pad.locator('[data-pending="true"]').count()).toBe(4);
    expect(await pad.getByTestId('sync-tile').innerText()).toContain('4 waiting');
    const afterReload = offline.concat(await tap(pad, 'drug-amiodarone'));
    await poll(() => pad.getByTestId('sync-tile').innerText()).toContain('5 waiting');
    console.warn(`[screenshot] ${await screenshot(pad, 'recorder-pad-offline-reloaded')}`);

    // The network returns: everything is sent, once.
    await ctx.setOffline(false);
    await poll(() => pad.getByTestId('sync-tile').innerText(), { timeout: 20_000 }).toContain(
      'All saved',
    );
    expect(await pad.locator('[data-pending="true"]').count()).toBe(0);

    const log = await storedLog(pad, codeId);
    const expected = [online1, online2, ...afterReload].map((t) => t.id);
    const stored = log.entries.map((e) => e.id);
    expect(stored).toEqual(expected);
    const seqs = log.entries.map((e) => e.seq ?? 0);
    expect(seqs).toEqual([...seqs].sort((a, b) => a - b));
    expect(new Set(log.entries.map((e) => e.deviceId)).size).toBe(1);

    // A second screen shows the same log.
    const wallCtx = await newContext(run.browser, run.server.baseUrl);
    const wall = await wallCtx.newPage();
    await signInAs(wall, 'kofi.asante');
    await wall.goto(`/codes/${codeId}/record`);
    await poll(async () => (await recentIds(wall)).slice().reverse()).toEqual(expected);
    expect(await recentIds(pad)).toEqual(await recentIds(wall));

    // Now sign-out is allowed.
    await pad.getByRole('button', { name: 'Sign out' }).click();
    await pad.waitForURL(/\/sign-in/);
    await wallCtx.close();
    await ctx.close();
  }, 240_000);
});
