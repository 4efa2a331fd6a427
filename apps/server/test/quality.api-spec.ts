import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { csvRecords, type FollowUpListResponse, type NewEntry, type QualityCodeDetail, type QualityListResponse, type QualityStats } from '@steadyhand/shared';
import { Fhir } from 'fhir';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeEntry } from './support/entries.js';
import { addUser, signIn, startTestApp, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

const DOCS = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../../docs/utstein-export.md');
type NoBase<T> = T extends unknown ? Omit<T, 'id' | 'at'> : never;

describe('quality review over REST', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let leader: SignedInAgent;
  let reviewer: SignedInAgent;
  let admin: SignedInAgent;
  let pharmacist: SignedInAgent;
  const ids: Record<'march' | 'aprilAsystole' | 'aprilLate' | 'running', string> = { march: '', aprilAsystole: '', aprilLate: '', running: '' };
  let lateShockId = '';

  const send = (who: SignedInAgent, method: 'post' | 'put' | 'patch', url: string, body: object) => who.agent[method](url).set('x-csrf-token', who.csrf).send(body);

  /** A code at a fixed past time, its entries at seconds after the arrest. */
  async function code(arrestAt: string, unitId: string, entries: [number, NoBase<NewEntry>][]): Promise<{ id: string; entryIds: string[] }> {
    const res = await send(recorder, 'post', '/api/codes', { category: 'adult', arrestAt, unitId, location: 'Bed 12' }).expect(201);
    const id = (res.body as { code: { id: string } }).code.id;
    const entryIds: string[] = [];
    for (const [s, fields] of entries) {
      const entry = makeEntry(fields, new Date(Date.parse(arrestAt) + s * 1000));
      entryIds.push(entry.id);
      await send(recorder, 'post', `/api/codes/${id}/entries`, entry).expect(201);
    }
    return { id, entryIds };
  }

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'q.recorder', ['recorder']);
    await addUser(app, 'q.leader', ['leader']);
    await addUser(app, 'q.reviewer', ['reviewer']);
    await addUser(app, 'q.admin', ['admin']);
    await addUser(app, 'q.pharmacist', ['pharmacist']);
    [recorder, leader, reviewer, admin, pharmacist] = (await Promise.all(['q.recorder', 'q.leader', 'q.reviewer', 'q.admin', 'q.pharmacist'].map((u) => signIn(app, u)))) as [
      SignedInAgent, SignedInAgent, SignedInAgent, SignedInAgent, SignedInAgent,
    ];
    const now = new Date().toISOString();
    const addUnit = app.database.sqlite.prepare('INSERT INTO units (id, name, active, created_at) VALUES (?, ?, 1, ?)');
    addUnit.run('unit-4w', '4 West Medical', now);
    addUnit.run('unit-3b', 'Cardiac Step-Down 3B', now);

    ids.march = (
      await code('2026-03-04T07:42:10.000Z', 'unit-4w', [
        [15, { kind: 'cpr', action: 'start' }],
        [94, { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }],
        [95, { kind: 'rhythm', rhythm: 'vf', pulse: false }],
        [100, { kind: 'shock', joules: 200, synchronized: false }],
        [102, { kind: 'cpr', action: 'start' }],
        [200, { kind: 'etco2', mmHg: 18 }],
        [345, { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }],
        [400, { kind: 'drug', drug: 'amiodarone', dose: 300, unit: 'mg', route: 'iv' }],
        [600, { kind: 'rosc' }],
        [1380, { kind: 'end', outcome: 'sustained-rosc' }],
      ])
    ).id;
    ids.aprilAsystole = (
      await code('2026-04-10T13:00:00.000Z', 'unit-3b', [
        [10, { kind: 'cpr', action: 'start' }],
        [60, { kind: 'rhythm', rhythm: 'asystole', pulse: false }],
        [400, { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'io' }],
        [900, { kind: 'end', outcome: 'died' }],
      ])
    ).id;
    const late = await code('2026-04-22T02:10:00.000Z', 'unit-4w', [
      [20, { kind: 'cpr', action: 'start' }],
      [60, { kind: 'rhythm', rhythm: 'vf', pulse: false }],
      [200, { kind: 'shock', joules: 200, synchronized: false }],
      [700, { kind: 'end', outcome: 'died' }],
    ]);
    ids.aprilLate = late.id;
    lateShockId = late.entryIds[2] as string;
    ids.running = (await code('2026-04-23T09:00:00.000Z', 'unit-4w', [[5, { kind: 'cpr', action: 'start' }]])).id;
    // The shock target counts witnessed or monitored arrests: both VF codes were witnessed.
    for (const id of [ids.march, ids.aprilLate]) await send(recorder, 'patch', `/api/codes/${id}/review`, { utstein: { witnessed: 'yes', witnessedBy: 'staff' } }).expect(200);
  }, 120_000);
  afterAll(() => app.close());

  const list = async (query: string, who = reviewer) => (await who.agent.get(`/api/quality/codes?${query}`).expect(200)).body as QualityListResponse;

  it('lists ended codes only, filters them, sorts and pages on the server', async () => {
    const all = await list('');
    expect(all.total).toBe(3);
    expect(all.items.map((i) => i.codeId)).toEqual([ids.aprilLate, ids.aprilAsystole, ids.march]); // newest arrest first
    expect(all.units.map((u) => u.name)).toEqual(['4 West Medical', 'Cardiac Step-Down 3B']);
    expect((await list('unitId=unit-4w')).items.map((i) => i.codeId)).toEqual([ids.aprilLate, ids.march]);
    expect((await list('firstRhythm=asystole')).items.map((i) => i.codeId)).toEqual([ids.aprilAsystole]);
    expect((await list('outcome=sustained-rosc')).items.map((i) => i.codeId)).toEqual([ids.march]);
    expect((await list('from=2026-04-01&to=2026-04-22')).total).toBe(2); // `to` takes in its whole day
    expect((await list('missed=time-to-shock')).items.map((i) => i.codeId)).toEqual([ids.aprilLate]);
    expect((await list('missed=time-to-epinephrine')).items.map((i) => i.codeId)).toEqual([ids.aprilAsystole]);
    expect((await list('missed=any')).total).toBe(2);
    // Codes without a shock sort last whichever way.
    expect((await list('sort=toFirstShockSeconds&dir=asc')).items.map((i) => i.codeId)).toEqual([ids.march, ids.aprilLate, ids.aprilAsystole]);
    expect((await list('sort=toFirstShockSeconds&dir=desc')).items.map((i) => i.codeId)).toEqual([ids.aprilLate, ids.march, ids.aprilAsystole]);
    const page2 = await list('pageSize=2&page=2');
    expect(page2).toMatchObject({ total: 3, page: 2, pageSize: 2 });
    expect(page2.items.map((i) => i.codeId)).toEqual([ids.march]);
    const bad = await reviewer.agent.get('/api/quality/codes?pageSize=0&missed=nothing').expect(400);
    expect(bad.body.message).toMatch(/pageSize|missed/);
    await reviewer.agent.get('/api/quality/codes?from=2026-05-01&to=2026-04-01').expect(400);
  });

  it('keeps the metrics in step with the log: an amended shock time leaves the missed list', async () => {
    const amend = makeEntry({ kind: 'amend', target: lateShockId, changes: { at: '2026-04-22T02:11:40.000Z' }, reason: 'Defibrillator clock read again' });
    await send(recorder, 'post', `/api/codes/${ids.aprilLate}/entries`, amend).expect(201);
    expect((await list('missed=time-to-shock')).total).toBe(0);
    const item = (await list('unitId=unit-4w')).items.find((i) => i.codeId === ids.aprilLate);
    expect(item?.toFirstShockSeconds).toBe(100);
  });

  it('shows each target with its rule and source, takes notes and debrief points, and signs off only with the right password', async () => {
    const detail = (await reviewer.agent.get(`/api/quality/codes/${ids.aprilAsystole}`).expect(200)).body as QualityCodeDetail;
    const epi = detail.targets.find((t) => t.id === 'time-to-epinephrine');
    expect(epi).toMatchObject({ applies: true, met: false, value: 400 });
    expect(epi?.source).toMatch(/Donnino/);
    expect(detail.code.unitName).toBe('Cardiac Step-Down 3B');
    expect(detail.summary.firstRhythm).toBe('asystole');

    const saved = await send(reviewer, 'put', `/api/quality/codes/${ids.aprilAsystole}/review`, { notes: 'IO access delayed the first dose.', debriefPoints: ['Call for IO kit early'] }).expect(200);
    expect(saved.body.review).toMatchObject({ notes: 'IO access delayed the first dose.', debriefPoints: ['Call for IO kit early'], reviewedAt: null });
    await send(reviewer, 'put', `/api/quality/codes/${ids.aprilAsystole}/review`, { debriefPoints: [''] }).expect(400);
    await send(reviewer, 'put', `/api/quality/codes/${ids.running}/review`, { notes: 'too early' }).expect(409);

    const wrong = await send(reviewer, 'post', `/api/quality/codes/${ids.aprilAsystole}/review/sign`, { password: 'not my password' }).expect(403);
    expect(wrong.body.message).toMatch(/password does not match/);
    // A mistyped password signs nothing and keeps the session.
    const after = (await reviewer.agent.get(`/api/quality/codes/${ids.aprilAsystole}`).expect(200)).body as QualityCodeDetail;
    expect(after.review.reviewedAt).toBeNull();

    const signed = await send(reviewer, 'post', `/api/quality/codes/${ids.aprilAsystole}/review/sign`, { password: TEST_PASSWORD }).expect(200);
    expect(signed.body.review).toMatchObject({ reviewedBy: { displayName: 'Test q.reviewer' } });
    expect(Date.parse(signed.body.review.reviewedAt as string)).not.toBeNaN();
    await send(admin, 'post', `/api/quality/codes/${ids.aprilAsystole}/review/sign`, { password: TEST_PASSWORD }).expect(409);
    await send(reviewer, 'put', `/api/quality/codes/${ids.aprilAsystole}/review`, { notes: 'changed later' }).expect(409);
    expect((await list('firstRhythm=asystole')).items[0]?.reviewedAt).toBe(signed.body.review.reviewedAt);

    const actions = app.database.sqlite
      .prepare("SELECT action FROM audit_events WHERE code_id = ? AND action LIKE 'quality.%' ORDER BY id")
      .all(ids.aprilAsystole)
      .map((r) => (r as { action: string }).action);
    expect(actions).toEqual(['quality.review-saved', 'quality.sign-off-failed', 'quality.review-signed']);
  });

  it('gives medians, quartiles and target shares by month and by unit', async () => {
    const stats = (await reviewer.agent.get('/api/quality/stats').expect(200)).body as QualityStats;
    expect(stats.overall.codes).toBe(3);
    expect(stats.byMonth.map((m) => [m.key, m.codes])).toEqual([['2026-03', 1], ['2026-04', 2]]);
    expect(stats.byUnit.map((u) => [u.label, u.codes])).toEqual([['4 West Medical', 2], ['Cardiac Step-Down 3B', 1]]);
    expect(stats.overall.targets['time-to-shock']).toEqual({ applicable: 2, met: 2, share: 1 });
    expect(stats.overall.targets['time-to-epinephrine']).toEqual({ applicable: 1, met: 0, share: 0 });
    expect(stats.overall.intervals.toFirstShockSeconds).toEqual({ n: 2, median: 100, q1: 100, q3: 100 });
    expect(stats.quantileMethod).toMatch(/type 7/);
    const april = (await reviewer.agent.get('/api/quality/stats?from=2026-04-01').expect(200)).body as QualityStats;
    expect(april.overall.codes).toBe(2);
  });

  it('keeps the follow-up with dates and who entered it, lists codes still waiting by unit, and audits it', async () => {
    const put = (who: SignedInAgent, id: string, body: object) => send(who, 'put', `/api/quality/codes/${id}/follow-up`, body);
    const waiting = async (query = '') => (await reviewer.agent.get(`/api/quality/follow-up${query}`).expect(200)).body as FollowUpListResponse;
    // Oldest arrest first, with how long since the arrest.
    expect((await waiting()).items.map((i) => i.codeId)).toEqual([ids.march, ids.aprilAsystole, ids.aprilLate]);
    expect((await waiting()).items[0]?.daysSinceArrest).toBe(Math.floor((Date.now() - Date.parse('2026-03-04T07:42:10.000Z')) / 86_400_000));
    expect((await waiting('?unitId=unit-3b')).items.map((i) => i.codeId)).toEqual([ids.aprilAsystole]);

    const saved = await put(reviewer, ids.march, { survivalToDischarge: 'yes', survivalToDischargeDate: '2026-03-19', neurologicalOutcome: 'cpc-2', neurologicalOutcomeDate: '2026-03-19' }).expect(200);
    expect(saved.body.followUp).toMatchObject({
      survivalToDischarge: { value: 'yes', date: '2026-03-19', enteredBy: { displayName: 'Test q.reviewer' } },
      status30Days: null,
      neurologicalOutcome: { value: 'cpc-2', date: '2026-03-19' },
      complete: false,
      missing: ['status at 30 days'],
    });
    expect((await waiting()).items.map((i) => i.codeId)).toContain(ids.march);
    await put(admin, ids.march, { status30Days: 'alive', status30DaysDate: '2026-04-04' }).expect(200);
    const detail = (await reviewer.agent.get(`/api/quality/codes/${ids.march}`).expect(200)).body as QualityCodeDetail;
    expect(detail.followUp).toMatchObject({ complete: true, survivalToDischarge: { enteredBy: { displayName: 'Test q.reviewer' } }, status30Days: { value: 'alive', enteredBy: { displayName: 'Test q.admin' } } });
    expect((await waiting()).items.map((i) => i.codeId)).toEqual([ids.aprilAsystole, ids.aprilLate]);

    // Refusals name the field; a running code has no follow-up yet; nothing is stored.
    expect((await put(reviewer, ids.aprilLate, { survivalToDischarge: 'no', neurologicalOutcome: 'cpc-1' }).expect(400)).body.message).toMatch(/neurologicalOutcome: the patient died in hospital/);
    expect((await put(reviewer, ids.aprilLate, { neurologicalOutcome: 'cpc-9' }).expect(400)).body.message).toMatch(/neurologicalOutcome/);
    expect((await put(reviewer, ids.aprilLate, { survivalToDischarge: 'yes', survivalToDischargeDate: '2026-04-01' }).expect(400)).body.message).toMatch(/survivalToDischargeDate: must not be before the arrest \(2026-04-22\)/);
    await put(reviewer, ids.running, { survivalToDischarge: 'unknown' }).expect(409);
    await put(recorder, ids.aprilLate, { survivalToDischarge: 'no' }).expect(403);
    // Still open after the quality review was signed off (the 30-day status comes later).
    await put(reviewer, ids.aprilAsystole, { survivalToDischarge: 'no', survivalToDischargeDate: '2026-04-10', status30Days: 'dead', status30DaysDate: '2026-04-10' }).expect(200);
    await put(reviewer, ids.aprilLate, { survivalToDischarge: 'unknown' }).expect(200);

    const audit = app.database.sqlite.prepare("SELECT detail FROM audit_events WHERE code_id = ? AND action = 'quality.follow-up-saved' ORDER BY id").all(ids.march) as { detail: string }[];
    expect(audit.map((r) => JSON.parse(r.detail))).toEqual([
      { survivalToDischarge: { from: null, to: 'yes' }, survivalToDischargeDate: { from: null, to: '2026-03-19' }, neurologicalOutcome: { from: null, to: 'cpc-2' }, neurologicalOutcomeDate: { from: null, to: '2026-03-19' }, complete: false },
      { status30Days: { from: null, to: 'alive' }, status30DaysDate: { from: null, to: '2026-04-04' }, complete: true },
    ]);

    // The stats: ROSC and survival to discharge with Wilson intervals; survival over the known answers only.
    const stats = (await reviewer.agent.get('/api/quality/stats').expect(200)).body as QualityStats;
    expect(stats.overall.rosc).toMatchObject({ count: 1, known: 3 });
    expect(stats.overall.survivalToDischarge).toMatchObject({ count: 1, known: 2, unknown: 1, rate: 0.5 });
    expect(stats.overall.followUpComplete).toEqual({ complete: 2, codes: 3, share: 2 / 3 });
    expect(stats.byUnit.map((u) => [u.label, u.survivalToDischarge.known])).toEqual([['4 West Medical', 1], ['Cardiac Step-Down 3B', 1]]);
    expect(stats.rateMethod).toMatch(/Wilson/);
  });

  it('lets the reviewer complete registry details of an ended code, and applies the shock target only when witnessed or monitored is known', async () => {
    await send(reviewer, 'patch', `/api/codes/${ids.running}/review`, { utstein: { witnessed: 'no' } }).expect(409);
    await send(reviewer, 'patch', `/api/codes/${ids.aprilLate}/review`, { team: [] }).expect(403);
    await send(reviewer, 'patch', `/api/codes/${ids.aprilLate}/review`, { utstein: { witnessed: 'no', witnessedBy: null, monitored: 'no' } }).expect(200);
    const detail = (await reviewer.agent.get(`/api/quality/codes/${ids.aprilLate}`).expect(200)).body as QualityCodeDetail;
    expect(detail.utstein).toEqual({ witnessed: 'no', monitored: 'no' });
    const shock = detail.targets.find((t) => t.id === 'time-to-shock');
    expect(shock).toMatchObject({ applies: false, met: null, value: 100 });
    expect(shock?.note).toMatch(/neither witnessed nor monitored/);
    // The stored metrics follow, so the shares by month do too.
    const stats = (await reviewer.agent.get('/api/quality/stats').expect(200)).body as QualityStats;
    expect(stats.overall.targets['time-to-shock']).toEqual({ applicable: 1, met: 1, share: 1 });
    await send(reviewer, 'patch', `/api/codes/${ids.aprilLate}/review`, { utstein: { monitored: 'yes', monitoring: ['ecg', 'arterial-line'] } }).expect(200);
    expect(((await reviewer.agent.get('/api/quality/stats').expect(200)).body as QualityStats).overall.targets['time-to-shock'].applicable).toBe(2);
  });

  it('exports the Utstein CSV with exactly the documented columns, one row per code, and audits it', async () => {
    const documented = [...readFileSync(DOCS, 'utf8').matchAll(/^\| \d+ \| `([a-z_0-9]+)` \|/gm)].map((m) => m[1]);
    expect(documented.length).toBeGreaterThan(20);
    const res = await admin.agent.get('/api/quality/export/utstein.csv?unitId=unit-4w').expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="steadyhand-utstein-/);
    const lines = (res.text).trimEnd().split('\r\n');
    expect(lines[0]?.split(',')).toEqual(documented);
    expect(lines).toHaveLength(3);
    const rows = csvRecords(res.text);
    expect(rows.find((r) => r.record_id === ids.march)).toMatchObject({
      unit: '4 West Medical',
      arrest_to_first_defibrillation_s: '100',
      arrest_to_first_vasopressor_s: '345',
      first_documented_rhythm: 'VF',
      event_outcome: 'sustained-rosc',
      witnessed: 'yes',
      witnessed_by: 'staff',
      monitored: '',
      survival_to_discharge: 'yes',
      survival_to_discharge_date: '2026-03-19',
      status_30_days: 'alive',
      neurological_outcome: 'cpc-2',
      follow_up_complete: 'yes',
    });
    expect(rows.find((r) => r.record_id === ids.aprilLate)).toMatchObject({ witnessed: 'no', monitored: 'yes', monitoring: 'ecg;arterial-line', survival_to_discharge: 'unknown', neurological_outcome: '' });
    const audit = app.database.sqlite.prepare("SELECT detail FROM audit_events WHERE action = 'quality.export-utstein' ORDER BY id DESC").get() as { detail: string };
    expect(JSON.parse(audit.detail)).toMatchObject({ codes: 2, filter: { unitId: 'unit-4w' } });
  });

  it('makes a FHIR R4 document of a signed record only, which passes the fhir validator', async () => {
    const conflict = await reviewer.agent.get(`/api/quality/codes/${ids.march}/fhir`).expect(409);
    expect(conflict.body.message).toMatch(/not signed/);
    await send(recorder, 'post', `/api/codes/${ids.march}/signatures`, { meaning: 'recorded-by', password: TEST_PASSWORD }).expect(201);
    await send(leader, 'post', `/api/codes/${ids.march}/signatures`, { meaning: 'reviewed-confirmed', password: TEST_PASSWORD }).expect(201);

    const res = await reviewer.agent.get(`/api/quality/codes/${ids.march}/fhir`).buffer(true).parse((r, cb) => {
      let text = '';
      r.on('data', (c: Buffer) => (text += c.toString()));
      r.on('end', () => cb(null, text));
    }).expect(200);
    expect(res.headers['content-type']).toMatch(/^application\/fhir\+json/);
    const bundle = JSON.parse(res.body as string) as { type: string; entry: { resource: { resourceType: string; status?: string } }[] };
    const result = new Fhir().validate(bundle, { errorOnUnexpected: true });
    const errors = result.messages.filter((m) => ['error', 'fatal'].includes(String(m.severity)));
    expect(errors, JSON.stringify(errors, null, 1)).toEqual([]);
    expect(result.valid).toBe(true);
    expect(bundle.type).toBe('document');
    expect(bundle.entry[0]?.resource).toMatchObject({ resourceType: 'Composition', status: 'final' });
    const types = bundle.entry.map((e) => e.resource.resourceType);
    for (const t of ['Patient', 'Encounter', 'Condition', 'Procedure', 'MedicationAdministration', 'Observation', 'Provenance']) expect(types).toContain(t);
    expect(types.filter((t) => t === 'Provenance')).toHaveLength(2);
    expect(types.filter((t) => t === 'MedicationAdministration')).toHaveLength(2);
    const audit = app.database.sqlite.prepare("SELECT count(*) AS n FROM audit_events WHERE action = 'quality.export-fhir' AND code_id = ?").get(ids.march) as { n: number };
    expect(audit.n).toBe(1);
  });

  it('shows nothing of it to recorders, leaders and pharmacists', async () => {
    for (const who of [recorder, leader, pharmacist]) {
      await who.agent.get('/api/quality/codes').expect(403);
      await who.agent.get(`/api/quality/codes/${ids.march}`).expect(403);
      await who.agent.get('/api/quality/export/utstein.csv').expect(403);
    }
    await admin.agent.get('/api/quality/codes').expect(200);
  });
});
