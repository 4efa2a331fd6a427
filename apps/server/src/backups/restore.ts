import { existsSync } from 'node:fs';
import { chmod, copyFile, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import type { BackupCheck } from '@steadyhand/shared';
import Database from 'better-sqlite3';
import { backupUploadsDir, checkCopy, copyAttachments, copyName, fsyncPath } from './backup-copy.js';

/**
 * Whether another process has the database open: a server (or a backup command) holds a shared
 * lock on a WAL database for as long as it is open, so an exclusive lock cannot be had. The lock
 * goes with the process, so a server that was killed does not count.
 */
export function databaseInUse(file: string): boolean {
  if (!existsSync(file)) return false;
  const probe = new Database(file, { fileMustExist: true });
  try {
    probe.pragma('busy_timeout = 0');
    probe.pragma('locking_mode = EXCLUSIVE');
    probe.exec('BEGIN EXCLUSIVE');
    probe.exec('COMMIT');
    return false;
  } catch (err) {
    if ((err as { code?: string }).code?.startsWith('SQLITE_BUSY') || /locked|busy/i.test((err as Error).message)) return true;
    throw err;
  } finally {
    probe.close();
  }
}

/** Folds a database's WAL into its file so it can be moved as one file; a file that cannot be opened is moved as it is. */
function settle(file: string): void {
  try {
    const db = new Database(file, { fileMustExist: true });
    try {
      db.pragma('wal_checkpoint(TRUNCATE)');
      db.pragma('journal_mode = DELETE');
    } finally {
      db.close();
    }
  } catch {
    // a damaged file (the reason for the restore, perhaps): keep it and its journal files as they are
  }
}

export type RestoreOutcome =
  | { ok: true; check: BackupCheck; replacedBy: string; keptAs: string | null; attachmentsCopied: number }
  | { ok: false; reason: 'in-use' | 'not-found' | 'check-failed' | 'attachments-missing'; message: string; check?: BackupCheck };

/**
 * Puts a copy in place of the database: refuses while a process uses it; checks the copy first
 * (integrity, every entry chain); brings back the attachments it names from the uploads folder
 * beside it; keeps the database it replaces beside it as `<name>.replaced-<time>`.
 */
export async function restoreCopy(options: { copy: string; databaseFile: string; dataDir: string; acceptMissingAttachments?: boolean }): Promise<RestoreOutcome> {
  const { copy, databaseFile, dataDir } = options;
  if (!existsSync(copy)) return { ok: false, reason: 'not-found', message: `No file at ${copy}` };
  if (databaseInUse(databaseFile)) {
    return {
      ok: false,
      reason: 'in-use',
      message: `${databaseFile} is open in another process (a running server, or a backup in progress). Stop the server first (for example: systemctl stop steadyhand), then run the restore again. Nothing was changed.`,
    };
  }
  const check = await checkCopy(copy, backupUploadsDir(path.dirname(copy)));
  const chainsOrFile = check.error || check.integrity.length !== 1 || check.integrity[0] !== 'ok' || check.brokenChains.length > 0;
  if (chainsOrFile) return { ok: false, reason: 'check-failed', message: `The copy ${copy} fails its check; nothing was changed.`, check };

  const uploads = path.join(dataDir, 'uploads');
  const attachments = await copyAttachments(copy, backupUploadsDir(path.dirname(copy)), uploads);
  if (attachments.missing.length && !options.acceptMissingAttachments) {
    return {
      ok: false,
      reason: 'attachments-missing',
      message: `${attachments.missing.length} attachments the copy names are neither beside it nor in ${uploads}: ${attachments.missing.join(', ')}. Nothing was changed; add --accept-missing-attachments to restore without them.`,
      check,
    };
  }

  let keptAs: string | null = null;
  if (existsSync(databaseFile)) {
    settle(databaseFile);
    keptAs = `${databaseFile}.replaced-${copyName(new Date()).replace(/^steadyhand-|\.db$/g, '')}`;
    await rename(databaseFile, keptAs);
    for (const suffix of ['-wal', '-shm', '-journal']) {
      if (existsSync(databaseFile + suffix)) await rename(databaseFile + suffix, keptAs + suffix);
    }
  }
  const temp = `${databaseFile}.restoring`;
  await rm(temp, { force: true });
  await copyFile(copy, temp);
  await chmod(temp, 0o600);
  // On disk before it takes the database's name, so a crash now leaves either no database or all of it.
  await fsyncPath(temp);
  await rename(temp, databaseFile);
  await fsyncPath(path.dirname(databaseFile));
  return { ok: true, check, replacedBy: copy, keptAs, attachmentsCopied: attachments.copied };
}
