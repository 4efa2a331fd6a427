import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { NewEntry, QualityCodeDetail, QualityListResponse, QualityStats } from '@steadyhand/shared';
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

  const send = (who: SignedInAgent, method: 'post' | 'put', url: string, body: object) => who.agent[method](url).set('x-csrf-token', who.csrf).send(body);

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

  it('exports the Utstein CSV with exactly the documented columns, one row per code, and audits it', async () => {
    const documented = [...readFileSync(DOCS, 'utf8').matchAll(/^\| \d+ \| `([a-z_0-9]+)` \|/gm)].map((m) => m[1]);
    expect(documented.length).toBeGreaterThan(20);
    const res = await admin.agent.get('/api/quality/export/utstein.csv?unitId=unit-4w').expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/attachment; filename="steadyhand-utstein-/);
    const lines = (res.text).trimEnd().split('\r\n');
    expect(lines[0]?.split(',')).toEqual(documented);
    expect(lines).toHaveLength(3);
    const header = lines[0]!.split(',');
    const march = lines.map((l) => l.split(',')).find((cells) => cells[0] === ids.march)!;
    const cell = (name: string) => march[header.indexOf(name)];
    expect(cell('unit')).toBe('4 West Medical');
    expect(cell('arrest_to_first_defibrillation_s')).toBe('100');
    expect(cell('arrest_to_first_vasopressor_s')).toBe('345');
    expect(cell('first_documented_rhythm')).toBe('VF');
    expect(cell('event_outcome')).toBe('sustained-rosc');
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
