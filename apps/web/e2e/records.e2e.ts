import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { csvRecords } from '@steadyhand/shared';
import type { Page } from 'playwright-core';
import { describe, expect, it } from 'vitest';
import {
  newContext,
  screenshot,
  signInAs,
  signInAsAdmin,
  useServerAndBrowser,
} from './support/browser.js';
import { DEMO_PASSWORD } from './support/server.js';

/** The timeline row whose "what" reads exactly so (voided rows included). */
const row = (page: Page, what: string) =>
  page
    .getByTestId('timeline-row')
    .filter({ has: page.getByTestId('timeline-what').getByText(what, { exact: true }) });

describe('after the code: review, correct, attach, sign twice, print and verify, in Chromium', () => {
  const run = useServerAndBrowser();

  it('takes the demo 4 West code from ended to a signed PDF that verifies, and tells pharmacy and reviewers', async () => {
    const { baseUrl, dataDir } = run.server;

    // The recorder finds the demo code waiting for signatures on the home page.
    const nurse = await newContext(run.browser, baseUrl, { width: 1440, height: 900 });
    const page = await nurse.newPage();
    await signInAs(page, 'maren.holt');
    const waiting = page.getByTestId('home-record').filter({ hasText: '4 West Medical, bed 12' });
    await waiting.click();
    await page.getByTestId('review-heading').waitFor();
    expect(await page.getByTestId('review-heading').innerText()).toBe('4 West Medical, bed 12');
    expect(await page.getByTestId('record-status').getAttribute('data-status')).toBe('draft');
    const codeId = new URL(page.url()).pathname.split('/')[2] ?? '';
    // The summary from the shared computations: first shock 1:35 after the arrest (the demo's times).
    await expect.poll(() => page.getByTestId('code-summary').innerText()).toContain('1:35');

    // Correct a value: the first one stays beside the correction.
    await row(page, 'ETCO2 18 mmHg')
      .getByRole('button', { name: /^Correct/ })
      .click();
    const correction = page.getByTestId('correction-dialog');
    await correction.getByTestId('correction-mmHg').fill('16');
    await correction
      .getByTestId('correction-reason')
      .fill('Value read again from the monitor strip');
    await correction.getByTestId('correction-save').click();
    await row(page, 'ETCO2 16 mmHg').waitFor();
    const amended = await row(page, 'ETCO2 16 mmHg').innerText();
    expect(amended).toContain('First recorded: ETCO2 18 mmHg');
    expect(amended).toContain('Value read again from the monitor strip');
    expect(amended).toContain('Maren Holt, RN');
    expect(amended).toContain('Amended');

    // A note, then void it: struck through, kept, with the reason.
    await page.getByTestId('note-text').fill('Strip printed twice by mistake');
    await page.getByTestId('note-add').click();
    await row(page, 'Note: Strip printed twice by mistake').waitFor();
    await row(page, 'Note: Strip printed twice by mistake')
      .getByRole('button', { name: /^Void/ })
      .click();
    await correction.getByTestId('correction-reason').fill('Not part of the code');
    await correction.getByTestId('correction-save').click();
    await expect
      .poll(() => row(page, 'Note: Strip printed twice by mistake').getAttribute('data-voided'))
      .toBe('true');
    expect(await row(page, 'Note: Strip printed twice by mistake').innerText()).toContain('Voided');

    // Complete the details: the team and the debrief.
    const details = page.getByTestId('review-details');
    await details.getByTestId('add-team-member').click();
    await details.getByPlaceholder('Name').last().fill('Dr Kofi Asante');
    await details.getByPlaceholder('Role, e.g. Compressions').last().fill('Team leader');
    await details.getByTestId('add-team-member').click();
    await details.getByPlaceholder('Name').last().fill('Maren Holt, RN');
    await details.getByPlaceholder('Role, e.g. Compressions').last().fill('Recorder');
    await details
      .getByTestId('details-debrief')
      .fill('Shock delivered within two minutes. Amiodarone drawn up early.');
    await details.getByTestId('details-save').click();
    await details.getByText('Saved.').waitFor();

    // The registry details: witnessed by staff, monitored on ECG (the demo entered where and when the team came).
    const registry = page.getByTestId('utstein-details');
    expect(await registry.getByTestId('utstein-arrestLocation').inputValue()).toBe('ward');
    await registry.getByTestId('utstein-witnessed').selectOption('yes');
    await registry.getByTestId('utstein-witnessedBy').selectOption('staff');
    await registry.getByTestId('utstein-monitored').selectOption('yes');
    await registry.getByTestId('utstein-monitoring-ecg').click();
    await registry.getByTestId('utstein-stopReason').selectOption('rosc');
    await registry.getByTestId('utstein-save').click();
    await registry.getByText('Saved.').waitFor();

    // Attach a monitor strip (an image): listed with its SHA-256 and shown as a preview.
    const strip = await page.screenshot({ clip: { x: 0, y: 0, width: 320, height: 120 } });
    await page
      .getByTestId('attachment-input')
      .setInputFiles({ name: 'strip-0743.png', mimeType: 'image/png', buffer: strip });
    await page.getByTestId('attachment').first().waitFor();
    expect(await page.getByTestId('attachment-digest').first().innerText()).toBe(
      createHash('sha256').update(strip).digest('hex'),
    );
    await expect
      .poll(() =>
        page
          .getByTestId('attachment-preview')
          .first()
          .evaluate((img: HTMLImageElement) => img.complete && img.naturalWidth),
      )
      .toBe(320);
    await screenshot(page, 'record-review-draft');

    // Sign: a wrong password signs nothing and keeps the nurse signed in; the right one signs.
    const recorded = page.getByTestId('signature-recorded-by');
    await recorded.getByTestId('sign-password').fill('not my password');
    await recorded.getByTestId('sign-button').click();
    await expect
      .poll(() => recorded.getByRole('alert').innerText())
      .toContain('The password does not match');
    expect(await recorded.getAttribute('data-signed')).toBe('false');
    await recorded.getByTestId('sign-password').fill(DEMO_PASSWORD);
    await recorded.getByTestId('sign-button').click();
    await expect.poll(() => recorded.getAttribute('data-signed'), { timeout: 20_000 }).toBe('true');
    expect(await recorded.getByTestId('signature-name').innerText()).toBe('Maren Holt, RN');
    expect(await page.getByTestId('record-status').getAttribute('data-status')).toBe(
      'partly-signed',
    );
    // Signed once: the details are frozen, corrections go in as addenda.
    expect(await page.getByTestId('details-save').count()).toBe(0);
    expect(await page.getByTestId('note-add').innerText()).toBe('Add the addendum');
    await nurse.close();

    // The team leader signs second.
    const leaderContext = await newContext(run.browser, baseUrl, { width: 1440, height: 900 });
    const leader = await leaderContext.newPage();
    await signInAs(leader, 'kofi.asante');
    await leader.goto(`/codes/${codeId}/review`);
    const confirmed = leader.getByTestId('signature-reviewed-confirmed');
    await confirmed.getByTestId('sign-password').fill(DEMO_PASSWORD);
    await confirmed.getByTestId('sign-button').click();
    await expect
      .poll(() => confirmed.getAttribute('data-signed'), { timeout: 20_000 })
      .toBe('true');
    expect(await leader.getByTestId('record-status').getAttribute('data-status')).toBe('signed');
    expect(await leader.getByTestId('signature-recorded-by').innerText()).toContain(
      'Signature verified',
    );
    // Each signature names the server key that made it (GET /api/records/public-keys lists them).
    expect(
      await leader
        .getByTestId('signature-reviewed-confirmed')
        .getByTestId('signature-key')
        .innerText(),
    ).toMatch(/^Server key [0-9a-f]{16}$/);
    await screenshot(leader, 'record-review-signed');

    // The PDF: both signature lines, the corrected value with the first one, the digest; no draft mark.
    const [download] = await Promise.all([
      leader.waitForEvent('download'),
      leader.getByTestId('record-pdf').click(),
    ]);
    const pdfPath = path.join(dataDir, 'downloaded-record.pdf');
    await download.saveAs(pdfPath);
    const text = execFileSync('/usr/bin/pdftotext', ['-layout', pdfPath, '-'], {
      encoding: 'utf8',
    });
    const digest = await leader.getByTestId('record-digest').innerText();
    expect(text).toContain('Harbourview General Hospital');
    expect(text).toMatch(/Recorded by[\s\S]*Maren Holt, RN/);
    expect(text).toMatch(/Reviewed and confirmed by[\s\S]*Dr Kofi Asante/);
    const flat = text.replace(/\s+/g, ' ');
    expect(flat).toContain(
      'Was: 18 mmHg. Now: 16 mmHg. Reason: Value read again from the monitor strip',
    );
    expect(flat).toMatch(/VOIDED .* Reason: Not part of the code/);
    expect(text).toContain('strip-0743.png');
    expect(text.replace(/\s+/g, '')).toContain(digest);
    expect(text).not.toContain('DRAFT');

    // The verification page: the file as issued is valid; one changed byte is not.
    await leader.goto('/records/verify');
    await leader.getByTestId('verify-file').setInputFiles(pdfPath);
    await expect
      .poll(() => leader.getByTestId('verify-result').getAttribute('data-valid'), {
        timeout: 20_000,
      })
      .toBe('true');
    const verified = await leader.getByTestId('verify-result').innerText();
    expect(verified).toContain('4 West Medical, bed 12');
    expect(verified).toMatch(/server key [0-9a-f]{16} \(verified\)/);
    await screenshot(leader, 'record-verify-valid');
    const bytes = readFileSync(pdfPath);
    const middle = Math.floor(bytes.length / 2);
    bytes[middle] = bytes[middle]! ^ 0x01;
    const tamperedPath = path.join(dataDir, 'tampered-record.pdf');
    writeFileSync(tamperedPath, bytes);
    await leader.getByTestId('verify-file').setInputFiles(tamperedPath);
    await expect
      .poll(() => leader.getByTestId('verify-result').getAttribute('data-valid'), {
        timeout: 20_000,
      })
      .toBe('false');
    // The digest from a paper copy.
    await leader.getByTestId('verify-digest').fill(digest);
    await leader.getByTestId('verify-digest-submit').click();
    await expect
      .poll(() => leader.getByTestId('verify-result').getAttribute('data-valid'), {
        timeout: 20_000,
      })
      .toBe('true');
    await leaderContext.close();

    // The mail to pharmacy and reviewers reached the development relay, with the link to the record.
    const adminContext = await newContext(run.browser, baseUrl, { width: 1440, height: 900 });
    const admin = await adminContext.newPage();
    await signInAsAdmin(admin);
    await admin.goto('/admin/outbox');
    const mail = admin
      .getByTestId('outbox-message')
      .filter({ hasText: 'Code record signed: 4 West Medical, bed 12' });
    await mail.first().waitFor({ timeout: 20_000 });
    expect(await mail.first().innerText()).toContain(`/codes/${codeId}/review`);
    expect(await mail.first().innerText()).toContain('pharmacy@harbourview.example');
    await screenshot(admin, 'admin-outbox');
    await adminContext.close();

    // The reviewer finds the code waiting for its follow-up, enters it, and the registry CSV carries it all.
    const reviewerContext = await newContext(run.browser, baseUrl, { width: 1440, height: 900 });
    const reviewer = await reviewerContext.newPage();
    await signInAs(reviewer, 'ewan.trelawny');
    await reviewer.goto('/quality/follow-up');
    const waitingRow = reviewer.locator(`[data-testid="follow-up-row"][data-code-id="${codeId}"]`);
    await waitingRow.waitFor();
    expect(await waitingRow.innerText()).toContain('survival to discharge');
    await waitingRow.getByRole('link').click();
    const followUp = reviewer.getByTestId('follow-up');
    await followUp.waitFor();
    expect(await reviewer.getByTestId('quality-target-time-to-shock').getAttribute('data-state')).toBe('met');
    const today = new Date().toISOString().slice(0, 10);
    await followUp.getByTestId('follow-up-survivalToDischarge').selectOption('yes');
    await followUp.getByTestId('follow-up-survivalToDischarge-date').fill(today);
    await followUp.getByTestId('follow-up-neurologicalOutcome').selectOption('cpc-1');
    await followUp.getByTestId('follow-up-neurologicalOutcome-date').fill(today);
    await followUp.getByTestId('follow-up-save').click();
    await expect
      .poll(() => followUp.getByTestId('follow-up-status').innerText())
      .toBe('Waiting for: status at 30 days.');
    expect(await followUp.innerText()).toContain('Entered by Ewan Trelawny, RN');
    await screenshot(reviewer, 'quality-follow-up');

    await reviewer.goto('/quality');
    const [csvDownload] = await Promise.all([
      reviewer.waitForEvent('download'),
      reviewer.getByTestId('quality-export-csv').click(),
    ]);
    const exported = csvRecords(readFileSync(await csvDownload.path(), 'utf8')).find(
      (r) => r.record_id === codeId,
    );
    expect(exported).toMatchObject({
      witnessed: 'yes',
      witnessed_by: 'staff',
      monitored: 'yes',
      monitoring: 'ecg',
      survival_to_discharge: 'yes',
      survival_to_discharge_date: today,
      neurological_outcome: 'cpc-1',
      status_30_days: '',
    });
    await reviewerContext.close();
  }, 300_000);
});
