import type { EntryAddAck, EntryAddedEvent, CodeJoinAck, TimePingAck } from '@steadyhand/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeEntry } from './support/entries.js';
import { connected, connectLive, cookieHeader, refused, type LiveClient } from './support/live-client.js';
import { addUser, signIn, startTestApp, type SignedInAgent, type TestApp } from './support/test-app.js';

describe('the live socket (/live)', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let leader: SignedInAgent;
  let pharmacist: SignedInAgent;
  const open: LiveClient[] = [];

  const live = (who: SignedInAgent, origin = app.baseUrl) => {
    const socket = connectLive(app.baseUrl, { cookie: cookieHeader(who, app.baseUrl), origin });
    open.push(socket);
    return socket;
  };
  async function startCode(): Promise<string> {
    const res = await recorder.agent.post('/api/codes').set('x-csrf-token', recorder.csrf).send({ category: 'adult' }).expect(201);
    return res.body.code.id as string;
  }

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'rec.live', ['recorder']);
    await addUser(app, 'lead.live', ['leader']);
    await addUser(app, 'pharm.live', ['pharmacist']);
    recorder = await signIn(app, 'rec.live');
    leader = await signIn(app, 'lead.live');
    pharmacist = await signIn(app, 'pharm.live');
  }, 60_000);
  afterAll(async () => {
    for (const s of open) s.disconnect();
    await app.close();
  });

  it('refuses a handshake without a session', async () => {
    const socket = connectLive(app.baseUrl, { origin: app.baseUrl });
    open.push(socket);
    expect((await refused(socket)).message).toMatch(/unauthorized/);
  });

  it('refuses a handshake from an Origin that is not allowed, even with a session', async () => {
    const socket = live(recorder, 'https://evil.example');
    expect((await refused(socket)).message).toMatch(/origin not allowed/);
  });

  it('commits, acknowledges, then broadcasts to every screen in the code, and a resend stores one row', async () => {
    const codeId = await startCode();
    const pad = live(recorder);
    const wall = live(leader);
    await Promise.all([connected(pad), connected(wall)]);
    const joinPad: CodeJoinAck = await pad.emitWithAck('code:join', { codeId });
    const joinWall: CodeJoinAck = await wall.emitWithAck('code:join', { codeId });
    expect(joinPad).toMatchObject({ ok: true, entries: [] });
    expect(joinWall.ok).toBe(true);

    const seenByWall = new Promise<EntryAddedEvent>((resolve) => wall.once('entry:added', resolve));
    const seenByPad = new Promise<EntryAddedEvent>((resolve) => pad.once('entry:added', resolve));
    const entry = makeEntry({ kind: 'cpr', action: 'start', deviceId: 'pad-1', seq: 1 });
    const ack: EntryAddAck = await pad.emitWithAck('entry:add', { codeId, entry });
    expect(ack).toMatchObject({ ok: true, duplicate: false, entry: { id: entry.id, codeId } });
    const [onWall, onPad] = await Promise.all([seenByWall, seenByPad]);
    expect(onWall.entry.id).toBe(entry.id);
    expect(onPad.entry.id).toBe(entry.id);
    expect(onWall.cursor).toBe(ack.ok ? ack.entry.cursor : -1);

    const again: EntryAddAck = await pad.emitWithAck('entry:add', { codeId, entry });
    expect(again).toMatchObject({ ok: true, duplicate: true, entry: { id: entry.id } });
    const count = app.database.sqlite.prepare('SELECT count(*) FROM entries WHERE id = ?').pluck().get(entry.id);
    expect(count).toBe(1);
  });

  it('answers code:join with everything after the cursor the screen sends', async () => {
    const codeId = await startCode();
    const pad = live(recorder);
    await connected(pad);
    const acks: EntryAddAck[] = [];
    for (let i = 0; i < 3; i++) acks.push(await pad.emitWithAck('entry:add', { codeId, entry: makeEntry({ kind: 'note', text: `n${i}` }) }));
    const firstCursor = acks[0]!.ok ? acks[0]!.entry.cursor : 0;
    const rejoin: CodeJoinAck = await pad.emitWithAck('code:join', { codeId, after: firstCursor });
    expect(rejoin.ok && rejoin.entries.map((e) => (e.kind === 'note' ? e.text : ''))).toEqual(['n1', 'n2']);
    expect(rejoin.ok && rejoin.cursor).toBe(acks[2]!.ok ? acks[2]!.entry.cursor : -1);
  });

  it('gives a bad payload an error acknowledgement and keeps the connection', async () => {
    const codeId = await startCode();
    const pad = live(recorder);
    await connected(pad);
    const bad: EntryAddAck = await pad.emitWithAck('entry:add', { codeId, entry: { kind: 'shock', joules: 'many' } } as never);
    expect(bad).toMatchObject({ ok: false, status: 400 });
    expect(!bad.ok && bad.error).toMatch(/joules|id/);
    const unknownCode: EntryAddAck = await pad.emitWithAck('entry:add', { codeId: 'nope', entry: makeEntry({ kind: 'rosc' }) });
    expect(unknownCode).toMatchObject({ ok: false, status: 404 });
    expect(pad.connected).toBe(true);
    const good: EntryAddAck = await pad.emitWithAck('entry:add', { codeId, entry: makeEntry({ kind: 'rosc' }) });
    expect(good.ok).toBe(true);
  });

  it('lets a pharmacist watch but not write', async () => {
    const codeId = await startCode();
    const watcher = live(pharmacist);
    await connected(watcher);
    const join: CodeJoinAck = await watcher.emitWithAck('code:join', { codeId });
    expect(join.ok).toBe(true);
    const write: EntryAddAck = await watcher.emitWithAck('entry:add', { codeId, entry: makeEntry({ kind: 'rosc' }) });
    expect(write).toMatchObject({ ok: false, status: 403 });
    expect(app.database.sqlite.prepare('SELECT count(*) FROM entries WHERE code_id = ?').pluck().get(codeId)).toBe(0);
  });

  it('answers time:ping with the server receive and send times', async () => {
    const pad = live(recorder);
    await connected(pad);
    const t0 = Date.now();
    const pong: TimePingAck = await pad.emitWithAck('time:ping', { t0 });
    expect(pong.t0).toBe(t0);
    expect(pong.t1).toBeGreaterThanOrEqual(t0 - 5);
    expect(pong.t2).toBeGreaterThanOrEqual(pong.t1);
  });

  it('disconnects a session’s sockets within a second of signing out', async () => {
    const own = await signIn(app, 'rec.live');
    const socket = live(own);
    await connected(socket);
    const gone = new Promise<number>((resolve) => {
      const started = Date.now();
      socket.once('disconnect', () => resolve(Date.now() - started));
    });
    await own.agent.post('/api/auth/logout').set('x-csrf-token', own.csrf).expect(204);
    expect(await gone).toBeLessThan(1000);
    // The other session of the same person stays connected.
    const other = live(recorder);
    await connected(other);
    expect(other.connected).toBe(true);
  });

  describe('a socket lives no longer than its session', () => {
    /** The session id inside the signed cookie (`s:<sid>.<signature>`). */
    const sidOf = (who: SignedInAgent) => {
      const value = decodeURIComponent(/steadyhand\.sid=([^;]+)/.exec(cookieHeader(who, app.baseUrl))![1]!);
      return value.slice(2, value.lastIndexOf('.'));
    };
    const expireIdle = (who: SignedInAgent) => app.database.sqlite.prepare('UPDATE sessions SET expires_at = ? WHERE sid = ?').run(Date.now() - 1, sidOf(who));
    const rows = (codeId: string) => app.database.sqlite.prepare('SELECT count(*) FROM entries WHERE code_id = ?').pluck().get(codeId) as number;

    it('answers 401 to a tap after the idle timeout, stores nothing, and closes the socket, as REST answers 401', async () => {
      const codeId = await startCode();
      const own = await signIn(app, 'rec.live');
      const socket = live(own);
      await connected(socket);
      expect(await socket.emitWithAck('code:join', { codeId })).toMatchObject({ ok: true });
      const closed = new Promise<void>((resolve) => socket.once('disconnect', () => resolve()));
      // The idle timeout has passed for this session (its row says when it expires).
      expireIdle(own);
      await own.agent.get('/api/auth/me').expect(401);
      const ack = await socket.emitWithAck('entry:add', { codeId, entry: makeEntry({ kind: 'rosc' }) });
      expect(ack).toMatchObject({ ok: false, status: 401, error: expect.stringMatching(/session has ended/) as unknown });
      await closed;
      expect(rows(codeId)).toBe(0);
    });

    it('closes an idle socket by itself once its session expires, without waiting for a message', async () => {
      const own = await signIn(app, 'rec.live');
      const socket = live(own);
      await connected(socket);
      const closed = new Promise<void>((resolve) => socket.once('disconnect', () => resolve()));
      expireIdle(own);
      await closed;
      expect(socket.connected).toBe(false);
    });

    it('refuses a tap after the absolute timeout, however active the session was', async () => {
      const codeId = await startCode();
      const own = await signIn(app, 'rec.live');
      const socket = live(own);
      await connected(socket);
      // Signed in longer ago than the absolute timeout, though active a moment ago.
      app.database.sqlite
        .prepare("UPDATE sessions SET data = json_set(data, '$.signedInAt', ?) WHERE sid = ?")
        .run(Date.now() - app.config.sessionAbsoluteMs - 60_000, sidOf(own));
      expect(await socket.emitWithAck('entry:add', { codeId, entry: makeEntry({ kind: 'rosc' }) })).toMatchObject({ ok: false, status: 401 });
      expect(rows(codeId)).toBe(0);
    });

    it('takes a tap as activity: it pushes the idle timeout forward like a request', async () => {
      const codeId = await startCode();
      const own = await signIn(app, 'rec.live');
      const socket = live(own);
      await connected(socket);
      const soon = Date.now() + 60_000;
      app.database.sqlite.prepare('UPDATE sessions SET expires_at = ? WHERE sid = ?').run(soon, sidOf(own));
      expect(await socket.emitWithAck('entry:add', { codeId, entry: makeEntry({ kind: 'rosc' }) })).toMatchObject({ ok: true });
      const after = app.database.sqlite.prepare('SELECT expires_at FROM sessions WHERE sid = ?').pluck().get(sidOf(own)) as number;
      expect(after).toBeGreaterThan(soon);
      expect(after).toBeGreaterThanOrEqual(Date.now() + app.config.sessionIdleMs - 60_000);
    });
  });
});
