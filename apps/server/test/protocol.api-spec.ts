import { DEFAULT_PROTOCOL, type ProtocolSettings } from '@steadyhand/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addUser, signIn, startTestApp, type SignedInAgent, type TestApp } from './support/test-app.js';

/** A deep copy to edit, so no test can change the published defaults by accident. */
const defaults = (): ProtocolSettings => structuredClone(DEFAULT_PROTOCOL);

describe('protocol settings: admins edit them, every screen reads them', () => {
  let app: TestApp;
  let admin: SignedInAgent;
  let recorder: SignedInAgent;

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'admin.one', ['admin']);
    await addUser(app, 'rec.one', ['recorder']);
    admin = await signIn(app, 'admin.one');
    recorder = await signIn(app, 'rec.one');
  }, 60_000);
  afterAll(() => app.close());

  const put = (who: SignedInAgent, body: unknown) => who.agent.put('/api/protocol').set('x-csrf-token', who.csrf).send(body as object);
  const read = async () =>
    (await recorder.agent.get('/api/protocol').expect(200)).body as { protocol: ProtocolSettings; version: number; updatedAt: string | null; updatedBy: string | null };
  const reset = () => admin.agent.post('/api/protocol/reset').set('x-csrf-token', admin.csrf).expect(200);
  const auditRows = (action: string) =>
    (app.database.sqlite.prepare('SELECT username, detail FROM audit_events WHERE action = ? ORDER BY id').all(action) as { username: string; detail: string }[]).map(
      (r) => ({ username: r.username, detail: JSON.parse(r.detail) as Record<string, { from: unknown; to: unknown }> }),
    );

  it('serves the published defaults, never saved, before any admin has changed them', async () => {
    expect(await read()).toEqual({ protocol: DEFAULT_PROTOCOL, version: 1, updatedAt: null, updatedBy: null });
  });

  it('stores an admin change; everyone reads it back with who saved it and when; the audit row holds old and new values', async () => {
    // Values for the test only, not a clinical recommendation.
    const next = { ...defaults(), cprCycleSeconds: 150, epinephrineWindowSeconds: { min: 240, max: 360 } };
    const before = Date.now();
    const res = await put(admin, next).expect(200);
    expect(res.body.protocol).toEqual(next);

    const got = await read();
    expect(got.version).toBe(2);
    expect(got.protocol.cprCycleSeconds).toBe(150);
    expect(got.protocol.epinephrineWindowSeconds).toEqual({ min: 240, max: 360 });
    expect(got.updatedBy).toBe('Test admin.one');
    expect(Date.parse(got.updatedAt ?? '')).toBeGreaterThanOrEqual(before - 1000);

    const rows = auditRows('protocol.changed');
    expect(rows).toHaveLength(1);
    expect(rows[0]?.username).toBe('admin.one');
    // Only the changed top-level fields, each with its old and new value.
    expect(rows[0]?.detail).toEqual({
      version: 2,
      cprCycleSeconds: { from: 120, to: 150 },
      epinephrineWindowSeconds: { from: { min: 180, max: 300 }, to: { min: 240, max: 360 } },
    });
  });

  it("gives new codes a changed pediatric cap and edition, and never changes a code already started", async () => {
    const start = async () =>
      ((await recorder.agent.post('/api/codes').set('x-csrf-token', recorder.csrf).send({ category: 'pediatric', weightKg: 40 }).expect(201)).body.code as { id: string; protocolVersion: number });
    const epiOf = async (id: string) => {
      const sheet = (await recorder.agent.get(`/api/codes/${id}/dosing`).expect(200)).body as {
        edition: string;
        drugs: { key: string; doses: { amount: number; capped: boolean }[] }[];
      };
      return { edition: sheet.edition, dose: sheet.drugs.find((d) => d.key === 'epinephrine')?.doses[0] };
    };
    const past = await start();
    // PALS medications table (AHA 2010 Table 1 / 2015 ECC Handbook): 0.01 mg/kg, max 1 mg -> 40 kg gives 0.4 mg, under the cap.
    expect((await epiOf(past.id)).dose).toMatchObject({ amount: 0.4, capped: false });

    const current = await read();
    expect(past.protocolVersion).toBe(current.version);
    // A deliberately low cap, a test value only: new codes' sheets must stop at 0.3 mg.
    const next = {
      ...current.protocol,
      edition: 'Harbourview local protocol, test edition',
      drugs: current.protocol.drugs.map((d) =>
        d.key === 'epinephrine' ? { ...d, pediatric: { doses: [{ perKg: 0.01, maxDose: 0.3 }], repeatLast: true } } : d,
      ),
    };
    await put(admin, next).expect(200);
    const fresh = await start();
    expect(fresh.protocolVersion).toBe(current.version + 1);
    expect(await epiOf(fresh.id)).toMatchObject({ edition: 'Harbourview local protocol, test edition', dose: { amount: 0.3, capped: true } });
    // The code started before the change keeps its version: same dose, same edition.
    expect(await epiOf(past.id)).toMatchObject({ edition: DEFAULT_PROTOCOL.edition, dose: { amount: 0.4, capped: false } });
    // Every version stays readable, for the screens of the codes that use it.
    const v = (await recorder.agent.get(`/api/protocol/versions/${current.version}`).expect(200)).body as { version: number; protocol: ProtocolSettings };
    expect(v.protocol.edition).toBe(DEFAULT_PROTOCOL.edition);
    await recorder.agent.get('/api/protocol/versions/999').expect(404);
    await recorder.agent.get('/api/protocol/versions/two').expect(400);
    // The stored versions cannot be rewritten, even from inside the database.
    expect(() => app.database.sqlite.prepare("UPDATE protocol_versions SET saved_at = 'x'").run()).toThrow(/append-only/);
  });

  it('refuses a non-admin with 403 and changes nothing', async () => {
    const before = await read();
    await put(recorder, { ...before.protocol, cprCycleSeconds: 90 }).expect(403);
    await recorder.agent.post('/api/protocol/reset').set('x-csrf-token', recorder.csrf).expect(403);
    expect(await read()).toEqual(before);
  });

  it('refuses bad settings with a 400 naming the problem, and keeps what was stored', async () => {
    const before = await read();
    const base = before.protocol;
    const firstDrug = base.drugs[0];
    if (!firstDrug) throw new Error('the catalogue should not be empty');
    const cases: [string, unknown, RegExp][] = [
      ['a 5 s compression cycle', { ...base, cprCycleSeconds: 5 }, /cprCycleSeconds/],
      ['a default energy outside the presets', { ...base, shockPresetsJoules: [150, 200], defaultShockJoules: 360 }, /defaultShockJoules: .*must be one of the shock presets/],
      ['a duplicate drug key', { ...base, drugs: [...base.drugs, { ...firstDrug, label: 'Second copy' }] }, new RegExp(`duplicate drug key "${firstDrug.key}"`)],
      ['an epinephrine window ending before it starts', { ...base, epinephrineWindowSeconds: { min: 300, max: 180 } }, /epinephrineWindowSeconds: max must not be below min/],
      ['a missing drug list', { ...base, drugs: undefined }, /drugs/],
    ];
    for (const [what, body, message] of cases) {
      const res = await put(admin, body);
      expect(res.status, what).toBe(400);
      expect(res.body.message, what).toMatch(message);
    }
    expect(await read()).toEqual(before);
  });

  it('resets to the published defaults, audited with what it undid', async () => {
    const changed = (await read()).protocol;
    expect(changed).not.toEqual(DEFAULT_PROTOCOL);
    const res = await reset();
    expect(res.body.protocol).toEqual(DEFAULT_PROTOCOL);
    const got = await read();
    expect(got.protocol).toEqual(DEFAULT_PROTOCOL);
    expect(got.updatedBy).toBe('Test admin.one');

    const rows = auditRows('protocol.reset');
    expect(rows).toHaveLength(1);
    expect(rows[0]?.detail.cprCycleSeconds).toEqual({ from: 150, to: 120 });
    expect(rows[0]?.detail.edition).toEqual({ from: 'Harbourview local protocol, test edition', to: DEFAULT_PROTOCOL.edition });
    // Fields that were never changed do not clutter the trail.
    expect(rows[0]?.detail).not.toHaveProperty('adultMaxJoules');
  });
});
