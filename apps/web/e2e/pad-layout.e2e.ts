import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import { expectAccessible } from './support/axe.js';
import { newContext, screenshot, signInAs, useServerAndBrowser } from './support/browser.js';
import { poll, setWeight, startCodeFromHome, storedLog } from './support/pad.js';

/** Every action used during a code, by its test id (the pediatric energies are read from the page). */
const ACTIONS = [
  'cpr-start',
  'cpr-swap',
  'cpr-pause-rhythm-check',
  'cpr-pause-shock',
  'cpr-pause-airway',
  'cpr-pause-other',
  'rhythm-pulse',
  'rhythm-vf',
  'rhythm-pvt',
  'rhythm-pea',
  'rhythm-asystole',
  'rhythm-organized',
  'rhythm-other',
  'shock-sync',
  'shock-other',
  'drug-epinephrine',
  'drug-amiodarone',
  'drug-lidocaine',
  'drug-atropine',
  'drug-adenosine',
  'drug-calcium-chloride',
  'drug-sodium-bicarbonate',
  'drug-magnesium-sulfate',
  'drug-other',
  'event-rosc',
  'event-rearrest',
  'event-end',
  'event-note',
  'airway-bag-mask',
  'airway-supraglottic',
  'airway-endotracheal',
  'airway-capno',
  'access-iv',
  'access-io',
  'etco2-10',
  'etco2-20',
  'etco2-30',
  'etco2-40',
  'etco2-other',
  'pad-details',
  'pad-wall-link',
];

interface Box {
  id: string;
  x: number;
  y: number;
  w: number;
  h: number;
}

/** Measures the page in Chromium: scroll size, and each action's box (also the shock buttons the page shows). */
async function measure(page: Page) {
  return page.evaluate((ids) => {
    // Two weight-based steps can share an energy (and so a test id): measure each element.
    const shocks = [...document.querySelectorAll('[data-testid^="shock-"]')]
      .filter((el) => /^shock-\d+$/.test(el.getAttribute('data-testid') ?? ''))
      .map((el, i) => ({ id: `${el.getAttribute('data-testid')}#${i}`, el }));
    const wanted = [...ids, 'undo'].map((id) => ({
      id,
      el: document.querySelector(`[data-testid="${id}"]`),
    }));
    const boxes = [...wanted, ...shocks].flatMap(({ id, el }) => {
      if (!el)
        return id === 'undo'
          ? []
          : [{ id, missing: true, x: 0, y: 0, w: 0, h: 0, hidden: true, clipped: false }];
      const r = el.getBoundingClientRect();
      // An ancestor that scrolls or clips and cuts the button off hides it.
      let clipped = false;
      for (let a = el.parentElement; a && a !== document.body; a = a.parentElement) {
        const style = getComputedStyle(a);
        if (style.overflowY !== 'visible' || style.overflowX !== 'visible') {
          const ar = a.getBoundingClientRect();
          if (
            r.top < ar.top - 0.5 ||
            r.bottom > ar.bottom + 0.5 ||
            r.left < ar.left - 0.5 ||
            r.right > ar.right + 0.5
          )
            clipped = true;
        }
      }
      // Text cut inside the button: its content is wider or taller than the box.
      const cut = el.scrollHeight > el.clientHeight + 1 || el.scrollWidth > el.clientWidth + 1;
      return [
        {
          id,
          missing: false,
          x: r.left,
          y: r.top,
          w: r.width,
          h: r.height,
          hidden: r.width === 0,
          clipped: clipped || cut,
        },
      ];
    });
    return {
      scrollHeight: document.scrollingElement?.scrollHeight ?? 0,
      scrollWidth: document.scrollingElement?.scrollWidth ?? 0,
      innerHeight: window.innerHeight,
      innerWidth: window.innerWidth,
      boxes,
    };
  }, ACTIONS);
}

function overlaps(a: Box, b: Box): boolean {
  return (
    a.x < b.x + b.w - 0.5 && b.x < a.x + a.w - 0.5 && a.y < b.y + b.h - 0.5 && b.y < a.y + a.h - 0.5
  );
}

