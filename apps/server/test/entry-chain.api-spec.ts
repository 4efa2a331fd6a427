import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { NewEntry, RecordView, StoredEntry } from '@steadyhand/shared';
import canonicalize from 'canonicalize';
import type Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { SEAL_KEY_FILE } from '../src/codes/record-seal.js';
import { makeEntry } from './support/entries.js';
import { connected, connectLive, cookieHeader } from './support/live-client.js';
import { addUser, signIn, startTestApp, tempDataDir, type SignedInAgent, type TestApp } from './support/test-app.js';

const ZEROS = '0'.repeat(64);

interface LinkRow {
  entry_id: string;
  code_id: string;
  position: number;
  prev_hash: string;
  hash: string;
}

const linksOf = (sqlite: Database.Database, codeId: string) =>
  sqlite.prepare('SELECT * FROM entry_links WHERE code_id = ? ORDER BY position').all(codeId) as LinkRow[];

/** The chain as it must be, computed here from the record's entries: SHA-256(prev + "\n" + RFC 8785 text). */
function expectedLinks(codeId: string, entries: StoredEntry[]): LinkRow[] {
  let prev = ZEROS;
  return entries.map((e, i) => {
    const hash = createHash('sha256').update(`${prev}\n${canonicalize(e)!}`, 'utf8').digest('hex');
    const row = { entry_id: e.id, code_id: codeId, position: i + 1, prev_hash: prev, hash };
    prev = hash;
    return row;
  });
}

/** Runs `work` with a trigger dropped, then puts the trigger back exactly as the migration made it. */
function withoutTrigger(sqlite: Database.Database, name: string, work: () => void): void {
  const sql = sqlite.prepare("SELECT sql FROM sqlite_master WHERE type = 'trigger' AND name = ?").pluck().get(name) as string | undefined;
  if (!sql) throw new Error(`no trigger ${name}`);
  sqlite.exec(`DROP TRIGGER ${name}`);
  try {
    work();
  } finally {
    sqlite.exec(sql);
  }
}

