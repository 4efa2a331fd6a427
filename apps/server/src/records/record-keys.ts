import {
  createHash,
  createPrivateKey,
  createPublicKey,
  generateKeyPairSync,
  sign,
  verify,
  type KeyObject,
} from 'node:crypto';
import {
  closeSync,
  existsSync,
  fsyncSync,
  mkdirSync,
  openSync,
  readFileSync,
  renameSync,
  rmSync,
  writeFileSync,
} from 'node:fs';
import path from 'node:path';
import { textSchema, type RecordPublicKey } from '@steadyhand/shared';
import { z } from 'zod';
import { ConfigError } from '../config/config.js';

/** The private key signing now, under DATA_DIR/keys (PEM, mode 600). The name predates rotation. */
export const RECORD_KEY_FILE = 'record-signing-ed25519.pem';
/** Every public key the server has signed with, with its key id and period. Not secret. */
export const RECORD_PUBLIC_KEYS_FILE = 'record-signing-public-keys.json';
/** A rotation writes the new private key here first; it takes RECORD_KEY_FILE's name once the list names it. */
const PENDING_SUFFIX = '.new';
const KEY_LIST_FORMAT = 'steadyhand-record-keys/1';

/** A key file that is missing, damaged or does not match the list: the server does not start on it. */
export class RecordKeyError extends ConfigError {}

/** One key as the list keeps it. */
export interface RecordKeyEntry {
  keyId: string;
  publicKeyPem: string;
  /** When it began to sign; null for the first key of an installation made before key ids. */
  validFrom: string | null;
  /** When it was retired; null for the key signing now. */
  validUntil: string | null;
}

export interface RecordKey extends RecordKeyEntry {
  fingerprint: string;
  publicKey: KeyObject;
}

export interface RecordKeyRing {
  /** Oldest first; the last one signs now. */
  keys: RecordKey[];
  current: RecordKey & { privateKey: KeyObject };
}

const isoSchema = textSchema().regex(
  /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(?:\.\d{1,3})?Z$/,
  'must be an ISO time in UTC',
);
const listSchema = z
  .object({
    format: z.literal(KEY_LIST_FORMAT),
    keys: z
      .array(
        z
          .object({
            keyId: textSchema().regex(/^[0-9a-f]{16}$/, 'must be 16 hexadecimal digits'),
            publicKeyPem: textSchema().min(1),
            validFrom: isoSchema.nullable(),
            validUntil: isoSchema.nullable(),
          })
          .strict(),
      )
      .min(1, 'lists no key'),
  })
  .strict();

/** SHA-256 (hex) of the key's DER SubjectPublicKeyInfo: `openssl pkey -pubin -outform DER | sha256sum` gives the same. */
export function fingerprintOf(publicKey: KeyObject): string {
  return createHash('sha256')
    .update(publicKey.export({ format: 'der', type: 'spki' }))
    .digest('hex');
}

/** The key id: the fingerprint's first 16 hex digits (64 bits), short enough to read off paper. */
export function keyIdOf(publicKey: KeyObject): string {
  return fingerprintOf(publicKey).slice(0, 16);
}

function keysDir(dataDir: string): string {
  const dir = path.join(dataDir, 'keys');
  mkdirSync(dir, { recursive: true, mode: 0o700 });
  return dir;
}

