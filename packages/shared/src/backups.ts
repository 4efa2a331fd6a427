import type { EntryChainBreak } from './records.js';

/**
 * The check of one database copy, written beside it as `<name>.check.json` and shown to admins:
 * SQLite's own integrity check, the entry chain of every code, and the attachments it names.
 */
export interface BackupCheck {
  ok: boolean;
  checkedAt: string;
  /** `PRAGMA integrity_check` lines: `["ok"]` when the file is sound. */
  integrity: string[];
  codes: number;
  entries: number;
  /** Codes whose entry chain does not verify in the copy. */
  brokenChains: { codeId: string; brokenAt: EntryChainBreak }[];
  /** Attachments the copy names, and those whose file could not be found beside it. */
  attachments: { count: number; missing: string[] };
  /** Why the check could not run to its end, when it could not. */
  error?: string;
}

/** One copy in BACKUP_DIR, newest first in `GET /api/admin/backups`. */
export interface BackupCopy {
  /** The file name (in BACKUP_DIR). */
  file: string;
  createdAt: string;
  sizeBytes: number;
  /** Null when the copy has no check file (its check never finished). */
  check: BackupCheck | null;
}

export interface BackupList {
  dir: string;
  intervalMinutes: number;
  keep: number;
  copies: BackupCopy[];
}
