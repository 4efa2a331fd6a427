import { execFileSync } from 'node:child_process';
import { createHash, createPublicKey, verify } from 'node:crypto';
import { mkdtempSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { NewEntry, StoredEntry } from '@steadyhand/shared';
import canonicalize from 'canonicalize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RECORD_KEY_FILE } from '../src/records/record-keys.js';
import { UsersService } from '../src/users/users.service.js';
import { makeEntry } from './support/entries.js';
import { connected, connectLive, cookieHeader, type LiveClient } from './support/live-client.js';
import { addUser, signIn, startTestApp, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

/** Clock time on the demo day, "07:42:10" → ISO (UTC; the facility's time zone is set to UTC below). */
const clock = (hms: string) => `2026-03-04T${hms}.000Z`;

type NoBase<T> = T extends unknown ? Omit<T, 'id' | 'at'> : never;
const at = (hms: string, fields: NoBase<NewEntry>): NewEntry => makeEntry(fields, clock(hms));

/**
 * Brief, "A code, start to finish" (demo scenario of our own): 07:42:10 arrest recognised in
 * 4 West bed 12; compressions 07:42:25; first rhythm check VF 07:43:40; shock 200 J;
 * epinephrine 1 mg IV 07:47:55; ROSC 07:58:30; code ended 08:05. The seconds between those
 * points (stop 07:43:38, shock 07:43:45, restart 07:43:47, stop 07:58:25) are our own fill-in.
 */
const demoTimeline = (): NewEntry[] => [
  at('07:42:25', { kind: 'cpr', action: 'start', deviceId: 'tablet-4w' }),
  at('07:43:38', { kind: 'cpr', action: 'stop', reason: 'rhythm-check', deviceId: 'tablet-4w' }),
  at('07:43:40', { kind: 'rhythm', rhythm: 'vf', pulse: false, deviceId: 'tablet-4w' }),
  at('07:43:45', { kind: 'shock', joules: 200, synchronized: false, deviceId: 'tablet-4w' }),
  at('07:43:47', { kind: 'cpr', action: 'start', deviceId: 'tablet-4w' }),
  at('07:47:55', { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv', deviceId: 'tablet-4w' }),
  at('07:58:25', { kind: 'cpr', action: 'stop', reason: 'rosc', deviceId: 'tablet-4w' }),
  at('07:58:30', { kind: 'rosc', deviceId: 'tablet-4w' }),
  at('08:05:00', { kind: 'end', outcome: 'transferred', deviceId: 'tablet-4w' }),
];

/** Collects a binary response body (supertest parses only text and JSON by default). */
type ParseFn = Extract<Parameters<ReturnType<SignedInAgent['agent']['get']>['parse']>[0], (res: never, cb: never) => void>;
const binary: ParseFn = (res, done) => {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
};

const workDir = mkdtempSync(path.join(tmpdir(), 'steadyhand-pdf-'));
let pdfCount = 0;
function pdfText(bytes: Buffer): string {
  const file = path.join(workDir, `record-${++pdfCount}.pdf`);
  writeFileSync(file, bytes);
  return execFileSync('/usr/bin/pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
}
/** The text of page 1 alone. */
function firstPageText(bytes: Buffer): string {
  const file = path.join(workDir, `record-${++pdfCount}.pdf`);
  writeFileSync(file, bytes);
  return execFileSync('/usr/bin/pdftotext', ['-f', '1', '-l', '1', '-layout', file, '-'], { encoding: 'utf8' });
}

describe('the signed record', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let leader: SignedInAgent;
  let pharmacist: SignedInAgent;
  let otherRecorder: SignedInAgent;
  let reviewer: SignedInAgent;

  beforeAll(async () => {
    app = await startTestApp();
    const users = app.app.get(UsersService);
    const actor = { userId: null, username: 'test' };
    await users.create({ username: 'maren.holt', displayName: 'Maren Holt, RN', password: TEST_PASSWORD, roles: ['recorder'] }, actor);
    await users.create({ username: 'kofi.asante', displayName: 'Dr Kofi Asante', password: TEST_PASSWORD, roles: ['leader'] }, actor);
    await addUser(app, 'pharm.one', ['pharmacist']);
    await addUser(app, 'rec.two', ['recorder']);
    await addUser(app, 'rev.one', ['reviewer']);
    recorder = await signIn(app, 'maren.holt');
    leader = await signIn(app, 'kofi.asante');
    pharmacist = await signIn(app, 'pharm.one');
    otherRecorder = await signIn(app, 'rec.two');
    reviewer = await signIn(app, 'rev.one');
    app.database.sqlite
      .prepare("INSERT INTO settings (key, value, updated_at) VALUES ('facility', ?, ?) ON CONFLICT(key) DO UPDATE SET value = excluded.value")
      .run(JSON.stringify({ name: 'Harbourview General Hospital', timeZone: 'UTC' }), new Date().toISOString());
  }, 90_000);
  afterAll(() => app.close());

  const post = (who: SignedInAgent, url: string, body: object) => who.agent.post(url).set('x-csrf-token', who.csrf).send(body);

  async function demoCode(): Promise<string> {
    const res = await post(recorder, '/api/codes', { category: 'adult', arrestAt: clock('07:42:10'), location: '4 West Medical, bed 12' }).expect(201);
    const id = (res.body as { code: { id: string } }).code.id;
    for (const entry of demoTimeline()) await post(recorder, `/api/codes/${id}/entries`, entry).expect(201);
    return id;
  }

  const sign = (who: SignedInAgent, id: string, meaning: string, password = TEST_PASSWORD) =>
    post(who, `/api/codes/${id}/signatures`, { meaning, password });

  const pdf = async (who: SignedInAgent, id: string): Promise<Buffer> => {
    const res = await who.agent.get(`/api/codes/${id}/record.pdf`).buffer(true).parse(binary).expect(200);
    expect(res.headers['content-type']).toMatch(/application\/pdf/);
    return res.body as Buffer;
  };

  const verifyFile = (who: SignedInAgent, bytes: Buffer) =>
    who.agent.post('/api/records/verify').set('x-csrf-token', who.csrf).attach('file', bytes, 'record.pdf').expect(200);

  it('builds the summary and the canonical record of the demo code, with a digest anyone can recompute', async () => {
    const id = await demoCode();
    const summary = await pharmacist.agent.get(`/api/codes/${id}/summary`).expect(200);
    // Derived arithmetic from the brief's clock times, not published values.
    expect(summary.body.intervals).toMatchObject({
      arrestToFirstCompressions: 15,
      arrestToFirstRhythmAnalysis: 90,
      arrestToFirstShock: 95,
      arrestToFirstEpinephrine: 345,
      arrestToFirstRosc: 980,
      arrestToEnd: 22 * 60 + 50,
    });

    const res = await pharmacist.agent.get(`/api/codes/${id}/record`).expect(200);
    const { record, digest, signatures, status } = res.body;
    expect(status).toBe('draft');
    expect(signatures).toEqual([]);
    expect(record).toMatchObject({ format: 'steadyhand-record/1', facility: 'Harbourview General Hospital', attachments: [] });
    expect(record.code).toMatchObject({ id, location: '4 West Medical, bed 12', status: 'ended', outcome: 'transferred', team: [], debriefNotes: null });
    expect(record.entries).toHaveLength(9);
    const cursors = record.entries.map((e: StoredEntry) => e.cursor);
    expect(cursors).toEqual([...cursors].sort((a, b) => a - b));
    expect(record.entries[0]).toHaveProperty('recordedAt');
    expect(digest).toBe(createHash('sha256').update(canonicalize(record)!, 'utf8').digest('hex'));
  });

  it('completes the review details and audits old and new values; the outcome change amends the end entry', async () => {
    const id = await demoCode();
    const res = await recorder.agent
      .patch(`/api/codes/${id}/review`)
      .set('x-csrf-token', recorder.csrf)
      .send({ team: [{ name: 'Dr Kofi Asante', role: 'Team leader' }, { name: 'Maren Holt, RN', role: 'Recorder' }], debriefNotes: 'Charge during compressions next time.', outcome: 'sustained-rosc' })
      .expect(200);
    expect(res.body.code).toMatchObject({ team: [{ name: 'Dr Kofi Asante', role: 'Team leader' }, { name: 'Maren Holt, RN', role: 'Recorder' }], debriefNotes: 'Charge during compressions next time.', outcome: 'sustained-rosc' });
    const row = app.database.sqlite.prepare("SELECT detail FROM audit_events WHERE code_id = ? AND action = 'code.review-changed'").get(id) as { detail: string };
    expect(JSON.parse(row.detail)).toMatchObject({ debriefNotes: { from: null, to: 'Charge during compressions next time.' }, outcome: { from: 'transferred', to: 'sustained-rosc' } });
    const log = await recorder.agent.get(`/api/codes/${id}`).expect(200);
    expect(log.body.entries.at(-1)).toMatchObject({ kind: 'amend', changes: { outcome: 'sustained-rosc' }, reason: 'Outcome confirmed at review' });
    await recorder.agent.patch(`/api/codes/${id}/review`).set('x-csrf-token', recorder.csrf).send({ team: [{ name: '', role: 'x' }] }).expect(400);
    await pharmacist.agent.patch(`/api/codes/${id}/review`).set('x-csrf-token', pharmacist.csrf).send({ debriefNotes: 'no' }).expect(403);
  });

  it('keeps the registry details with the record: signed as completed, later changes as addenda, closed by the quality sign-off', async () => {
    const id = await demoCode();
    const patch = (who: SignedInAgent, body: object) => who.agent.patch(`/api/codes/${id}/review`).set('x-csrf-token', who.csrf).send(body);
    const first = await patch(recorder, { utstein: { witnessed: 'yes', witnessedBy: 'staff', monitored: 'no', teamArrivedAt: '2026-03-04T08:43:00+01:00' } }).expect(200);
    expect(first.body.code.utstein).toEqual({ witnessed: 'yes', witnessedBy: 'staff', monitored: 'no', teamArrivedAt: '2026-03-04T08:43:00+01:00' });
    // Each bad detail is a 400 naming the field; nothing is stored.
    expect((await patch(recorder, { utstein: { witnessed: 'maybe' } }).expect(400)).body.message).toMatch(/utstein\.witnessed/);
    expect((await patch(recorder, { utstein: { witnessed: 'no' } }).expect(400)).body.message).toMatch(/utstein\.witnessedBy: is entered only for a witnessed arrest/);
    expect((await patch(recorder, { utstein: { deathPronouncedAt: clock('07:40:00') } }).expect(400)).body.message).toMatch(/utstein\.deathPronouncedAt: must be after the arrest/);
    // A reviewer completes the registry details only.
    expect((await patch(reviewer, { debriefNotes: 'from the committee' }).expect(403)).body.message).toMatch(/registry details \(utstein\)/);
    await patch(reviewer, { utstein: { monitored: 'unknown' } }).expect(200);
    await patch(pharmacist, { utstein: { monitored: 'yes' } }).expect(403);

    await sign(recorder, id, 'recorded-by').expect(201);
    await patch(recorder, { debriefNotes: 'too late' }).expect(409);
    const later = await patch(reviewer, { utstein: { monitored: 'yes', monitoring: ['ecg'] } }).expect(200);
    expect(later.body.utstein).toMatchObject({ witnessed: 'yes', monitored: 'yes', monitoring: ['ecg'] });
    await sign(leader, id, 'reviewed-confirmed').expect(201);
    await patch(leader, { utstein: { cause: 'hypoxia' } }).expect(200);

    const view = (await recorder.agent.get(`/api/codes/${id}/record`).expect(200)).body;
    // The signed details stay as signed; each later change is an addendum with its old and new value.
    expect(view.record.code.utstein).toMatchObject({ monitored: 'unknown' });
    expect(view.record.detailAddenda.map((a: { changes: object; userName: string }) => [a.userName, a.changes])).toEqual([
      ['Test rev.one', { monitored: { from: 'unknown', to: 'yes' }, monitoring: { from: null, to: ['ecg'] } }],
      ['Dr Kofi Asante', { cause: { from: null, to: 'hypoxia' } }],
    ]);
    expect(view.signatures.map((x: { valid: boolean }) => x.valid)).toEqual([true, true]);
    expect(view.integrity).toEqual({ valid: true, problems: [] });
    expect(view.digest).toBe(createHash('sha256').update(canonicalize(view.record)!, 'utf8').digest('hex'));
    const audit = app.database.sqlite.prepare("SELECT detail FROM audit_events WHERE code_id = ? AND action = 'code.review-changed' ORDER BY id").all(id) as { detail: string }[];
    expect(audit.map((r) => JSON.parse(r.detail))).toEqual([
      { utstein: { witnessed: { from: null, to: 'yes' }, witnessedBy: { from: null, to: 'staff' }, monitored: { from: null, to: 'no' }, teamArrivedAt: { from: null, to: '2026-03-04T08:43:00+01:00' } } },
      { utstein: { monitored: { from: 'no', to: 'unknown' } } },
      { utstein: { monitored: { from: 'unknown', to: 'yes' }, monitoring: { from: null, to: ['ecg'] } }, addendum: true },
      { utstein: { cause: { from: null, to: 'hypoxia' } }, addendum: true },
    ]);
    const printed = pdfText(await pdf(recorder, id)).replace(/\s+/g, ' ');
    expect(printed).toContain('Registry details');
    expect(printed).toContain('Witnessed Yes');
    expect(printed).toContain('Team arrived 4 March 2026, 07:43:00');
    expect(printed).toContain('Monitored: Yes (was: Unknown). Test rev.one');

    // The quality review's sign-off closes them, for everyone.
    await reviewer.agent.post(`/api/quality/codes/${id}/review/sign`).set('x-csrf-token', reviewer.csrf).send({ password: TEST_PASSWORD }).expect(200);
    expect((await patch(reviewer, { utstein: { ecpr: 'no' } }).expect(409)).body.message).toMatch(/quality review of this code was signed off/);
    await patch(recorder, { utstein: { ecpr: 'no' } }).expect(409);
    expect((await recorder.agent.get(`/api/codes/${id}/record`).expect(200)).body.qualityReviewedAt).not.toBeNull();
  });

  it('refuses a signature with a wrong password, and stores none', async () => {
    const id = await demoCode();
    // 403, not 401: a mistyped password must not look like an ended session to the page.
    const res = await sign(recorder, id, 'recorded-by', 'not the password').expect(403);
    expect(res.body).toMatchObject({ error: 'password', message: 'The password does not match. Nothing was signed.' });
    const record = await recorder.agent.get(`/api/codes/${id}/record`).expect(200);
    expect(record.body.signatures).toEqual([]);
    expect(record.body.status).toBe('draft');
    expect(app.database.sqlite.prepare('SELECT count(*) FROM signatures WHERE code_id = ?').pluck().get(id)).toBe(0);
    const failed = app.database.sqlite.prepare("SELECT count(*) FROM audit_events WHERE code_id = ? AND action = 'record.sign-failed'").pluck().get(id);
    expect(failed).toBe(1);
  });

  it('lets each role sign only with its own meaning, once, and only after the code ended', async () => {
    const running = await post(recorder, '/api/codes', { category: 'adult' }).expect(201);
    await sign(recorder, running.body.code.id, 'recorded-by').expect(409);

    const id = await demoCode();
    await sign(leader, id, 'recorded-by').expect(403);
    await sign(recorder, id, 'reviewed-confirmed').expect(403);
    await sign(pharmacist, id, 'recorded-by').expect(403);
    const first = await sign(recorder, id, 'recorded-by').expect(201);
    expect(first.body).toMatchObject({ status: 'partly-signed', signature: { printedName: 'Maren Holt, RN', meaning: 'recorded-by', meaningText: 'Recorded by', valid: true } });
    await sign(otherRecorder, id, 'recorded-by').expect(409);
    const second = await sign(leader, id, 'reviewed-confirmed').expect(201);
    expect(second.body.status).toBe('signed');

    const record = await pharmacist.agent.get(`/api/codes/${id}/record`).expect(200);
    expect(record.body.status).toBe('signed');
    expect(record.body.signatures).toEqual([
      expect.objectContaining({ printedName: 'Maren Holt, RN', meaningText: 'Recorded by', valid: true }),
      expect.objectContaining({ printedName: 'Dr Kofi Asante', meaningText: 'Reviewed and confirmed by', valid: true }),
    ]);
    // Names for the review table: whoever wrote an entry or signed.
    const leaderId = record.body.signatures[1].signerId as string;
    expect(record.body.people[leaderId]).toBe('Dr Kofi Asante');
    expect(Object.values(record.body.people)).toContain('Maren Holt, RN');

    // The list of records: this one signed, the running code absent (only ended codes have a record to sign).
    const list = await pharmacist.agent.get('/api/records').expect(200);
    const listed = (list.body.records as { code: { id: string }; status: string; signatures: { meaning: string }[] }[]).find((r) => r.code.id === id);
    expect(listed).toMatchObject({ status: 'signed', signatures: [{ meaning: 'recorded-by' }, { meaning: 'reviewed-confirmed' }] });
    expect((list.body.records as { code: { id: string } }[]).some((r) => r.code.id === running.body.code.id)).toBe(false);
    const actions = app.database.sqlite.prepare("SELECT count(*) FROM audit_events WHERE code_id = ? AND action = 'record.signed'").pluck().get(id);
    expect(actions).toBe(2);

    // Pharmacy and reviewers are told, with a link to the review page (the mail log keeps every message).
    let mail: { subject: string } | undefined;
    for (let i = 0; i < 50 && !mail; i++) {
      mail = app.database.sqlite.prepare('SELECT subject FROM mail_log WHERE code_id = ?').get(id) as { subject: string } | undefined;
      if (!mail) await new Promise((r) => setTimeout(r, 100));
    }
    expect(mail?.subject).toMatch(/signed/i);
  });

  it('takes only addenda after the first signature, over REST and the live socket, and marks them', async () => {
    const unsigned = await demoCode();
    await post(recorder, `/api/codes/${unsigned}/addenda`, makeEntry({ kind: 'note', text: 'too early' })).expect(409);

    const id = await demoCode();
    await sign(recorder, id, 'recorded-by').expect(201);

    const plain = await post(recorder, `/api/codes/${id}/entries`, makeEntry({ kind: 'note', text: 'late plain entry' })).expect(409);
    expect(plain.body.message).toBe('This record is signed: add an addendum');
    await recorder.agent.patch(`/api/codes/${id}`).set('x-csrf-token', recorder.csrf).send({ location: 'Elsewhere' }).expect(409);
    await recorder.agent.patch(`/api/codes/${id}/review`).set('x-csrf-token', recorder.csrf).send({ debriefNotes: 'late' }).expect(409);

    const socket: LiveClient = connectLive(app.baseUrl, { cookie: cookieHeader(recorder, app.baseUrl), origin: app.baseUrl });
    try {
      await connected(socket);
      const ack = await socket.emitWithAck('entry:add', { codeId: id, entry: makeEntry({ kind: 'note', text: 'socket plain entry' }) });
      expect(ack).toMatchObject({ ok: false, status: 409, error: 'This record is signed: add an addendum' });
    } finally {
      socket.disconnect();
    }

    const shockId = (await recorder.agent.get(`/api/codes/${id}`).expect(200)).body.entries.find((e: StoredEntry) => e.kind === 'shock').id as string;
    const note = await post(leader, `/api/codes/${id}/addenda`, makeEntry({ kind: 'note', text: 'Family informed at 08:20.' })).expect(201);
    expect(note.body.entry).toMatchObject({ kind: 'note', addendum: true });
    const amend = await post(recorder, `/api/codes/${id}/addenda`, makeEntry({ kind: 'amend', target: shockId, changes: { joules: 150 }, reason: 'Defibrillator strip shows 150 J' })).expect(201);
    expect(amend.body.entry.addendum).toBe(true);
    const audit = app.database.sqlite.prepare("SELECT detail, username FROM audit_events WHERE code_id = ? AND action = 'entry.amended'").get(id) as { detail: string; username: string };
    expect(audit.username).toBe('maren.holt');
    expect(JSON.parse(audit.detail)).toMatchObject({ addendum: true, old: { joules: 200 }, new: { joules: 150 }, reason: 'Defibrillator strip shows 150 J' });

    const log = await recorder.agent.get(`/api/codes/${id}`).expect(200);
    expect(log.body.entries.filter((e: StoredEntry) => e.addendum).map((e: StoredEntry) => e.kind)).toEqual(['note', 'amend']);
    expect(log.body.entries.some((e: StoredEntry) => e.kind === 'note' && 'text' in e && e.text.includes('plain'))).toBe(false);

    // The signature still covers the record as it was signed; the addenda came after.
    const record = await recorder.agent.get(`/api/codes/${id}/record`).expect(200);
    expect(record.body.signatures[0].valid).toBe(true);
    const text = pdfText(await pdf(recorder, id));
    expect(text).toContain('ADDENDUM');
    expect(text).toMatch(/AMENDED \(addendum\)/);
    expect(text).toMatch(/Was: 200 J, unsynchronised. Now: 150 J,/);
  });

  it('prints the record: times, values, page numbers, digest, DRAFT until signed, then the signatures', async () => {
    const id = await demoCode();
    const draftBytes = await pdf(pharmacist, id);
    const { digest } = (await pharmacist.agent.get(`/api/codes/${id}/record`).expect(200)).body as { digest: string };
    const draft = pdfText(draftBytes);
    for (const expected of ['Harbourview General Hospital', '4 West Medical, bed 12', 'Unknown patient', 'Adult, weight not recorded', '07:42:10', '07:42:25', '07:43:40', '07:47:55', '07:58:30', '08:05:00', '200 J', 'Epinephrine 1 mg', 'VF, no pulse', 'Page 1 of', digest, 'DRAFT']) {
      expect(draft, expected).toContain(expected);
    }
    expect(draft).toContain('Recorded by: not yet signed');
    expect(draft).toMatch(/Compression fraction\s+\d+%/);
    // Every page carries the footer and the draft mark.
    const pages = Number(/Page 1 of (\d+)/.exec(draft)![1]);
    expect(draft.split(digest).length - 1).toBeGreaterThanOrEqual(pages);
    expect(draft.split('DRAFT — not signed').length - 1).toBeGreaterThanOrEqual(pages);
    // Page 1 carries the picture of the code as vector text and shapes: lanes, axis, marks.
    const first = firstPageText(draftBytes);
    for (const label of ['The code at a glance', 'Compressions', 'Rhythm checks', 'Shocks', 'Drugs', 'Airway, access', 'ETCO2', 'ROSC', 'Arrest', 'End', 'min from arrest', 'VF', '200 J', 'Epinephrine 1 mg']) {
      expect(first, label).toContain(label);
    }
    // Each font embedded once, the picture's labels included (a second copy would be a second subset).
    const fonts = execFileSync('/usr/bin/pdffonts', [path.join(workDir, `record-${pdfCount}.pdf`)], { encoding: 'utf8' }).trim().split('\n').slice(2);
    expect(fonts.map((l) => l.split(/\s+/)[0]?.replace(/^[A-Z]{6}\+/, '')).sort()).toEqual(['AtkinsonHyperlegible-Bold', 'AtkinsonHyperlegible-Regular']);
    // Drawn as vector: no image on page 1.
    expect(execFileSync('/usr/bin/pdfimages', ['-f', '1', '-l', '1', '-list', path.join(workDir, `record-${pdfCount}.pdf`)], { encoding: 'utf8' }).trim().split('\n')).toHaveLength(2);

    await sign(recorder, id, 'recorded-by').expect(201);
    await sign(leader, id, 'reviewed-confirmed').expect(201);
    const signed = pdfText(await pdf(pharmacist, id));
    expect(signed).not.toContain('DRAFT');
    expect(signed).toMatch(/Recorded by: Maren Holt, RN/);
    expect(signed).toMatch(/Reviewed and confirmed by: Dr Kofi Asante/);
    expect(signed).toMatch(/Signed \d{1,2} \w+ 20\d\d, \d\d:\d\d:\d\d UTC, password re-entered at signing/);
    expect(signed).toContain(digest);
  });

  it('verifies a fresh PDF and the digest, and fails after a byte of the record or the file changes', async () => {
    const id = await demoCode();
    await sign(recorder, id, 'recorded-by').expect(201);
    await sign(leader, id, 'reviewed-confirmed').expect(201);
    const bytes = await pdf(recorder, id);
    const { digest } = (await recorder.agent.get(`/api/codes/${id}/record`).expect(200)).body as { digest: string };

    const good = await verifyFile(pharmacist, bytes);
    expect(good.body).toMatchObject({ valid: true, record: { id, location: '4 West Medical, bed 12', status: 'signed' } });
    expect(good.body.record.signatures).toHaveLength(2);
    const byDigest = await post(pharmacist, '/api/records/verify', { digest }).expect(200);
    expect(byDigest.body).toMatchObject({ valid: true, record: { id } });

    // An edited file (one byte of its page content) is not the copy the server issued.
    const edited = Buffer.from(bytes);
    const streamAt = edited.indexOf('stream\n') + 40;
    edited[streamAt] = edited[streamAt]! ^ 0xff;
    const editedResult = await verifyFile(pharmacist, edited);
    expect(editedResult.body.valid).toBe(false);

    // A forged stamp fails the server signature.
    const forged = Buffer.from(bytes.toString('latin1').replace(/sha256:[0-9a-f]{64}/, `sha256:${'a'.repeat(64)}`), 'latin1');
    expect((await verifyFile(pharmacist, forged)).body).toMatchObject({ valid: false, reason: expect.stringMatching(/server signature/) });

    // One byte of the record changed behind the application's back.
    app.database.sqlite.prepare('UPDATE codes SET location = ? WHERE id = ?').run('4 West Medical, bed 13', id);
    const stale = await verifyFile(pharmacist, bytes);
    expect(stale.body.valid).toBe(false);
    expect(stale.body.reason).toMatch(/the record has changed since this copy was made/i);
    // Even with the tampered record's own new digest, the signatures no longer match it.
    const now = (await recorder.agent.get(`/api/codes/${id}/record`).expect(200)).body as { digest: string; signatures: { valid: boolean }[] };
    expect(now.signatures.map((s) => s.valid)).toEqual([false, false]);
    const tampered = await post(pharmacist, '/api/records/verify', { digest: now.digest, recordId: id }).expect(200);
    expect(tampered.body.valid).toBe(false);
    expect(tampered.body.reason).toMatch(/does not verify/);
    await post(pharmacist, '/api/records/verify', { digest: 'xyz' }).expect(400);
  });

  it('fails verification when a signature row is copied to another code', async () => {
    const source = await demoCode();
    await sign(recorder, source, 'recorded-by').expect(201);
    await sign(leader, source, 'reviewed-confirmed').expect(201);
    const target = await demoCode();
    app.database.sqlite
      .prepare(
        `INSERT INTO signatures (id, code_id, user_id, printed_name, meaning, signed_at, record_digest, server_signature)
         SELECT id || '-copy', ?, user_id, printed_name, meaning, signed_at, record_digest, server_signature FROM signatures WHERE code_id = ?`,
      )
      .run(target, source);
    const record = await pharmacist.agent.get(`/api/codes/${target}/record`).expect(200);
    expect(record.body.signatures.map((s: { valid: boolean }) => s.valid)).toEqual([false, false]);
    const result = await verifyFile(pharmacist, await pdf(pharmacist, target));
    expect(result.body.valid).toBe(false);
    expect(result.body.reason).toMatch(/does not verify/);
    // The original keeps verifying.
    expect((await verifyFile(pharmacist, await pdf(pharmacist, source))).body.valid).toBe(true);
  });

  it('keeps the private key in the data folder with mode 600 and serves the public key', async () => {
    const res = await pharmacist.agent.get('/api/records/public-key').expect(200);
    expect(res.text).toMatch(/^-----BEGIN PUBLIC KEY-----/);
    const file = path.join(app.config.dataDir, 'keys', RECORD_KEY_FILE);
    expect(statSync(file).mode & 0o777).toBe(0o600);
    expect(path.relative(path.resolve(import.meta.dirname, '../../..'), file).startsWith('..')).toBe(true);

    // Anyone with the public key can check the stamp in a PDF without the server.
    const id = await demoCode();
    const bytes = await pdf(recorder, id);
    const m = /steadyhand-record:(\S+) sha256:([0-9a-f]{64}) sig:([A-Za-z0-9_-]+) at:(\S+Z)/.exec(bytes.toString('latin1'))!;
    const payload = canonicalize({ recordId: m[1], digest: m[2], generatedAt: m[4] })!;
    expect(verify(null, Buffer.from(payload), createPublicKey(res.text), Buffer.from(m[3]!, 'base64url'))).toBe(true);
  });
});