/** Written whole, on disk, then given its name: a crash leaves the old file or the new one, never half of one. */
function writeDurably(file: string, text: string, mode = 0o600): void {
  const temp = `${file}.writing`;
  rmSync(temp, { force: true });
  writeFileSync(temp, text, { mode, flag: 'wx' });
  const fd = openSync(temp, 'r');
  try {
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
  renameSync(temp, file);
  syncDir(path.dirname(file));
}

function syncDir(dir: string): void {
  const fd = openSync(dir, 'r');
  try {
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
}

/** A file that must not exist yet, on disk before this returns. */
function writeNewFile(file: string, text: string): void {
  const fd = openSync(file, 'wx', 0o600);
  try {
    writeFileSync(fd, text);
    fsyncSync(fd);
  } finally {
    closeSync(fd);
  }
  syncDir(path.dirname(file));
}

function newPrivateKeyPem(): string {
  return generateKeyPairSync('ed25519')
    .privateKey.export({ format: 'pem', type: 'pkcs8' })
    .toString();
}

function publicPem(key: KeyObject): string {
  return key.export({ format: 'pem', type: 'spki' }).toString();
}

function readPrivateKey(file: string): KeyObject {
  try {
    const key = createPrivateKey(readFileSync(file, 'utf8'));
    if (key.asymmetricKeyType !== 'ed25519')
      throw new Error(`it holds a ${key.asymmetricKeyType ?? 'non-asymmetric'} key`);
    return key;
  } catch (err) {
    throw new RecordKeyError(
      `The record signing key ${file} cannot be read as an Ed25519 private key (PEM): ${(err as Error).message}.`,
    );
  }
}

function writeList(file: string, keys: readonly RecordKeyEntry[]): void {
  const list = {
    format: KEY_LIST_FORMAT,
    keys: keys.map(entryOf),
  };
  writeDurably(file, JSON.stringify(list, null, 2) + '\n');
}

/**
 * Reads the list of public keys and checks it: each id is its key's own, the periods follow one
 * another, and only the last key is open-ended. A list edited by hand into something else stops
 * the start rather than let a record verify against a key nobody can account for.
 */
function readList(file: string): RecordKey[] {
  let parsed: z.infer<typeof listSchema>;
  try {
    parsed = listSchema.parse(JSON.parse(readFileSync(file, 'utf8')));
  } catch (err) {
    const detail =
      err instanceof z.ZodError
        ? err.issues.map((i) => `${i.path.join('.') || 'the file'}: ${i.message}`).join('; ')
        : (err as Error).message;
    throw new RecordKeyError(`The list of record signing keys ${file} cannot be read: ${detail}.`);
  }
  const keys = parsed.keys.map((entry, i): RecordKey => {
    let publicKey: KeyObject;
    try {
      publicKey = createPublicKey(entry.publicKeyPem);
    } catch {
      throw new RecordKeyError(
        `The list of record signing keys ${file}: key ${i + 1} (${entry.keyId}) is not a public key in PEM.`,
      );
    }
    const fingerprint = fingerprintOf(publicKey);
    if (publicKey.asymmetricKeyType !== 'ed25519' || fingerprint.slice(0, 16) !== entry.keyId) {
      throw new RecordKeyError(
        `The list of record signing keys ${file}: key ${i + 1} is listed as ${entry.keyId}, but its public key is ${fingerprint.slice(0, 16)}.`,
      );
    }
    return { ...entry, fingerprint, publicKey };
  });
  keys.forEach((key, i) => {
    const last = i === keys.length - 1;
    const next = keys[i + 1];
    if (last !== (key.validUntil === null)) {
      throw new RecordKeyError(
        `The list of record signing keys ${file}: only the last key may be without an end, and it must be (key ${key.keyId}).`,
      );
    }
    if (
      key.validFrom !== null &&
      key.validUntil !== null &&
      Date.parse(key.validUntil) < Date.parse(key.validFrom)
    ) {
      throw new RecordKeyError(
        `The list of record signing keys ${file}: key ${key.keyId} ends before it begins.`,
      );
    }
    if (next && next.validFrom !== key.validUntil) {
      throw new RecordKeyError(
        `The list of record signing keys ${file}: key ${next.keyId} must begin when key ${key.keyId} ended.`,
      );
    }
    if (i > 0 && key.validFrom === null)
      throw new RecordKeyError(
        `The list of record signing keys ${file}: key ${key.keyId} has no beginning.`,
      );
  });
  if (new Set(keys.map((k) => k.keyId)).size !== keys.length)
    throw new RecordKeyError(`The list of record signing keys ${file} names a key twice.`);
  return keys;
}

/**
 * The list as found, made or brought up to date, and the private key file if there is one:
 * - nothing yet (a new installation): a new key, signing from now;
 * - a private key without a list (an installation from before key ids): the list is made with that
 *   key as the first one, from the beginning (every signature without a key id is this key's);
 * - a rotation cut short after the list named the new key: its pending private key is put in place;
 *   one cut short before: the pending file is removed (it never signed anything).
 */
function openKeyFiles(dataDir: string): {
  listFile: string;
  keyFile: string;
  keys: RecordKey[];
  made: boolean;
} {
  const dir = keysDir(dataDir);
  const keyFile = path.join(dir, RECORD_KEY_FILE);
  const listFile = path.join(dir, RECORD_PUBLIC_KEYS_FILE);
  const pendingFile = keyFile + PENDING_SUFFIX;
  let made = false;

  if (!existsSync(listFile)) {
    if (!existsSync(keyFile)) {
      made = true;
      try {
        writeNewFile(keyFile, newPrivateKeyPem());
      } catch (err) {
        // Another process made it a moment ago: read theirs.
        if ((err as NodeJS.ErrnoException).code !== 'EEXIST') throw err;
      }
      if (!existsSync(listFile)) {
        const publicKey = createPublicKey(readPrivateKey(keyFile));
        writeList(listFile, [
          {
            keyId: keyIdOf(publicKey),
            publicKeyPem: publicPem(publicKey),
            validFrom: new Date().toISOString(),
            validUntil: null,
          },
        ]);
      }
    } else {
      const publicKey = createPublicKey(readPrivateKey(keyFile));
      writeList(listFile, [
        {
          keyId: keyIdOf(publicKey),
          publicKeyPem: publicPem(publicKey),
          validFrom: null,
          validUntil: null,
        },
      ]);
    }
  }
  const keys = readList(listFile);
  const current = keys[keys.length - 1]!;

  if (existsSync(pendingFile)) {
    const pending = readPrivateKey(pendingFile);
    if (keyIdOf(createPublicKey(pending)) === current.keyId) renameSync(pendingFile, keyFile);
    else rmSync(pendingFile);
    syncDir(dir);
  }
  return { listFile, keyFile, keys, made };
}

/**
 * Refuses to start a server on a database that holds signed records while DATA_DIR/keys has no
 * record signing key and no list of keys (a server rebuilt without its keys): it would make new
 * keys, and every earlier record would fail its checks. Checked before the app is built, so
 * nothing is made or sealed first. `pnpm keys:rotate` is the deliberate way to a new key.
 */
export function assertRecordKeysPresent(dataDir: string, hasSignatures: boolean): void {
  const dir = path.join(dataDir, 'keys');
  if (
    !hasSignatures ||
    existsSync(path.join(dir, RECORD_KEY_FILE)) ||
    existsSync(path.join(dir, RECORD_PUBLIC_KEYS_FILE))
  )
    return;
  throw new RecordKeyError(
    `The database holds signed records, but ${dir} has no record signing key. Put DATA_DIR/keys back from where it is kept before starting (docs/operations.md, "Key rotation"). ` +
      'If it is lost for good, run `pnpm keys:rotate` to make a new key: records signed before will then fail their signature checks.',
  );
}

/**
 * The server's keys for records: every public key it has signed with (kept in DATA_DIR/keys, never
 * in the database, so someone who can write the database cannot add a key of their own) and the
 * private key of the one signing now. Made on first use; refuses to go on when the private key is
 * missing or is not the one the list says signs now.
 */
export function loadRecordKeyRing(dataDir: string): RecordKeyRing {
  const { keyFile, listFile, keys } = openKeyFiles(dataDir);
  const current = keys[keys.length - 1]!;
  if (!existsSync(keyFile)) {
    throw new RecordKeyError(
      `The record signing key ${keyFile} is missing, while ${listFile} says key ${current.keyId} signs now. ` +
        'Put the private key back from where it is kept (docs/operations.md, "Key rotation"), or run `pnpm keys:rotate` with the server stopped to start a new key: earlier records keep verifying with the public keys in the list.',
    );
  }
  const privateKey = readPrivateKey(keyFile);
  const keyId = keyIdOf(createPublicKey(privateKey));
  if (keyId !== current.keyId) {
    const known = keys.some((k) => k.keyId === keyId)
      ? `an earlier key (${keyId}), retired`
      : `key ${keyId}, which the list does not hold`;
    throw new RecordKeyError(
      `The record signing key ${keyFile} is ${known}, while ${listFile} says key ${current.keyId} signs now. ` +
        `Put back the private key of ${current.keyId}; if it is lost, move ${keyFile} aside and run \`pnpm keys:rotate\` with the server stopped.`,
    );
  }
  return { keys, current: { ...current, privateKey } };
}

/** The key a signature names; a signature stored before key ids (null) was made by the first key. */
export function keyFor(
  ring: RecordKeyRing,
  keyId: string | null | undefined,
): RecordKey | undefined {
  return keyId ? ring.keys.find((k) => k.keyId === keyId) : ring.keys[0];
}

/** A signature counts only when it is dated within its key's period (both ends included). */
export function withinPeriod(key: RecordKeyEntry, at: string): boolean {
  const t = Date.parse(at);
  if (Number.isNaN(t)) return false;
  return (
    (key.validFrom === null || t >= Date.parse(key.validFrom)) &&
    (key.validUntil === null || t <= Date.parse(key.validUntil))
  );
}

/** "2026-03-01T08:00:00.000Z to now", or "installation to ..." for a first key from before key ids. */
export function periodText(key: RecordKeyEntry): string {
  return `${key.validFrom ?? 'installation'} to ${key.validUntil ?? 'now'}`;
}

export function publicKeyView(key: RecordKey, ring: RecordKeyRing): RecordPublicKey {
  return {
    keyId: key.keyId,
    algorithm: 'Ed25519',
    fingerprint: key.fingerprint,
    publicKeyPem: key.publicKeyPem,
    validFrom: key.validFrom,
    validUntil: key.validUntil,
    current: key.keyId === ring.current.keyId,
  };
}

export interface RotationResult {
  /** The key that signed until now (its private key is gone from DATA_DIR/keys); null when there was none yet. */
  retired: RecordKeyEntry | null;
  /** The new key, signing from `validFrom`. */
  current: RecordKeyEntry;
  keys: RecordKeyEntry[];
  listFile: string;
  /** False when the retired key's private key was already missing. */
  retiredPrivateKeyFound: boolean;
}

/**
 * `pnpm keys:rotate` (the server stopped): a new Ed25519 key signs from now; the key signing until
 * now is retired at the same instant and its public key stays in the list, so every signature and
 * printed copy it made keeps verifying; its private key is overwritten by the new one. `notBefore`
 * (the latest signature or printed copy in the database) keeps a clock that stepped back from
 * ending the old key before the last thing it signed.
 *
 * Crash safety: the new private key is written beside the old one first, then the list naming it
 * replaces the old list (the moment the rotation happens), then the new key takes the private key's
 * name. The next start finishes a rotation cut short after the list, and drops one cut short before.
 */
export function rotateRecordKey(
  dataDir: string,
  options: { now?: Date; notBefore?: string | null } = {},
): RotationResult {
  const { keyFile, listFile, keys, made } = openKeyFiles(dataDir);
  const current = keys[keys.length - 1]!;
  // No key yet: the one just made is the new key (retiring it at once would list a key that never signed).
  if (made)
    return {
      retired: null,
      current,
      keys: keys.map(entryOf),
      listFile,
      retiredPrivateKeyFound: false,
    };
  const retiredPrivateKeyFound = existsSync(keyFile);
  if (retiredPrivateKeyFound) {
    const found = keyIdOf(createPublicKey(readPrivateKey(keyFile)));
    if (found !== current.keyId) {
      throw new RecordKeyError(
        `Not rotated: ${keyFile} holds key ${found}, while ${listFile} says key ${current.keyId} signs now. Put back the private key of ${current.keyId}, or move ${keyFile} aside and rotate again.`,
      );
    }
  }
  const times = [
    (options.now ?? new Date()).getTime(),
    ...[options.notBefore, current.validFrom]
      .filter((t): t is string => !!t)
      .map((t) => Date.parse(t)),
  ];
  const at = new Date(Math.max(...times)).toISOString();

  const pem = newPrivateKeyPem();
  const publicKey = createPublicKey(createPrivateKey(pem));
  const retired: RecordKeyEntry = {
    keyId: current.keyId,
    publicKeyPem: current.publicKeyPem,
    validFrom: current.validFrom,
    validUntil: at,
  };
  const next: RecordKeyEntry = {
    keyId: keyIdOf(publicKey),
    publicKeyPem: publicPem(publicKey),
    validFrom: at,
    validUntil: null,
  };
  if (keys.some((k) => k.keyId === next.keyId)) {
    throw new RecordKeyError(
      'Not rotated: the new key has the id of an earlier one (a chance of 1 in 2^64); run the command again.',
    );
  }
  const entries: RecordKeyEntry[] = [...keys.slice(0, -1).map(entryOf), retired, next];

  const pendingFile = keyFile + PENDING_SUFFIX;
  writeDurably(pendingFile, pem);
  writeList(listFile, entries);
  renameSync(pendingFile, keyFile);
  syncDir(path.dirname(keyFile));
  return { retired, current: next, keys: entries, listFile, retiredPrivateKeyFound };
}

function entryOf({ keyId, publicKeyPem, validFrom, validUntil }: RecordKeyEntry): RecordKeyEntry {
  return { keyId, publicKeyPem, validFrom, validUntil };
}

/** Ed25519 over the UTF-8 bytes of a canonical string, as base64url. */
export function signText(privateKey: KeyObject, text: string): string {
  return sign(null, Buffer.from(text, 'utf8'), privateKey).toString('base64url');
}

export function verifyText(publicKey: KeyObject, text: string, signature: string): boolean {
  try {
    return verify(null, Buffer.from(text, 'utf8'), publicKey, Buffer.from(signature, 'base64url'));
  } catch {
    return false;
  }
}
