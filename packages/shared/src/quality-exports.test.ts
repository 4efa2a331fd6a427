import { describe, expect, it } from 'vitest';
import { histogram, quantileSummary, rateWithInterval, shareOf, wilsonInterval, COMPRESSION_FRACTION_EDGES } from './aggregate.js';
import type { LogEntry } from './effective-log.js';
import { buildFhirBundle } from './fhir-bundle.js';
import { DEFAULT_PROTOCOL } from './protocol.js';
import { aggregateQuality, type QualityMetricsRow } from './quality.js';
import { summarize } from './summary.js';
import { foldLog } from './timeline.js';
import { UTSTEIN_CSV_COLUMNS, utsteinCsv, utsteinRow } from './utstein-csv.js';
import type { FollowUp, UtsteinDetails } from './utstein.js';

let nextId = 1;
const uuid = () => `00000000-0000-4000-8000-${(nextId++).toString().padStart(12, '0')}`;
const ARREST = '2026-03-04T07:42:10.000Z';
const t = (s: number) => new Date(Date.parse(ARREST) + s * 1000).toISOString();
type NoBase<T> = T extends unknown ? Omit<T, 'id' | 'at'> : never;
const e = (s: number, fields: NoBase<LogEntry>): LogEntry => ({ id: uuid(), at: t(s), ...fields });

describe('medians and interquartile ranges', () => {
  it('uses linear interpolation between closest ranks (type 7): 1..10 gives 3.25 / 5.5 / 7.75', () => {
    // Same as R quantile(1:10, c(.25,.5,.75)) and numpy.percentile: arithmetic check, no published source needed.
    expect(quantileSummary([10, 9, 8, 7, 6, 5, 4, 3, 2, 1])).toEqual({ n: 10, median: 5.5, q1: 3.25, q3: 7.75 });
    expect(quantileSummary([60, null, 120, 90])).toEqual({ n: 3, median: 90, q1: 75, q3: 105 });
    expect(quantileSummary([])).toEqual({ n: 0, median: null, q1: null, q3: null });
  });

  it('shares leave out codes a target does not apply to', () => {
    expect(shareOf([true, false, null, true])).toEqual({ applicable: 3, met: 2, share: 2 / 3 });
    expect(shareOf([null])).toEqual({ applicable: 0, met: 0, share: null });
  });

  it('bins compression fractions with the top edge included', () => {
    const bins = histogram([0.5, 0.6, 0.78, 0.8, 1], COMPRESSION_FRACTION_EDGES, (a, b) => `${a}-${b}`);
    expect(bins.map((b) => b.count)).toEqual([1, 1, 1, 1, 1]);
  });

  it('groups by month and unit, with target shares', () => {
    const row = (arrestAt: string, unitId: string | null, over: Partial<QualityMetricsRow>): QualityMetricsRow => ({
      arrestAt, unitId, unitName: unitId ? `Unit ${unitId}` : null, durationSeconds: 600, toCompressionsSeconds: 10,
      firstRhythm: 'vf', witnessedOrMonitored: true, anyRosc: false, toFirstShockSeconds: 100, toFirstEpinephrineSeconds: null, compressionFraction: 0.85, maxPreShockPauseSeconds: 5,
      survivalToDischarge: null, followUpComplete: false, ...over,
    });
    const stats = aggregateQuality([
      row('2026-03-01T10:00:00.000Z', 'a', {}),
      row('2026-03-20T10:00:00.000Z', 'b', { toFirstShockSeconds: 200 }),
      row('2026-04-02T10:00:00.000Z', 'a', { firstRhythm: 'asystole', toFirstShockSeconds: null, toFirstEpinephrineSeconds: 240 }),
    ]);
    expect(stats.byMonth.map((m) => [m.key, m.codes])).toEqual([['2026-03', 2], ['2026-04', 1]]);
    expect(stats.byMonth[0]?.targets['time-to-shock']).toEqual({ applicable: 2, met: 1, share: 0.5 });
    expect(stats.byMonth[0]?.intervals.toFirstShockSeconds.median).toBe(150);
    expect(stats.byUnit.map((u) => [u.label, u.codes])).toEqual([['Unit a', 2], ['Unit b', 1]]);
    expect(stats.overall.targets['time-to-epinephrine']).toEqual({ applicable: 1, met: 1, share: 1 });
  });

  it('gives ROSC and survival rates with Wilson intervals, survival over the codes whose answer is known', () => {
    const row = (unitId: string, anyRosc: boolean, survival: QualityMetricsRow['survivalToDischarge'], complete: boolean): QualityMetricsRow => ({
      arrestAt: '2026-03-01T10:00:00.000Z', unitId, unitName: `Unit ${unitId}`, durationSeconds: 600, toCompressionsSeconds: 10, firstRhythm: 'pea',
      witnessedOrMonitored: null, anyRosc, toFirstShockSeconds: null, toFirstEpinephrineSeconds: 120, compressionFraction: 0.9, maxPreShockPauseSeconds: null,
      survivalToDischarge: survival, followUpComplete: complete,
    });
    const stats = aggregateQuality([row('a', true, 'yes', true), row('a', true, 'no', true), row('a', false, 'unknown', false), row('b', false, null, false)]);
    const a = stats.byUnit[0]!;
    expect(a.rosc).toMatchObject({ count: 2, known: 3, unknown: 0, rate: 2 / 3 });
    expect(a.survivalToDischarge).toMatchObject({ count: 1, known: 2, unknown: 1, rate: 0.5 });
    // Wilson for 1/2 (arithmetic on the formula in aggregate.ts): 0.0945 to 0.9055.
    expect(a.survivalToDischarge.low).toBeCloseTo(0.0945, 4);
    expect(a.survivalToDischarge.high).toBeCloseTo(0.9055, 4);
    expect(a.followUpComplete).toEqual({ complete: 2, codes: 3, share: 2 / 3 });
    expect(stats.byUnit[1]?.survivalToDischarge).toMatchObject({ known: 0, rate: null, low: null, high: null });
    expect(stats.rateMethod).toMatch(/Wilson/);
  });
});

