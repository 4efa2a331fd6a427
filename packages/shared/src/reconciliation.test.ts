import { describe, expect, it } from 'vitest';
import type { LogEntry } from './effective-log.js';
import { DEFAULT_PROTOCOL } from './protocol.js';
import {
  cartRestockQuerySchema,
  convertToItemUnit,
  expiryNote,
  reconcileDrugs,
  reconciliationCounts,
  restockRows,
  saveReconciliationSchema,
  sumCartRestock,
  trayTemplateInputSchema,
  type CartRestockCodeInput,
  type ReconciledDrug,
  type ReconciliationLineInput,
  type TrayItem,
} from './reconciliation.js';
import { summarizeLog } from './summary.js';

// Tray strengths below are common practice for an adult code-cart tray, no published source
// (prefilled syringes and vials as commonly stocked in North American hospitals).

let n = 0;
const item = (fields: Partial<TrayItem> & Pick<TrayItem, 'drugKey' | 'strengthAmount' | 'strengthUnit'>): TrayItem => ({
  id: `item-${++n}`,
  label: fields.drugKey,
  volumeMl: null,
  quantity: 2,
  controlled: false,
  sortOrder: n,
  lot: null,
  expiry: null,
  ...fields,
});

const EPI = item({ drugKey: 'epinephrine', label: 'Epinephrine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 10 }); // 1 mg in 10 mL (0.1 mg/mL), common practice
const AMIO = item({ drugKey: 'amiodarone', label: 'Amiodarone', strengthAmount: 150, strengthUnit: 'mg', volumeMl: 3, quantity: 4 }); // 150 mg in 3 mL (50 mg/mL), common practice
const BICARB = item({ drugKey: 'sodium-bicarbonate', label: 'Sodium bicarbonate 8.4%', strengthAmount: 50, strengthUnit: 'meq', volumeMl: 50 }); // 8.4% = 1 mEq/mL, 50 mL syringe = 50 mEq, common practice
const BICARB_ML = item({ drugKey: 'sodium-bicarbonate', label: 'Sodium bicarbonate 8.4%', strengthAmount: 50, strengthUnit: 'mL' }); // the same syringe counted by volume
const CALCIUM = item({ drugKey: 'calcium-chloride', label: 'Calcium chloride 10%', strengthAmount: 1, strengthUnit: 'g', volumeMl: 10 }); // 1 g in 10 mL, common practice
const MAG = item({ drugKey: 'magnesium-sulfate', label: 'Magnesium sulfate', strengthAmount: 2, strengthUnit: 'g' }); // common practice
const NALOXONE = item({ drugKey: 'naloxone', label: 'Naloxone', strengthAmount: 0.4, strengthUnit: 'mg', volumeMl: 1 }); // 0.4 mg/mL, common practice
const ATROPINE = item({ drugKey: 'atropine', label: 'Atropine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10 }); // common practice
const MIDAZOLAM = item({ drugKey: 'midazolam', label: 'Midazolam', strengthAmount: 5, strengthUnit: 'mg', volumeMl: 5, controlled: true }); // 5 mg/5 mL, common practice

const total = (drug: string, totalDose: number, unit: 'mg' | 'ug' | 'g' | 'meq' | 'mL', doses = 1) => ({ drug, label: drug, unit, total: totalDose, doses });
const line = (drugKey: string, unitsOpened: number, unitsWasted = 0, wasteWitness: string | null = null): ReconciliationLineInput => ({
  drugKey,
  trayItemId: null,
  unitsOpened,
  unitsWasted,
  wasteWitness,
  lotNumbers: null,
  note: null,
});
const one = (rows: ReconciledDrug[], key: string): ReconciledDrug => {
  const row = rows.find((r) => r.drugKey === key);
  if (!row) throw new Error(`no row for ${key}`);
  return row;
};
const kinds = (row: ReconciledDrug) => row.discrepancies.map((d) => d.kind);

describe('reconcileDrugs: the discrepancy rules on worked cases', () => {
  it('flags 3 mg of epinephrine given from two opened 1 mg units', () => {
    const rows = reconcileDrugs({ drugTotals: [total('epinephrine', 3, 'mg', 3)], items: [EPI], lines: [line('epinephrine', 2)] });
    const epi = one(rows, 'epinephrine');
    expect(kinds(epi)).toEqual(['given-more-than-opened']);
    expect(epi).toMatchObject({ given: 3, available: 2, leftover: -1, flagged: true, restock: 2 });
  });

  it('balances 300 + 150 mg of amiodarone against three opened 150 mg vials', () => {
    // 300 mg then 150 mg: AHA 2020 Adult Cardiac Arrest Algorithm.
    const drugTotals = summarizeLog(
      { arrestAt: '2026-03-04T07:42:10.000Z', endedAt: null, category: 'adult', weightKg: null },
      [
        { id: '00000000-0000-4000-8000-000000000001', kind: 'drug', at: '2026-03-04T07:50:00.000Z', drug: 'amiodarone', dose: 300, unit: 'mg', route: 'iv' },
        { id: '00000000-0000-4000-8000-000000000002', kind: 'drug', at: '2026-03-04T07:56:00.000Z', drug: 'Amiodarone', dose: 150, unit: 'mg', route: 'iv' },
      ] satisfies LogEntry[],
      DEFAULT_PROTOCOL,
    ).drugTotals;
    const rows = reconcileDrugs({ drugTotals, items: [AMIO], lines: [line('amiodarone', 3)], settings: DEFAULT_PROTOCOL });
    expect(one(rows, 'amiodarone')).toMatchObject({ given: 450, available: 450, leftover: 0, doses: 2, flagged: false });
    expect(kinds(one(rows, 'amiodarone'))).toEqual(['balanced']);
  });

  it('converts 50 mEq of sodium bicarbonate to one 50 mL syringe before comparing (8.4% is 1 mEq/mL, common practice)', () => {
    const byVolume = reconcileDrugs({ drugTotals: [total('sodium-bicarbonate', 50, 'meq')], items: [BICARB_ML], lines: [line('sodium-bicarbonate', 1)], settings: DEFAULT_PROTOCOL });
    expect(one(byVolume, 'sodium-bicarbonate')).toMatchObject({ unit: 'mL', given: 50, available: 50, flagged: false });
    // A dose written as 50 mL against the syringe counted in mEq: 50 mL × 50 mEq / 50 mL.
    const inMl = reconcileDrugs({ drugTotals: [total('sodium-bicarbonate', 50, 'mL')], items: [BICARB], lines: [line('sodium-bicarbonate', 1)] });
    expect(one(inMl, 'sodium-bicarbonate')).toMatchObject({ unit: 'meq', given: 50, leftover: 0, flagged: false });
    // 100 mEq from one syringe is short by a whole syringe.
    const short = reconcileDrugs({ drugTotals: [total('sodium-bicarbonate', 100, 'meq', 2)], items: [BICARB_ML], lines: [line('sodium-bicarbonate', 1)], settings: DEFAULT_PROTOCOL });
    expect(kinds(one(short, 'sodium-bicarbonate'))).toEqual(['given-more-than-opened']);
  });

  it('converts mass units: 1000 mcg of epinephrine is one 1 mg unit; 1000 mg of calcium chloride is one 1 g vial', () => {
    const rows = reconcileDrugs({
      drugTotals: [total('epinephrine', 1000, 'ug'), total('calcium-chloride', 1000, 'mg')],
      items: [EPI, CALCIUM],
      lines: [line('epinephrine', 1), line('calcium-chloride', 1)],
    });
    expect(one(rows, 'epinephrine')).toMatchObject({ given: 1, flagged: false });
    expect(one(rows, 'calcium-chloride')).toMatchObject({ unit: 'g', given: 1, flagged: false });
  });

  it('adds doses recorded in different units of the same drug after converting each (0.5 mg + 500 mcg = 1 mg)', () => {
    const rows = reconcileDrugs({ drugTotals: [total('epinephrine', 0.5, 'mg'), total('epinephrine', 500, 'ug')], items: [EPI], lines: [line('epinephrine', 1)] });
    expect(one(rows, 'epinephrine')).toMatchObject({ given: 1, doses: 2, flagged: false });
  });

  it('converts a dose recorded in mL through the tray item concentration (20 mL of 1 mg/10 mL = 2 mg)', () => {
    expect(convertToItemUnit(20, 'mL', EPI)).toBe(2);
    const rows = reconcileDrugs({ drugTotals: [total('epinephrine', 20, 'mL', 2)], items: [EPI], lines: [line('epinephrine', 2)] });
    expect(one(rows, 'epinephrine')).toMatchObject({ given: 2, flagged: false });
  });

  it('calls a dose in a unit that cannot be converted a unit mismatch (magnesium recorded in mEq against 2 g vials)', () => {
    const rows = reconcileDrugs({ drugTotals: [total('magnesium-sulfate', 16, 'meq')], items: [MAG], lines: [line('magnesium-sulfate', 1)] });
    const mag = one(rows, 'magnesium-sulfate');
    expect(kinds(mag)).toEqual(['unit-mismatch']);
    expect(mag).toMatchObject({ given: null, leftover: null, flagged: true });
  });

  it('flags units opened with nothing recorded and not wasted, and accepts them once wasted', () => {
    const opened = reconcileDrugs({ drugTotals: [], items: [NALOXONE], lines: [line('naloxone', 1)] });
    expect(kinds(one(opened, 'naloxone'))).toEqual(['opened-not-recorded']);
    const wasted = reconcileDrugs({ drugTotals: [], items: [NALOXONE], lines: [line('naloxone', 1, 1)] });
    expect(kinds(one(wasted, 'naloxone'))).toEqual(['balanced']);
    expect(one(wasted, 'naloxone').restock).toBe(1);
  });

  it('flags a whole opened unit beyond what was given (1 mg given, three 1 mg units opened)', () => {
    const rows = reconcileDrugs({ drugTotals: [total('epinephrine', 1, 'mg')], items: [EPI], lines: [line('epinephrine', 3)] });
    expect(kinds(one(rows, 'epinephrine'))).toEqual(['opened-not-recorded']);
  });

  it('calls a part of a unit left over "partly used", information only for a drug that is not controlled', () => {
    const rows = reconcileDrugs({ drugTotals: [total('atropine', 0.5, 'mg')], items: [ATROPINE], lines: [line('atropine', 1)] });
    const atropine = one(rows, 'atropine');
    expect(kinds(atropine)).toEqual(['partly-used']);
    expect(atropine).toMatchObject({ leftover: 0.5, flagged: false });
  });

  it('needs a witness for the waste of a controlled drug, and puts controlled drugs first', () => {
    const items = [EPI, MIDAZOLAM];
    const unwitnessed = reconcileDrugs({ drugTotals: [total('epinephrine', 1, 'mg'), total('midazolam', 2, 'mg')], items, lines: [line('epinephrine', 1), line('midazolam', 1)] });
    expect(unwitnessed[0]?.drugKey).toBe('midazolam');
    expect(kinds(one(unwitnessed, 'midazolam'))).toEqual(['waste-not-witnessed', 'partly-used']);
    const witnessed = reconcileDrugs({ drugTotals: [total('midazolam', 2, 'mg')], items, lines: [line('midazolam', 1, 0, 'R. Okafor, RN')] });
    expect(kinds(one(witnessed, 'midazolam'))).toEqual(['partly-used']);
    expect(one(witnessed, 'midazolam').flagged).toBe(false);
  });

  it('flags a drug given that the tray does not hold', () => {
    const rows = reconcileDrugs({ drugTotals: [total('vasopressin', 40, 'mg')], items: [EPI], lines: [] });
    expect(kinds(one(rows, 'vasopressin'))).toEqual(['not-on-tray']);
    expect(reconciliationCounts(rows)).toEqual({ drugs: 1, discrepancies: 1 });
  });

  it('lists every tray item, untouched ones last as balanced, and avoids float noise (0.1 + 0.2 mg)', () => {
    const rows = reconcileDrugs({ drugTotals: [total('naloxone', 0.4, 'mg', 2)], items: [EPI, NALOXONE], lines: [line('naloxone', 1)] });
    expect(rows.map((r) => r.drugKey)).toEqual(['naloxone', 'epinephrine']);
    expect(one(rows, 'epinephrine')).toMatchObject({ touched: false, flagged: false });
    const noise = reconcileDrugs({ drugTotals: [total('naloxone', 0.1 + 0.3, 'mg', 2)], items: [NALOXONE], lines: [line('naloxone', 1)] });
    expect(kinds(one(noise, 'naloxone'))).toEqual(['balanced']);
  });
});

describe('reconciliation schemas', () => {
  it('refuses a tray with the same drug twice, and more wasted than opened', () => {
    const tray = trayTemplateInputSchema.safeParse({
      name: 'Tray',
      items: [
        { drugKey: 'epinephrine', label: 'Epinephrine', strengthAmount: 1, strengthUnit: 'mg', quantity: 10 },
        { drugKey: 'Epinephrine', label: 'Epinephrine', strengthAmount: 1, strengthUnit: 'mg', quantity: 2 },
      ],
    });
    expect(tray.success).toBe(false);
    const save = saveReconciliationSchema.safeParse({ lines: [{ drugKey: 'epinephrine', unitsOpened: 1, unitsWasted: 2 }] });
    expect(save.success).toBe(false);
    expect(save.error?.issues[0]?.message).toMatch(/wasted/);
  });
});

describe('tray item lot and expiry', () => {
  const base = { drugKey: 'epinephrine', label: 'Epinephrine', strengthAmount: 1, strengthUnit: 'mg', quantity: 10 } as const;
  const parse = (extra: object) => trayTemplateInputSchema.safeParse({ name: 'Tray', items: [{ ...base, ...extra }] });

  it('takes a trimmed lot and a calendar date; blank or missing is null', () => {
    expect(parse({ lot: '  EP2291 ', expiry: '2028-02-29' }).data?.items[0]).toMatchObject({ lot: 'EP2291', expiry: '2028-02-29' });
    expect(parse({ lot: '   ', expiry: null }).data?.items[0]).toMatchObject({ lot: null, expiry: null });
    expect(parse({}).data?.items[0]).toMatchObject({ lot: null, expiry: null });
  });

  it('refuses an expiry that is not a real YYYY-MM-DD date, and a lot over 40 characters, saying which field', () => {
    for (const expiry of ['2027-02-30', '31/03/2027', '2027-3-31', '']) {
      const result = parse({ expiry });
      expect(result.success).toBe(false);
      expect(result.error?.issues[0]).toMatchObject({ path: ['items', 0, 'expiry'], message: 'must be a date, YYYY-MM-DD, e.g. 2027-03-31' });
    }
    expect(parse({ lot: 'L'.repeat(41) }).error?.issues[0]).toMatchObject({ path: ['items', 0, 'lot'], message: 'must be at most 40 characters' });
    expect(parse({ lot: 'L'.repeat(40) }).success).toBe(true);
  });

  it('flags an expiry that has passed, or falls within 30 days (a unit is usable through its expiry date)', () => {
    const today = '2026-12-02';
    expect(expiryNote('2026-12-01', today)).toBe('expired');
    expect(expiryNote('2026-12-02', today)).toBe('expires within 30 days');
    expect(expiryNote('2027-01-01', today)).toBe('expires within 30 days');
    expect(expiryNote('2027-01-02', today)).toBeNull();
    expect(expiryNote(null, today)).toBeNull();
  });

  it('carries the tray lot into each row, and lists an expiring item on the restock list even when none was opened', () => {
    const epi = { ...EPI, lot: 'EP2291', expiry: '2027-06-30' };
    const atropine = { ...ATROPINE, lot: 'AT0415', expiry: '2026-12-20' };
    const rows = reconcileDrugs({ drugTotals: [total('epinephrine', 1, 'mg')], items: [epi, atropine, NALOXONE], lines: [line('epinephrine', 1)] });
    expect(one(rows, 'epinephrine')).toMatchObject({ trayLot: 'EP2291', trayExpiry: '2027-06-30' });
    expect(one(rows, 'naloxone')).toMatchObject({ trayLot: null, trayExpiry: null });
    expect(restockRows(rows, '2026-12-02').map((r) => r.drugKey)).toEqual(['epinephrine', 'atropine']);
    // A tray item frozen by a sign-off before lots existed has neither field.
    const { lot: _lot, expiry: _expiry, ...old } = EPI;
    expect(one(reconcileDrugs({ drugTotals: [], items: [old as TrayItem], lines: [] }), 'epinephrine')).toMatchObject({ trayLot: null, trayExpiry: null });
  });
});

describe('sumCartRestock: one restock list for a cart over several codes', () => {
  const TODAY = '2026-12-02';
  const tray = { id: 'tray-adult', name: 'Adult tray', items: [EPI, AMIO, { ...ATROPINE, lot: 'AT0415', expiry: '2026-12-20' }, MIDAZOLAM] };
  const withLot = (l: ReconciliationLineInput, lotNumbers: string | null): ReconciliationLineInput => ({ ...l, lotNumbers });
  let k = 0;
  const code = (fields: Partial<CartRestockCodeInput> & { totals?: ReturnType<typeof total>[]; lines?: ReconciliationLineInput[] }): CartRestockCodeInput => {
    const { totals = [], lines = [], ...rest } = fields;
    k += 1;
    return {
      codeId: `code-${k}`,
      arrestAt: new Date(Date.UTC(2026, 10, 20, k)).toISOString(),
      location: '4 West Medical',
      codeStatus: 'ended',
      status: 'signed',
      tray: { id: tray.id, name: tray.name },
      // The per-code rules, as the reconciliation page computes them.
      rows: reconcileDrugs({ drugTotals: totals, items: tray.items, lines }),
      ...rest,
    };
  };

  it('sums two codes that each opened one epinephrine 1 mg/10 mL: restock 2, both codes named, both lots once each', () => {
    const a = code({ totals: [total('epinephrine', 1, 'mg')], lines: [withLot(line('epinephrine', 1), 'EP2291')] });
    const b = code({ totals: [total('epinephrine', 1, 'mg')], lines: [withLot(line('epinephrine', 1), 'EP2291, EP2300')] });
    const sum = sumCartRestock({ tray, codes: [b, a], today: TODAY });
    const epi = sum.lines.find((l) => l.drugKey === 'epinephrine');
    expect(epi).toMatchObject({ strength: '1 mg in 10 mL', par: 10, unitsOpened: 2, unitsWasted: 0, restock: 2, lotsUsed: ['EP2291', 'EP2300'], codeIds: [a.codeId, b.codeId] });
    expect(sum.included.map((c) => c.codeId)).toEqual([a.codeId, b.codeId]);
    expect(sum.leftOut).toEqual([]);
  });

  it('keeps an item only one code opened with that code alone, and counts waste into the restock', () => {
    const a = code({ totals: [total('epinephrine', 1, 'mg')], lines: [line('epinephrine', 1)] });
    // 300 mg amiodarone from three 150 mg vials, one dropped: 3 to put back, 1 of them wasted.
    const b = code({ totals: [total('epinephrine', 1, 'mg'), total('amiodarone', 300, 'mg')], lines: [line('epinephrine', 1), line('amiodarone', 3, 1)] });
    const sum = sumCartRestock({ tray, codes: [a, b], today: TODAY });
    expect(sum.lines.find((l) => l.drugKey === 'amiodarone')).toMatchObject({ unitsOpened: 3, unitsWasted: 1, restock: 3, codeIds: [b.codeId] });
    expect(sum.lines.find((l) => l.drugKey === 'epinephrine')).toMatchObject({ restock: 2, codeIds: [a.codeId, b.codeId] });
    // Atropine: nobody opened it, but its lot on the tray expires within 30 days. Midazolam: untouched, not listed.
    expect(sum.lines.map((l) => [l.drugKey, l.restock, l.expiryNote])).toEqual([
      ['epinephrine', 2, null],
      ['amiodarone', 3, null],
      ['atropine', 0, 'expires within 30 days'],
    ]);
  });

  it('leaves out a code whose reconciliation is not signed off, one still running and one counted against another tray, saying why', () => {
    const signed = code({ totals: [total('epinephrine', 1, 'mg')], lines: [line('epinephrine', 1)] });
    const draft = code({ status: 'draft', totals: [total('epinephrine', 1, 'mg')], lines: [line('epinephrine', 1)] });
    const notStarted = code({ status: 'not-started' });
    const running = code({ codeStatus: 'active', status: 'not-started' });
    const other = code({ tray: { id: 'tray-peds', name: 'Pediatric tray' }, totals: [total('epinephrine', 1, 'mg')], lines: [line('epinephrine', 1)] });
    const sum = sumCartRestock({ tray, codes: [signed, draft, notStarted, running, other], today: TODAY });
    expect(sum.lines.find((l) => l.drugKey === 'epinephrine')).toMatchObject({ restock: 1, codeIds: [signed.codeId] });
    expect(sum.included.map((c) => c.codeId)).toEqual([signed.codeId]);
    expect(sum.leftOut.map((c) => [c.codeId, c.reason, c.message])).toEqual([
      [draft.codeId, 'not-signed-off', 'The reconciliation is a draft, not signed off: sign it off to count it here.'],
      [notStarted.codeId, 'not-signed-off', 'The reconciliation is not started, not signed off: sign it off to count it here.'],
      [running.codeId, 'running', 'The code is still running: reconcile it after it ends.'],
      [other.codeId, 'other-tray', 'Reconciled against the tray "Pediatric tray", not "Adult tray".'],
    ]);
  });

  it('lists a drug opened that is not on the cart\'s tray, and puts controlled drugs first', () => {
    const a = code({
      totals: [total('midazolam', 2, 'mg'), total('naloxone', 0.4, 'mg')],
      lines: [{ ...line('midazolam', 1), wasteWitness: 'R. Okafor' }, line('naloxone', 1), line('epinephrine', 1)],
    });
    const sum = sumCartRestock({ tray: { ...tray, items: [EPI, MIDAZOLAM] }, codes: [a], today: TODAY });
    expect(sum.lines.map((l) => [l.drugKey, l.onTray, l.strength, l.restock])).toEqual([
      ['midazolam', true, '5 mg in 5 mL', 1],
      ['epinephrine', true, '1 mg in 10 mL', 1],
      ['naloxone', false, null, 1],
    ]);
  });

  it('takes `since` as a YYYY-MM-DD date or nothing', () => {
    expect(cartRestockQuerySchema.parse({})).toEqual({});
    expect(cartRestockQuerySchema.parse({ since: '2026-11-25' })).toEqual({ since: '2026-11-25' });
    expect(cartRestockQuerySchema.safeParse({ since: '25/11/2026' }).error?.issues[0]).toMatchObject({ path: ['since'] });
  });
});