async function expectFits(page: Page, label: string) {
  const m = await measure(page);
  const problems: string[] = [];
  if (m.scrollHeight > m.innerHeight)
    problems.push(`page scrolls: ${m.scrollHeight} > ${m.innerHeight}`);
  if (m.scrollWidth > m.innerWidth)
    problems.push(`page scrolls sideways: ${m.scrollWidth} > ${m.innerWidth}`);
  for (const b of m.boxes) {
    if (b.missing) problems.push(`${b.id} missing`);
    else if (
      b.x < 0 ||
      b.y < 0 ||
      b.x + b.w > m.innerWidth + 0.5 ||
      b.y + b.h > m.innerHeight + 0.5
    )
      problems.push(
        `${b.id} outside the viewport (${Math.round(b.x)},${Math.round(b.y)} ${Math.round(b.w)}x${Math.round(b.h)})`,
      );
    // WCAG 2.2 target size: our floor is 48 x 48 CSS px.
    if (!b.missing && (b.w < 48 || b.h < 48))
      problems.push(`${b.id} is ${b.w.toFixed(1)}x${b.h.toFixed(1)}`);
    if (b.clipped)
      problems.push(`${b.id} cut off (clipped by a container or its own text overflows)`);
  }
  const shown = m.boxes.filter((b) => !b.missing);
  for (let i = 0; i < shown.length; i++)
    for (let j = i + 1; j < shown.length; j++)
      if (overlaps(shown[i]!, shown[j]!)) problems.push(`${shown[i]!.id} overlaps ${shown[j]!.id}`);
  if (problems.length > 0)
    console.warn(
      `[screenshot] ${await screenshot(page, `pad-layout-failed-${label.replace(/[^a-z]+/g, '-')}`)}`,
    );
  expect(
    problems,
    `${label}: ${m.innerWidth}x${m.innerHeight}, page ${m.scrollWidth}x${m.scrollHeight}`,
  ).toEqual([]);
  // The shock energies were measured too (five presets for an adult, the weight-based steps for a child).
  expect(m.boxes.filter((b) => /^shock-\d+#/.test(b.id)).length).toBeGreaterThanOrEqual(3);
}

const LANDSCAPE = { width: 1180, height: 820 };
const PORTRAIT = { width: 820, height: 1180 };

describe('the pad on one tablet screen', () => {
  const run = useServerAndBrowser({ timeoutMs: 90_000 });

  it('shows every action of an adult code without scrolling, landscape and portrait, 48 px targets, none overlapping', async () => {
    const ctx = await newContext(run.browser, run.server.baseUrl, LANDSCAPE);
    const page = await ctx.newPage();
    await signInAs(page, 'maren.holt');
    await expectAccessible(page, 'home');
    await startCodeFromHome(page, 'adult');
    await poll(() => page.getByTestId('sync-state').getAttribute('data-connected')).toBe('true');
    await expectFits(page, 'adult, landscape');
    await expectAccessible(page, 'recorder pad (adult)');
    // A tap brings Undo: it must fit too, without moving the buttons onto each other.
    await page.getByTestId('drug-epinephrine').click();
    await page.getByTestId('undo').waitFor();
    await expectFits(page, 'adult, landscape, after a tap');
    console.warn(`[screenshot] ${await screenshot(page, 'pad-adult-landscape')}`);
    await page.setViewportSize(PORTRAIT);
    await expectFits(page, 'adult, portrait');
    console.warn(`[screenshot] ${await screenshot(page, 'pad-adult-portrait')}`);
    await ctx.close();
  }, 120_000);

  it('shows every action of a child code with its weight-based doses without scrolling, landscape and portrait', async () => {
    const ctx = await newContext(run.browser, run.server.baseUrl, PORTRAIT);
    const page = await ctx.newPage();
    await signInAs(page, 'kofi.asante');
    await startCodeFromHome(page, 'child');
    await setWeight(page, 18);
    // PALS medications table: epinephrine 0.01 mg/kg (0.18 mg for 18 kg).
    await poll(() => page.getByTestId('drug-epinephrine').innerText()).toContain('0.18 mg');
    expect(await page.getByTestId('header-weight').innerText()).toContain('18 kg');
    expect(await page.getByTestId('record-heading').innerText()).toContain('Pediatric');
    await expectFits(page, 'child, portrait');
    await page.getByTestId('drug-amiodarone').click();
    await page.getByTestId('undo').waitFor();
    await expectFits(page, 'child, portrait, after a tap');
    console.warn(`[screenshot] ${await screenshot(page, 'pad-child-portrait')}`);
    await page.setViewportSize(LANDSCAPE);
    await expectFits(page, 'child, landscape');
    await expectAccessible(page, 'recorder pad (child)');
    console.warn(`[screenshot] ${await screenshot(page, 'pad-child-landscape')}`);
    await page.getByTestId('pad-details').click();
    await page.getByTestId('details-sheet').waitFor();
    await expectAccessible(page, 'code details sheet');
    await page.getByTestId('details-close').click();
    await ctx.close();
  }, 120_000);

  it('records by keyboard alone: Tab reaches each action with a visible focus ring, Enter and Space record', async () => {
    const ctx = await newContext(run.browser, run.server.baseUrl, LANDSCAPE);
    const page = await ctx.newPage();
    await signInAs(page, 'maren.holt');
    const codeId = await startCodeFromHome(page, 'adult');
    await poll(() => page.getByTestId('sync-state').getAttribute('data-connected')).toBe('true');

    // Tab from the top of the page until each wanted action has focus; check its ring as it passes.
    const tabTo = async (testId: string) => {
      for (let i = 0; i < 120; i++) {
        await page.keyboard.press('Tab');
        const focused = await page.evaluate(() => {
          const el = document.activeElement as HTMLElement | null;
          if (!el) return null;
          const s = getComputedStyle(el);
          return {
            id: el.getAttribute('data-testid'),
            ring: s.outlineStyle !== 'none' && parseFloat(s.outlineWidth) >= 2,
          };
        });
        if (focused?.id === testId) {
          expect(focused.ring, `${testId} shows a focus ring`).toBe(true);
          return;
        }
      }
      throw new Error(`Tab never reached ${testId}`);
    };
    await page.locator('body').focus();
    await tabTo('cpr-start');
    await page.keyboard.press('Enter');
    await tabTo('rhythm-vf');
    await page.keyboard.press('Space');
    await tabTo('drug-epinephrine');
    await page.keyboard.press('Enter');
    await poll(async () => (await storedLog(page, codeId)).entries.map((e) => e.kind)).toEqual([
      'cpr',
      'rhythm',
      'drug',
    ]);
    const log = await storedLog(page, codeId);
    expect(log.entries[1]).toMatchObject({ rhythm: 'vf', pulse: false });
    await ctx.close();
  }, 120_000);
});
