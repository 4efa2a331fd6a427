import { randomUUID } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { UTSTEIN_CSV_COLUMNS, type QualityListResponse } from '@steadyhand/shared';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiSession } from './support/api-session.js';
import { launchChromium, newContext, screenshot, signInAs } from './support/browser.js';
import { DEMO_PASSWORD, startServer, type RunningServer } from './support/server.js';

type Fields = Record<string, unknown> & { kind: string };
// The machines are small and busy: give the page time to answer.
const POLL = { timeout: 10_000 };

describe('quality review, in Chromium', () => {
  let server: RunningServer;
  let browser: Browser;
  let shockCode = '';
  let asystoleCode = '';

  beforeAll(async () => {
    server = await startServer();
    browser = await launchChromium();
    const recorder = await apiSession(server.baseUrl, 'maren.holt');
    const leader = await apiSession(server.baseUrl, 'kofi.asante');
    const reviewer = await apiSession(server.baseUrl, 'ewan.trelawny');
    const { units } = (await reviewer.get('/api/quality/codes')) as unknown as QualityListResponse;
    const unit = (name: string) => units.find((u) => u.name === name)?.id;

    const makeCode = async (arrestAt: string, unitName: string, entries: [number, Fields][]) => {
      const { code } = (await recorder.post('/api/codes', {
        category: 'adult',
        arrestAt,
        unitId: unit(unitName),
        location: 'Bed 12',
      })) as { code: { id: string } };
      for (const [s, fields] of entries) {
        await recorder.post(`/api/codes/${code.id}/entries`, {
          id: randomUUID(),
          at: new Date(Date.parse(arrestAt) + s * 1000).toISOString(),
          ...fields,
        });
      }
      return code.id;
    };
    // The brief's demo code: VF, shock within 2 min, ROSC.
    shockCode = await makeCode('2026-03-04T07:42:10.000Z', '4 West Medical', [
      [15, { kind: 'cpr', action: 'start' }],
      [88, { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
      [90, { kind: 'rhythm', rhythm: 'vf', pulse: false }],
      [96, { kind: 'shock', joules: 200, synchronized: false }],
      [98, { kind: 'cpr', action: 'start' }],
      [345, { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }],
      [380, { kind: 'etco2', mmHg: 21 }],
      [980, { kind: 'rosc' }],
      [1370, { kind: 'end', outcome: 'sustained-rosc' }],
    ]);
    asystoleCode = await makeCode('2026-03-18T22:05:00.000Z', 'Emergency Bay 2', [
      [20, { kind: 'cpr', action: 'start' }],
      [60, { kind: 'rhythm', rhythm: 'asystole', pulse: false }],
      [410, { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'io' }],
      [1500, { kind: 'end', outcome: 'died' }],
    ]);
    // The shock target counts witnessed or monitored arrests: this one was both.
    await recorder.patch(`/api/codes/${shockCode}/review`, {
      utstein: { witnessed: 'yes', witnessedBy: 'staff', monitored: 'yes', monitoring: ['ecg'] },
    });
    await recorder.post(`/api/codes/${shockCode}/signatures`, {
      meaning: 'recorded-by',
      password: DEMO_PASSWORD,
    });
    await leader.post(`/api/codes/${shockCode}/signatures`, {
      meaning: 'reviewed-confirmed',
      password: DEMO_PASSWORD,
    });
  }, 120_000);
  afterAll(async () => {
    await browser?.close();
    await server?.stop();
  });

  it('lets the reviewer filter, open a code, sign the review off and download both exports', async () => {
    const context = await newContext(browser, server.baseUrl, { width: 1440, height: 900 });
    const page = await context.newPage();
    await signInAs(page, 'ewan.trelawny');
    await page
      .getByTestId('home-panel-reviewer')
      .getByRole('link', { name: 'Codes to review' })
      .click();
    await page.waitForURL(/\/quality$/);
    await page.getByTestId('quality-total').waitFor();
    // The demo hospital's own past codes are recent; this test's two codes are in March 2026.
    await page.locator('#quality-filter-to').fill('2026-03-31');
    await expect
      .poll(() => page.getByTestId('quality-total').innerText(), POLL)
      .toContain('2 codes match');
    await expect.poll(() => page.getByTestId('quality-row').count(), POLL).toBe(2);

    // Filter: the code that missed the epinephrine target, then clear and filter by unit.
    await page.getByTestId('quality-filter-missed').selectOption('time-to-epinephrine');
    await expect.poll(() => page.getByTestId('quality-row').count(), POLL).toBe(1);
    expect(await page.getByTestId('quality-row').getAttribute('data-code-id')).toBe(asystoleCode);
    expect(await page.getByTestId('quality-row').innerText()).toContain('Epinephrine within 5 min');
    await page.getByTestId('quality-filter-missed').selectOption('');
    await expect.poll(() => page.getByTestId('quality-row').count(), POLL).toBe(2);
    await page.getByTestId('quality-filter-unit').selectOption({ label: '4 West Medical' });
    // Wait for the unit filter's answer itself: the list just before it also had one row.
    await expect
      .poll(() => page.getByTestId('quality-row').first().getAttribute('data-code-id'), POLL)
      .toBe(shockCode);
    await expect.poll(() => page.getByTestId('quality-row').count(), POLL).toBe(1);
    await screenshot(page, 'quality-list');

    // The CSV of what the filters show.
    const [csvDownload] = await Promise.all([
      page.waitForEvent('download'),
      page.getByTestId('quality-export-csv').click(),
    ]);
    expect(csvDownload.suggestedFilename()).toMatch(/^steadyhand-utstein-.*\.csv$/);
    const csv = readFileSync(await csvDownload.path(), 'utf8')
      .trimEnd()
      .split('\r\n');
    expect(csv[0]).toBe(UTSTEIN_CSV_COLUMNS.map((c) => c.name).join(','));
    expect(csv).toHaveLength(2);
    expect(csv[1]).toContain(shockCode);

    // Open the code: targets met or missed in words, the rule and its source.
    await page.getByTestId('quality-row').getByRole('link').click();
    await page.getByTestId('quality-code-heading').waitFor();
    const shock = page.getByTestId('quality-target-time-to-shock');
    expect(await shock.getAttribute('data-state')).toBe('met');
    expect(await shock.innerText()).toContain('Met');
    expect(await shock.innerText()).toContain('Chan PS');
    expect(await page.getByTestId('quality-target-time-to-epinephrine').innerText()).toContain(
      'Does not apply',
    );

    await page
      .getByLabel('Review notes')
      .fill('Fast first shock; epinephrine at 5:45 after the second analysis.');
    await page.getByLabel('New debrief point').fill('Praise the defibrillator operator');
    await page.getByRole('button', { name: 'Add point' }).click();
    await page.getByLabel('Your password').fill('not the password');
    await page.getByRole('button', { name: 'Sign review off' }).click();
    await expect
      .poll(() => page.getByRole('alert').innerText(), POLL)
      .toContain('password does not match');
    await page.getByLabel('Your password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign review off' }).click();
    await expect
      .poll(() => page.getByTestId('quality-signed-off').innerText(), POLL)
      .toContain('Reviewed by Ewan Trelawny, RN');
    expect(await page.getByTestId('quality-review').innerText()).toContain(
      'Praise the defibrillator operator',
    );

    const [fhirDownload] = await Promise.all([
      page.waitForEvent('download'),
      page.getByTestId('quality-export-fhir').click(),
    ]);
    expect(fhirDownload.suggestedFilename()).toBe(`steadyhand-code-${shockCode}.fhir.json`);
    const bundle = JSON.parse(readFileSync(await fhirDownload.path(), 'utf8')) as {
      type: string;
      entry: { resource: { resourceType: string; status?: string } }[];
    };
    expect(bundle.type).toBe('document');
    expect(bundle.entry[0]?.resource).toMatchObject({
      resourceType: 'Composition',
      status: 'final',
    });
    await screenshot(page, 'quality-code');

    // The charts, with their numbers beside them.
    await page.goto('/quality/stats');
    await page.getByTestId('quality-chart-targets-month').waitFor();
    expect(await page.getByTestId('quality-table-targets-month').innerText()).toContain('2026-03');
    // ROSC and survival rates with their Wilson intervals, said so on the page.
    expect(await page.getByTestId('quality-table-rates-month').innerText()).toContain('2026-03');
    expect(await page.getByTestId('quality-rate-method-rates-month').innerText()).toContain('Wilson score interval');
    expect(await page.locator('.recharts-surface').count()).toBeGreaterThanOrEqual(4);
    await screenshot(page, 'quality-stats');
    await context.close();
  }, 180_000);

  it('tells a recorder the quality pages are not theirs', async () => {
    const context = await newContext(browser, server.baseUrl);
    const page = await context.newPage();
    await signInAs(page, 'maren.holt');
    await page.goto('/quality');
    await page.getByTestId('quality-needs-reviewer').waitFor();
    expect(await page.getByTestId('quality-row').count()).toBe(0);
    await context.close();
  });
});
