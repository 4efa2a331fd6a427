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
});
