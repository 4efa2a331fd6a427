import type { StoredEntry } from '@steadyhand/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeEntry } from './support/entries.js';
import { addUser, signIn, startTestApp, type SignedInAgent, type TestApp } from './support/test-app.js';

describe('codes and the entry log over REST', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let pharmacist: SignedInAgent;

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'rec.one', ['recorder']);
    await addUser(app, 'pharm.one', ['pharmacist']);
    recorder = await signIn(app, 'rec.one');
    pharmacist = await signIn(app, 'pharm.one');
  }, 60_000);
  afterAll(() => app.close());

  async function startCode(body: object = { category: 'adult' }) {
    const res = await recorder.agent.post('/api/codes').set('x-csrf-token', recorder.csrf).send(body).expect(201);
    return res.body.code as { id: string; status: string; arrestAt: string };
  }

  it('starts a code in one call with nothing but the category, arrest time defaulting to now', async () => {
    const before = Date.now();
    const code = await startCode();
    expect(code.status).toBe('active');
    expect(Date.parse(code.arrestAt)).toBeGreaterThanOrEqual(before - 1000);
    const list = await recorder.agent.get('/api/codes?status=active').expect(200);
    expect(list.body.codes.map((c: { id: string }) => c.id)).toContain(code.id);
  });

  it('returns the same code when a start is retried with the same device-made id', async () => {
    const id = crypto.randomUUID();
    const first = await recorder.agent.post('/api/codes').set('x-csrf-token', recorder.csrf).send({ id, category: 'pediatric', weightKg: 18 }).expect(201);
    const again = await recorder.agent.post('/api/codes').set('x-csrf-token', recorder.csrf).send({ id, category: 'pediatric', weightKg: 18 }).expect(200);
    expect(again.body.code).toEqual(first.body.code);
  });

  it('refuses a bad code with a 400 naming the field', async () => {
    const res = await recorder.agent.post('/api/codes').set('x-csrf-token', recorder.csrf).send({ category: 'pediatric', weightKg: -3 }).expect(400);
    expect(res.body.message).toMatch(/weightKg/);
  });

  it('stores an entry once: 201 the first time, 200 with the same stored row when resent', async () => {
    const code = await startCode();
    const entry = makeEntry({ kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv', deviceId: 'tablet-1', seq: 1, offsetMs: -120, offsetUncertaintyMs: 4 });
    const first = await recorder.agent.post(`/api/codes/${code.id}/entries`).set('x-csrf-token', recorder.csrf).send(entry).expect(201);
    const again = await recorder.agent.post(`/api/codes/${code.id}/entries`).set('x-csrf-token', recorder.csrf).send(entry).expect(200);
    expect(again.body.entry).toEqual(first.body.entry);
    const stored = first.body.entry as StoredEntry;
    expect(stored).toMatchObject({ id: entry.id, codeId: code.id, kind: 'drug', dose: 1, offsetMs: -120, offsetUncertaintyMs: 4, addendum: false });
    expect(Date.parse(stored.recordedAt)).toBeGreaterThanOrEqual(Date.parse(stored.receivedAt));
    const log = await recorder.agent.get(`/api/codes/${code.id}`).expect(200);
    expect(log.body.entries.filter((e: StoredEntry) => e.id === entry.id)).toHaveLength(1);
  });

  it('refuses bad entries with a 400 that says what is wrong, and keeps what was saved', async () => {
    const code = await startCode();
    const good = makeEntry({ kind: 'shock', joules: 200, synchronized: false });
    await recorder.agent.post(`/api/codes/${code.id}/entries`).set('x-csrf-token', recorder.csrf).send(good).expect(201);
    const cases: [object, RegExp][] = [
      [{ ...makeEntry({ kind: 'shock', joules: 200, synchronized: false }), joules: -5 }, /joules/],
      [{ ...makeEntry({ kind: 'rhythm', rhythm: 'vf', pulse: false }), rhythm: 'wobbly' }, /rhythm/],
      [{ ...makeEntry({ kind: 'note', text: 'x' }), id: 'not-a-uuid' }, /id/],
      [{ ...makeEntry({ kind: 'note', text: 'x' }), at: 'yesterday' }, /at/],
      [{ kind: 'teleport' }, /kind/],
    ];
    for (const [body, message] of cases) {
      const res = await recorder.agent.post(`/api/codes/${code.id}/entries`).set('x-csrf-token', recorder.csrf).send(body).expect(400);
      expect(res.body.message).toMatch(message);
    }
    const log = await recorder.agent.get(`/api/codes/${code.id}`).expect(200);
    expect(log.body.entries.map((e: StoredEntry) => e.id)).toEqual([good.id]);
  });

  it('does not let a pharmacist write to the log', async () => {
    const code = await startCode();
    await pharmacist.agent
      .post(`/api/codes/${code.id}/entries`)
      .set('x-csrf-token', pharmacist.csrf)
      .send(makeEntry({ kind: 'note', text: 'should not land' }))
      .expect(403);
    const log = await pharmacist.agent.get(`/api/codes/${code.id}`).expect(200);
    expect(log.body.entries).toHaveLength(0);
  });

  it('ends the code when an end entry lands, and reopens it when that entry is voided', async () => {
    const code = await startCode();
    const end = makeEntry({ kind: 'end', outcome: 'sustained-rosc' });
    await recorder.agent.post(`/api/codes/${code.id}/entries`).set('x-csrf-token', recorder.csrf).send(end).expect(201);
    let got = await recorder.agent.get(`/api/codes/${code.id}`).expect(200);
    expect(got.body.code).toMatchObject({ status: 'ended', outcome: 'sustained-rosc', endedAt: end.at });
    await recorder.agent
      .post(`/api/codes/${code.id}/entries`)
      .set('x-csrf-token', recorder.csrf)
      .send(makeEntry({ kind: 'void', target: end.id, reason: 'ended by mistake' }))
      .expect(201);
    got = await recorder.agent.get(`/api/codes/${code.id}`).expect(200);
    expect(got.body.code).toMatchObject({ status: 'active', outcome: null, endedAt: null });
  });

  it('refuses an amendment that would leave an invalid entry, and one pointing at another code', async () => {
    const code = await startCode();
    const other = await startCode();
    const shock = makeEntry({ kind: 'shock', joules: 200, synchronized: false });
    await recorder.agent.post(`/api/codes/${code.id}/entries`).set('x-csrf-token', recorder.csrf).send(shock).expect(201);
    const bad = await recorder.agent
      .post(`/api/codes/${code.id}/entries`)
      .set('x-csrf-token', recorder.csrf)
      .send(makeEntry({ kind: 'amend', target: shock.id, changes: { joules: 'lots' }, reason: 'typo' }))
      .expect(400);
    expect(bad.body.message).toMatch(/joules/);
    await recorder.agent
      .post(`/api/codes/${other.id}/entries`)
      .set('x-csrf-token', recorder.csrf)
      .send(makeEntry({ kind: 'void', target: shock.id, reason: 'wrong code' }))
      .expect(400);
    await recorder.agent
      .post(`/api/codes/${code.id}/entries`)
      .set('x-csrf-token', recorder.csrf)
      .send(makeEntry({ kind: 'amend', target: shock.id, changes: { joules: 150 }, reason: 'energy misread' }))
      .expect(201);
    const summary = await recorder.agent.get(`/api/codes/${code.id}/summary`).expect(200);
    expect(summary.body.shocks.map((s: { joules: number }) => s.joules)).toEqual([150]);
  });

  it('serves the weight-based dosing sheet for a pediatric code and says a weight is needed without one', async () => {
    const withWeight = await startCode({ category: 'pediatric', weightKg: 20 });
    const sheet = await recorder.agent.get(`/api/codes/${withWeight.id}/dosing`).expect(200);
    const epi = sheet.body.drugs.find((d: { key: string }) => d.key === 'epinephrine');
    // PALS medications table (AHA 2010 Table 1 / 2015 ECC Handbook): 0.01 mg/kg -> 20 kg x 0.01 = 0.2 mg
    expect(epi.doses[0].amount).toBeCloseTo(0.2, 6);
    expect(sheet.body.cautions.join(' ')).toMatch(/double-check|second person/i);
    const noWeight = await startCode({ category: 'pediatric' });
    const empty = await recorder.agent.get(`/api/codes/${noWeight.id}/dosing`).expect(200);
    expect(empty.body.status).toBe('weight-needed');
    await recorder.agent.get('/api/codes/00000000-0000-4000-8000-000000000000/dosing').expect(404);
  });

  it('completes details later, and records who changed them', async () => {
    const code = await startCode();
    const res = await recorder.agent
      .patch(`/api/codes/${code.id}`)
      .set('x-csrf-token', recorder.csrf)
      .send({ location: '4 West Medical, bed 12', patient: { mrn: 'HG-000123' } })
      .expect(200);
    expect(res.body.code).toMatchObject({ location: '4 West Medical, bed 12', patient: { mrn: 'HG-000123' } });
    await recorder.agent.patch(`/api/codes/${code.id}`).set('x-csrf-token', recorder.csrf).send({}).expect(400);
    const row = app.database.sqlite.prepare("SELECT action, detail FROM audit_events WHERE code_id = ? AND action = 'code.details-changed'").get(code.id) as { detail: string };
    expect(JSON.parse(row.detail).location).toEqual({ from: null, to: '4 West Medical, bed 12' });
  });

  const post = (codeId: string, fields: Parameters<typeof makeEntry>[0], at: Date) =>
    recorder.agent.post(`/api/codes/${codeId}/entries`).set('x-csrf-token', recorder.csrf).send(makeEntry(fields, at)).expect(201);

  it('answers the state at any moment of a code: the rhythm check due then, and its reminders', async () => {
    const arrest = Date.now() - 10 * 60_000;
    const code = await startCode({ category: 'adult', arrestAt: new Date(arrest).toISOString() });
    const at = (s: number) => new Date(arrest + s * 1000);
    await post(code.id, { kind: 'cpr', action: 'start' }, at(15));
    // A 6 s airway pause at 1:50 of the cycle does not restart it: only a rhythm check or a shock
    // ends the 2-min cycle (AHA 2020 Adult Cardiac Arrest Algorithm, "CPR 2 min").
    await post(code.id, { kind: 'cpr', action: 'stop', reason: 'airway' }, at(125));
    await post(code.id, { kind: 'cpr', action: 'start' }, at(131));
    await post(code.id, { kind: 'rhythm', rhythm: 'asystole', pulse: false }, at(136));
    const res = await recorder.agent.get(`/api/codes/${code.id}/state`).query({ at: at(131 + 115).toISOString() }).expect(200);
    // The late-tapped check (5 s after the restart) belongs to the pause: cycle 2 runs from 2:11, due at 4:11.
    expect(res.body.rhythmCheckDueAt).toBe(at(131 + 120).toISOString());
    expect(res.body.reminders.map((r: { kind: string }) => r.kind)).toEqual(expect.arrayContaining(['rhythm-check', 'epinephrine-first']));
    expect(res.body.reminders.find((r: { kind: string }) => r.kind === 'rhythm-check').message).toBe('Rhythm check due in 0:05 (cycle 2).');
    // Before the airway pause the same code showed cycle 1, due at 2:15.
    const earlier = await recorder.agent.get(`/api/codes/${code.id}/state`).query({ at: at(120).toISOString() }).expect(200);
    expect(earlier.body.rhythmCheckDueAt).toBe(at(135).toISOString());
    expect(earlier.body.state.compressions.cycle.number).toBe(1);
    // Now, by default; a bad time is a 400 that says what is wrong; an unknown code a 404.
    const now = await pharmacist.agent.get(`/api/codes/${code.id}/state`).expect(200);
    expect(Date.parse(now.body.at)).toBeGreaterThanOrEqual(arrest + 600_000 - 1000);
    const bad = await recorder.agent.get(`/api/codes/${code.id}/state`).query({ at: 'yesterday' }).expect(400);
    expect(bad.body.message).toMatch(/at must be an ISO 8601 date-time/);
    await recorder.agent.get('/api/codes/00000000-0000-4000-8000-000000000000/state').expect(404);
  });

  it('lists exactly the allowed doses and the limit per drug, and energies by kind of shock', async () => {
    const child = await startCode({ category: 'pediatric', weightKg: 18 });
    const sheet = (await recorder.agent.get(`/api/codes/${child.id}/dosing`).expect(200)).body as {
      drugs: { key: string; doses: { amount: number }[]; maxDoses: number | null }[];
      defibrillation: { steps: { joules: number; joulesHigh: number | null }[] };
      cardioversion: { steps: { joules: number; joulesHigh: number | null }[] };
    };
    // PALS medications table: amiodarone 5 mg/kg, may repeat twice (15 mg/kg): 90 mg three times for 18 kg.
    expect(sheet.drugs.find((d) => d.key === 'amiodarone')).toMatchObject({ doses: [{ amount: 90 }, { amount: 90 }, { amount: 90 }], maxDoses: 3 });
    // AHA 2020 PALS: 2 J/kg, 4 J/kg, then up to 10 J/kg or the adult dose (200 J here).
    expect(sheet.defibrillation.steps.map((s) => [s.joules, s.joulesHigh])).toEqual([
      [36, null],
      [72, null],
      [72, 180],
    ]);
    expect(sheet.cardioversion.steps[0]).toMatchObject({ joules: 9, joulesHigh: 18 });
    const adult = await startCode({ category: 'adult' });
    const a = (await recorder.agent.get(`/api/codes/${adult.id}/dosing`).expect(200)).body as typeof sheet;
    // AHA 2020 adult algorithm: amiodarone 300 mg then 150 mg, two doses.
    expect(a.drugs.find((d) => d.key === 'amiodarone')).toMatchObject({ doses: [{ amount: 300 }, { amount: 150 }], maxDoses: 2 });
    expect(a.drugs.find((d) => d.key === 'epinephrine')?.maxDoses).toBeNull();
  });

  it('sets when the arrest was recognised if recording began late, audited, and every interval follows', async () => {
    const start = Date.now() - 60_000;
    const code = await startCode({ category: 'adult', arrestAt: new Date(start).toISOString() });
    await post(code.id, { kind: 'cpr', action: 'start' }, new Date(start + 30_000));
    const earlier = new Date(start - 2 * 60_000).toISOString();
    const res = await recorder.agent.patch(`/api/codes/${code.id}`).set('x-csrf-token', recorder.csrf).send({ arrestAt: earlier }).expect(200);
    expect(res.body.code.arrestAt).toBe(earlier);
    const summary = (await recorder.agent.get(`/api/codes/${code.id}/summary`).expect(200)).body as { intervals: { arrestToFirstCompressions: number } };
    expect(summary.intervals.arrestToFirstCompressions).toBe(150);
    const row = app.database.sqlite.prepare("SELECT detail FROM audit_events WHERE code_id = ? AND action = 'code.details-changed'").get(code.id) as { detail: string };
    expect(JSON.parse(row.detail).arrestAt).toEqual({ from: new Date(start).toISOString(), to: earlier });
    // Not after the first entry, not in the future, and a clear 400 for a malformed time.
    const late = await recorder.agent.patch(`/api/codes/${code.id}`).set('x-csrf-token', recorder.csrf).send({ arrestAt: new Date(start + 40_000).toISOString() }).expect(400);
    expect(late.body.message).toMatch(/before the first entry/);
    await recorder.agent.patch(`/api/codes/${code.id}`).set('x-csrf-token', recorder.csrf).send({ arrestAt: new Date(Date.now() + 3_600_000).toISOString() }).expect(400);
    const bad = await recorder.agent.patch(`/api/codes/${code.id}`).set('x-csrf-token', recorder.csrf).send({ arrestAt: '07:42' }).expect(400);
    expect(bad.body.message).toMatch(/arrestAt must be an ISO 8601 date-time/);
  });

  it('a switch between adult and child is stamped and audited, and the sheet recalculates', async () => {
    const code = await startCode({ category: 'adult', weightKg: 12, weightSource: 'stated' });
    const adultSheet = (await recorder.agent.get(`/api/codes/${code.id}/dosing`).expect(200)).body as { categoryWarning: string | null };
    expect(adultSheet.categoryWarning).toMatch(/under 40 kg/);
    const res = await recorder.agent.patch(`/api/codes/${code.id}`).set('x-csrf-token', recorder.csrf).send({ category: 'pediatric' }).expect(200);
    expect(res.body.code).toMatchObject({ category: 'pediatric', weightSource: 'stated' });
    expect(Date.parse(res.body.code.categoryChangedAt)).toBeGreaterThan(Date.now() - 10_000);
    const sheet = (await recorder.agent.get(`/api/codes/${code.id}/dosing`).expect(200)).body as { drugs: { key: string; doses: { display: string }[] }[] };
    // PALS medications table: 0.01 mg/kg × 12 kg = 0.12 mg.
    expect(sheet.drugs.find((d) => d.key === 'epinephrine')?.doses[0]?.display).toBe('0.12 mg');
  });
});