describe('Wilson score interval', () => {
  it('matches the worked examples of Newcombe 1998, Table I, method 3 (Stat Med 17:857-872; values from memory, reproduced here to 4 decimals)', () => {
    const at4 = (x: number, n: number) => {
      const ci = wilsonInterval(x, n)!;
      return [Number(ci.low.toFixed(4)), Number(ci.high.toFixed(4))];
    };
    expect(at4(81, 263)).toEqual([0.2553, 0.3662]);
    expect(at4(15, 148)).toEqual([0.0624, 0.1605]);
    expect(at4(0, 20)).toEqual([0, 0.1611]);
    expect(at4(1, 29)).toEqual([0.0061, 0.1718]);
  });

  it('stays inside 0 to 1, is never zero-width at n/n, and is null for no codes', () => {
    const all = wilsonInterval(5, 5)!;
    expect(all.high).toBe(1);
    expect(all.low).toBeGreaterThan(0.5);
    expect(all.low).toBeLessThan(1);
    expect(wilsonInterval(0, 0)).toBeNull();
    expect(rateWithInterval([null, null])).toMatchObject({ known: 0, unknown: 2, rate: null });
  });
});

function sampleRecord() {
  const entries: LogEntry[] = [
    e(15, { kind: 'cpr', action: 'start' }),
    e(88, { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }),
    e(90, { kind: 'rhythm', rhythm: 'vf', pulse: false }),
    e(102, { kind: 'shock', joules: 200, synchronized: false }),
    e(104, { kind: 'cpr', action: 'start' }),
    e(200, { kind: 'airway', device: 'endotracheal', confirmation: 'waveform-capnography' }),
    e(210, { kind: 'access', route: 'io' }),
    e(240, { kind: 'etco2', mmHg: 14 }),
    e(345, { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'io' }),
    e(400, { kind: 'drug', drug: 'amiodarone', dose: 300, unit: 'mg', route: 'io' }),
    e(420, { kind: 'drug', drug: 'Sodium bicarbonate 8.4%', dose: 50, unit: 'meq', route: 'iv' }),
    e(500, { kind: 'rosc' }),
    e(1500, { kind: 'end', outcome: 'sustained-rosc' }),
  ];
  const code = { id: uuid(), category: 'adult' as const, location: 'Bed 12, "window"', patient: null, arrestAt: ARREST, endedAt: t(1500) };
  const timeline = foldLog({ ...code, weightKg: null }, entries, DEFAULT_PROTOCOL);
  return { code, timeline, summary: summarize(timeline) };
}

