import type { EntryChainBreak, NewEntry, StoredEntry } from '@steadyhand/shared';
import { and, asc, eq, gt } from 'drizzle-orm';
import type { DatabaseHandle, Db } from '../db/database.js';
import { entries } from '../db/schema/index.js';
import { verifyEntryChain, type EntryLink } from './entry-chain.js';

type EntryRow = typeof entries.$inferSelect;

export function toStoredEntry(row: EntryRow): StoredEntry {
  return {
    ...(row.body as unknown as NewEntry),
    codeId: row.codeId,
    userId: row.userId,
    // Only where it was kept: an entry stored before names were kept reads (and hashes) as it did.
    ...(row.userName !== null ? { userName: row.userName } : {}),
    cursor: row.cursor,
    receivedAt: row.receivedAt,
    recordedAt: row.recordedAt,
    addendum: row.addendum,
  };
}

export interface ChainCheckSummary {
  codes: number;
  entries: number;
  /** Codes whose chain does not verify, with where it breaks. */
  broken: { codeId: string; brokenAt: EntryChainBreak }[];
}

/**
 * Reads a database's entry logs and their chain links, and nothing else: what the repository
 * uses for its reads, and what the backup check uses on a copy (no keys, no writes).
 */
export class LogReader {
  constructor(
    private readonly db: Db,
    private readonly database: DatabaseHandle,
  ) {}

  entriesOf(codeId: string, afterCursor = 0): StoredEntry[] {
    return this.db
      .select()
      .from(entries)
      .where(and(eq(entries.codeId, codeId), gt(entries.cursor, afterCursor)))
      .orderBy(asc(entries.cursor))
      .all()
      .map(toStoredEntry);
  }

  linksOf(codeId: string): EntryLink[] {
    return this.database.sqlite
      .prepare<[string], EntryLink>('SELECT entry_id AS entryId, position, prev_hash AS prevHash, hash FROM entry_links WHERE code_id = ? ORDER BY position')
      .all(codeId);
  }

  allCodeIds(): string[] {
    return this.database.sqlite.prepare<[], string>('SELECT id FROM codes ORDER BY created_at, id').pluck().all();
  }

  /** Every code's chain. `pause` runs between codes, so a long check inside the server leaves room for taps. */
  async verifyAll(pause: () => Promise<void> = () => Promise.resolve()): Promise<ChainCheckSummary> {
    const summary: ChainCheckSummary = { codes: 0, entries: 0, broken: [] };
    for (const codeId of this.allCodeIds()) {
      const log = this.entriesOf(codeId);
      const status = verifyEntryChain(log, this.linksOf(codeId));
      summary.codes++;
      summary.entries += log.length;
      if (!status.valid) summary.broken.push({ codeId, brokenAt: status.brokenAt });
      await pause();
    }
    return summary;
  }
}
