import { describe, expect, it } from 'vitest';
import { newContext, screenshot, signInAs, useServerAndBrowser } from './support/browser.js';

const PEOPLE = [
  { role: 'recorder', username: 'maren.holt', name: 'Maren Holt, RN' },
  { role: 'leader', username: 'kofi.asante', name: 'Dr Kofi Asante' },
  { role: 'pharmacist', username: 'priya.venkat', name: 'Priya Venkat, PharmD' },
  { role: 'reviewer', username: 'ewan.trelawny', name: 'Ewan Trelawny, RN' },
  { role: 'admin', username: 'sofia.delacroix', name: 'Sofia Delacroix' },
] as const;

describe('signing in, in Chromium', () => {
  const run = useServerAndBrowser({ timeoutMs: 60_000 });

  for (const person of PEOPLE) {
    it(`shows the ${person.role}'s home after signing in as ${person.username}`, async () => {
      const context = await newContext(run.browser, run.server.baseUrl);
      const page = await context.newPage();
      await signInAs(page, person.username);
      await expect.poll(() => page.getByTestId('home-heading').innerText(), { timeout: 15_000 }).toContain(person.name.split(',')[0]!);
      expect(await page.getByTestId(`home-panel-${person.role}`).isVisible()).toBe(true);
      await screenshot(page, `home-${person.role}`);
      await context.close();
    });
  }

  it('shows the demo password only in demo mode, and a clear message for a wrong password', async () => {
    const context = await newContext(run.browser, run.server.baseUrl);
    const page = await context.newPage();
    await page.goto('/sign-in');
    await expect.poll(() => page.getByText('steady-hands-demo').count(), { timeout: 15_000 }).toBeGreaterThan(0);
    await page.getByLabel('Username').fill('maren.holt');
    await page.getByLabel('Password').fill('not the right one');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText('That username and password do not match.').waitFor();
    await screenshot(page, 'sign-in-wrong-password');
    await context.close();
  });

  it('sends a signed-out visitor to sign in, then back where they were going', async () => {
    const context = await newContext(run.browser, run.server.baseUrl);
    const page = await context.newPage();
    await page.goto('/codes/some-code/record');
    await page.waitForURL(/\/sign-in\?next=/);
    await page.getByLabel('Username').fill('maren.holt');
    await page.getByLabel('Password').fill('steady-hands-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(/\/codes\/some-code\/record$/);
    await context.close();
  });
});
