import { describe, expect, it } from 'vitest';
import { newContext, screenshot, signInAs, useServerAndBrowser } from './support/browser.js';
import {
  arrivalOf,
  poll,
  setWeight,
  startCodeFromHome,
  storedLog,
  tap,
  watchArrivals,
} from './support/pad.js';

describe('the recorder pad, in Chromium on a tablet', () => {
  const run = useServerAndBrowser({ timeoutMs: 90_000 });

  it('records a whole adult code without typing, and the leader sees each entry land', async () => {
    const recorderCtx = await newContext(run.browser, run.server.baseUrl);
    const leaderCtx = await newContext(run.browser, run.server.baseUrl);
    const pad = await recorderCtx.newPage();
    const wall = await leaderCtx.newPage();
    await signInAs(pad, 'maren.holt');
    await signInAs(wall, 'kofi.asante');

    const codeId = await startCodeFromHome(pad);
    await wall.goto(`/codes/${codeId}/record`);
    await wall.getByTestId('recorder-pad').waitFor();
    // Both screens joined the live link before the first tap.
    await poll(() => pad.getByTestId('sync-state').getAttribute('data-connected')).toBe('true');
    await poll(() => wall.getByTestId('sync-state').getAttribute('data-connected')).toBe('true');
    await watchArrivals(wall);

    // Amiodarone's first dose is 300 mg; the 200 J preset is the protocol default.
    expect(await pad.getByTestId('drug-amiodarone').innerText()).toContain('300 mg');
    expect(await pad.getByTestId('shock-200').innerText()).toContain('default');

    const steps = [
      'cpr-start',
      'cpr-pause-rhythm-check',
      'rhythm-vf',
      'shock-200',
      'cpr-start',
      'drug-epinephrine',
      'drug-amiodarone',
      'cpr-pause-rhythm-check',
    ];
    const taps: { step: string; id: string; latencyMs: number }[] = [];
    const record = async (step: string) => {
      const { id, tapAt } = await tap(pad, step);
      const seenAt = await arrivalOf(wall, id);
      taps.push({ step, id, latencyMs: seenAt - tapAt });
    };
    for (const step of steps) await record(step);

    // The next amiodarone dose is now the second one.
    expect(await pad.getByTestId('drug-amiodarone').innerText()).toContain('150 mg');

    // Pulse toggle, then the rhythm: organised with a pulse.
    await pad.getByTestId('rhythm-pulse').click();
    await record('rhythm-organized');
    await record('event-rosc');

    // A mistaken tap, undone within 5 s: voided on both screens, never deleted.
    const mistaken = await tap(pad, 'etco2-20');
    await arrivalOf(wall, mistaken.id);
    await pad.getByTestId('undo').click();
    await poll(() =>
      pad.locator(`[data-entry-id="${mistaken.id}"]`).getAttribute('data-voided'),
    ).toBe('true');
    await poll(() =>
      wall.locator(`[data-entry-id="${mistaken.id}"]`).getAttribute('data-voided'),
    ).toBe('true');

    // Ending is the one two-step action: End code, then the outcome.
    await pad.getByTestId('event-end').click();
    await record('end-rosc');

    await poll(() => pad.getByTestId('sync-tile').innerText()).toContain('All saved');
    await poll(() => pad.locator('[data-pending="true"]').count()).toBe(0);
    expect(await pad.getByTestId('state-shocks').innerText()).toContain('200 J');
    expect(await wall.getByTestId('ended-banner').innerText()).toContain('ROSC at the end of the code');
    expect(await pad.getByTestId('reminder-caution').innerText()).toContain(
      "Reminders support, and do not replace, the team leader's judgment, local protocol and licensed practice.",
    );

    // The stored log holds every tap exactly once, plus the one void, in the order tapped.
    const log = await storedLog(pad, codeId);
    const ids = log.entries.map((e) => e.id);
    expect(new Set(ids).size).toBe(ids.length);
    for (const t of [...taps, mistaken]) expect(ids.filter((x) => x === t.id)).toHaveLength(1);
    const voids = log.entries.filter((e) => e.kind === 'void');
    expect(voids).toHaveLength(1);
    expect(voids[0]).toMatchObject({ target: mistaken.id, reason: 'undone on the pad within 5 s' });
    expect(log.entries).toHaveLength(taps.length + 2);
    const seqs = log.entries.map((e) => e.seq ?? 0);
    expect(seqs).toEqual([...seqs].sort((a, b) => a - b));
    expect(log.code.status).toBe('ended');
    expect(log.code.outcome).toBe('rosc');
    const amiodarone = log.entries.find((e) => e.kind === 'drug' && e.drug === 'amiodarone');
    expect(amiodarone).toMatchObject({ dose: 300, unit: 'mg', route: 'iv' });

    const latencies = taps.map((t) => t.latencyMs).sort((a, b) => a - b);
    const median = latencies[Math.floor(latencies.length / 2)]!;
    console.warn(
      `[latency] tap to second screen over ${latencies.length} taps: median ${median.toFixed(1)} ms, ` +
        `min ${latencies[0]!.toFixed(1)} ms, max ${latencies[latencies.length - 1]!.toFixed(1)} ms ` +
        `(${taps.map((t) => `${t.step} ${t.latencyMs.toFixed(0)}`).join(', ')})`,
    );

    console.warn(`[screenshot] ${await screenshot(pad, 'recorder-pad-adult-ended')}`);
    console.warn(`[screenshot] ${await screenshot(wall, 'recorder-pad-second-screen')}`);
    await recorderCtx.close();
    await leaderCtx.close();
  }, 240_000);

  it('shows a pad in the middle of a code, and a read-only view to a pharmacist', async () => {
    const ctx = await newContext(run.browser, run.server.baseUrl);
    const pad = await ctx.newPage();
    await signInAs(pad, 'maren.holt');
    const codeId = await startCodeFromHome(pad);
    for (const step of [
      'cpr-start',
      'cpr-pause-rhythm-check',
      'rhythm-vf',
      'shock-200',
      'cpr-start',
      'drug-epinephrine',
    ])
      await tap(pad, step);
    await poll(() => pad.getByTestId('sync-tile').innerText()).toContain('All saved');
    console.warn(`[screenshot] ${await screenshot(pad, 'recorder-pad-adult-running')}`);

    // A drug's dose can be corrected right after the tap: an amendment, the tap stays.
    await tap(pad, 'drug-epinephrine');
    await pad.getByTestId('change-dose').click();
    await pad.getByTestId('numpad-back').click();
    await pad.getByTestId('numpad-0').click();
    await pad.getByTestId('numpad-dot').click();
    await pad.getByTestId('numpad-5').click();
    await pad.getByTestId('choice-io').click();
    await pad.getByTestId('dose-save').click();
    await poll(
      async () => (await storedLog(pad, codeId)).entries.filter((e) => e.kind === 'amend').length,
    ).toBe(1);
    const amend = (await storedLog(pad, codeId)).entries.find((e) => e.kind === 'amend');
    expect(amend).toMatchObject({
      changes: { dose: 0.5, route: 'io' },
      reason: 'dose corrected after tap',
    });

    // Portrait tablet and phone layouts.
    await pad.setViewportSize({ width: 820, height: 1180 });
    console.warn(`[screenshot] ${await screenshot(pad, 'recorder-pad-portrait')}`);
    await pad.setViewportSize({ width: 390, height: 844 });
    console.warn(`[screenshot] ${await screenshot(pad, 'recorder-pad-phone')}`);

    const pharmCtx = await newContext(run.browser, run.server.baseUrl);
    const pharm = await pharmCtx.newPage();
    await signInAs(pharm, 'priya.venkat');
    await pharm.goto(`/codes/${codeId}/record`);
    await pharm.getByTestId('read-only-notice').waitFor();
    expect(await pharm.getByTestId('group-cpr').count()).toBe(0);
    expect(await pharm.getByTestId('read-only-notice').innerText()).toContain(
      'only a recorder or a team leader can add entries',
    );
    await poll(() => pharm.locator('[data-testid="entry-row"]').count()).toBeGreaterThanOrEqual(7);
    console.warn(`[screenshot] ${await screenshot(pharm, 'recorder-pad-pharmacist')}`);
    await pharmCtx.close();
    await ctx.close();
  }, 240_000);

  it('records a child from "Start a code": 18 kg gives 36 J and 0.18 mg, and no 4th amiodarone without a second tap', async () => {
    const ctx = await newContext(run.browser, run.server.baseUrl);
    const pad = await ctx.newPage();
    await signInAs(pad, 'kofi.asante');
    const codeId = await startCodeFromHome(pad, 'child');
    await pad.getByTestId('pediatric-caution').waitFor();
    expect(await pad.getByTestId('pediatric-caution').innerText()).toContain('Double-check every weight-based dose with a second person.');
    await setWeight(pad, 18);
    // PALS medications table: epinephrine 0.01 mg/kg (0.18 mg for 18 kg); AHA 2020 PALS: first shock 2 J/kg (36 J).
    await poll(() => pad.getByTestId('drug-epinephrine').innerText()).toContain('0.18 mg');
    expect(await pad.getByTestId('drug-epinephrine').innerText()).toContain('0.01 mg/kg × 18 kg');
    expect(await pad.getByTestId('shock-36').innerText()).toContain('36 J');
    await tap(pad, 'cpr-start');
    await tap(pad, 'shock-36');
    await poll(() => pad.getByTestId('state-shocks').innerText()).toContain('36 J');

    // PALS medications table: amiodarone 5 mg/kg, may repeat twice (90 mg, three doses for 18 kg).
    for (let i = 1; i <= 3; i++) {
      await poll(() => pad.getByTestId('drug-amiodarone').innerText()).toContain('90 mg');
      await tap(pad, 'drug-amiodarone');
    }
    await poll(() => pad.getByTestId('drug-limit-amiodarone').innerText()).toContain('Limit reached: 3 of 3 doses given');
    const before = (await storedLog(pad, codeId)).entries.length;
    await pad.getByTestId('drug-amiodarone').click();
    expect(await pad.getByTestId('drug-amiodarone').innerText()).toContain('Tap again to record');
    await poll(() => pad.getByTestId('sync-tile').innerText()).toContain('All saved');
    expect((await storedLog(pad, codeId)).entries.length).toBe(before);
    console.warn(`[screenshot] ${await screenshot(pad, 'recorder-pad-pediatric')}`);

    // After the code: the review replays the wall at any moment, from the code's own protocol version.
    await pad.getByTestId('event-end').click();
    await tap(pad, 'end-died');
    await pad.getByTestId('ended-review').click();
    await pad.getByTestId('review-replay').waitFor();
    expect(await pad.getByTestId('replay-wall').innerText()).toContain('18 kg');
    await pad.getByTestId('review-replay').getByRole('slider').focus();
    await pad.keyboard.press('Home');
    await poll(() => pad.getByTestId('replay-moment').innerText()).toMatch(/^\+0:00/);
    await poll(() => pad.getByTestId('replay-wall').innerText()).toContain('NOT STARTED');
    console.warn(`[screenshot] ${await screenshot(pad, 'review-replay')}`);

    // Back to the pad in the same tab: the pad still reads its protocol version (one owner, one shape per key).
    await pad.goBack();
    await pad.getByTestId('recorder-pad').waitFor();
    await poll(() => pad.getByTestId('drug-epinephrine').innerText()).toContain('0.18 mg');
    expect(await pad.getByTestId('status-strip').innerText()).toContain('ENDED');
    await ctx.close();
  }, 240_000);
});
