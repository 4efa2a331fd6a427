import { execFileSync } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { CART_RESTOCK_CSV_COLUMNS, type CartRestock } from '@steadyhand/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DB } from '../src/db/database.module.js';
import type { Db } from '../src/db/database.js';
import { auditEvents, units } from '../src/db/schema/index.js';
import { makeEntry } from './support/entries.js';
import { addUser, signIn, startTestApp, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

describe('pharmacy: restock list by cart, over several codes', () => {
  let app: TestApp;
  let admin: SignedInAgent;
  let pharmacist: SignedInAgent;
  let recorder: SignedInAgent;
  let unitId: string;
  let bareUnitId: string;
  let first: string;
  let second: string;
  let draft: string;

  const send = (who: SignedInAgent, method: 'post' | 'put', url: string, body: object) => who.agent[method](url).set('x-csrf-token', who.csrf).send(body);
  const inDays = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);
  const farExpiry = inDays(400);

  /** An ended code on the unit with the drugs given, reconciled with these lines; signed off or left a draft. */
  async function reconciledCode(
    minutesAgo: number,
    drugs: [string, number][],
    lines: { drugKey: string; unitsOpened: number; unitsWasted: number; lotNumbers?: string }[],
    signOff: boolean,
  ): Promise<string> {
    const arrestAt = new Date(Date.now() - minutesAgo * 60_000).toISOString();
    const res = await send(recorder, 'post', '/api/codes', { category: 'adult', unitId, location: '4 West Medical bed 3', arrestAt }).expect(201);
    const id = (res.body as { code: { id: string } }).code.id;
    const t0 = Date.parse(arrestAt);
    const entries = [
      ...drugs.map(([drug, dose], i) => makeEntry({ kind: 'drug', drug, dose, unit: 'mg', route: 'iv' }, new Date(t0 + (i + 1) * 60_000))),
      makeEntry({ kind: 'end', outcome: 'sustained-rosc' }, new Date(t0 + 20 * 60_000)),
    ];
    for (const entry of entries) await send(recorder, 'post', `/api/codes/${id}/entries`, entry).expect(201);
    await send(pharmacist, 'put', `/api/codes/${id}/reconciliation`, { lines }).expect(200);
    if (signOff) await send(pharmacist, 'post', `/api/codes/${id}/reconciliation/sign`, { password: TEST_PASSWORD }).expect(200);
    return id;
  }

  const getBuffer = (url: string) =>
    pharmacist.agent
      .get(url)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      });

  beforeAll(async () => {
    app = await startTestApp();
    for (const [name, roles] of [
      ['cart.adm', ['admin']],
      ['cart.pharm', ['pharmacist']],
      ['cart.rec', ['recorder']],
    ] as const) {
      await addUser(app, name, [...roles]);
    }
    [admin, pharmacist, recorder] = (await Promise.all(['cart.adm', 'cart.pharm', 'cart.rec'].map((u) => signIn(app, u)))) as [SignedInAgent, SignedInAgent, SignedInAgent];
    unitId = randomUUID();
    bareUnitId = randomUUID();
    const db = app.app.get<symbol, Db>(DB);
    db.insert(units).values({ id: unitId, name: '4 West Medical', createdAt: new Date().toISOString() }).run();
    db.insert(units).values({ id: bareUnitId, name: '6 North Surgical', createdAt: new Date().toISOString() }).run();

    // Tray strengths: common practice for an adult code-cart tray, no published source.
    const tray = await send(admin, 'post', '/api/pharmacy/trays', {
      name: 'Adult tray',
      items: [
        { drugKey: 'epinephrine', label: 'Epinephrine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 10, lot: 'EPI-C-0411', expiry: farExpiry },
        { drugKey: 'amiodarone', label: 'Amiodarone', strengthAmount: 150, strengthUnit: 'mg', volumeMl: 3, quantity: 4, lot: 'AMI-C-2207', expiry: farExpiry },
        { drugKey: 'atropine', label: 'Atropine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 3, lot: 'ATR-C-1150', expiry: farExpiry },
      ],
    }).expect(201);
    await send(admin, 'put', `/api/pharmacy/units/${unitId}/tray`, { trayId: (tray.body as { tray: { id: string } }).tray.id }).expect(200);

    // Each balanced (given = opened × strength), so sign-off sends no discrepancy mail.
    first = await reconciledCode(180, [['epinephrine', 1]], [{ drugKey: 'epinephrine', unitsOpened: 1, unitsWasted: 0, lotNumbers: 'EP2291' }], true);
    second = await reconciledCode(120, [['epinephrine', 1], ['amiodarone', 300]], [
      { drugKey: 'epinephrine', unitsOpened: 1, unitsWasted: 0, lotNumbers: 'EP2300' },
      { drugKey: 'amiodarone', unitsOpened: 2, unitsWasted: 0 },
    ], true);
    draft = await reconciledCode(60, [['epinephrine', 1]], [{ drugKey: 'epinephrine', unitsOpened: 1, unitsWasted: 0 }], false);
  }, 120_000);
  afterAll(() => app.close());

  it('sums the signed-off codes on the cart since 7 days ago, and lists the unsigned one as left out', async () => {
    const res = await pharmacist.agent.get(`/api/pharmacy/carts/${unitId}/restock`).expect(200);
    const restock = res.body as CartRestock;
    expect(restock.unit).toEqual({ id: unitId, name: '4 West Medical' });
    expect(restock.tray.name).toBe('Adult tray');
    expect(restock.since).toBe(`${inDays(-7)}T00:00:00.000Z`);
    expect(restock.included.map((c) => c.codeId)).toEqual([first, second]);
    expect(restock.leftOut).toMatchObject([{ codeId: draft, reason: 'not-signed-off', message: 'The reconciliation is a draft, not signed off: sign it off to count it here.' }]);
    // 1 + 1 epinephrine from two codes; amiodarone from the second only; atropine untouched, not listed.
    expect(restock.lines.map((l) => [l.drugKey, l.unitsOpened, l.unitsWasted, l.restock, l.lotsUsed, l.codeIds])).toEqual([
      ['epinephrine', 2, 0, 2, ['EP2291', 'EP2300'], [first, second]],
      ['amiodarone', 2, 0, 2, [], [second]],
    ]);

    // A period starting after the codes holds none of them.
    const later = (await pharmacist.agent.get(`/api/pharmacy/carts/${unitId}/restock?since=${inDays(1)}`).expect(200)).body as CartRestock;
    expect([later.included, later.leftOut, later.lines]).toEqual([[], [], []]);
  });

  it('answers 404 for an unknown unit, 400 naming `since` for a bad date, 409 for a cart without a tray', async () => {
    const unknown = await pharmacist.agent.get('/api/pharmacy/carts/no-such-unit/restock').expect(404);
    expect(unknown.body.message).toBe('No unit with id no-such-unit');
    await pharmacist.agent.get('/api/pharmacy/carts/no-such-unit/restock.csv').expect(404);
    for (const since of ['2026-02-30', '01/03/2026', 'last-week']) {
      const bad = await pharmacist.agent.get(`/api/pharmacy/carts/${unitId}/restock.csv?since=${since}`).expect(400);
      expect(bad.body.message).toBe('since: must be a date, YYYY-MM-DD, e.g. 2026-03-01');
    }
    const bare = await pharmacist.agent.get(`/api/pharmacy/carts/${bareUnitId}/restock`).expect(409);
    expect(bare.body.message).toMatch(/6 North Surgical cart has no tray template/);
    await admin.agent.get(`/api/pharmacy/carts/${unitId}/restock`).expect(403);
  });

  it('writes the CSV with the per-code columns and a codes column, and audits the export', async () => {
    const csv = await pharmacist.agent.get(`/api/pharmacy/carts/${unitId}/restock.csv?since=${inDays(-1)}`).expect(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    expect(csv.headers['content-disposition']).toBe(`attachment; filename="restock-cart-4-west-medical-since-${inDays(-1)}.csv"`);
    const lines = csv.text.trim().split('\r\n');
    expect(lines[0]).toBe(CART_RESTOCK_CSV_COLUMNS.join(','));
    expect(lines[0]).toBe('unit,tray,drug,strength,controlled,par_quantity,units_opened,units_wasted,restock_units,lots_used,current_lot,current_expiry,expiry_note,new_lot,new_expiry,codes');
    expect(lines.slice(1)).toEqual([
      `4 West Medical,Adult tray,Epinephrine,1 mg in 10 mL,no,10,2,0,2,EP2291; EP2300,EPI-C-0411,${farExpiry},,,,${first} ${second}`,
      `4 West Medical,Adult tray,Amiodarone,150 mg in 3 mL,no,4,2,0,2,,AMI-C-2207,${farExpiry},,,,${second}`,
    ]);
    const audit = app.app
      .get<symbol, Db>(DB)
      .select()
      .from(auditEvents)
      .all()
      .filter((e) => e.action === 'pharmacy.export-cart-restock');
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ username: 'cart.pharm', detail: { format: 'csv', unitId, codes: [first, second], leftOut: [{ codeId: draft, reason: 'not-signed-off' }], lines: 2 } });
  });

  it('prints the PDF with the unit, the tray, the codes included and left out, the lines and page x of y', async () => {
    const pdf = await getBuffer(`/api/pharmacy/carts/${unitId}/restock.pdf`).expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    expect(pdf.headers['content-disposition']).toMatch(/^inline; filename="restock-cart-4-west-medical-since-.*\.pdf"$/);
    const file = path.join(mkdtempSync(path.join(tmpdir(), 'cart-restock-')), 'restock.pdf');
    writeFileSync(file, pdf.body as Buffer);
    const text = execFileSync('/usr/bin/pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
    expect(text).toContain('4 West Medical');
    expect(text).toContain('Adult tray');
    expect(text).toContain(`from ${inDays(-7)} 00:00 UTC`);
    expect(text).toContain('Codes included (reconciliation signed off): 2');
    expect(text).toContain('Codes left out: 1');
    expect(text).toContain('not signed off');
    expect(text).toMatch(/Epinephrine\s+1 mg in 10 mL\s+10\s+2\s+0\s+2\s+EP2291, EP2300\s+EPI-C-0411/);
    expect(text).toMatch(/Amiodarone\s+150 mg in 3 mL\s+4\s+2\s+0\s+2/);
    expect(text).toContain('Page 1 of 1');
    const formats = app.app
      .get<symbol, Db>(DB)
      .select()
      .from(auditEvents)
      .all()
      .filter((e) => e.action === 'pharmacy.export-cart-restock')
      .map((e) => e.detail?.format);
    expect(formats).toEqual(['csv', 'pdf']);
  });
});
