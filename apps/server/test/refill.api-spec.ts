import { randomUUID } from 'node:crypto';
import type { CodeJoinAck, CodeLogAck, CodeRefillAck, EntryAddAck } from '@steadyhand/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeEntry } from './support/entries.js';
import { connected, connectLive, cookieHeader, type LiveClient } from './support/live-client.js';
import { addUser, signIn, startTestApp, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

/**
 * What a tablet uses to refill a server restored from an older copy: the ids in a code's log, a
 * code started again with its device-made id, entries sent again marked as a refill.
 */
describe('refilling a restored server over the live socket', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let leader: SignedInAgent;
  let pharmacist: SignedInAgent;
  const open: LiveClient[] = [];

  async function live(who: SignedInAgent): Promise<LiveClient> {
    const socket = connectLive(app.baseUrl, { cookie: cookieHeader(who, app.baseUrl), origin: app.baseUrl });
    open.push(socket);
    await connected(socket);
    return socket;
  }
  const audit = (action: string, codeId: string) =>
    app.database.sqlite
      .prepare<[string, string], { detail: string; username: string }>('SELECT detail, username FROM audit_events WHERE action = ? AND code_id = ? ORDER BY id')
      .all(action, codeId)
      .map((r) => ({ username: r.username, detail: JSON.parse(r.detail) as Record<string, unknown> }));

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'rec.refill', ['recorder']);
    await addUser(app, 'lead.refill', ['leader']);
    await addUser(app, 'pharm.refill', ['pharmacist']);
    recorder = await signIn(app, 'rec.refill');
    leader = await signIn(app, 'lead.refill');
    pharmacist = await signIn(app, 'pharm.refill');
  }, 60_000);
  afterAll(async () => {
    for (const s of open) s.disconnect();
    await app.close();
  });

  it('starts a code it does not know again with the device-made id, then stores the entries sent back once, with the audit trail saying so', async () => {
    const pad = await live(recorder);
    const codeId = randomUUID();
    expect(await pad.emitWithAck('code:log', { codeId })).toEqual({ ok: true, exists: false });

    const arrestAt = '2026-03-04T07:40:00.000Z';
    // The device names the protocol version the code had; a version this server lacks is not taken (it gets the one in force).
    const started: CodeRefillAck = await pad.emitWithAck('code:refill', {
      code: { id: codeId, category: 'pediatric', weightKg: 18, location: '4 West, bed 12', arrestAt },
      protocolVersion: 1,
    });
    expect(started).toMatchObject({ ok: true, created: true, code: { id: codeId, category: 'pediatric', weightKg: 18, location: '4 West, bed 12', arrestAt, protocolVersion: 1 } });
    const other = randomUUID();
    expect(await pad.emitWithAck('code:refill', { code: { id: other, category: 'adult', arrestAt }, protocolVersion: 99 })).toMatchObject({ ok: true, code: { protocolVersion: 1 } });
    // Another tablet refilling the same code a moment later finds it, whoever started it.
    const wallPad = await live(leader);
    expect(await wallPad.emitWithAck('code:refill', { code: { id: codeId, category: 'pediatric', arrestAt } })).toMatchObject({ ok: true, created: false });
    expect(audit('code.refilled', codeId)).toEqual([{ username: 'rec.refill', detail: { category: 'pediatric', arrestAt, protocolVersion: 1, from: 'device' } }]);

    const tap = makeEntry({ kind: 'cpr', action: 'start', deviceId: 'pad-1', seq: 4 }, '2026-03-04T07:41:00.000Z');
    const refill = { storedAt: '2026-03-04T07:41:00.090Z', storedBy: 'user-before-restore' };
    const first: EntryAddAck = await pad.emitWithAck('entry:add', { codeId, entry: tap, refill });
    expect(first).toMatchObject({ ok: true, duplicate: false, entry: { id: tap.id, at: tap.at, addendum: false } });
    if (!first.ok) throw new Error(first.error);
    // The device's time stays; the server's receive and commit times are now.
    expect(Date.parse(first.entry.recordedAt)).toBeGreaterThan(Date.parse(refill.storedAt));
    const again: EntryAddAck = await pad.emitWithAck('entry:add', { codeId, entry: tap, refill });
    expect(again).toMatchObject({ ok: true, duplicate: true });

    const log: CodeLogAck = await pad.emitWithAck('code:log', { codeId });
    expect(log).toEqual({ ok: true, exists: true, ids: [tap.id], signed: false });
    expect(audit('entry.refilled', codeId)).toEqual([
      {
        username: 'rec.refill',
        detail: { entryId: tap.id, kind: 'cpr', deviceId: 'pad-1', seq: 4, at: tap.at, addendum: false, firstStoredAt: refill.storedAt, firstStoredBy: refill.storedBy },
      },
    ]);
    const chain = app.database.sqlite.prepare('SELECT count(*) FROM entry_links WHERE code_id = ?').pluck().get(codeId);
    expect(chain).toBe(1);
  });

  it('answers a join with how many entries the log holds, so a screen can tell its copy is off', async () => {
    const pad = await live(recorder);
    const codeId = randomUUID();
    await pad.emitWithAck('code:refill', { code: { id: codeId, category: 'adult', arrestAt: new Date().toISOString() } });
    for (let i = 0; i < 3; i++) await pad.emitWithAck('entry:add', { codeId, entry: makeEntry({ kind: 'note', text: `n${i}` }) });
    const join: CodeJoinAck = await pad.emitWithAck('code:join', { codeId, after: 1_000_000 });
    expect(join).toMatchObject({ ok: true, entries: [], count: 3 });
  });

  it('stores an entry sent back after the record was signed as an addendum', async () => {
    const pad = await live(recorder);
    const codeId = randomUUID();
    await pad.emitWithAck('code:refill', { code: { id: codeId, category: 'adult', arrestAt: '2026-03-04T07:40:00.000Z' } });
    await pad.emitWithAck('entry:add', { codeId, entry: makeEntry({ kind: 'end', outcome: 'died' }, '2026-03-04T08:10:00.000Z') });
    await recorder.agent.post(`/api/codes/${codeId}/signatures`).set('x-csrf-token', recorder.csrf).send({ meaning: 'recorded-by', password: TEST_PASSWORD }).expect(201);

    const late = makeEntry({ kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }, '2026-03-04T07:45:00.000Z');
    // Sent plainly it is refused (the record is signed)...
    expect(await pad.emitWithAck('entry:add', { codeId, entry: late })).toMatchObject({ ok: false, status: 409 });
    // ...sent back as a refill it becomes an addendum, by the same path as any addendum.
    const ack: EntryAddAck = await pad.emitWithAck('entry:add', { codeId, entry: late, refill: {} });
    expect(ack).toMatchObject({ ok: true, entry: { id: late.id, addendum: true } });
    expect(await pad.emitWithAck('code:log', { codeId })).toMatchObject({ exists: true, signed: true });
    expect(audit('record.addendum', codeId)).toHaveLength(1);
    expect(audit('entry.refilled', codeId)[0]?.detail).toMatchObject({ entryId: late.id, addendum: true });
  });

  it('lets a pharmacist read a log but not start a code or send entries back, and names a bad payload', async () => {
    const watcher = await live(pharmacist);
    const codeId = randomUUID();
    expect(await watcher.emitWithAck('code:refill', { code: { id: codeId, category: 'adult' } })).toMatchObject({ ok: false, status: 403 });
    expect(await watcher.emitWithAck('code:log', { codeId })).toEqual({ ok: true, exists: false });
    const bad = await watcher.emitWithAck('code:refill', { code: { id: 'not-a-uuid', category: 'adult' } } as never);
    expect(bad).toMatchObject({ ok: false, status: 400 });
    expect((bad as { error: string }).error).toMatch(/code\.id/);
    expect(await watcher.emitWithAck('code:log', {} as never)).toMatchObject({ ok: false, status: 400 });
  });
});
