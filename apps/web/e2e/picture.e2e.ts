import { randomUUID } from 'node:crypto';
import type { QualityListResponse } from '@steadyhand/shared';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { apiSession } from './support/api-session.js';
import { newContext, screenshot, signInAs, useServerAndBrowser } from './support/browser.js';

const POLL = { timeout: 10_000 };
type Fields = Record<string, unknown> & { kind: string };

/**
 * Every table on the page stays inside its frame (the element that would scroll or clip it), no
 * cell reaches past the frame's right edge, and the page itself does not scroll sideways.
 * Returns what overflows, so a failure names it.
 */
async function overflowing(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const out: string[] = [];
    if (document.documentElement.scrollWidth > window.innerWidth)
      out.push(`page ${document.documentElement.scrollWidth} > ${window.innerWidth}`);
    for (const table of document.querySelectorAll('table')) {
      const frame = table.parentElement as HTMLElement;
      const right = frame.getBoundingClientRect().right + 1;
      const name = table.getAttribute('data-testid') ?? 'table';
      if (table.scrollWidth > frame.clientWidth + 1)
        out.push(`${name}: ${table.scrollWidth} in a frame of ${frame.clientWidth}`);
      for (const cell of table.querySelectorAll('th, td')) {
        const r = cell.getBoundingClientRect().right;
        if (r > right) {
          out.push(
            `${name}: "${(cell.textContent ?? '').slice(0, 30)}" ends at ${Math.round(r)}, frame at ${Math.round(right)}`,
          );
          break;
        }
      }
    }
    return out;
  });
}

