import { readdirSync, readFileSync, renameSync, rmSync } from 'node:fs';
import path from 'node:path';
import type { RecordPublicKeys, RecordView } from '@steadyhand/shared';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { RECORD_PUBLIC_KEYS_FILE } from '../src/records/record-keys.js';
import { makeEntry } from './support/entries.js';
import { pdfText, recordPdf } from './support/pdf.js';
import { runBuiltCommand } from './support/server-process.js';
import {
  addUser,
  signIn,
  startTestApp,
  tempDataDir,
  type SignedInAgent,
  type TestApp,
} from './support/test-app.js';

describe('rotating the record signing key', () => {
  const dataDir = tempDataDir();
  let app: TestApp;
  let recorder: SignedInAgent;
  let leader: SignedInAgent;
  let reader: SignedInAgent;

  async function start(): Promise<void> {
    app = await startTestApp({ dataDir });
    recorder = await signIn(app, 'rec.keys');
    leader = await signIn(app, 'lead.keys');
    reader = await signIn(app, 'pharm.keys');
  }

  beforeAll(async () => {
    app = await startTestApp({ dataDir });
    await addUser(app, 'rec.keys', ['recorder']);
    await addUser(app, 'lead.keys', ['leader']);
    await addUser(app, 'pharm.keys', ['pharmacist']);
    await app.close();
    await start();
  }, 60_000);
  afterAll(() => app.close());

  const post = (who: SignedInAgent, url: string, body: object) =>
    who.agent.post(url).set('x-csrf-token', who.csrf).send(body);

  /** An ended code with both signatures. */
  async function signedRecord(): Promise<string> {
    const id = (
      (
        await post(recorder, '/api/codes', {
          category: 'adult',
          location: '4 West Medical, bed 3',
        }).expect(201)
      ).body as { code: { id: string } }
    ).code.id;
    await post(
      recorder,
      `/api/codes/${id}/entries`,
      makeEntry({ kind: 'cpr', action: 'start' }),
    ).expect(201);
    await post(
      recorder,
      `/api/codes/${id}/entries`,
      makeEntry({ kind: 'end', outcome: 'died' }),
    ).expect(201);
    await post(recorder, `/api/codes/${id}/signatures`, {
      meaning: 'recorded-by',
      password: 'correct horse battery staple',
    }).expect(201);
    await post(leader, `/api/codes/${id}/signatures`, {
      meaning: 'reviewed-confirmed',
      password: 'correct horse battery staple',
    }).expect(201);
    return id;
  }

  const view = async (id: string) =>
    (await reader.agent.get(`/api/codes/${id}/record`).expect(200)).body as RecordView;
  const keys = async () =>
    ((await reader.agent.get('/api/records/public-keys').expect(200)).body as RecordPublicKeys)
      .keys;
  const verifyFile = async (bytes: Buffer) =>
    (
      await reader.agent
        .post('/api/records/verify')
        .set('x-csrf-token', reader.csrf)
        .attach('file', bytes, 'record.pdf')
        .expect(200)
    ).body as { valid: boolean; reason: string };

  it('signs, rotates with the built command while the server is stopped, signs again: every record and printed copy verifies, and the list shows both keys with their periods', async () => {
    const first = await signedRecord();
    const firstCopy = await recordPdf(reader, first);
    const [firstKey, ...none] = await keys();
    expect(none).toEqual([]);
    expect(firstKey).toMatchObject({
      algorithm: 'Ed25519',
      current: true,
      validUntil: null,
      keyId: expect.stringMatching(/^[0-9a-f]{16}$/),
    });
    expect((await view(first)).signatures.map((s) => s.keyId)).toEqual([
      firstKey!.keyId,
      firstKey!.keyId,
    ]);
    expect(pdfText(firstCopy).replace(/\s+/g, ' ')).toContain(
      `stamped with server key ${firstKey!.keyId}`,
    );

    // While the server runs, the command refuses and changes nothing.
    const listBefore = readFileSync(path.join(dataDir, 'keys', RECORD_PUBLIC_KEYS_FILE), 'utf8');
    const refused = await runBuiltCommand('keys-rotate.js', [], dataDir);
    expect(refused.code).toBe(1);
    expect(refused.stderr).toMatch(
      /open in another process.*Stop the server first.*Nothing was changed/,
    );
    expect(readFileSync(path.join(dataDir, 'keys', RECORD_PUBLIC_KEYS_FILE), 'utf8')).toBe(
      listBefore,
    );

    await app.close();
    // As an installation from before key ids: the first record's signatures name no key, and only the private key file exists.
    const db = new Database(path.join(dataDir, 'steadyhand.db'));
    db.exec('DROP TRIGGER signatures_refuse_update');
    db.prepare('UPDATE signatures SET key_id = NULL WHERE code_id = ?').run(first);
    db.exec(
      "CREATE TRIGGER signatures_refuse_update BEFORE UPDATE ON signatures BEGIN SELECT RAISE(ABORT, 'signatures are append-only'); END",
    );
    db.close();
    rmSync(path.join(dataDir, 'keys', RECORD_PUBLIC_KEYS_FILE));

    const rotated = await runBuiltCommand('keys-rotate.js', [], dataDir);
    expect(rotated.code, rotated.stderr).toBe(0);
    expect(rotated.stdout).toContain(
      `Retired key ${firstKey!.keyId} (signed from installation to `,
    );
    const newKeyId = /New key ([0-9a-f]{16}) signs from/.exec(rotated.stdout)?.[1];
    expect(newKeyId).toBeDefined();

    await start();
    const second = await signedRecord();

    const listed = await keys();
    expect(listed.map((k) => [k.keyId, k.current])).toEqual([
      [firstKey!.keyId, false],
      [newKeyId, true],
    ]);
    expect(listed[0]).toMatchObject({
      publicKeyPem: firstKey!.publicKeyPem,
      validFrom: null,
      validUntil: expect.stringMatching(/Z$/),
    });
    expect(listed[1]!.validFrom).toBe(listed[0]!.validUntil);
    expect(listed[1]!.validUntil).toBeNull();
    expect((await reader.agent.get('/api/records/public-key').expect(200)).text).toBe(
      listed[1]!.publicKeyPem,
    );

    // Both records: every signature verifies with the key that made it (none named: the first key).
    const [before, after] = [await view(first), await view(second)];
    expect(before.integrity).toEqual({ valid: true, problems: [] });
    expect(after.integrity).toEqual({ valid: true, problems: [] });
    expect(before.signatures.map((s) => [s.valid, s.keyId])).toEqual([
      [true, firstKey!.keyId],
      [true, firstKey!.keyId],
    ]);
    expect(after.signatures.map((s) => [s.valid, s.keyId])).toEqual([
      [true, newKeyId],
      [true, newKeyId],
    ]);
    for (const s of before.signatures)
      expect(Date.parse(s.signedAt)).toBeLessThanOrEqual(Date.parse(listed[0]!.validUntil!));
    for (const s of after.signatures)
      expect(Date.parse(s.signedAt)).toBeGreaterThanOrEqual(Date.parse(listed[1]!.validFrom!));
    const keyIds = app.database.sqlite
      .prepare('SELECT code_id AS codeId, key_id AS keyId FROM signatures ORDER BY signed_at')
      .all();
    expect(keyIds).toEqual([
      { codeId: first, keyId: null },
      { codeId: first, keyId: null },
      { codeId: second, keyId: newKeyId },
      { codeId: second, keyId: newKeyId },
    ]);

    // Printed copies: the one stamped by the retired key, and fresh ones stamped by the new key.
    expect(await verifyFile(firstCopy)).toMatchObject({ valid: true });
    const [firstAgain, secondCopy] = [
      await recordPdf(reader, first),
      await recordPdf(reader, second),
    ];
    expect(await verifyFile(firstAgain)).toMatchObject({ valid: true });
    expect(await verifyFile(secondCopy)).toMatchObject({ valid: true });
    const oldText = pdfText(firstAgain).replace(/\s+/g, ' ');
    const newText = pdfText(secondCopy).replace(/\s+/g, ' ');
    expect(oldText).toContain(
      `Server key ${firstKey!.keyId}. Server check of this signature: verified`,
    );
    expect(oldText).toContain(`stamped with server key ${newKeyId}`);
    expect(newText).toContain(`Server key ${newKeyId}. Server check of this signature: verified`);
    expect(newText).not.toContain(firstKey!.keyId);

    const audit = app.database.sqlite
      .prepare("SELECT username, detail FROM audit_events WHERE action = 'record-key.rotated'")
      .all() as { username: string; detail: string }[];
    expect(audit).toHaveLength(1);
    expect(audit[0]!.username).toBe('command-line');
    expect(JSON.parse(audit[0]!.detail)).toMatchObject({
      retiredKeyId: firstKey!.keyId,
      keyId: newKeyId,
    });

    // A server started on this database without its keys (a rebuilt disk) refuses, rather than make new ones.
    await app.close();
    renameSync(path.join(dataDir, 'keys'), path.join(dataDir, 'keys-elsewhere'));
    await expect(startTestApp({ dataDir })).rejects.toThrow(
      /holds signed records, but .* has no record signing key/,
    );
    // Nothing was made but the session secret the configuration reads first.
    expect(readdirSync(path.join(dataDir, 'keys'))).toEqual(['session-secret']);
    rmSync(path.join(dataDir, 'keys'), { recursive: true });
    renameSync(path.join(dataDir, 'keys-elsewhere'), path.join(dataDir, 'keys'));
    await start();
    expect((await view(second)).integrity.valid).toBe(true);
  }, 120_000);
});
