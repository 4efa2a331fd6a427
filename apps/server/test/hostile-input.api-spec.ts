import type { RecordView, StoredEntry } from '@steadyhand/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeEntry } from './support/entries.js';
import { recordPdf } from './support/pdf.js';
import { addUser, signIn, startTestApp, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

const LONE = '\ud800';

describe('hostile input', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let admin: SignedInAgent;
  let otherId: string;

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'maren.holt', ['recorder']);
    otherId = (await addUser(app, 'someone.else', ['recorder'])).id;
    await addUser(app, 'kofi.asante', ['leader']);
    await addUser(app, 'site.admin', ['admin']);
    recorder = await signIn(app, 'maren.holt');
    admin = await signIn(app, 'site.admin');
  }, 90_000);
  afterAll(() => app.close());

  const post = (who: SignedInAgent, url: string, body: unknown) => who.agent.post(url).set('x-csrf-token', who.csrf).send(body as object);
  const patch = (who: SignedInAgent, url: string, body: unknown) => who.agent.patch(url).set('x-csrf-token', who.csrf).send(body as object);
  const recordOf = async (id: string) => (await recorder.agent.get(`/api/codes/${id}/record`).expect(200)).body as RecordView;

  /** An ended code with a shock at 200 J, recorded by maren.holt. Returns the code and the shock's id. */
  async function endedCode(): Promise<{ id: string; shockId: string }> {
    const res = await post(recorder, '/api/codes', { category: 'adult', location: 'Hostile ward, bed 1' }).expect(201);
    const id = (res.body as { code: { id: string } }).code.id;
    const shock = makeEntry({ kind: 'shock', joules: 200, synchronized: false, deviceId: 'tablet-1', seq: 1 });
    await post(recorder, `/api/codes/${id}/entries`, shock).expect(201);
    await post(recorder, `/api/codes/${id}/entries`, makeEntry({ kind: 'end', outcome: 'died', deviceId: 'tablet-1', seq: 2 })).expect(201);
    return { id, shockId: shock.id };
  }

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

  it('leaves the stored entries untouched: the log only grew by what was accepted', async () => {
    const { id } = await endedCode();
    const entries = (await recorder.agent.get(`/api/codes/${id}`).expect(200)).body.entries as StoredEntry[];
    expect(entries.map((e) => e.kind)).toEqual(['shock', 'end']);
  });
});
