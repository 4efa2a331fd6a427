import { randomUUID } from 'node:crypto';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { launchChromium, newContext, screenshot, signInAs } from './support/browser.js';
import { DEMO_PASSWORD, startServer, type RunningServer } from './support/server.js';

/** A signed-in API client from Node: cookie and CSRF token, like the browser keeps them. */
async function apiAs(baseUrl: string, username: string) {
  let cookie = '';
  const call = async (method: string, path: string, body?: unknown, csrf?: string) => {
    const res = await fetch(`${baseUrl}${path}`, {
      method,
      headers: {
        cookie,
        origin: baseUrl,
        'content-type': 'application/json',
        ...(csrf ? { 'x-csrf-token': csrf } : {}),
      },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    const set = res.headers
      .getSetCookie()
      .map((c) => c.split(';')[0])
      .join('; ');
    if (set) cookie = set;
    const json = (await res.json().catch(() => null)) as unknown;
    if (!res.ok)
      throw new Error(`${method} ${path} answered ${res.status}: ${JSON.stringify(json)}`);
    return json as Record<string, unknown>;
  };
  const token = async () => (await call('GET', '/api/auth/csrf')).token as string;
  await call('POST', '/api/auth/login', { username, password: DEMO_PASSWORD }, await token());
  const csrf = await token();
  return { post: (path: string, body: unknown) => call('POST', path, body, csrf) };
}

describe('pharmacy reconciliation, in Chromium', () => {
  let server: RunningServer;
  let browser: Browser;
  let codeId: string;

  beforeAll(async () => {
    server = await startServer();
    browser = await launchChromium();
    // A demo code in 4 West, ended and signed by the recorder through the records route.
    const maren = await apiAs(server.baseUrl, 'maren.holt');
    const arrest = Date.now() - 50 * 60_000;
    const at = (minutes: number) => new Date(arrest + minutes * 60_000).toISOString();
    const created = await maren.post('/api/codes', {
      category: 'adult',
      location: '4 West Medical bed 12',
      arrestAt: at(0),
    });
    codeId = (created.code as { id: string }).id;
    const drug = (minutes: number, name: string, dose: number) => ({
      id: randomUUID(),
      kind: 'drug',
      at: at(minutes),
      drug: name,
      dose,
      unit: 'mg',
      route: 'iv',
    });
    for (const entry of [
      { id: randomUUID(), kind: 'cpr', action: 'start', at: at(0.25) },
      drug(5, 'epinephrine', 1),
      drug(7, 'amiodarone', 300),
      drug(9, 'epinephrine', 1),
      drug(12, 'amiodarone', 150),
      drug(13, 'epinephrine', 1),
      { id: randomUUID(), kind: 'end', at: at(23), outcome: 'sustained-rosc' },
    ]) {
      await maren.post(`/api/codes/${codeId}/entries`, entry);
    }
    await maren.post(`/api/codes/${codeId}/signatures`, {
      meaning: 'recorded-by',
      password: DEMO_PASSWORD,
    });
  }, 90_000);
  afterAll(async () => {
    await browser?.close();
    await server?.stop();
  });

  it('lets the pharmacist find the code, see 3 mg epinephrine against 2 units flagged, fix the count and sign off', async () => {
    const context = await newContext(browser, server.baseUrl);
    const page = await context.newPage();
    await signInAs(page, 'priya.venkat');
    await page.getByTestId('home-pharmacy-worklist').click();
    await page.waitForURL(/\/pharmacy$/);
    const row = page.getByTestId(`worklist-row-${codeId}`);
    expect(await row.innerText()).toMatch(
      /4 West Medical[\s\S]*Signed[\s\S]*2 \(5 doses\)[\s\S]*2 to account for/,
    );
    await row.getByRole('link', { name: 'Reconcile' }).click();
    await page.waitForURL(new RegExp(`/pharmacy/codes/${codeId}$`));

    const epi = page.getByTestId('drug-row-epinephrine');
    const amio = page.getByTestId('drug-row-amiodarone');
    expect(await epi.getByTestId('given-epinephrine').innerText()).toContain('3 mg in 3 doses');
    // The demo tray's invented lots; atropine's expiry is set within 30 days to show the flag.
    expect(await epi.getByTestId('tray-lot-epinephrine').innerText()).toContain('lot DEMO-EP-2611');
    expect(await page.getByTestId('tray-lot-atropine').innerText()).toContain(
      'Expires within 30 days',
    );
    await epi.getByLabel('Units opened').fill('2');
    await epi.getByLabel('Lot numbers').fill('EP2291');
    await amio.getByLabel('Units opened').fill('3');
    // Shape, words and colour: impossible to miss.
    await expect
      .poll(() => epi.getByTestId('discrepancies-epinephrine').innerText(), { timeout: 5_000 })
      .toContain('Given more than opened');
    expect(await amio.getByTestId('discrepancies-amiodarone').innerText()).toContain('Balanced');
    expect(await page.getByTestId('live-summary').innerText()).toContain(
      '1 drug with a discrepancy',
    );
    // One compact row per drug; the explanation sits under a row only when it does not balance.
    expect(await page.getByTestId('explanation-epinephrine').innerText()).toMatch(/Given more than opened: .+/);
    expect(await page.getByTestId('explanation-amiodarone').count()).toBe(0);
    const heights = await page
      .getByTestId('reconciliation-table')
      .locator('tbody[data-flagged="false"]')
      .evaluateAll((bodies) => bodies.map((b) => b.getBoundingClientRect().height));
    expect(heights.length).toBeGreaterThanOrEqual(3);
    expect(Math.max(...heights)).toBeLessThan(120);
    await page.getByTestId('save-reconciliation').click();
    await expect
      .poll(() => page.getByTestId('reconciliation-status').innerText(), { timeout: 10_000 })
      .toContain('Draft');
    await screenshot(page, 'pharmacy-discrepancy');

    // The third syringe turns up: the count is corrected before sign-off.
    await epi.getByLabel('Units opened').fill('3');
    await expect
      .poll(() => epi.getByTestId('discrepancies-epinephrine').innerText(), { timeout: 5_000 })
      .toContain('Balanced');
    expect(await page.getByTestId('live-summary').innerText()).toContain(
      'Every drug given is accounted for',
    );
    expect(await page.getByTestId('explanation-epinephrine').count()).toBe(0);

    await page.getByTestId('open-sign-off').click();
    const dialog = page.getByTestId('sign-off-dialog');
    await dialog.getByTestId('sign-off-password').fill('wrong password');
    await dialog.getByTestId('confirm-sign-off').click();
    // Password checks take a moment (scrypt).
    await expect
      .poll(() => dialog.innerText(), { timeout: 20_000 })
      .toContain('The password does not match');
    await dialog.getByTestId('sign-off-password').fill(DEMO_PASSWORD);
    await dialog.getByTestId('confirm-sign-off').click();
    await expect
      .poll(() => page.getByTestId('reconciliation-status').innerText(), { timeout: 20_000 })
      .toContain('Signed off');
    expect(await page.getByTestId('signed-banner').innerText()).toContain('Priya Venkat');
    expect(await page.getByTestId('restock-pdf').getAttribute('href')).toBe(
      `/api/codes/${codeId}/reconciliation/restock.pdf`,
    );
    const pdf = await context.request.get(`/api/codes/${codeId}/reconciliation/restock.pdf`);
    expect(pdf.headers()['content-type']).toBe('application/pdf');
    const csv = await (
      await context.request.get(`/api/codes/${codeId}/reconciliation/restock.csv`)
    ).text();
    expect(csv).toMatch(
      /Atropine,1 mg in 10 mL,no,3,0,0,0,,DEMO-AT-5520,\d{4}-\d\d-\d\d,expires within 30 days,,/,
    );
    await screenshot(page, 'pharmacy-signed-off');

    // The signed-off code leaves the worklist (the demo's own signed codes stay on it).
    await page.goto('/pharmacy');
    await page.getByTestId('worklist').waitFor();
    expect(await page.getByTestId(`worklist-row-${codeId}`).count()).toBe(0);

    // Restock by cart: the 4 West cart's list counts the code just signed off.
    const unitSelect = page.getByTestId('cart-restock-unit');
    const westUnit = await unitSelect
      .locator('option', { hasText: '4 West Medical' })
      .first()
      .getAttribute('value');
    await unitSelect.selectOption(westUnit ?? '');
    await page.getByTestId('cart-restock-line-epinephrine').waitFor();
    expect(await page.getByTestId('cart-restock-included').innerText()).toMatch(
      /Codes included: [1-9]/,
    );
    expect(await page.getByTestId('cart-restock-pdf').getAttribute('href')).toMatch(
      /\/api\/pharmacy\/carts\/.+\/restock\.pdf\?since=\d{4}-\d\d-\d\d$/,
    );
    await screenshot(page, 'pharmacy-cart-restock');
    await context.close();
    // Three password checks (sign-in, a wrong one, the right one) on a busy two-core machine.
  }, 150_000);
});