type Fields = NewEntry extends infer T ? (T extends unknown ? Omit<T, 'id' | 'at'> : never) : never;
const taps: Fields[] = [
  { kind: 'cpr', action: 'start', deviceId: 'tablet-4w', seq: 1 },
  { kind: 'rhythm', rhythm: 'vf', pulse: false, deviceId: 'tablet-4w', seq: 2 },
  { kind: 'shock', joules: 200, synchronized: false, deviceId: 'tablet-4w', seq: 3 },
  { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv', deviceId: 'tablet-4w', seq: 4 },
  { kind: 'note', text: 'Wife informed — ünïcode kept as written', deviceId: 'tablet-4w', seq: 5 },
];

const pdfDir = mkdtempSync(path.join(tmpdir(), 'steadyhand-chain-pdf-'));
let pdfCount = 0;
function pdfText(bytes: Buffer): string {
  const file = path.join(pdfDir, `record-${++pdfCount}.pdf`);
  writeFileSync(file, bytes);
  return execFileSync('/usr/bin/pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
}

type ParseFn = Extract<Parameters<ReturnType<SignedInAgent['agent']['get']>['parse']>[0], (res: never, cb: never) => void>;
const binary: ParseFn = (res, done) => {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
};

const post = (who: SignedInAgent, url: string, body: object) => who.agent.post(url).set('x-csrf-token', who.csrf).send(body);

async function startCode(who: SignedInAgent, entries: Fields[] = taps): Promise<string> {
  const res = await post(who, '/api/codes', { category: 'adult', location: 'Chain ward, bed 1' }).expect(201);
  const id = (res.body as { code: { id: string } }).code.id;
  for (const fields of entries) await post(who, `/api/codes/${id}/entries`, makeEntry(fields)).expect(201);
  return id;
}

const recordOf = async (who: SignedInAgent, id: string) => (await who.agent.get(`/api/codes/${id}/record`).expect(200)).body as RecordView;

describe('the entry chain', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let leader: SignedInAgent;

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'chain.recorder', ['recorder']);
    await addUser(app, 'chain.leader', ['leader']);
    recorder = await signIn(app, 'chain.recorder');
    leader = await signIn(app, 'chain.leader');
  }, 90_000);
  afterAll(() => app.close());

  it('links every entry, from REST and the live socket, in cursor order with hashes anyone can recompute', async () => {
    const id = await startCode(recorder);
    const socket = connectLive(app.baseUrl, { cookie: cookieHeader(recorder, app.baseUrl), origin: app.baseUrl });
    try {
      await connected(socket);
      expect(await socket.emitWithAck('code:join', { codeId: id })).toMatchObject({ ok: true });
      const ack = await socket.emitWithAck('entry:add', { codeId: id, entry: makeEntry({ kind: 'rosc', deviceId: 'tablet-4w', seq: 6 }) });
      expect(ack).toMatchObject({ ok: true, duplicate: false });
    } finally {
      socket.disconnect();
    }
    // Leader entries chain on the same code.
    await post(leader, `/api/codes/${id}/entries`, makeEntry({ kind: 'note', text: 'Leader here' })).expect(201);

    const view = await recordOf(leader, id);
    expect(view.record.entries).toHaveLength(7);
    const links = linksOf(app.database.sqlite, id);
    expect(links).toEqual(expectedLinks(id, view.record.entries));
    expect(links.map((l) => l.position)).toEqual([1, 2, 3, 4, 5, 6, 7]);
    expect(view.chain).toEqual({ valid: true, length: 7, head: links[6]!.hash });
  });

  it('adds no link for a resent entry, and the links refuse UPDATE and DELETE', async () => {
    const id = await startCode(recorder, taps.slice(0, 2));
    const entry = makeEntry({ kind: 'note', text: 'sent twice' });
    await post(recorder, `/api/codes/${id}/entries`, entry).expect(201);
    await post(recorder, `/api/codes/${id}/entries`, entry).expect(200);
    const { sqlite } = app.database;
    expect(linksOf(sqlite, id)).toHaveLength(3);
    expect((await recordOf(recorder, id)).chain).toMatchObject({ valid: true, length: 3 });

    expect(() => sqlite.prepare("UPDATE entry_links SET hash = 'x' WHERE code_id = ?").run(id)).toThrow(/append-only/);
    expect(() => sqlite.prepare('DELETE FROM entry_links WHERE code_id = ?').run(id)).toThrow(/append-only/);
    // The unique (code, position) pair: a second link at a taken position cannot be added.
    const [first] = linksOf(sqlite, id);
    expect(() =>
      sqlite.prepare('INSERT INTO entry_links (entry_id, code_id, position, prev_hash, hash) VALUES (?, ?, 1, ?, ?)').run(first!.entry_id, id, ZEROS, ZEROS),
    ).toThrow(/UNIQUE/);
  });

  it('refuses with 400 (stores nothing) an entry whose text cannot be canonicalised', async () => {
    const id = await startCode(recorder, taps.slice(0, 1));
    const entry = makeEntry({ kind: 'note', text: 'half a pair \ud800' });
    await post(recorder, `/api/codes/${id}/entries`, entry).expect(400);
    expect(app.database.sqlite.prepare('SELECT count(*) FROM entries WHERE id = ?').pluck().get(entry.id)).toBe(0);
    expect((await recordOf(recorder, id)).chain).toMatchObject({ valid: true, length: 1 });
  });

  it('reports an entry changed in place: the record view names the position, verification names the chain', async () => {
    const id = await startCode(recorder, [...taps, { kind: 'end', outcome: 'sustained-rosc', deviceId: 'tablet-4w', seq: 6 }]);
    await post(recorder, `/api/codes/${id}/signatures`, { meaning: 'recorded-by', password: 'correct horse battery staple' }).expect(201);
    await post(leader, `/api/codes/${id}/signatures`, { meaning: 'reviewed-confirmed', password: 'correct horse battery staple' }).expect(201);
    const before = await recordOf(recorder, id);
    expect(before.chain).toMatchObject({ valid: true, length: 6 });
    const intact = await post(recorder, '/api/records/verify', { digest: before.digest }).expect(200);
    expect(intact.body).toMatchObject({ valid: true });
    const printed = pdfText((await recorder.agent.get(`/api/codes/${id}/record.pdf`).buffer(true).parse(binary).expect(200)).body as Buffer);
    expect(printed).toContain(`Entry chain: 6 entries, head ${before.chain.head!.slice(0, 16)}…, intact`);

    const shock = before.record.entries[2]!;
    expect(shock.kind).toBe('shock');
    const { sqlite } = app.database;
    withoutTrigger(sqlite, 'entries_refuse_update', () => {
      sqlite.prepare("UPDATE entries SET body = json_set(body, '$.joules', 360) WHERE id = ?").run(shock.id);
    });

    const after = await recordOf(recorder, id);
    expect(after.chain).toMatchObject({
      valid: false,
      length: 6,
      head: before.chain.head,
      brokenAt: { position: 3, entryId: shock.id, reason: expect.stringMatching(/does not match its hash/) as unknown },
    });
    const verified = await post(recorder, '/api/records/verify', { digest: before.digest }).expect(200);
    expect(verified.body.valid).toBe(false);
    expect(verified.body.reason).toMatch(new RegExp(`entry chain is broken at position 3 \\(entry ${shock.id}\\)`));
    const file = (await recorder.agent.get(`/api/codes/${id}/record.pdf`).buffer(true).parse(binary).expect(200)).body as Buffer;
    expect(pdfText(file)).toContain('Entry chain: BROKEN at position 3');
    const byFile = await recorder.agent.post('/api/records/verify').set('x-csrf-token', recorder.csrf).attach('file', file, 'record.pdf').expect(200);
    expect(byFile.body).toMatchObject({ valid: false, reason: expect.stringMatching(/entry chain is broken at position 3/) as unknown });
  });

  it('reports a removed link even though the record, and so its digest, is unchanged', async () => {
    const id = await startCode(recorder);
    const before = await recordOf(recorder, id);
    const { sqlite } = app.database;
    const second = linksOf(sqlite, id)[1]!;
    withoutTrigger(sqlite, 'entry_links_refuse_delete', () => {
      sqlite.prepare('DELETE FROM entry_links WHERE entry_id = ?').run(second.entry_id);
    });
    const after = await recordOf(recorder, id);
    expect(after.digest).toBe(before.digest);
    expect(after.chain).toMatchObject({ valid: false, length: 4, brokenAt: { position: 2, entryId: second.entry_id, reason: 'the link positions skip from 1 to 3' } });
    const verified = await post(recorder, '/api/records/verify', { digest: before.digest, recordId: id }).expect(200);
    expect(verified.body).toMatchObject({ valid: false, reason: expect.stringMatching(/entry chain is broken at position 2/) as unknown });
  });
});