const DETAILS: UtsteinDetails = {
  witnessed: 'yes',
  witnessedBy: 'staff',
  monitored: 'yes',
  monitoring: ['ecg', 'pulse-oximetry'],
  arrestLocation: 'ward',
  teamArrivedAt: '2026-03-04T08:43:40+01:00',
  cause: 'other',
  causeNote: '=HYPERLINK("x")',
  specialCircumstances: ['unknown'],
  mechanicalCpr: 'no',
  ecpr: 'unknown',
  stopReason: 'rosc',
  temperatureControl: 'yes',
  twelveLeadEcg: 'st-elevation',
  handoverSystolicMmHg: 96,
  handoverDiastolicMmHg: 58,
  handoverSpo2Percent: 95,
  handoverGlucose: { value: 8.2, unit: 'mmol/L' },
  destination: 'cath-lab',
};
const by = { id: 'u1', displayName: 'Ewan Trelawny, RN' };
const FOLLOW_UP: FollowUp = {
  survivalToDischarge: { value: 'yes', date: '2026-03-20', enteredBy: by, enteredAt: '2026-03-21T09:00:00.000Z' },
  status30Days: { value: 'unknown', date: null, enteredBy: by, enteredAt: '2026-03-21T09:00:00.000Z' },
  neurologicalOutcome: { value: 'cpc-1', date: '2026-03-20', enteredBy: by, enteredAt: '2026-03-21T09:00:00.000Z' },
  complete: false,
  missing: ['status at 30 days'],
};

describe('Utstein CSV', () => {
  it('writes the documented columns in order, one row per code, details and follow-up in their API words', () => {
    const { code, summary } = sampleRecord();
    const row = utsteinRow({ code, summary, unitName: '4 West Medical', facility: 'Harbourview General Hospital', utstein: DETAILS, followUp: FOLLOW_UP });
    const csv = utsteinCsv([row, row]);
    const lines = csv.trimEnd().split('\r\n');
    expect(lines).toHaveLength(3);
    expect(lines[0]).toBe(UTSTEIN_CSV_COLUMNS.map((c) => c.name).join(','));
    expect(Object.keys(row)).toEqual(UTSTEIN_CSV_COLUMNS.map((c) => c.name));
    expect(row).toMatchObject({
      arrest_to_first_defibrillation_s: '102',
      arrest_to_first_vasopressor_s: '345',
      first_documented_rhythm: 'VF',
      first_rhythm_shockable: 'yes',
      advanced_airway: 'endotracheal',
      vascular_access: 'io',
      any_rosc: 'yes',
      event_outcome: 'sustained-rosc',
      patient_sex: 'unknown',
      witnessed: 'yes',
      witnessed_by: 'staff',
      monitored: 'yes',
      monitoring: 'ecg;pulse-oximetry',
      arrest_location: 'ward',
      // Entered with an offset, written in UTC; 07:43:40 is 90 s after the 07:42:10 arrest.
      team_arrived_at: '2026-03-04T07:43:40.000Z',
      arrest_to_team_arrival_s: '90',
      pads_on_at: '',
      cause: 'other',
      special_circumstances: 'unknown',
      treatment_limitation_before_event: '',
      mechanical_cpr: 'no',
      ecpr: 'unknown',
      handover_glucose: '8.2',
      handover_glucose_unit: 'mmol/L',
      survival_to_discharge: 'yes',
      survival_to_discharge_date: '2026-03-20',
      status_30_days: 'unknown',
      status_30_days_date: '',
      neurological_outcome: 'cpc-1',
      follow_up_complete: 'no',
    });
    expect(lines[1]).toContain('"Bed 12, ""window"""');
    // Free text goes through the one CSV cell function: a formula is defused.
    expect(lines[1]).toContain(`"'=HYPERLINK(""x"")"`);
  });

  it('leaves every detail and follow-up cell empty when nothing was entered', () => {
    const { code, summary } = sampleRecord();
    const row = utsteinRow({ code, summary, unitName: null, facility: 'Harbourview General Hospital', utstein: {}, followUp: null });
    for (const name of ['witnessed', 'monitored', 'monitoring', 'cause', 'survival_to_discharge', 'neurological_outcome', 'handover_glucose'] as const) expect(row[name]).toBe('');
    expect(row.follow_up_complete).toBe('no');
  });
});

