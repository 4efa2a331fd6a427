import type { NewEntry, RecordView, StoredEntry } from '@steadyhand/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CodesRepository } from '../src/codes/codes.repository.js';
import { makeEntry } from './support/entries.js';
import { connected, connectLive, cookieHeader, type LiveClient } from './support/live-client.js';
import { pdfText, recordPdf } from './support/pdf.js';
import { addUser, signIn, startTestApp, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

const LONE = '\ud800';

describe('hostile input', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let leader: SignedInAgent;
  let admin: SignedInAgent;
  let reviewer: SignedInAgent;
  let otherId: string;

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'maren.holt', ['recorder']);
    otherId = (await addUser(app, 'someone.else', ['recorder'])).id;
    await addUser(app, 'kofi.asante', ['leader']);
    await addUser(app, 'site.admin', ['admin']);
    await addUser(app, 'qi.reviewer', ['reviewer']);
    recorder = await signIn(app, 'maren.holt');
    leader = await signIn(app, 'kofi.asante');
    admin = await signIn(app, 'site.admin');
    reviewer = await signIn(app, 'qi.reviewer');
  }, 90_000);
  afterAll(() => app.close());

  const post = (who: SignedInAgent, url: string, body: unknown) => who.agent.post(url).set('x-csrf-token', who.csrf).send(body as object);
  const patch = (who: SignedInAgent, url: string, body: unknown) => who.agent.patch(url).set('x-csrf-token', who.csrf).send(body as object);
  const recordOf = async (id: string) => (await recorder.agent.get(`/api/codes/${id}/record`).expect(200)).body as RecordView;
  const entryCount = (id: string) => app.database.sqlite.prepare('SELECT count(*) FROM entries WHERE code_id = ?').pluck().get(id) as number;

  /** An ended code with a shock at 200 J, recorded by maren.holt. Returns the code and the shock's id. */
  async function endedCode(): Promise<{ id: string; shockId: string }> {
    const res = await post(recorder, '/api/codes', { category: 'adult', location: 'Hostile ward, bed 1' }).expect(201);
    const id = (res.body as { code: { id: string } }).code.id;
    const shock = makeEntry({ kind: 'shock', joules: 200, synchronized: false, deviceId: 'tablet-1', seq: 1 });
    await post(recorder, `/api/codes/${id}/entries`, shock).expect(201);
    await post(recorder, `/api/codes/${id}/entries`, makeEntry({ kind: 'end', outcome: 'died', deviceId: 'tablet-1', seq: 2 })).expect(201);
    return { id, shockId: shock.id };
  }

  async function signedCode(): Promise<{ id: string; shockId: string }> {
    const code = await endedCode();
    await post(recorder, `/api/codes/${code.id}/signatures`, { meaning: 'recorded-by', password: TEST_PASSWORD }).expect(201);
    await post(leader, `/api/codes/${code.id}/signatures`, { meaning: 'reviewed-confirmed', password: TEST_PASSWORD }).expect(201);
    return code;
  }

  const amend = (target: string, changes: Record<string, unknown>): NewEntry =>
    makeEntry({ kind: 'amend', target, changes, reason: 'Strip reviewed', deviceId: 'review' });

  describe('an amendment cannot rewrite what the server set', () => {
    it('refuses server fields with 400 on the entries route, the addenda route and the live socket, storing nothing', async () => {
      const draft = await endedCode();
      const before = entryCount(draft.id);
      for (const changes of [{ userId: otherId }, { userName: 'Someone Else' }, { addendum: true }, { recordedAt: '2020-01-01T00:00:00.000Z' }, { receivedAt: '2020-01-01T00:00:00.000Z' }, { cursor: 1 }, { codeId: 'x' }, { deviceId: 'forged' }]) {
        const res = await post(recorder, `/api/codes/${draft.id}/entries`, amend(draft.shockId, changes)).expect(400);
        const field = Object.keys(changes)[0]!;
        expect(res.body.message).toMatch(new RegExp(`changes\\.${field}: ${field} is set by the (server|device)`));
      }
      expect(entryCount(draft.id)).toBe(before);

      const signed = await signedCode();
      const forged = await post(recorder, `/api/codes/${signed.id}/addenda`, amend(signed.shockId, { userId: otherId, addendum: false, recordedAt: '2020-01-01T00:00:00.000Z' })).expect(400);
      expect(forged.body.message).toMatch(/userId is set by the server/);

      const socket: LiveClient = connectLive(app.baseUrl, { cookie: cookieHeader(recorder, app.baseUrl), origin: app.baseUrl });
      try {
        await connected(socket);
        const ack = await socket.emitWithAck('entry:add', { codeId: draft.id, entry: amend(draft.shockId, { userId: otherId }) });
        expect(ack).toMatchObject({ ok: false, status: 400, error: expect.stringMatching(/userId is set by the server/) as unknown });
      } finally {
        socket.disconnect();
      }
      expect(entryCount(draft.id)).toBe(before);
    });

    it('refuses a field the target kind does not have, and a change to the value it already has', async () => {
      const { id, shockId } = await endedCode();
      const foreign = await post(recorder, `/api/codes/${id}/entries`, amend(shockId, { dose: 1 })).expect(400);
      expect(foreign.body.message).toMatch(/dose is not a field of a shock entry \(it has at, joules, synchronized\)/);
      const same = await post(recorder, `/api/codes/${id}/entries`, amend(shockId, { joules: 200 })).expect(400);
      expect(same.body.message).toMatch(/The amendment changes nothing: joules is already 200/);
      await post(recorder, `/api/codes/${id}/entries`, amend(shockId, { joules: 150 })).expect(201);
      // Against the entry as it reads now, after the first correction.
      await post(recorder, `/api/codes/${id}/entries`, amend(shockId, { joules: 150 })).expect(400);
      await post(recorder, `/api/codes/${id}/entries`, amend(shockId, { joules: 200 })).expect(201);
    });

    it('keeps a forged amendment stored by an older build out of the record, so screen and PDF name the real writer', async () => {
      const { id, shockId } = await endedCode();
      const forged = amend(shockId, { userId: otherId, joules: 360 });
      // As an older build stored it, past no check.
      app.app.get(CodesRepository).appendEntry(forged, { codeId: id, userId: otherId, receivedAt: new Date().toISOString(), addendum: false });
      const view = await recordOf(id);
      expect(view.record.entries.some((e) => e.id === forged.id)).toBe(true);
      const text = pdfText(await recordPdf(recorder, id));
      expect(text).toContain('Test maren.holt');
      expect(text).not.toContain('Test someone.else');
      expect(text).not.toContain('360 J');
      expect(text).not.toMatch(/AMENDED/);
    });
  });

  describe('text that is not well-formed Unicode', () => {
    it('is refused by every route that takes text into a record, so every record still opens', async () => {
      const { id } = await endedCode();
      const refused = [
        await post(recorder, '/api/codes', { category: 'adult', patient: { name: LONE } }),
        await patch(recorder, `/api/codes/${id}`, { patient: { name: LONE } }),
        await patch(recorder, `/api/codes/${id}`, { location: `Bed ${LONE}` }),
        await patch(recorder, `/api/codes/${id}/review`, { team: [{ name: `Dr ${LONE}`, role: 'Leader' }] }),
        await patch(recorder, `/api/codes/${id}/review`, { debriefNotes: LONE }),
        await admin.agent.put('/api/admin/places/facility').set('x-csrf-token', admin.csrf).send({ name: `Harbourview ${LONE}` }),
        await patch(admin, `/api/admin/users/${otherId}`, { displayName: LONE }),
        await post(recorder, `/api/codes/${id}/entries`, makeEntry({ kind: 'note', text: LONE })),
      ];
      for (const res of refused) {
        expect(res.status).toBe(400);
        expect(res.body.message).toMatch(/well-formed text/);
      }
      await recordOf(id);
      await recordPdf(recorder, id);
    });

    it('already stored, makes the record say which field cannot be canonicalised, never a 500', async () => {
      const { id } = await endedCode();
      app.database.sqlite.prepare('UPDATE codes SET patient = ? WHERE id = ?').run(JSON.stringify({ name: `Half ${LONE}` }), id);
      const view = await recorder.agent.get(`/api/codes/${id}/record`).expect(409);
      expect(view.body).toMatchObject({ error: 'record-not-canonical', message: expect.stringMatching(/record\.code\.patient\.name holds text that is not well-formed Unicode/) as unknown });
      await recorder.agent.get(`/api/codes/${id}/record.pdf`).expect(409);
      const sign = await post(recorder, `/api/codes/${id}/signatures`, { meaning: 'recorded-by', password: TEST_PASSWORD }).expect(409);
      expect(sign.body.message).toMatch(/patient\.name/);
      const verify = await post(recorder, '/api/records/verify', { digest: '0'.repeat(64), recordId: id }).expect(200);
      expect(verify.body).toMatchObject({ valid: false, reason: expect.stringMatching(/cannot be canonicalised/) as unknown });
      // The detail can be corrected, and the record opens again.
      await patch(recorder, `/api/codes/${id}`, { patient: { name: 'Half known' } }).expect(200);
      await recordOf(id);
    });
  });

  describe('JSON nested deep', () => {
    /** `{"a":{"a":...{"a":1}}}`, `levels` objects deep, as text (too deep for JSON.stringify). */
    const nestedText = (levels: number) => `${'{"a":'.repeat(levels)}1${'}'.repeat(levels)}`;
    /** An amendment of `target` whose change to joules is `levels` deep, as JSON text. */
    const deepAmendText = (target: string, levels: number) =>
      JSON.stringify(amend(target, { joules: '@@deep@@' })).replace('"@@deep@@"', nestedText(levels));
    const postText = (who: SignedInAgent, url: string, body: string) =>
      who.agent.post(url).set('x-csrf-token', who.csrf).set('content-type', 'application/json').send(body);

    it('is refused at the edge with a 400 that says so, at any depth past the bound, on every route', async () => {
      const { id, shockId } = await endedCode();
      const before = entryCount(id);
      // 15,000 levels is 75 kB, under the 100 kB body limit.
      for (const levels of [20, 1_900, 5_000, 15_000]) {
        const res = await postText(recorder, `/api/codes/${id}/entries`, deepAmendText(shockId, levels)).expect(400);
        expect(res.body).toEqual({ statusCode: 400, error: 'Bad Request', message: 'The JSON body is nested more than 16 levels deep; at most 16 are accepted' });
      }
      await postText(recorder, `/api/codes/${id}/addenda`, deepAmendText(shockId, 3_000)).expect(400);
      await admin.agent.put('/api/protocol').set('x-csrf-token', admin.csrf).set('content-type', 'application/json').send(nestedText(100)).expect(400);
      await postText(recorder, '/api/auth/login', `{"username":"x","password":${nestedText(100)}}`).expect(400);
      expect(entryCount(id)).toBe(before);
      // Within the bound, the amendment's own check answers.
      const shallow = await postText(recorder, `/api/codes/${id}/entries`, deepAmendText(shockId, 3)).expect(400);
      expect(shallow.body.message).toMatch(/joules/);
    });

    it('gets a final 400 acknowledgement on the live socket, never a 500 that a device would retry for ever', async () => {
      const { id, shockId } = await endedCode();
      const socket: LiveClient = connectLive(app.baseUrl, { cookie: cookieHeader(recorder, app.baseUrl), origin: app.baseUrl });
      try {
        await connected(socket);
        // Written as raw socket.io frames: the client library cannot serialise such depth itself.
        const engine = socket.io.engine;
        let ackId = 900;
        const rawEmit = (payload: string) =>
          new Promise<unknown>((resolve) => {
            const id = ++ackId;
            const onMessage = (data: unknown) => {
              const frame = String(data);
              const prefix = `3/live,${id}`;
              if (!frame.startsWith(prefix)) return;
              engine.off('message', onMessage);
              resolve((JSON.parse(frame.slice(prefix.length)) as unknown[])[0]);
            };
            engine.on('message', onMessage);
            engine.write(`2/live,${id}["entry:add",${payload}]`);
          });
        // 10,000 levels is 50 kB, under the socket's 64 kB message cap.
        for (const levels of [20, 1_900, 5_000, 10_000]) {
          const ack = await rawEmit(`{"codeId":"${id}","entry":${deepAmendText(shockId, levels)}}`);
          expect(ack).toEqual({ ok: false, status: 400, error: 'The message is nested more than 16 levels deep; at most 16 are accepted' });
        }
        // The connection stays open and takes the next good message.
        const good = await socket.emitWithAck('entry:add', { codeId: id, entry: amend(shockId, { joules: 150 }) });
        expect(good).toMatchObject({ ok: true });
      } finally {
        socket.disconnect();
      }
    });

    it('already stored by an older build, makes the record say so (409) instead of overflowing the stack, also after a restart', async () => {
      let own = await startTestApp();
      try {
        await addUser(own, 'old.recorder', ['recorder']);
        let writer = await signIn(own, 'old.recorder');
        const res = await post(writer, '/api/codes', { category: 'adult' }).expect(201);
        const id = (res.body as { code: { id: string } }).code.id;
        const shock = makeEntry({ kind: 'shock', joules: 200, synchronized: false });
        await post(writer, `/api/codes/${id}/entries`, shock).expect(201);
        // As an older build stored it: the row, without a link.
        const deepId = '6f0e8a52-9b1c-4d2e-8f3a-5b6c7d8e9f01';
        const body = deepAmendText(shock.id, 1_000).replace(/"id":"[^"]+"/, `"id":"${deepId}"`);
        own.database.sqlite
          .prepare(
            `INSERT INTO entries (id, code_id, kind, at, at_ms, user_id, received_at, recorded_at, addendum, body)
             SELECT ?, code_id, 'amend', at, at_ms, user_id, received_at, recorded_at, 0, ? FROM entries WHERE id = ?`,
          )
          .run(deepId, body, shock.id);
        const check = async () => {
          const view = await writer.agent.get(`/api/codes/${id}/record`).expect(409);
          expect(view.body.message).toMatch(/is nested more than 200 levels deep/);
          await writer.agent.get(`/api/codes/${id}/record.pdf`).expect(409);
          await writer.agent.get(`/api/codes/${id}`).expect(200);
          await writer.agent.get(`/api/codes/${id}/summary`).expect(200);
        };
        await check();
        const { dataDir } = own.config;
        await own.close();
        own = await startTestApp({ dataDir });
        writer = await signIn(own, 'old.recorder');
        await check();
      } finally {
        await own.close();
      }
    });
  });

  it('answers 409, never 500, when two requests race to take one unique name', async () => {
    const body = { username: 'twin.request', displayName: 'Twin Request', password: 'a long enough passphrase', roles: ['recorder'] };
    const answers = await Promise.all([1, 2, 3].map(() => admin.agent.post('/api/admin/users').set('x-csrf-token', admin.csrf).send(body)));
    expect(answers.map((r) => r.status).sort()).toEqual([201, 409, 409]);
    for (const res of answers.filter((r) => r.status === 409)) {
      expect(res.body).toMatchObject({ statusCode: 409, error: 'Conflict', message: expect.stringMatching(/username/) as unknown });
    }
    expect(app.database.sqlite.prepare("SELECT count(*) FROM users WHERE username = 'twin.request'").pluck().get()).toBe(1);
  });

  it('exports no cell a spreadsheet would run as a formula, a leading minus included', async () => {
    const payload = "-2+3+cmd|' /C calc'!A0";
    const res = await post(recorder, '/api/codes', { category: 'adult', location: payload }).expect(201);
    const id = (res.body as { code: { id: string } }).code.id;
    await post(recorder, `/api/codes/${id}/entries`, makeEntry({ kind: 'end', outcome: 'died' })).expect(201);
    const utstein = (await reviewer.agent.get('/api/quality/export/utstein.csv').expect(200)).text;
    const row = utstein.split('\r\n').find((l) => l.startsWith(id))!;
    expect(row).toContain(`,'${payload},`);
    expect(row).not.toContain(`,${payload},`);

    await post(admin, '/api/auth/login', { username: '-1+1', password: 'not the password' }).expect(401);
    const audit = (await admin.agent.get('/api/admin/audit.csv').query({ action: 'auth.login-failed' }).expect(200)).text;
    expect(audit).toContain(`,'-1+1,`);
  });

  it('leaves the stored entries untouched: the log only grew by what was accepted', async () => {
    const { id } = await endedCode();
    const entries = (await recorder.agent.get(`/api/codes/${id}`).expect(200)).body.entries as StoredEntry[];
    expect(entries.map((e) => e.kind)).toEqual(['shock', 'end']);
  });
});