describe('linking entries stored before the chain existed', () => {
  it('adds the missing links on the first start with seals, per code in cursor order, continuing from the last link kept', async () => {
    const dataDir = tempDataDir();
    let app = await startTestApp({ dataDir });
    let codeA: string;
    let codeB: string;
    try {
      await addUser(app, 'old.recorder', ['recorder']);
      const recorder = await signIn(app, 'old.recorder');
      codeA = await startCode(recorder);
      codeB = await startCode(recorder);
      // Interleave the two codes' cursors.
      await post(recorder, `/api/codes/${codeA}/entries`, makeEntry({ kind: 'note', text: 'A again' })).expect(201);
      await post(recorder, `/api/codes/${codeB}/entries`, makeEntry({ kind: 'note', text: 'B again' })).expect(201);
      const { sqlite } = app.database;
      // As an older build left it: code A without any link, code B with its first 3 only, no
      // record seals and no seal key (made at the first start of a build with seals).
      withoutTrigger(sqlite, 'entry_links_refuse_delete', () => {
        sqlite.prepare('DELETE FROM entry_links WHERE code_id = ?').run(codeA);
        sqlite.prepare('DELETE FROM entry_links WHERE code_id = ? AND position > 3').run(codeB);
      });
      sqlite.prepare('DELETE FROM record_seals').run();
      rmSync(path.join(dataDir, 'keys', SEAL_KEY_FILE));
      expect(linksOf(sqlite, codeA)).toHaveLength(0);
      expect(linksOf(sqlite, codeB)).toHaveLength(3);
      expect((await recordOf(recorder, codeA)).chain).toMatchObject({ valid: false, length: 0, head: null, brokenAt: { position: 1 } });
    } finally {
      await app.close();
    }

    app = await startTestApp({ dataDir });
    try {
      await addUser(app, 'new.reader', ['leader']);
      const reader = await signIn(app, 'new.reader');
      const { sqlite } = app.database;
      for (const id of [codeA, codeB]) {
        const view = await recordOf(reader, id);
        expect(view.record.entries).toHaveLength(6);
        expect(linksOf(sqlite, id)).toEqual(expectedLinks(id, view.record.entries));
        expect(view.chain).toMatchObject({ valid: true, length: 6 });
        expect(view.integrity).toEqual({ valid: true, problems: [] });
      }
      // New taps chain after the backfilled links.
      await post(reader, `/api/codes/${codeA}/entries`, makeEntry({ kind: 'note', text: 'after the restart' })).expect(201);
      const view = await recordOf(reader, codeA);
      expect(linksOf(sqlite, codeA)).toEqual(expectedLinks(codeA, view.record.entries));
      expect(view.chain).toMatchObject({ valid: true, length: 7 });
    } finally {
      await app.close();
    }
  });
});

describe('a chain linked before is never linked again', () => {
  it('leaves links removed outside the application missing after a restart, and the record says so', async () => {
    const dataDir = tempDataDir();
    let app = await startTestApp({ dataDir });
    let id: string;
    try {
      await addUser(app, 'relink.recorder', ['recorder']);
      const recorder = await signIn(app, 'relink.recorder');
      id = await startCode(recorder);
      const { sqlite } = app.database;
      // An entry changed, and every link of its code removed, hoping the next start re-links it.
      withoutTrigger(sqlite, 'entries_refuse_update', () => {
        sqlite.prepare("UPDATE entries SET body = json_set(body, '$.joules', 360) WHERE code_id = ? AND kind = 'shock'").run(id);
      });
      withoutTrigger(sqlite, 'entry_links_refuse_delete', () => {
        sqlite.prepare('DELETE FROM entry_links WHERE code_id = ?').run(id);
      });
    } finally {
      await app.close();
    }
    app = await startTestApp({ dataDir });
    try {
      await addUser(app, 'relink.reader', ['leader']);
      const reader = await signIn(app, 'relink.reader');
      expect(linksOf(app.database.sqlite, id)).toHaveLength(0);
      const view = await recordOf(reader, id);
      expect(view.chain).toMatchObject({ valid: false, length: 0, brokenAt: { position: 1, reason: 'this entry has no link' } });
      expect(view.integrity.valid).toBe(false);
      expect(view.integrity.problems.join(' ')).toMatch(/not the one the server sealed: the seal holds 5 entries/);
    } finally {
      await app.close();
    }
  });
});
