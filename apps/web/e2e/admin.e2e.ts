import { describe, expect, it } from 'vitest';
import { enrolAuthenticator, newContext, screenshot, signInAs, signInAsAdmin, useServerAndBrowser } from './support/browser.js';

describe('the admin area, in Chromium', () => {
  const run = useServerAndBrowser({ timeoutMs: 60_000 });

  it('the demo admin sets up an authenticator from the QR page, signs in again with a code, adds a person with roles and disables them', async () => {
    const context = await newContext(run.browser, run.server.baseUrl);
    const page = await context.newPage();

    // No authenticator yet: the admin pages send the admin to set one up first.
    await signInAs(page, 'sofia.delacroix');
    await page.getByTestId('home-admin-area').click();
    await page.waitForURL(/\/account\/second-factor\?next=/);
    await page.getByTestId('second-factor-reason').waitFor();
    await page.getByRole('button', { name: 'Set up an authenticator' }).click();
    await page.getByTestId('totp-qr').waitFor();
    expect(await page.getByTestId('totp-qr').getAttribute('src')).toMatch(/^data:image\/png;base64,/);
    const recoveryCodes = await enrolAuthenticator(page, 'sofia.delacroix');
    expect(recoveryCodes).toHaveLength(10);
    await screenshot(page, 'admin-second-factor-recovery-codes');
    await page.getByRole('button', { name: 'I have saved them' }).click();
    await page.getByTestId('admin-heading').waitFor();

    // Sign out, then the sign-in asks for the code after the password.
    await page.getByRole('button', { name: 'Sign out' }).click();
    await page.waitForURL(/\/sign-in/);
    await signInAsAdmin(page);
    await page.goto('/admin');
    await page.getByTestId('admin-heading').waitFor();

    const form = page.getByRole('form', { name: 'Add a person' });
    await form.getByLabel('Full name').fill('Nadia Quist, RN');
    await form.getByLabel('Username').fill('nadia.quist');
    await form.getByLabel('Temporary password').fill('first shift on ward four');
    await form.locator('label').filter({ hasText: /^Recorder$/ }).click();
    await form.locator('label').filter({ hasText: /^Team leader$/ }).click();
    await form.getByRole('button', { name: 'Add person' }).click();
    await page.getByText('Nadia Quist, RN was added.').waitFor();
    const card = page.getByTestId('person-nadia.quist');
    await expect.poll(() => card.innerText()).toContain('Team leader');
    expect(await card.innerText()).toContain('Must choose a password');

    await card.getByRole('button', { name: 'Manage Nadia Quist, RN' }).click();
    await card.getByRole('button', { name: 'Disable account' }).click();
    await card.getByTestId('person-disabled').waitFor();
    await screenshot(page, 'admin-people');

    await page.getByRole('link', { name: 'Audit trail' }).click();
    await expect.poll(() => page.getByTestId('audit-table').innerText()).toContain('user.disabled');
    expect(await page.getByTestId('audit-table').innerText()).toContain('totp.enrolled');
    await screenshot(page, 'admin-audit');

    await page.getByRole('link', { name: 'Backups' }).click();
    await expect.poll(() => page.getByText('The server copies the database every 15 minutes').count()).toBe(1);
    expect(await page.getByText('No copies yet.').count()).toBe(1);
    await context.close();
  });
});