describe('the picture of a code, and tables that fit, in Chromium', () => {
  const run = useServerAndBrowser();

  it('draws the code on the review page; a mark shows its entry, corrections included; the timeline fits at 1280 px', async () => {
    const { baseUrl } = run.server;
    const recorder = await apiSession(baseUrl, 'maren.holt');
    const arrestAt = '2026-03-04T07:42:10.000Z';
    const { code } = (await recorder.post('/api/codes', {
      category: 'adult',
      arrestAt,
      location: 'Bed 7, picture test',
    })) as { code: { id: string } };
    const add = async (s: number, fields: Fields) => {
      const id = randomUUID();
      await recorder.post(`/api/codes/${code.id}/entries`, {
        id,
        at: new Date(Date.parse(arrestAt) + s * 1000).toISOString(),
        ...fields,
      });
      return id;
    };
    await add(15, { kind: 'cpr', action: 'start' });
    await add(88, { kind: 'cpr', action: 'stop', reason: 'rhythm-check' });
    const vf = await add(90, { kind: 'rhythm', rhythm: 'vf', pulse: false });
    const shockId = await add(96, { kind: 'shock', joules: 200, synchronized: false });
    await add(118, { kind: 'cpr', action: 'start' });
    const epi = await add(345, {
      kind: 'drug',
      drug: 'epinephrine',
      dose: 1,
      unit: 'mg',
      route: 'iv',
    });
    await add(380, { kind: 'etco2', mmHg: 21 });
    await add(980, { kind: 'rosc' });
    await add(1370, { kind: 'end', outcome: 'rosc' });
    await add(1400, {
      kind: 'amend',
      target: epi,
      changes: { route: 'io' },
      reason: 'Route read again from the chart',
    });

    const context = await newContext(run.browser, baseUrl, { width: 1280, height: 900 });
    const page = await context.newPage();
    await signInAs(page, 'maren.holt');
    await page.goto(`/codes/${code.id}/review`);
    const picture = page.getByTestId('review-picture');
    const svg = picture.getByTestId('code-picture');
    await svg.waitFor(POLL);
    // Lanes by name, marks by shape and label.
    const text = await svg.textContent();
    for (const word of [
      'Compressions',
      'Rhythm checks',
      'Shocks',
      'Drugs',
      'ETCO2',
      'ROSC',
      'Arrest',
      'End',
      'VF',
      '200 J',
      'Epinephrine 1 mg*',
      '21',
    ]) {
      expect(text).toContain(word);
    }
    // The 30 s pause (1:28 to 1:58) is over the 10 s warning: marked with its seconds.
    expect(await svg.locator('[data-kind="pause"]').count()).toBe(1);
    expect(await svg.locator('[data-kind="pause"]').textContent()).toBe('30 s');
    expect(await svg.locator(`[data-entry="${vf}"]`).getAttribute('aria-label')).toContain(
      'Rhythm check at 1:30: VF',
    );

    // Hover a shock: its entry, who recorded it.
    await svg.locator(`[data-entry="${shockId}"]`).hover();
    const entry = picture.getByTestId('picture-entry');
    await expect.poll(() => entry.innerText(), POLL).toContain('Shock');
    expect(await entry.innerText()).toContain('+1:36');
    expect(await entry.innerText()).toContain('Maren Holt');
    // Tap (click) the corrected drug: the correction and what was first recorded.
    await svg.locator(`[data-entry="${epi}"]`).click();
    await expect
      .poll(() => entry.getByTestId('picture-entry-correction').innerText(), POLL)
      .toContain('Route read again from the chart');
    expect(await entry.innerText()).toMatch(/first recorded: .*IV/i);
    // Keyboard: a mark takes focus and shows its entry too.
    await svg.locator(`[data-entry="${vf}"]`).focus();
    await expect.poll(() => entry.innerText(), POLL).toContain('VF');

    // The review timeline fits its frame at 1280 px (the "Who" column used to be cut).
    await page.getByTestId('record-timeline').waitFor();
    expect(await overflowing(page)).toEqual([]);
    await screenshot(page, 'picture-review-1280');
    await context.close();
  });

  it('draws a demo code on the quality page, and the statistics and records list fit at 1280 px', async () => {
    const { baseUrl } = run.server;
    const reviewer = await apiSession(baseUrl, 'ewan.trelawny');
    const list = (await reviewer.get('/api/quality/codes')) as unknown as QualityListResponse;
    const demo = list.items[0];
    expect(demo).toBeDefined();
    const context = await newContext(run.browser, baseUrl, { width: 1280, height: 900 });
    const page = await context.newPage();
    await signInAs(page, 'ewan.trelawny');
    await page.goto(`/quality/codes/${demo?.codeId ?? ''}`);
    const svg = page.getByTestId('quality-picture').getByTestId('code-picture');
    await svg.waitFor(POLL);
    expect(await svg.textContent()).toContain('Rhythm checks');
    const marks = svg.getByTestId('picture-mark');
    expect(await marks.count()).toBeGreaterThan(3);
    await marks.first().click();
    await expect
      .poll(
        () => page.getByTestId('quality-picture').getByTestId('picture-entry').innerText(),
        POLL,
      )
      .toMatch(/\+\d+:\d\d\): /);
    expect(await overflowing(page)).toEqual([]);

    await page.goto('/quality/stats');
    await page.getByTestId('quality-stats-heading').waitFor();
    await page.locator('table').first().waitFor(POLL);
    expect(await overflowing(page)).toEqual([]);
    await screenshot(page, 'picture-stats-1280');
    await context.close();

    const nurse = await newContext(run.browser, baseUrl, { width: 1280, height: 900 });
    const records = await nurse.newPage();
    await signInAs(records, 'maren.holt');
    await records.goto('/records');
    await records.getByTestId('records-table').first().waitFor(POLL);
    expect(await overflowing(records)).toEqual([]);
    await nurse.close();
  });

  it('shows the last 10 minutes of a live code on the wall, across the room, without scrolling', async () => {
    const { baseUrl } = run.server;
    const recorder = await apiSession(baseUrl, 'maren.holt');
    const arrestAt = new Date(Date.now() - 14 * 60_000).toISOString();
    const { code } = (await recorder.post('/api/codes', {
      category: 'adult',
      arrestAt,
      location: 'Bed 3, wall picture',
    })) as { code: { id: string } };
    const add = (s: number, fields: Fields) =>
      recorder.post(`/api/codes/${code.id}/entries`, {
        id: randomUUID(),
        at: new Date(Date.parse(arrestAt) + s * 1000).toISOString(),
        ...fields,
      });
    await add(10, { kind: 'cpr', action: 'start' });
    await add(60, { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }); // before the window
    await add(600, { kind: 'cpr', action: 'stop', reason: 'rhythm-check' });
    await add(603, { kind: 'rhythm', rhythm: 'vf', pulse: false });
    await add(608, { kind: 'shock', joules: 150, synchronized: false });
    await add(610, { kind: 'cpr', action: 'start' });
    await add(700, { kind: 'drug', drug: 'amiodarone', dose: 300, unit: 'mg', route: 'iv' });

    const context = await newContext(run.browser, baseUrl, { width: 1920, height: 1080 });
    const wall = await context.newPage();
    await signInAs(wall, 'kofi.asante');
    await wall.goto(`/codes/${code.id}/wall`);
    await wall.getByTestId('wall-recent').waitFor(POLL);
    await wall.getByTestId('wall-picture-toggle').click();
    const svg = wall.getByTestId('wall-picture').getByTestId('code-picture');
    await svg.waitFor(POLL);
    const text = (await svg.textContent()) ?? '';
    expect(text).toContain('150 J');
    expect(text).toContain('Amiodarone 300 mg');
    // The first epinephrine, 13 minutes ago, is outside the window.
    expect(text).not.toContain('Epinephrine');
    // Large type: the smallest label is at least 13 px on screen.
    const smallest = await svg.evaluate((el) =>
      Math.min(...[...el.querySelectorAll('text')].map((t) => t.getBoundingClientRect().height)),
    );
    expect(smallest).toBeGreaterThanOrEqual(13);
    await screenshot(wall, 'picture-wall');
    expect(await wall.evaluate(() => document.documentElement.scrollHeight)).toBeLessThanOrEqual(
      1080,
    );

    // A child's wall gives the doses the widest column; the picture takes the last entries' place there too.
    const { code: child } = (await recorder.post('/api/codes', {
      category: 'pediatric',
      weightKg: 18,
      arrestAt,
      location: 'Bed 4, wall picture',
    })) as { code: { id: string } };
    const addChild = (s: number, fields: Fields) =>
      recorder.post(`/api/codes/${child.id}/entries`, {
        id: randomUUID(),
        at: new Date(Date.parse(arrestAt) + s * 1000).toISOString(),
        ...fields,
      });
    await addChild(10, { kind: 'cpr', action: 'start' });
    await addChild(500, { kind: 'shock', joules: 36, synchronized: false });
    await wall.goto(`/codes/${child.id}/wall`);
    await wall.getByTestId('wall-recent').waitFor(POLL);
    await wall.getByTestId('wall-picture-toggle').click();
    const childSvg = wall.getByTestId('wall-picture').getByTestId('code-picture');
    await childSvg.waitFor(POLL);
    expect(await childSvg.textContent()).toContain('36 J');
    await screenshot(wall, 'picture-wall-child');
    expect(await wall.evaluate(() => document.documentElement.scrollHeight)).toBeLessThanOrEqual(
      1080,
    );
    await context.close();
  });
});
