import { createHash, createPrivateKey, createPublicKey, generateKeyPairSync } from 'node:crypto';
import {
  existsSync,
  mkdirSync,
  mkdtempSync,
  readFileSync,
  renameSync,
  rmSync,
  statSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { formatPdfStamp, readPdfStamp } from './record-canonical.js';
import {
  keyFor,
  loadRecordKeyRing,
  RECORD_KEY_FILE,
  RECORD_PUBLIC_KEYS_FILE,
  RecordKeyError,
  rotateRecordKey,
  signText,
  verifyText,
  withinPeriod,
} from './record-keys.js';

const dataDir = () => mkdtempSync(path.join(tmpdir(), 'steadyhand-keys-'));
const keyFile = (dir: string) => path.join(dir, 'keys', RECORD_KEY_FILE);
const listFile = (dir: string) => path.join(dir, 'keys', RECORD_PUBLIC_KEYS_FILE);
const idOfPem = (pem: string) =>
  createHash('sha256')
    .update(createPublicKey(createPrivateKey(pem)).export({ format: 'der', type: 'spki' }))
    .digest('hex')
    .slice(0, 16);

describe('the record signing keys', () => {
  it('makes a first key with an id anyone can recompute from the public key, private key mode 600', () => {
    const dir = dataDir();
    const ring = loadRecordKeyRing(dir);
    expect(ring.keys).toHaveLength(1);
    expect(ring.current.keyId).toBe(idOfPem(readFileSync(keyFile(dir), 'utf8')));
    expect(ring.current.fingerprint.startsWith(ring.current.keyId)).toBe(true);
    expect(ring.current.validFrom).toMatch(/Z$/);
    expect(ring.current.validUntil).toBeNull();
    expect(statSync(keyFile(dir)).mode & 0o777).toBe(0o600);
    // The list holds public keys only.
    expect(readFileSync(listFile(dir), 'utf8')).not.toContain('PRIVATE KEY');
    expect(loadRecordKeyRing(dir).current.keyId).toBe(ring.current.keyId);

    // A rotation before any key existed makes the first key, and retires nothing that never signed.
    const fresh = dataDir();
    const made = rotateRecordKey(fresh);
    expect(made.retired).toBeNull();
    expect(loadRecordKeyRing(fresh).keys.map((k) => k.keyId)).toEqual([made.current.keyId]);
  });

  it('takes the key of an installation from before key ids as the first key, since installation, for signatures without an id', () => {
    const dir = dataDir();
    mkdirSync(path.join(dir, 'keys'));
    const pem = generateKeyPairSync('ed25519')
      .privateKey.export({ format: 'pem', type: 'pkcs8' })
      .toString();
    writeFileSync(keyFile(dir), pem, { mode: 0o600 });
    const ring = loadRecordKeyRing(dir);
    expect(ring.keys.map((k) => [k.keyId, k.validFrom, k.validUntil])).toEqual([
      [idOfPem(pem), null, null],
    ]);
    expect(keyFor(ring, null)?.keyId).toBe(idOfPem(pem));
  });

  it('rotates: the old public key stays with its period, its signatures still verify, the new key signs from the same instant', () => {
    const dir = dataDir();
    const before = loadRecordKeyRing(dir);
    const oldSignature = signText(before.current.privateKey, 'signed before the rotation');
    const notBefore = new Date(Date.now() + 60_000).toISOString();
    const result = rotateRecordKey(dir, { notBefore });
    // A clock that stepped back does not end the old key before the last thing it signed.
    expect(result.retired).toMatchObject({ keyId: before.current.keyId, validUntil: notBefore });
    expect(result.current.validFrom).toBe(notBefore);
    expect(result.retiredPrivateKeyFound).toBe(true);

    const after = loadRecordKeyRing(dir);
    expect(after.keys.map((k) => k.keyId)).toEqual([before.current.keyId, result.current.keyId]);
    expect(after.current.keyId).toBe(idOfPem(readFileSync(keyFile(dir), 'utf8')));
    const old = keyFor(after, before.current.keyId)!;
    expect(verifyText(old.publicKey, 'signed before the rotation', oldSignature)).toBe(true);
    expect(verifyText(after.current.publicKey, 'signed before the rotation', oldSignature)).toBe(
      false,
    );
    // Without an id: the first key. An id nobody holds: none.
    expect(keyFor(after, null)?.keyId).toBe(before.current.keyId);
    expect(keyFor(after, '0123456789abcdef')).toBeUndefined();
    // Periods, both ends included.
    expect(withinPeriod(old, before.current.validFrom!)).toBe(true);
    expect(withinPeriod(old, notBefore)).toBe(true);
    expect(withinPeriod(old, new Date(Date.parse(notBefore) + 1).toISOString())).toBe(false);
    expect(withinPeriod(after.current, new Date(Date.parse(notBefore) - 1).toISOString())).toBe(
      false,
    );

    rotateRecordKey(dir);
    expect(loadRecordKeyRing(dir).keys).toHaveLength(3);
  });

  it('finishes a rotation cut short after the list named the new key, and drops one cut short before', () => {
    const dir = dataDir();
    const first = loadRecordKeyRing(dir).current.keyId;
    const oldPem = readFileSync(keyFile(dir), 'utf8');
    const { current } = rotateRecordKey(dir);
    // As if the process died between writing the list and renaming the new private key.
    renameSync(keyFile(dir), `${keyFile(dir)}.new`);
    writeFileSync(keyFile(dir), oldPem, { mode: 0o600 });
    expect(loadRecordKeyRing(dir).current.keyId).toBe(current.keyId);
    expect(existsSync(`${keyFile(dir)}.new`)).toBe(false);

    // As if it died before writing the list: the pending key never signed anything.
    const other = dataDir();
    const kept = loadRecordKeyRing(other).current.keyId;
    writeFileSync(
      `${keyFile(other)}.new`,
      generateKeyPairSync('ed25519').privateKey.export({ format: 'pem', type: 'pkcs8' }),
      { mode: 0o600 },
    );
    expect(loadRecordKeyRing(other).current.keyId).toBe(kept);
    expect(existsSync(`${keyFile(other)}.new`)).toBe(false);
    expect(first).not.toBe(current.keyId);
  });

  it('refuses a missing or foreign private key and a hand-edited list, saying what to do; a rotation recovers from a lost private key', () => {
    const dir = dataDir();
    const first = loadRecordKeyRing(dir).current.keyId;
    rmSync(keyFile(dir));
    expect(() => loadRecordKeyRing(dir)).toThrow(RecordKeyError);
    expect(() => loadRecordKeyRing(dir)).toThrow(/is missing.*pnpm keys:rotate/);
    const rotated = rotateRecordKey(dir);
    expect(rotated).toMatchObject({ retiredPrivateKeyFound: false, retired: { keyId: first } });
    expect(loadRecordKeyRing(dir).current.keyId).toBe(rotated.current.keyId);

    writeFileSync(
      keyFile(dir),
      generateKeyPairSync('ed25519').privateKey.export({ format: 'pem', type: 'pkcs8' }),
    );
    expect(() => loadRecordKeyRing(dir)).toThrow(/which the list does not hold/);
    expect(() => rotateRecordKey(dir)).toThrow(/Not rotated/);

    const edited = dataDir();
    loadRecordKeyRing(edited);
    const list = JSON.parse(readFileSync(listFile(edited), 'utf8')) as {
      keys: { keyId: string }[];
    };
    list.keys[0]!.keyId = '0123456789abcdef';
    writeFileSync(listFile(edited), JSON.stringify(list));
    expect(() => loadRecordKeyRing(edited)).toThrow(
      /listed as 0123456789abcdef, but its public key is/,
    );
  });

  it('reads the key id from a printed copy, and a copy printed before key ids without one', () => {
    const stamp = {
      recordId: 'c0de',
      digest: 'a'.repeat(64),
      signature: 'b'.repeat(86),
      generatedAt: '2026-03-04T08:30:00.000Z',
    };
    const pdf = (keywords: string) =>
      Buffer.from(`%PDF-1.3\n<< /Keywords (${keywords}) >>`, 'latin1');
    expect(readPdfStamp(pdf(formatPdfStamp({ ...stamp, keyId: '0123456789abcdef' })))).toEqual({
      ...stamp,
      keyId: '0123456789abcdef',
    });
    expect(readPdfStamp(pdf(formatPdfStamp(stamp)))).toEqual(stamp);
  });
});
