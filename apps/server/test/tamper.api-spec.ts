import { readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import type { NewEntry, RecordView, StoredEntry } from '@steadyhand/shared';
import type Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { UsersService } from '../src/users/users.service.js';
import { makeEntry } from './support/entries.js';
import { pdfText, recordPdf } from './support/pdf.js';
import { tinyPng } from './support/sample-files.js';
import { linkHash, relinkChain, withoutTriggers } from './support/tamper.js';
import { addUser, signIn, startTestApp, tempDataDir, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

/**
 * What someone with write access to the database file or the uploads folder, but not to the
 * server's keys, can do to a record; each must show on the record view, on a fresh PDF and at
 * verification. Legitimate renames afterwards must change nothing and raise no alarm.
 */

type Fields = NewEntry extends infer T ? (T extends unknown ? Omit<T, 'id' | 'at'> : never) : never;
const TAPS: Fields[] = [
  { kind: 'cpr', action: 'start', deviceId: 'tablet-4w', seq: 1 },
  { kind: 'rhythm', rhythm: 'vf', pulse: false, deviceId: 'tablet-4w', seq: 2 },
  { kind: 'shock', joules: 200, synchronized: false, deviceId: 'tablet-4w', seq: 3 },
  { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv', deviceId: 'tablet-4w', seq: 4 },
  { kind: 'end', outcome: 'sustained-rosc', deviceId: 'tablet-4w', seq: 5 },
];

interface Made {
  id: string;
  entries: StoredEntry[];
  attachment: { id: string; sha256: string };
}

describe('tampering with a record', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let leader: SignedInAgent;
  let admin: SignedInAgent;
  let sqlite: Database.Database;
  let colour = 0;

  beforeAll(async () => {
    app = await startTestApp();
    const users = app.app.get(UsersService);
    const actor = { userId: null, username: 'test' };
    await users.create({ username: 'maren.holt', displayName: 'Maren Holt, RN', password: TEST_PASSWORD, roles: ['recorder'] }, actor);
    await users.create({ username: 'kofi.asante', displayName: 'Dr Kofi Asante', password: TEST_PASSWORD, roles: ['leader'] }, actor);
    await addUser(app, 'site.admin', ['admin']);
    recorder = await signIn(app, 'maren.holt');
    leader = await signIn(app, 'kofi.asante');
    admin = await signIn(app, 'site.admin');
    await admin.agent.put('/api/admin/places/facility').set('x-csrf-token', admin.csrf).send({ name: 'Harbourview General Hospital' }).expect(200);
    sqlite = app.database.sqlite;
  }, 90_000);
  afterAll(() => app.close());

  const post = (who: SignedInAgent, url: string, body: object) => who.agent.post(url).set('x-csrf-token', who.csrf).send(body);
  const entriesOf = async (id: string) => (await recorder.agent.get(`/api/codes/${id}`).expect(200)).body.entries as StoredEntry[];
  const viewOf = async (id: string) => (await recorder.agent.get(`/api/codes/${id}/record`).expect(200)).body as RecordView;

  /** A code with its taps and a monitor strip (bytes of its own), not signed. */
  async function draft(): Promise<Made> {
    const res = await post(recorder, '/api/codes', { category: 'adult', location: '4 West Medical, bed 12' }).expect(201);
    const id = (res.body as { code: { id: string } }).code.id;
    for (const fields of TAPS) await post(recorder, `/api/codes/${id}/entries`, makeEntry(fields)).expect(201);
    colour++;
    const strip = tinyPng([colour % 256, Math.floor(colour / 256), 77]);
    const upload = await recorder.agent.post(`/api/codes/${id}/attachments`).set('x-csrf-token', recorder.csrf).attach('file', strip, 'strip.png').expect(201);
    const { attachment } = upload.body as { attachment: { id: string; sha256: string } };
    return { id, entries: await entriesOf(id), attachment };
  }

  /** Signed by recorder and leader, then one addendum. */
  async function signed(): Promise<Made> {
    const made = await draft();
    await post(recorder, `/api/codes/${made.id}/signatures`, { meaning: 'recorded-by', password: TEST_PASSWORD }).expect(201);
    await post(leader, `/api/codes/${made.id}/signatures`, { meaning: 'reviewed-confirmed', password: TEST_PASSWORD }).expect(201);
    await post(leader, `/api/codes/${made.id}/addenda`, makeEntry({ kind: 'note', text: 'Family informed at 08:20.' })).expect(201);
    return { ...made, entries: await entriesOf(made.id) };
  }

  const byKind = (made: Made, kind: string) => made.entries.find((e) => e.kind === kind)!;

  /** The record view, a fresh PDF and verification all say the record was changed. */
  async function expectDetected(id: string, problem?: RegExp): Promise<void> {
    const view = await viewOf(id);
    expect(view.integrity.valid).toBe(false);
    if (problem) expect(view.integrity.problems.join('\n')).toMatch(problem);
    const printed = pdfText(await recordPdf(recorder, id));
    expect(printed).toContain('RECORD CHECK FAILED');
    const verified = await post(recorder, '/api/records/verify', { digest: view.digest, recordId: id }).expect(200);
    expect(verified.body.valid).toBe(false);
  }

  it('sees nothing wrong with a record nobody touched, and the copy of it verifies', async () => {
    const made = await signed();
    const view = await viewOf(made.id);
    expect(view.integrity).toEqual({ valid: true, problems: [] });
    const file = await recordPdf(recorder, made.id);
    expect(pdfText(file)).toContain('Record check: entry chain, seal, signatures and attachment files all verify');
    const verified = await recorder.agent.post('/api/records/verify').set('x-csrf-token', recorder.csrf).attach('file', file, 'record.pdf').expect(200);
    expect(verified.body).toMatchObject({ valid: true });
  });

  describe('on a signed record', () => {
    it('1. a signed entry changed in place', async () => {
      const made = await signed();
      withoutTriggers(sqlite, ['entries_refuse_update'], () => {
        sqlite.prepare("UPDATE entries SET body = json_set(body, '$.joules', 360) WHERE id = ?").run(byKind(made, 'shock').id);
      });
      await expectDetected(made.id, /entry chain is broken at position 3/);
    });

    it('2. a signed entry deleted with its link', async () => {
      const made = await signed();
      const drug = byKind(made, 'drug').id;
      withoutTriggers(sqlite, ['entry_links_refuse_delete', 'entries_refuse_delete'], () => {
        sqlite.prepare('DELETE FROM entry_links WHERE entry_id = ?').run(drug);
        sqlite.prepare('DELETE FROM entries WHERE id = ?').run(drug);
      });
      await expectDetected(made.id, /entry chain is broken/);
    });

    it('3. one link deleted, the entries left as they were', async () => {
      const made = await signed();
      withoutTriggers(sqlite, ['entry_links_refuse_delete'], () => {
        sqlite.prepare('DELETE FROM entry_links WHERE entry_id = ?').run(byKind(made, 'rhythm').id);
      });
      await expectDetected(made.id, /positions skip from 1 to 3/);
    });

    it('4. two entries swapped in the log order', async () => {
      const made = await signed();
      const [a, b] = [byKind(made, 'rhythm'), byKind(made, 'shock')];
      withoutTriggers(sqlite, ['entries_refuse_update'], () => {
        sqlite.prepare('UPDATE entries SET cursor = -1 WHERE id = ?').run(a.id);
        sqlite.prepare('UPDATE entries SET cursor = ? WHERE id = ?').run(a.cursor, b.id);
        sqlite.prepare('UPDATE entries SET cursor = ? WHERE id = ?').run(b.cursor, a.id);
      });
      await expectDetected(made.id, /names another entry/);
    });

    it('5. the location changed', async () => {
      const made = await signed();
      sqlite.prepare('UPDATE codes SET location = ? WHERE id = ?').run('4 West Medical, bed 13', made.id);
      await expectDetected(made.id, /signature of Maren Holt, RN does not verify/);
    });

    it('6. the team changed', async () => {
      const made = await signed();
      sqlite.prepare('UPDATE codes SET team = ? WHERE id = ?').run(JSON.stringify([{ name: 'Dr Nobody', role: 'Team leader' }]), made.id);
      await expectDetected(made.id, /does not verify/);
    });

    it('7. the patient changed', async () => {
      const made = await signed();
      sqlite.prepare('UPDATE codes SET patient = ? WHERE id = ?').run(JSON.stringify({ name: 'Someone Else', mrn: '000' }), made.id);
      await expectDetected(made.id, /does not verify/);
    });

    it('8. a signature’s printed name changed', async () => {
      const made = await signed();
      withoutTriggers(sqlite, ['signatures_refuse_update'], () => {
        sqlite.prepare("UPDATE signatures SET printed_name = 'Dr Someone Else' WHERE code_id = ? AND meaning = 'reviewed-confirmed'").run(made.id);
      });
      await expectDetected(made.id, /signature of Dr Someone Else does not verify/);
    });

    it('9. a signature’s digest changed', async () => {
      const made = await signed();
      withoutTriggers(sqlite, ['signatures_refuse_update'], () => {
        sqlite.prepare("UPDATE signatures SET record_digest = ? WHERE code_id = ? AND meaning = 'recorded-by'").run('a'.repeat(64), made.id);
      });
      await expectDetected(made.id, /does not verify/);
    });

    it('10. a signature moved later, to cover an entry it never saw', async () => {
      const made = await signed();
      withoutTriggers(sqlite, ['signatures_refuse_update'], () => {
        sqlite.prepare("UPDATE signatures SET signed_at = '2099-01-01T00:00:00.000Z' WHERE code_id = ? AND meaning = 'reviewed-confirmed'").run(made.id);
      });
      await expectDetected(made.id, /does not verify/);
    });

    it('11. both signatures copied onto another record', async () => {
      const source = await signed();
      const target = await draft();
      sqlite
        .prepare(
          `INSERT INTO signatures (id, code_id, user_id, printed_name, meaning, signed_at, record_digest, server_signature)
           SELECT id || '-copy', ?, user_id, printed_name, meaning, signed_at, record_digest, server_signature FROM signatures WHERE code_id = ?`,
        )
        .run(target.id, source.id);
      await expectDetected(target.id, /2 signatures are stored, but the seal counts 0/);
    });

    it('12. a signature deleted', async () => {
      const made = await signed();
      withoutTriggers(sqlite, ['signatures_refuse_delete'], () => {
        sqlite.prepare("DELETE FROM signatures WHERE code_id = ? AND meaning = 'reviewed-confirmed'").run(made.id);
      });
      const view = await viewOf(made.id);
      // What is left still verifies on its own: only the seal's count tells.
      expect(view.signatures.map((s) => s.valid)).toEqual([true]);
      await expectDetected(made.id, /1 signature is stored, but the seal counts 2/);
    });

    it('13. an attachment deleted', async () => {
      const made = await signed();
      sqlite.prepare('DELETE FROM attachments WHERE id = ?').run(made.attachment.id);
      await expectDetected(made.id, /attachments listed are not the ones the server sealed/);
    });

    it('14. an attachment renamed in the database', async () => {
      const made = await signed();
      sqlite.prepare("UPDATE attachments SET filename = 'lab-results.pdf' WHERE id = ?").run(made.attachment.id);
      await expectDetected(made.id, /does not verify/);
    });

    it('15. an attachment’s bytes changed on the server’s disk', async () => {
      const made = await signed();
      const file = path.join(app.config.dataDir, 'uploads', made.attachment.sha256);
      const bytes = readFileSync(file);
      bytes[bytes.length - 20] = bytes[bytes.length - 20]! ^ 0xff;
      writeFileSync(file, bytes);
      await expectDetected(made.id, /file of attachment strip\.png .* no longer matches its SHA-256/);
      // Not served as if it were the file the record lists.
      const served = await recorder.agent.get(`/api/attachments/${made.attachment.id}/content`).expect(409);
      expect(served.body.error).toBe('attachment-changed');
    });

    it('16. the writer’s name kept with an entry changed', async () => {
      const made = await signed();
      withoutTriggers(sqlite, ['entries_refuse_update'], () => {
        sqlite.prepare("UPDATE entries SET user_name = 'Dr Someone Else' WHERE id = ?").run(byKind(made, 'shock').id);
      });
      await expectDetected(made.id, /entry chain is broken at position 3/);
    });

    it('17. the facility name kept with the record changed', async () => {
      const made = await signed();
      sqlite.prepare("UPDATE codes SET facility_name = 'Elsewhere Clinic' WHERE id = ?").run(made.id);
      await expectDetected(made.id, /does not verify/);
    });

    it('18. an addendum deleted with its link', async () => {
      const made = await signed();
      const addendum = made.entries.find((e) => e.addendum)!;
      withoutTriggers(sqlite, ['entry_links_refuse_delete', 'entries_refuse_delete'], () => {
        sqlite.prepare('DELETE FROM entry_links WHERE entry_id = ?').run(addendum.id);
        sqlite.prepare('DELETE FROM entries WHERE id = ?').run(addendum.id);
      });
      const view = await viewOf(made.id);
      // The chain that is left is whole, and both signatures verify: only the seal tells.
      expect(view.chain.valid).toBe(true);
      expect(view.signatures.every((s) => s.valid)).toBe(true);
      await expectDetected(made.id, /the seal holds 6 entries .* the log has 5/);
    });

    it('24. the registry details signed with the record changed', async () => {
      const made = await signed();
      sqlite.prepare('UPDATE codes SET utstein = ? WHERE id = ?').run(JSON.stringify({ witnessed: 'yes' }), made.id);
      await expectDetected(made.id, /does not verify/);
    });

    it('25. a registry-details addendum deleted', async () => {
      const made = await signed();
      await recorder.agent.patch(`/api/codes/${made.id}/review`).set('x-csrf-token', recorder.csrf).send({ utstein: { monitored: 'yes' } }).expect(200);
      expect((await viewOf(made.id)).integrity.valid).toBe(true);
      withoutTriggers(sqlite, ['utstein_addenda_refuse_delete'], () => {
        sqlite.prepare('DELETE FROM utstein_addenda WHERE code_id = ?').run(made.id);
      });
      // Both signatures still verify (the addendum came after them): only the seal tells.
      expect((await viewOf(made.id)).signatures.every((x) => x.valid)).toBe(true);
      await expectDetected(made.id, /registry details after signing are not the ones the server sealed/);
    });

    it('19. a plain entry inserted after signing, linked as the server would', async () => {
      const made = await signed();
      const last = made.entries.at(-1)!;
      const fake = makeEntry({ kind: 'note', text: 'Written in later' });
      const recordedAt = new Date().toISOString();
      sqlite
        .prepare(
          `INSERT INTO entries (id, code_id, kind, at, at_ms, user_id, user_name, received_at, recorded_at, addendum, body)
           VALUES (?, ?, 'note', ?, ?, ?, ?, ?, ?, 0, ?)`,
        )
        .run(fake.id, made.id, fake.at, Date.parse(fake.at), last.userId, last.userName ?? null, recordedAt, recordedAt, JSON.stringify(fake));
      const stored = (await entriesOf(made.id)).at(-1)!;
      const prev = sqlite.prepare('SELECT hash FROM entry_links WHERE entry_id = ?').pluck().get(last.id) as string;
      sqlite.prepare('INSERT INTO entry_links (entry_id, code_id, position, prev_hash, hash) VALUES (?, ?, ?, ?, ?)').run(fake.id, made.id, made.entries.length + 1, prev, linkHash(prev, stored));
      expect((await viewOf(made.id)).chain.valid).toBe(true);
      await expectDetected(made.id, /stored after the record was signed but is not marked as an addendum/);
      expect((await viewOf(made.id)).integrity.problems.join(' ')).toMatch(/not the one the server sealed/);
    });

    it('20. an addendum passed off as part of the signed log', async () => {
      const made = await signed();
      withoutTriggers(sqlite, ['entries_refuse_update'], () => {
        sqlite.prepare('UPDATE entries SET addendum = 0 WHERE code_id = ? AND addendum = 1').run(made.id);
      });
      await expectDetected(made.id, /entry chain is broken/);
    });

    it('26. a signature said to be made by a key the server does not hold', async () => {
      const made = await signed();
      withoutTriggers(sqlite, ['signatures_refuse_update'], () => {
        sqlite.prepare("UPDATE signatures SET key_id = '0123456789abcdef' WHERE code_id = ? AND meaning = 'recorded-by'").run(made.id);
      });
      await expectDetected(made.id, /signature of Maren Holt, RN was made with server key 0123456789abcdef, which this server does not hold/);
    });
  });

  describe('on a record not signed yet', () => {
    it('21. an entry changed and the whole chain computed again', async () => {
      const made = await draft();
      withoutTriggers(sqlite, ['entries_refuse_update'], () => {
        sqlite.prepare("UPDATE entries SET body = json_set(body, '$.joules', 360) WHERE id = ?").run(byKind(made, 'shock').id);
      });
      relinkChain(sqlite, made.id, await entriesOf(made.id));
      expect((await viewOf(made.id)).chain.valid).toBe(true);
      await expectDetected(made.id, /entry log is not the one the server sealed/);
    });

    it('22. an entry changed and its links deleted, for the next start to link it again', async () => {
      const dataDir = tempDataDir();
      let own = await startTestApp({ dataDir });
      let id: string;
      try {
        await addUser(own, 'own.recorder', ['recorder']);
        const writer = await signIn(own, 'own.recorder');
        const res = await post(writer, '/api/codes', { category: 'adult' }).expect(201);
        id = (res.body as { code: { id: string } }).code.id;
        for (const fields of TAPS.slice(0, 3)) await post(writer, `/api/codes/${id}/entries`, makeEntry(fields)).expect(201);
        withoutTriggers(own.database.sqlite, ['entries_refuse_update', 'entry_links_refuse_delete'], () => {
          own.database.sqlite.prepare("UPDATE entries SET body = json_set(body, '$.joules', 360) WHERE code_id = ? AND kind = 'shock'").run(id);
          own.database.sqlite.prepare('DELETE FROM entry_links WHERE code_id = ?').run(id);
        });
      } finally {
        await own.close();
      }
      own = await startTestApp({ dataDir });
      try {
        const reader = await signIn(own, 'own.recorder');
        const view = (await reader.agent.get(`/api/codes/${id}/record`).expect(200)).body as RecordView;
        expect(view.chain).toMatchObject({ valid: false, length: 0 });
        expect(view.integrity.problems.join(' ')).toMatch(/the seal holds 3 entries/);
        expect(pdfText(await recordPdf(reader, id))).toContain('RECORD CHECK FAILED');
        const verified = await post(reader, '/api/records/verify', { digest: view.digest, recordId: id }).expect(200);
        expect(verified.body.valid).toBe(false);
      } finally {
        await own.close();
      }
    });

    it('23. the record’s seal deleted', async () => {
      const made = await draft();
      sqlite.prepare('DELETE FROM record_seals WHERE code_id = ?').run(made.id);
      await expectDetected(made.id, /The record has no seal/);
    });
  });

  describe('legitimate changes after signing raise no alarm and change nothing', () => {
    it('a person renamed, and the facility renamed: the record, its PDF and its verification stay as signed', async () => {
      const made = await signed();
      const before = await viewOf(made.id);
      const maren = before.signatures.find((s) => s.meaning === 'recorded-by')!.signerId!;
      await admin.agent.patch(`/api/admin/users/${maren}`).set('x-csrf-token', admin.csrf).send({ displayName: 'Maren Holt-Berg, RN' }).expect(200);
      await admin.agent.put('/api/admin/places/facility').set('x-csrf-token', admin.csrf).send({ name: 'Harbourview University Hospital' }).expect(200);
      try {
        const after = await viewOf(made.id);
        expect(after.integrity).toEqual({ valid: true, problems: [] });
        expect(after.digest).toBe(before.digest);
        expect(after.signatures.every((s) => s.valid)).toBe(true);
        expect(after.record.facility).toBe('Harbourview General Hospital');
        expect(after.people[maren]).toBe('Maren Holt, RN');
        const file = await recordPdf(recorder, made.id);
        const printed = pdfText(file);
        expect(printed).toContain('Harbourview General Hospital');
        expect(printed).not.toContain('Harbourview University Hospital');
        expect(printed).not.toContain('Holt-Berg');
        const shockRow = printed.split('\n').find((l) => /\sShock\s/.test(l))!;
        expect(shockRow).toContain('Maren Holt, RN');
        const verified = await recorder.agent.post('/api/records/verify').set('x-csrf-token', recorder.csrf).attach('file', file, 'record.pdf').expect(200);
        expect(verified.body).toMatchObject({ valid: true });
        // A record not signed yet takes the new facility name; its new entries the new person name.
        const open = await draft();
        const openView = await viewOf(open.id);
        expect(openView.record.facility).toBe('Harbourview University Hospital');
        expect(openView.integrity.valid).toBe(true);
      } finally {
        await admin.agent.patch(`/api/admin/users/${maren}`).set('x-csrf-token', admin.csrf).send({ displayName: 'Maren Holt, RN' }).expect(200);
        await admin.agent.put('/api/admin/places/facility').set('x-csrf-token', admin.csrf).send({ name: 'Harbourview General Hospital' }).expect(200);
      }
    });
  });
});
