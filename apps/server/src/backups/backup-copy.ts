import { createHash, randomBytes } from 'node:crypto';
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { chmod, mkdir, open, readFile, rename, rm, stat, writeFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import type { BackupCheck, BackupCopy } from '@steadyhand/shared';
import Database from 'better-sqlite3';
import { drizzle } from 'drizzle-orm/better-sqlite3';
import { LogReader } from '../codes/log-reader.js';
import * as schema from '../db/schema/index.js';

/**
 * Online copies of the database and their checks, shared by the server's schedule and the
 * `db:backup` / `db:restore` commands. A copy is one self-contained SQLite file (rollback journal,
 * no -wal beside it) named by the time it was taken; its check is written next to it as
 * `<name>.check.json`; attachments are kept once each under BACKUP_DIR/uploads by their SHA-256,
 * like DATA_DIR/uploads, so every copy finds the files it names.
 */

const COPY_NAME = /^steadyhand-(\d{8}T\d{9}Z)\.db$/;
const DIGEST = /^[0-9a-f]{64}$/;

/** `steadyhand-20261202T031500123Z.db`: sorts by time, readable, no characters a shell minds. */
export function copyName(at: Date): string {
  return `steadyhand-${at.toISOString().replace(/[-:.]/g, '')}.db`;
}

export function copyTime(name: string): Date | null {
  const m = COPY_NAME.exec(name)?.[1];
  if (!m) return null;
  const iso = `${m.slice(0, 4)}-${m.slice(4, 6)}-${m.slice(6, 8)}T${m.slice(9, 11)}:${m.slice(11, 13)}:${m.slice(13, 15)}.${m.slice(15, 18)}Z`;
  const date = new Date(iso);
  return Number.isNaN(date.getTime()) ? null : date;
}

export const checkFileOf = (copyFile: string): string => copyFile.replace(/\.db$/, '.check.json');
export const backupUploadsDir = (backupDir: string): string => path.join(backupDir, 'uploads');

/** The copies in a folder, newest first (only names this code writes). */
export function copyNames(backupDir: string): string[] {
  if (!existsSync(backupDir)) return [];
  return readdirSync(backupDir)
    .filter((n) => COPY_NAME.test(n))
    .sort()
    .reverse();
}

/** The copies beyond the newest `keep`, which pruning removes. */
export function copiesToPrune(names: readonly string[], keep: number): string[] {
  return [...names].sort().reverse().slice(keep);
}

export function listCopies(backupDir: string): BackupCopy[] {
  return copyNames(backupDir).map((file) => {
    const full = path.join(backupDir, file);
    let check: BackupCheck | null = null;
    try {
      check = JSON.parse(readFileSync(checkFileOf(full), 'utf8')) as BackupCheck;
    } catch {
      // no check file: the check did not finish (or the file was copied here by hand)
    }
    return { file, createdAt: copyTime(file)!.toISOString(), sizeBytes: statSync(full).size, check };
  });
}

export async function fsyncPath(file: string): Promise<void> {
  const handle = await open(file, 'r');
  try {
    await handle.sync();
  } finally {
    await handle.close();
  }
}

/**
 * Copies the open database through SQLite's backup API into `backupDir`. Written under a temporary
 * name, switched to a rollback journal (one file), synced, then renamed, so a copy under a final
 * name is always whole. `pagesPerStep`: the server copies in steps and lets taps through between
 * them (its own writes during the copy reach the copy too); a command on another connection copies
 * in one step, because another connection's write would restart a stepped copy.
 */
export async function makeCopy(source: Database.Database, backupDir: string, options: { pagesPerStep?: number; at?: Date } = {}): Promise<string> {
  await mkdir(backupDir, { recursive: true, mode: 0o700 });
  const name = copyName(options.at ?? new Date());
  const final = path.join(backupDir, name);
  const temp = path.join(backupDir, `.${name}.${randomBytes(4).toString('hex')}.partial`);
  try {
    await source.backup(temp, { progress: ({ totalPages }) => options.pagesPerStep ?? totalPages });
    const copy = new Database(temp);
    try {
      copy.pragma('journal_mode = DELETE');
    } finally {
      copy.close();
    }
    await chmod(temp, 0o600); // patient data: readable by the server's account only
    await fsyncPath(temp);
    await rename(temp, final);
    await fsyncPath(backupDir);
  } catch (err) {
    await rm(temp, { force: true });
    throw err;
  }
  return final;
}

function attachmentsOf(file: string): { sha256: string; sizeBytes: number }[] {
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    return db.prepare<[], { sha256: string; sizeBytes: number }>('SELECT sha256, max(size_bytes) AS sizeBytes FROM attachments GROUP BY sha256').all();
  } finally {
    db.close();
  }
}

