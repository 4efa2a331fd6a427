import { Inject, Injectable } from '@nestjs/common';
import type { Code, CodeStatus, NewEntry, Outcome, StoredEntry } from '@steadyhand/shared';
import { and, asc, desc, eq, gt } from 'drizzle-orm';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { codes, entries, signatures } from '../db/schema/index.js';

type CodeRow = typeof codes.$inferSelect;
type EntryRow = typeof entries.$inferSelect;

export function toCode(row: CodeRow): Code {
  return {
    id: row.id,
    status: row.status,
    category: row.category,
    weightKg: row.weightKg,
    location: row.location,
    unitId: row.unitId,
    patient: (row.patient) ?? null,
    arrestAt: row.arrestAt,
    createdAt: row.createdAt,
    createdBy: row.createdBy,
    endedAt: row.endedAt,
    outcome: (row.outcome as Outcome | null) ?? null,
  };
}

export function toStoredEntry(row: EntryRow): StoredEntry {
  return {
    ...(row.body as unknown as NewEntry),
    codeId: row.codeId,
    userId: row.userId,
    cursor: row.cursor,
    receivedAt: row.receivedAt,
    recordedAt: row.recordedAt,
    addendum: row.addendum,
  };
}

@Injectable()
export class CodesRepository {
  constructor(@Inject(DB) private readonly db: Db) {}

  insertCode(row: typeof codes.$inferInsert): Code {
    return toCode(this.db.insert(codes).values(row).returning().get());
  }

  findCode(id: string): Code | undefined {
    const row = this.db.select().from(codes).where(eq(codes.id, id)).get();
    return row && toCode(row);
  }

  listCodes(status?: CodeStatus, limit = 200): Code[] {
    const query = this.db.select().from(codes);
    const rows = (status ? query.where(eq(codes.status, status)) : query).orderBy(desc(codes.arrestAt)).limit(limit).all();
    return rows.map(toCode);
  }

  updateCode(
    id: string,
    changes: Partial<Pick<CodeRow, 'status' | 'endedAt' | 'outcome' | 'location' | 'unitId' | 'patient' | 'weightKg' | 'category' | 'team' | 'debriefNotes'>>,
  ): Code {
    return toCode(this.db.update(codes).set(changes).where(eq(codes.id, id)).returning().get());
  }

  /** Review details kept beside the code (not part of the live `Code` shape). */
  reviewDetails(id: string): { team: { name: string; role: string }[] | null; debriefNotes: string | null } | undefined {
    return this.db.select({ team: codes.team, debriefNotes: codes.debriefNotes }).from(codes).where(eq(codes.id, id)).get();
  }

  /**
   * Whether the record carries a signature. Read here rather than through the records module,
   * which depends on this one (no module cycle).
   */
  isSigned(codeId: string): boolean {
    return this.db.select({ id: signatures.id }).from(signatures).where(eq(signatures.codeId, codeId)).limit(1).get() !== undefined;
  }

  findEntry(id: string): StoredEntry | undefined {
    const row = this.db.select().from(entries).where(eq(entries.id, id)).get();
    return row && toStoredEntry(row);
  }

  /**
   * Stores one entry, or finds the stored one with the same device-made id. Runs in one
   * transaction, so the answer is given only after the row is committed.
   */
  appendEntry(
    entry: NewEntry,
    meta: { codeId: string; userId: string; receivedAt: string; addendum: boolean },
    afterInsert?: (stored: StoredEntry) => void,
  ): { entry: StoredEntry; duplicate: boolean } {
    return this.db.transaction((tx) => {
      const existing = tx.select().from(entries).where(eq(entries.id, entry.id)).get();
      if (existing) return { entry: toStoredEntry(existing), duplicate: true };
      const row = tx
        .insert(entries)
        .values({
          id: entry.id,
          codeId: meta.codeId,
          kind: entry.kind,
          at: new Date(entry.at).toISOString(),
          atMs: Date.parse(entry.at),
          deviceId: entry.deviceId ?? null,
          seq: entry.seq ?? null,
          offsetMs: entry.offsetMs ?? null,
          offsetUncertaintyMs: entry.offsetUncertaintyMs ?? null,
          userId: meta.userId,
          receivedAt: meta.receivedAt,
          recordedAt: new Date().toISOString(),
          addendum: meta.addendum,
          body: { ...entry, at: new Date(entry.at).toISOString() } as Record<string, unknown>,
        })
        .returning()
        .get();
      const stored = toStoredEntry(row);
      afterInsert?.(stored);
      return { entry: stored, duplicate: false };
    });
  }

  entriesOf(codeId: string, afterCursor = 0): StoredEntry[] {
    return this.db
      .select()
      .from(entries)
      .where(and(eq(entries.codeId, codeId), gt(entries.cursor, afterCursor)))
      .orderBy(asc(entries.cursor))
      .all()
      .map(toStoredEntry);
  }
}
