import { execFileSync } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { RESTOCK_CSV_COLUMNS, type ReconciliationView, type TrayItem, type WorklistItem } from '@steadyhand/shared';
import { SMTPServer } from 'smtp-server';
import type { Response } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DB } from '../src/db/database.module.js';
import type { Db } from '../src/db/database.js';
import { auditEvents, units } from '../src/db/schema/index.js';
import { makeEntry } from './support/entries.js';
import { addUser, freePort, signIn, startTestApp, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

/** Collects what the server sends; stands in for the pharmacy lead's mailbox. */
async function startMailbox(): Promise<{ port: number; messages: { to: string[]; raw: string }[]; close(): Promise<void> }> {
  const messages: { to: string[]; raw: string }[] = [];
  const port = await freePort();
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    onData(stream, session, done) {
      let raw = '';
      stream.on('data', (d: Buffer) => (raw += d.toString()));
      stream.on('end', () => {
        messages.push({ to: session.envelope.rcptTo.map((r) => r.address), raw });
        done();
      });
    },
  });
  await new Promise<void>((resolve) => server.listen(port, '127.0.0.1', resolve));
  return { port, messages, close: () => new Promise((resolve) => server.close(() => resolve())) };
}

describe('pharmacy: trays, worklist, reconciliation, sign-off, restock list', () => {
  let app: TestApp;
  let mailbox: Awaited<ReturnType<typeof startMailbox>>;
  let admin: SignedInAgent;
  let pharmacist: SignedInAgent;
  let recorder: SignedInAgent;
  let leader: SignedInAgent;
  let bystander: SignedInAgent;
  let unitId: string;
  let trayId: string;
  let older: string;
  let newer: string;

  const send = (who: SignedInAgent, method: 'post' | 'put' | 'patch', url: string, body: object) => who.agent[method](url).set('x-csrf-token', who.csrf).send(body);
  const view = (res: Response) => res.body as ReconciliationView;
  const row = (v: ReconciliationView, key: string) => v.rows.find((r) => r.drugKey === key);
  // Expiry dates relative to today (UTC, as the server reads them), away from the 30-day edge.
  const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);
  const farExpiry = inDays(400);
  const soonExpiry = inDays(10);
  const pastExpiry = inDays(-5);

  async function endedCode(arrestAt: string, drugs: [string, number, 'mg' | 'meq'][], sign: boolean): Promise<string> {
    const res = await send(recorder, 'post', '/api/codes', { category: 'adult', unitId, location: '4 West Medical bed 12', arrestAt }).expect(201);
    const id = (res.body as { code: { id: string } }).code.id;
    const t0 = Date.parse(arrestAt);
    const entries = [
      ...drugs.map(([drug, dose, unit], i) => makeEntry({ kind: 'drug', drug, dose, unit, route: 'iv' }, new Date(t0 + (i + 1) * 180_000))),
      makeEntry({ kind: 'end', outcome: 'sustained-rosc' }, new Date(t0 + 40 * 60_000)),
    ];
    for (const entry of entries) await send(recorder, 'post', `/api/codes/${id}/entries`, entry).expect(201);
    if (sign) await send(recorder, 'post', `/api/codes/${id}/signatures`, { meaning: 'recorded-by', password: TEST_PASSWORD }).expect(201);
    return id;
  }

  beforeAll(async () => {
    mailbox = await startMailbox();
    app = await startTestApp({ env: { SMTP_PORT: String(mailbox.port), PHARMACY_EMAIL: 'pharmacy-lead@harbourview.example' } });
    for (const [name, roles] of [
      ['adm', ['admin']],
      ['pharm', ['pharmacist']],
      ['rec', ['recorder']],
      ['lead', ['leader']],
      ['other.rec', ['recorder']],
    ] as const) {
      await addUser(app, name, [...roles]);
    }
    [admin, pharmacist, recorder, leader, bystander] = (await Promise.all(['adm', 'pharm', 'rec', 'lead', 'other.rec'].map((u) => signIn(app, u)))) as [
      SignedInAgent,
      SignedInAgent,
      SignedInAgent,
      SignedInAgent,
      SignedInAgent,
    ];
    // Units are managed elsewhere (admin); one row is enough here.
    unitId = randomUUID();
    app.app.get<symbol, Db>(DB).insert(units).values({ id: unitId, name: '4 West Medical', createdAt: new Date().toISOString() }).run();
  }, 90_000);
  afterAll(async () => {
    await app.close();
    await mailbox.close();
  });

  it('lets an admin make a tray template and put it on a unit cart; a pharmacist reads it', async () => {
    const created = await send(admin, 'post', '/api/pharmacy/trays', {
      name: 'Adult tray',
      items: [
        { drugKey: 'epinephrine', label: 'Epinephrine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 10, lot: ' EPI-T-0411 ', expiry: farExpiry },
        { drugKey: 'amiodarone', label: 'Amiodarone', strengthAmount: 150, strengthUnit: 'mg', volumeMl: 3, quantity: 4, lot: 'AMI-T-2207', expiry: soonExpiry },
        // Counted by volume: 8.4% is 1 mEq/mL (common practice), so 50 mEq is one syringe.
        { drugKey: 'sodium-bicarbonate', label: 'Sodium bicarbonate 8.4%', strengthAmount: 50, strengthUnit: 'mL', quantity: 2, lot: '' },
        { drugKey: 'naloxone', label: 'Naloxone', strengthAmount: 0.4, strengthUnit: 'mg', quantity: 2, lot: 'NAL-T-0930', expiry: pastExpiry },
        // Never opened below; on the restock list only because its lot expires soon.
        { drugKey: 'atropine', label: 'Atropine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 3, lot: 'ATR-T-1150', expiry: inDays(20) },
      ],
    }).expect(201);
    trayId = (created.body as { tray: { id: string } }).tray.id;
    await send(admin, 'put', `/api/pharmacy/units/${unitId}/tray`, { trayId }).expect(200);
    const list = await pharmacist.agent.get('/api/pharmacy/trays').expect(200);
    expect(list.body.units).toEqual([{ id: unitId, name: '4 West Medical', trayId, trayName: 'Adult tray' }]);
    const items = (list.body as { trays: { items: TrayItem[] }[] }).trays[0]?.items ?? [];
    expect(items.map((i) => i.drugKey)).toEqual(['epinephrine', 'amiodarone', 'sodium-bicarbonate', 'naloxone', 'atropine']);
    expect(items.map((i) => [i.lot, i.expiry])).toEqual([
      ['EPI-T-0411', farExpiry],
      ['AMI-T-2207', soonExpiry],
      [null, null],
      ['NAL-T-0930', pastExpiry],
      ['ATR-T-1150', inDays(20)],
    ]);
    const duplicate = await send(admin, 'post', '/api/pharmacy/trays', { name: 'Adult tray', items: [{ drugKey: 'naloxone', label: 'N', strengthAmount: 0.4, strengthUnit: 'mg', quantity: 1 }] });
    expect(duplicate.status).toBe(409);
    await send(pharmacist, 'post', '/api/pharmacy/trays', { name: 'x', items: [] }).expect(403);
  });

  it('refuses a bad expiry or an over-long lot with a 400 that names the field, and audits lot changes with what they replace', async () => {
    const item = { drugKey: 'adenosine', label: 'Adenosine', strengthAmount: 6, strengthUnit: 'mg', volumeMl: 2, quantity: 5 };
    for (const expiry of ['2027-02-30', '31/03/2027']) {
      const bad = await send(admin, 'post', '/api/pharmacy/trays', { name: 'Lot tray', items: [{ ...item, expiry }] }).expect(400);
      expect(bad.body.message).toBe('items.0.expiry: must be a date, YYYY-MM-DD, e.g. 2027-03-31');
    }
    const long = await send(admin, 'post', '/api/pharmacy/trays', { name: 'Lot tray', items: [{ ...item, lot: 'L'.repeat(41) }] }).expect(400);
    expect(long.body.message).toBe('items.0.lot: must be at most 40 characters');

    const created = await send(admin, 'post', '/api/pharmacy/trays', { name: 'Lot tray', active: false, items: [{ ...item, lot: 'ADE-T-0101', expiry: farExpiry }] }).expect(201);
    const tray = (created.body as { tray: { id: string; items: TrayItem[] } }).tray;
    expect(tray.items[0]).toMatchObject({ lot: 'ADE-T-0101', expiry: farExpiry });
    const itemId = tray.items[0]?.id;
    const changed = await send(admin, 'put', `/api/pharmacy/trays/${tray.id}`, { name: 'Lot tray', active: false, items: [{ ...item, id: itemId, lot: 'ADE-T-0202', expiry: soonExpiry }] }).expect(200);
    expect((changed.body as { tray: { items: TrayItem[] } }).tray.items[0]).toMatchObject({ id: itemId, lot: 'ADE-T-0202', expiry: soonExpiry });
    const audits = app.app
      .get<symbol, Db>(DB)
      .select()
      .from(auditEvents)
      .all()
      .filter((e) => (e.detail as { trayId?: string } | null)?.trayId === tray.id);
    expect(audits.map((e) => [e.action, e.detail?.lots])).toEqual([
      ['tray.created', [{ drugKey: 'adenosine', lot: 'ADE-T-0101', expiry: farExpiry, was: null }]],
      ['tray.changed', [{ drugKey: 'adenosine', lot: 'ADE-T-0202', expiry: soonExpiry, was: { lot: 'ADE-T-0101', expiry: farExpiry } }]],
    ]);
  });

  it('lists ended codes awaiting reconciliation oldest first, with counts and whether the record is signed', async () => {
    newer = await endedCode(new Date(Date.now() - 3_600_000).toISOString(), [['epinephrine', 1, 'mg']], false);
    older = await endedCode(new Date(Date.now() - 7_200_000).toISOString(), [
      ['epinephrine', 1, 'mg'],
      ['amiodarone', 300, 'mg'],
      ['epinephrine', 1, 'mg'],
      ['amiodarone', 150, 'mg'],
      ['epinephrine', 1, 'mg'],
      ['sodium-bicarbonate', 50, 'meq'],
    ], true);
    await send(recorder, 'post', '/api/codes', { category: 'adult' }).expect(201); // still running: not listed
    const res = await pharmacist.agent.get('/api/pharmacy/worklist').expect(200);
    const codes = res.body.codes as WorklistItem[];
    expect(codes.map((c) => c.codeId)).toEqual([older, newer]);
    // Nothing counted yet: every drug given is a discrepancy until the opened units are entered.
    expect(codes[0]).toMatchObject({ recordSigned: true, status: 'not-started', drugs: 3, doses: 6, discrepancies: 3, unitName: '4 West Medical' });
    expect(codes[1]).toMatchObject({ recordSigned: false, drugs: 1, discrepancies: 1 });
  });

  it('saves a draft and answers the discrepancies: 3 mg epinephrine from two 1 mg units is flagged, amiodarone 450 mg from three 150 mg vials balances', async () => {
    const res = await send(pharmacist, 'put', `/api/codes/${older}/reconciliation`, {
      notes: 'Cart 4W opened at 07:44',
      lines: [
        { drugKey: 'epinephrine', unitsOpened: 2, unitsWasted: 0, lotNumbers: 'EP2291' },
        { drugKey: 'amiodarone', unitsOpened: 3, unitsWasted: 0 },
        { drugKey: 'sodium-bicarbonate', unitsOpened: 1, unitsWasted: 0 },
        { drugKey: 'naloxone', unitsOpened: 1, unitsWasted: 0 },
      ],
    }).expect(200);
    const v = view(res);
    expect(v.status).toBe('draft');
    expect(v.tray).toEqual({ id: trayId, name: 'Adult tray' });
    expect(row(v, 'epinephrine')).toMatchObject({ given: 3, available: 2, flagged: true, discrepancies: [{ kind: 'given-more-than-opened' }] });
    expect(row(v, 'amiodarone')).toMatchObject({ given: 450, available: 450, flagged: false, discrepancies: [{ kind: 'balanced' }] });
    expect(row(v, 'sodium-bicarbonate')).toMatchObject({ unit: 'mL', given: 50, flagged: false });
    expect(row(v, 'naloxone')?.discrepancies.map((d) => d.kind)).toEqual(['opened-not-recorded']);
    expect(v.counts).toEqual({ drugs: 3, discrepancies: 2 });

    const bad = await send(pharmacist, 'put', `/api/codes/${older}/reconciliation`, { lines: [{ drugKey: 'epinephrine', unitsOpened: 1, unitsWasted: 2 }] }).expect(400);
    expect(bad.body.message).toMatch(/wasted/);
    await send(recorder, 'put', `/api/codes/${older}/reconciliation`, { lines: [] }).expect(403);
  });

  it('lets the recorder of the code read it, never a recorder who only wrote an addendum afterwards', async () => {
    expect(view(await recorder.agent.get(`/api/codes/${older}/reconciliation`).expect(200)).counts.discrepancies).toBe(2);
    // A recorder who was not there, writing an addendum to the signed record, is still not part of it.
    await send(bystander, 'post', `/api/codes/${older}/addenda`, makeEntry({ kind: 'note', text: 'I was here' })).expect(201);
    await bystander.agent.get(`/api/codes/${older}/reconciliation`).expect(403);

  });

  it('writes the restock list as CSV with the documented columns and as a printable PDF', async () => {
    const csv = await pharmacist.agent.get(`/api/codes/${older}/reconciliation/restock.csv`).expect(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    expect(csv.headers['content-disposition']).toMatch(/attachment; filename="restock-4-west-medical-.*\.csv"/);
    const lines = (csv.text).trim().split('\r\n');
    expect(lines[0]).toBe(RESTOCK_CSV_COLUMNS.join(','));
    // The export is in the audit trail, like every other export.
    const exported = app.database.sqlite.prepare("SELECT detail FROM audit_events WHERE code_id = ? AND action = 'pharmacy.export-restock'").all(older) as { detail: string }[];
    expect(exported.map((r) => JSON.parse(r.detail) as { format: string })).toContainEqual(expect.objectContaining({ format: 'csv' }));
    // The lot and expiry on the tray now, a flag when it has expired or expires within 30 days;
    // new_lot and new_expiry blank for the person restocking.
    expect(lines).toContain(`4 West Medical,Adult tray,Epinephrine,1 mg in 10 mL,no,10,2,0,2,EP2291,EPI-T-0411,${farExpiry},,,`);
    expect(lines).toContain(`4 West Medical,Adult tray,Amiodarone,150 mg in 3 mL,no,4,3,0,3,,AMI-T-2207,${soonExpiry},expires within 30 days,,`);
    expect(lines).toContain('4 West Medical,Adult tray,Sodium bicarbonate 8.4%,50 mL,no,2,1,0,1,,,,,,');
    expect(lines).toContain(`4 West Medical,Adult tray,Naloxone,0.4 mg,no,2,1,0,1,,NAL-T-0930,${pastExpiry},expired,,`);
    // Nothing opened, but its lot expires soon: on the list to swap.
    expect(lines).toContain(`4 West Medical,Adult tray,Atropine,1 mg in 10 mL,no,3,0,0,0,,ATR-T-1150,${inDays(20)},expires within 30 days,,`);
    expect(lines).toHaveLength(6);

    const pdf = await pharmacist.agent.get(`/api/codes/${older}/reconciliation/restock.pdf`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    }).expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    const file = path.join(mkdtempSync(path.join(tmpdir(), 'restock-')), 'restock.pdf');
    writeFileSync(file, pdf.body as Buffer);
    const text = execFileSync('/usr/bin/pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
    expect(text).toContain('Code-cart restock list');
    expect(text).toContain('4 West Medical');
    expect(text).toMatch(/Epinephrine\s+1 mg in 10 mL\s+10\s+2\s+0\s+2\s+EP2291\s+EPI-T-0411\s+\d{4}-\d\d-\d\d/);
    expect(text).toMatch(/NAL-T-0930\s+\d{4}-\d\d-\d\d/);
    expect(text).toContain('EXPIRED');
    expect(text).toMatch(/EXPIRES\s+WITHIN/);
    expect(text).toContain('DRAFT, not signed off');
    expect(text).toContain('Given more than opened');
    expect(text).toContain('page 1 of 1');
  });

  it('refuses a sign-off with the wrong password, signs with the right one, audits it and mails the discrepancies', async () => {
    const wrong = await send(pharmacist, 'post', `/api/codes/${older}/reconciliation/sign`, { password: 'not the password' }).expect(403);
    expect(wrong.body).toMatchObject({ error: 'password', message: 'The password does not match. Nothing was signed.' });
    expect(view(await pharmacist.agent.get(`/api/codes/${older}/reconciliation`)).status).toBe('draft');

    const signed = view(await send(pharmacist, 'post', `/api/codes/${older}/reconciliation/sign`, { password: TEST_PASSWORD }).expect(200));
    expect(signed).toMatchObject({ status: 'signed', signedBy: 'Test pharm', mail: { status: 'sent', to: 'pharmacy-lead@harbourview.example' } });
    const audit = app.app.get<symbol, Db>(DB).select().from(auditEvents).all().filter((e) => e.codeId === older).map((e) => e.action);
    expect(audit).toEqual(expect.arrayContaining(['reconciliation.saved', 'reconciliation.sign-failed', 'reconciliation.signed']));
    expect(mailbox.messages).toHaveLength(1);
    expect(mailbox.messages[0]?.to).toEqual(['pharmacy-lead@harbourview.example']);
    expect(mailbox.messages[0]?.raw).toMatch(/Subject: Drug discrepancy: 4 West Medical/);
    expect(mailbox.messages[0]?.raw).toContain('Given more than opened');

    const list = await pharmacist.agent.get('/api/pharmacy/worklist').expect(200);
    expect((list.body.codes as WorklistItem[]).map((c) => c.codeId)).toEqual([newer]);
  });

  it('after sign-off refuses changes (409) and takes addenda; a later tray edit does not change what was signed', async () => {
    await send(pharmacist, 'put', `/api/codes/${older}/reconciliation`, { lines: [] }).expect(409);
    await send(pharmacist, 'post', `/api/codes/${older}/reconciliation/sign`, { password: TEST_PASSWORD }).expect(409);
    await send(pharmacist, 'post', `/api/codes/${newer}/reconciliation/addenda`, { text: 'too early' }).expect(409);
    const after = view(
      await send(pharmacist, 'post', `/api/codes/${older}/reconciliation/addenda`, {
        text: 'Third epinephrine syringe found in the sharps bin',
        lines: [{ drugKey: 'epinephrine', unitsOpened: 3, unitsWasted: 0, lotNumbers: 'EP2291' }],
      }).expect(201),
    );
    expect(after.addenda).toMatchObject([{ by: 'Test pharm', text: 'Third epinephrine syringe found in the sharps bin' }]);
    expect(row(after, 'epinephrine')).toMatchObject({ given: 3, available: 3, flagged: false });

    const tray = (await pharmacist.agent.get('/api/pharmacy/trays')).body.trays[0] as { items: { strengthAmount: number }[] };
    await send(admin, 'put', `/api/pharmacy/trays/${trayId}`, { name: 'Adult tray', items: tray.items.map((i, n) => ({ ...i, id: undefined, sortOrder: undefined, strengthAmount: n === 0 ? 2 : i.strengthAmount })) }).expect(200);
    expect(row(view(await pharmacist.agent.get(`/api/codes/${older}/reconciliation`)), 'epinephrine')?.strength).toBe('1 mg in 10 mL');

    // Restocked: the admin writes the new lot on the tray item; the signed counts stay, the
    // restock list shows the lot the cart carries now.
    const edited = (await pharmacist.agent.get('/api/pharmacy/trays')).body.trays.find((t: { id: string }) => t.id === trayId) as { items: TrayItem[] };
    await send(admin, 'put', `/api/pharmacy/trays/${trayId}`, {
      name: 'Adult tray',
      items: edited.items.map(({ sortOrder: _s, ...i }) => (i.drugKey === 'naloxone' ? { ...i, lot: 'NAL-T-1201', expiry: farExpiry } : i)),
    }).expect(200);
    const signedView = view(await pharmacist.agent.get(`/api/codes/${older}/reconciliation`));
    expect(row(signedView, 'naloxone')).toMatchObject({ strength: '0.4 mg', trayLot: 'NAL-T-1201', trayExpiry: farExpiry });
    const csv = (await pharmacist.agent.get(`/api/codes/${older}/reconciliation/restock.csv`).expect(200)).text;
    expect(csv).toContain(`Naloxone,0.4 mg,no,2,1,0,1,,NAL-T-1201,${farExpiry},,,`);
  });

  it('refuses to reconcile a code that is still running', async () => {
    const res = await send(recorder, 'post', '/api/codes', { category: 'adult' }).expect(201);
    await send(pharmacist, 'put', `/api/codes/${(res.body as { code: { id: string } }).code.id}/reconciliation`, { lines: [] }).expect(409);
  });

  it('counts as part of a code those who recorded during it or are on its team, never one who wrote after it ended', async () => {
    const started = await send(recorder, 'post', '/api/codes', { category: 'adult', location: '4 West Medical, bed 3' }).expect(201);
    const id = (started.body as { code: { id: string } }).code.id;
    await send(leader, 'post', `/api/codes/${id}/entries`, makeEntry({ kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' })).expect(201);
    await send(recorder, 'post', `/api/codes/${id}/entries`, makeEntry({ kind: 'end', outcome: 'died' })).expect(201);
    // One note after the end, on a record not signed yet: still not part of the code.
    await send(bystander, 'post', `/api/codes/${id}/entries`, makeEntry({ kind: 'note', text: 'Was I there?' })).expect(201);
    await bystander.agent.get(`/api/codes/${id}/reconciliation`).expect(403);
    await leader.agent.get(`/api/codes/${id}/reconciliation`).expect(200);
    // Named on the team at review (by display name), they are.
    await send(recorder, 'patch', `/api/codes/${id}/review`, { team: [{ name: 'Test other.rec', role: 'Compressions' }] }).expect(200);
    await bystander.agent.get(`/api/codes/${id}/reconciliation`).expect(200);
  });
});