/**
 * Copies the attachments a database file names from `fromDir` into `toDir` (both named by
 * digest), skipping those already there; each copied file's bytes are hashed and must match
 * their name. Returns the digests that could not be copied.
 */
export async function copyAttachments(databaseFile: string, fromDir: string, toDir: string): Promise<{ count: number; copied: number; missing: string[] }> {
  const wanted = attachmentsOf(databaseFile);
  let copied = 0;
  const missing: string[] = [];
  if (wanted.length) await mkdir(toDir, { recursive: true, mode: 0o700 });
  for (const { sha256, sizeBytes } of wanted) {
    if (!DIGEST.test(sha256)) {
      missing.push(sha256);
      continue;
    }
    const target = path.join(toDir, sha256);
    const there = await stat(target).catch(() => undefined);
    if (there?.isFile() && there.size === sizeBytes) continue;
    const bytes = await readFile(path.join(fromDir, sha256)).catch(() => undefined);
    if (!bytes || createHash('sha256').update(bytes).digest('hex') !== sha256) {
      missing.push(sha256);
      continue;
    }
    const temp = path.join(toDir, `.${sha256}.${randomBytes(4).toString('hex')}.tmp`);
    await writeFile(temp, bytes, { mode: 0o600 });
    await fsyncPath(temp);
    await rename(temp, target);
    copied++;
  }
  return { count: wanted.length, copied, missing };
}

const requireHere = createRequire(import.meta.url);

/**
 * `PRAGMA integrity_check` on a file, in a worker thread: on a large copy it takes seconds, which
 * must not stop the server's event loop during a code.
 */
export function integrityCheck(file: string): Promise<string[]> {
  const code = `
    const { parentPort, workerData } = require('node:worker_threads');
    const Database = require(workerData.driver);
    const db = new Database(workerData.file, { readonly: true, fileMustExist: true });
    try {
      parentPort.postMessage(db.pragma('integrity_check').map((row) => row.integrity_check));
    } finally {
      db.close();
    }`;
  return new Promise((resolve, reject) => {
    const worker = new Worker(code, { eval: true, workerData: { driver: requireHere.resolve('better-sqlite3'), file } });
    let answered = false;
    worker.once('message', (rows: string[]) => {
      answered = true;
      resolve(rows);
    });
    worker.once('error', reject);
    worker.once('exit', (code) => {
      if (!answered) reject(new Error(`the integrity check stopped (exit ${code})`));
    });
  });
}

/** Lets other work run between codes when the check runs inside the server. */
const nextTurn = () => new Promise<void>((resolve) => setImmediate(resolve));

/**
 * Checks a copy: SQLite's integrity check, the entry chain of every code (by the same service that
 * checks a live record's chain, on the copy opened read-only), and that every attachment it names
 * is in `uploadsDir` with its size.
 */