describe('FHIR document bundle', () => {
  it('puts the Composition first, references every resource and uses the sheet\'s codes', () => {
    const { code, timeline, summary } = sampleRecord();
    let n = 0;
    const bundle = buildFhirBundle({
      code, timeline, summary, facility: 'Harbourview General Hospital', unitName: '4 West Medical',
      utstein: DETAILS, followUp: FOLLOW_UP,
      signatures: [{ printedName: 'Maren Holt, RN', meaning: 'recorded-by', signedAt: t(1600), serverSignature: 'ab-_' }],
      generatedAt: t(1700),
      newId: () => `10000000-0000-4000-8000-${String(++n).padStart(12, '0')}`,
    });
    expect(bundle.type).toBe('document');
    const resources = bundle.entry.map((x) => x.resource);
    expect(resources[0]?.resourceType).toBe('Composition');
    expect(resources[0]?.status).toBe('preliminary'); // one signature of two
    const of = (type: string) => resources.filter((r) => r.resourceType === type);
    expect(JSON.stringify(of('Condition'))).toContain('410429000');
    // CPR, one shock, the tube, the IO; mechanical CPR not done and temperature control done (ECPR unknown: absent).
    expect(of('Procedure')).toHaveLength(6);
    expect(JSON.stringify(of('Procedure'))).toContain('89666000');
    expect(JSON.stringify(of('Procedure'))).toContain('426220008');
    expect(JSON.stringify(of('Procedure'))).toContain('"code":"232674004"'); // endotracheal, sheet §5b (secondary)
    expect(JSON.stringify(of('Procedure'))).toContain('"code":"430824005"'); // IO, sheet §5b (secondary)
    expect(JSON.stringify(of('Procedure'))).toContain('"status":"not-done","code":{"text":"Mechanical chest compressions"}');
    expect(JSON.stringify(of('Procedure'))).not.toContain('ECPR');
    const texts = of('Observation').map((o) => (o.code as { text?: string }).text);
    expect(texts).toContain('Return of spontaneous circulation (ROSC)');
    expect(texts).toContain('Survival to hospital discharge');
    expect(texts).toContain('Neurological outcome at hospital discharge');
    // An answer entered as unknown stays absent, never guessed.
    expect(texts).not.toContain('Status 30 days after the arrest');
    expect(texts).not.toContain('Special circumstances');
    const survival = of('Observation').find((o) => (o.code as { text?: string }).text === 'Survival to hospital discharge')!;
    expect(survival).toMatchObject({ effectiveDateTime: '2026-03-20', issued: '2026-03-21T09:00:00.000Z', performer: [{ display: 'Ewan Trelawny, RN' }] });
    expect(JSON.stringify(of('Observation'))).toContain('"code":"mmol/L"');
    const meds = of('MedicationAdministration') as unknown as { medicationCodeableConcept: { coding?: { code: string }[] }; dosage: { dose: { code: string; system: string } } }[];
    expect(meds.map((m) => m.medicationCodeableConcept.coding?.[0]?.code)).toEqual(['3992', '703', '36676']);
    expect(meds.map((m) => m.dosage.dose.code)).toEqual(['mg', 'mg', 'meq']);
    expect(meds.every((m) => m.dosage.dose.system === 'http://unitsofmeasure.org')).toBe(true);
    expect(JSON.stringify(of('Observation'))).toContain('"code":"mm[Hg]"');
    expect(JSON.stringify(of('Observation'))).toContain('19891-1');
    const prov = of('Provenance')[0] as unknown as { target: { reference: string }[]; signature: { data: string }[] };
    expect(prov.target[0]?.reference).toBe(bundle.entry[0]?.fullUrl);
    expect(prov.signature[0]?.data).toBe('ab+/');
    // Every reference inside the bundle resolves to an entry of it.
    const urls = new Set(bundle.entry.map((x) => x.fullUrl));
    const refs = [...JSON.stringify(bundle).matchAll(/"reference":"([^"]+)"/g)].map((m) => m[1]);
    expect(refs.length).toBeGreaterThan(10);
    for (const ref of refs) expect(urls.has(ref as string), ref).toBe(true);
  });
});