export async function checkCopy(file: string, uploadsDir: string): Promise<BackupCheck> {
  const check: BackupCheck = {
    ok: false,
    checkedAt: new Date().toISOString(),
    integrity: [],
    codes: 0,
    entries: 0,
    brokenChains: [],
    attachments: { count: 0, missing: [] },
  };
  try {
    check.integrity = await integrityCheck(file);
    if (check.integrity.length !== 1 || check.integrity[0] !== 'ok') return { ...check, checkedAt: new Date().toISOString() };
    const sqlite = new Database(file, { readonly: true, fileMustExist: true });
    try {
      const db = drizzle(sqlite, { schema });
      const chains = await new LogReader(db, { sqlite, db }).verifyAll(nextTurn);
      check.codes = chains.codes;
      check.entries = chains.entries;
      check.brokenChains = chains.broken;
    } finally {
      sqlite.close();
    }
    const attachments = attachmentsOf(file);
    check.attachments.count = attachments.length;
    for (const { sha256, sizeBytes } of attachments) {
      const there = DIGEST.test(sha256) ? await stat(path.join(uploadsDir, sha256)).catch(() => undefined) : undefined;
      if (!there?.isFile() || there.size !== sizeBytes) check.attachments.missing.push(sha256);
    }
    check.ok = check.brokenChains.length === 0 && check.attachments.missing.length === 0;
  } catch (err) {
    check.ok = false;
    check.error = err instanceof Error ? err.message : String(err);
  }
  check.checkedAt = new Date().toISOString();
  return check;
}

export async function writeCheck(copyFile: string, check: BackupCheck): Promise<void> {
  const target = checkFileOf(copyFile);
  const temp = `${target}.${randomBytes(4).toString('hex')}.tmp`;
  await writeFile(temp, JSON.stringify(check, null, 2) + '\n', { mode: 0o600 });
  await rename(temp, target);
}

/** Removes the copies beyond the newest `keep`, with their check files. Attachments stay (they are never removed from the log). */
export async function pruneCopies(backupDir: string, keep: number): Promise<string[]> {
  const removed = copiesToPrune(copyNames(backupDir), keep);
  for (const name of removed) {
    const full = path.join(backupDir, name);
    await rm(full, { force: true });
    await rm(checkFileOf(full), { force: true });
  }
  return removed;
}

export interface BackupResult {
  file: string;
  sizeBytes: number;
  check: BackupCheck;
  attachmentsCopied: number;
  removed: string[];
}

/** One backup: the copy, its attachments, its check (written beside it), then pruning. */
export async function runBackup(options: {
  source: Database.Database;
  dataDir: string;
  backupDir: string;
  keep: number;
  pagesPerStep?: number;
}): Promise<BackupResult> {
  const file = await makeCopy(options.source, options.backupDir, { pagesPerStep: options.pagesPerStep });
  const uploads = backupUploadsDir(options.backupDir);
  const attachments = await copyAttachments(file, path.join(options.dataDir, 'uploads'), uploads);
  const check = await checkCopy(file, uploads);
  await writeCheck(file, check);
  const removed = await pruneCopies(options.backupDir, options.keep);
  return { file, sizeBytes: (await stat(file)).size, check, attachmentsCopied: attachments.copied, removed };
}

/** One line for the log and the command: what was checked and what failed. */
export function describeCheck(check: BackupCheck): string {
  if (check.error) return `check failed: ${check.error}`;
  if (check.integrity.length !== 1 || check.integrity[0] !== 'ok') return `integrity check failed: ${check.integrity.slice(0, 5).join('; ')}`;
  const parts = [`integrity ok`, `${check.codes} codes and ${check.entries} entries, ${check.brokenChains.length ? `${check.brokenChains.length} broken chains (${check.brokenChains.map((b) => `code ${b.codeId} at ${b.brokenAt.position}: ${b.brokenAt.reason}`).join('; ')})` : 'every chain verifies'}`];
  parts.push(check.attachments.missing.length ? `${check.attachments.missing.length} of ${check.attachments.count} attachments missing` : `${check.attachments.count} attachments present`);
  return parts.join(', ');
}
