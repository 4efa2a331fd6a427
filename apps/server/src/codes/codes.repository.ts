import { BadRequestException, Inject, Injectable } from '@nestjs/common';
import type { Code, CodeStatus, NewEntry, Outcome, StoredEntry, UtsteinAddendum, UtsteinDetails, WeightSource } from '@steadyhand/shared';
import { and, desc, eq, isNull } from 'drizzle-orm';
import type { Statement } from 'better-sqlite3';
import { DATABASE, DB } from '../db/database.module.js';
import type { DatabaseHandle, Db } from '../db/database.js';
import { codes, utsteinAddenda } from '../db/schema/index.js';
import { NotCanonicalisable } from '../common/canonical-json.js';
import { LogReader } from './log-reader.js';
import { CHAIN_START, entryLinkHash, type EntryLink } from './entry-chain.js';
import { attachmentsDigest, detailAddendaDigest, differingParts, EMPTY_SEAL_STATE, SealKey, type SealPart, type SealState, type StoredSeal } from './record-seal.js';

type CodeRow = typeof codes.$inferSelect;

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
    weightSource: (row.weightSource as WeightSource | null) ?? null,
    protocolVersion: row.protocolVersion ?? null,
    categoryChangedAt: row.categoryChangedAt ?? null,
  };
}


/** An entries row as SQLite returns it (column names, integers for booleans). */
interface RawEntryRow {
  cursor: number;
  code_id: string;
  user_id: string;
  received_at: string;
  recorded_at: string;
  addendum: number;
  user_name: string | null;
  body: string;
}

function fromRawEntry(row: RawEntryRow): StoredEntry {
  return {
    ...(JSON.parse(row.body) as NewEntry),
    codeId: row.code_id,
    userId: row.user_id,
    ...(row.user_name !== null ? { userName: row.user_name } : {}),
    cursor: row.cursor,
    receivedAt: row.received_at,
    recordedAt: row.recorded_at,
    addendum: row.addendum === 1,
  };
}

@Injectable()
export class CodesRepository {
  /**
   * The tap path (status, duplicate check, signed check, insert) runs on statements prepared
   * once: building a query per tap cost more than the commit itself.
   */
  private readonly hot: {
    codeStatus: Statement<[string], { status: CodeStatus }>;
    entryById: Statement<[string], RawEntryRow>;
    signed: Statement<[string], { one: number }>;
    insert: Statement<unknown[], { cursor: number }>;
    lastLink: Statement<[string], { position: number; hash: string }>;
    insertLink: Statement<[string, string, number, string, string]>;
    seal: Statement<[string], StoredSeal>;
    writeSeal: Statement<[string, number, string, number, string, string | null, string, string]>;
    countSignatures: Statement<[string], { n: number }>;
    attachmentList: Statement<[string], { id: string; sha256: string }>;
    entryCount: Statement<[string], { n: number }>;
    detailAddenda: Statement<[string], { id: string; codeId: string; recordedAt: string; userId: string; userName: string; changes: string }>;
  };

  private readonly reader: LogReader;

  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(DATABASE) private readonly database: DatabaseHandle,
    @Inject(SealKey) private readonly sealKey: SealKey,
  ) {
    const { sqlite } = database;
    this.reader = new LogReader(db, database);
    this.hot = {
      codeStatus: sqlite.prepare('SELECT status FROM codes WHERE id = ?'),
      entryById: sqlite.prepare('SELECT * FROM entries WHERE id = ?'),
      signed: sqlite.prepare('SELECT 1 AS one FROM signatures WHERE code_id = ? LIMIT 1'),
      insert: sqlite.prepare(
        `INSERT INTO entries (id, code_id, kind, at, at_ms, device_id, seq, offset_ms, offset_uncertainty_ms, user_id, user_name, received_at, recorded_at, addendum, body)
         VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?) RETURNING cursor`,
      ),
      // A seek on the (code_id, position) unique index.
      lastLink: sqlite.prepare('SELECT position, hash FROM entry_links WHERE code_id = ? ORDER BY position DESC LIMIT 1'),
      insertLink: sqlite.prepare('INSERT INTO entry_links (entry_id, code_id, position, prev_hash, hash) VALUES (?, ?, ?, ?, ?)'),
      seal: sqlite.prepare('SELECT code_id AS codeId, entries, head, signatures, attachments, detail_addenda AS detailAddenda, mac FROM record_seals WHERE code_id = ?'),
      writeSeal: sqlite.prepare(
        `INSERT INTO record_seals (code_id, entries, head, signatures, attachments, detail_addenda, mac, sealed_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?)
         ON CONFLICT(code_id) DO UPDATE SET entries = excluded.entries, head = excluded.head, signatures = excluded.signatures,
           attachments = excluded.attachments, detail_addenda = excluded.detail_addenda, mac = excluded.mac, sealed_at = excluded.sealed_at`,
      ),
      countSignatures: sqlite.prepare('SELECT count(*) AS n FROM signatures WHERE code_id = ?'),
      attachmentList: sqlite.prepare('SELECT id, sha256 FROM attachments WHERE code_id = ?'),
      entryCount: sqlite.prepare('SELECT count(*) AS n FROM entries WHERE code_id = ?'),
      detailAddenda: sqlite.prepare(
        'SELECT id, code_id AS codeId, recorded_at AS recordedAt, user_id AS userId, user_name AS userName, changes FROM utstein_addenda WHERE code_id = ? ORDER BY recorded_at, id',
      ),
    };
  }

  /** The code's status, or undefined when there is no such code. */
  codeStatus(id: string): CodeStatus | undefined {
    return this.hot.codeStatus.get(id)?.status;
  }

  /** A new code, sealed empty in the same transaction: from now on its seal only grows with it. */
  insertCode(row: typeof codes.$inferInsert): Code {
    return this.database.sqlite.transaction(() => {
      const code = toCode(this.db.insert(codes).values(row).returning().get());
      this.writeSeal(code.id, EMPTY_SEAL_STATE);
      return code;
    })();
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
    changes: Partial<
      Pick<
        CodeRow,
        'status' | 'endedAt' | 'outcome' | 'location' | 'unitId' | 'patient' | 'weightKg' | 'weightSource' | 'category' | 'categoryChangedAt' | 'arrestAt' | 'team' | 'debriefNotes'
      >
    >,
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
    return this.hot.signed.get(codeId) !== undefined;
  }

  findEntry(id: string): StoredEntry | undefined {
    const row = this.hot.entryById.get(id);
    return row && fromRawEntry(row);
  }

  /**
   * Stores one entry and its link in the code's hash chain, or finds the stored one with the same
   * device-made id (no new link). Runs in one transaction, so the answer is given only after both
   * rows are committed.
   */
  appendEntry(
    entry: NewEntry,
    meta: { codeId: string; userId: string; userName?: string; receivedAt: string; addendum: boolean },
    afterInsert?: (stored: StoredEntry) => void,
  ): { entry: StoredEntry; duplicate: boolean } {
    const commit = this.database.sqlite.transaction((): { entry: StoredEntry; duplicate: boolean } => {
      const existing = this.hot.entryById.get(entry.id);
      if (existing) return { entry: fromRawEntry(existing), duplicate: true };
      const at = new Date(entry.at).toISOString();
      const body = { ...entry, at };
      const recordedAt = new Date().toISOString();
      const { cursor } = this.hot.insert.get(
        entry.id,
        meta.codeId,
        entry.kind,
        at,
        Date.parse(at),
        entry.deviceId ?? null,
        entry.seq ?? null,
        entry.offsetMs ?? null,
        entry.offsetUncertaintyMs ?? null,
        meta.userId,
        meta.userName ?? null,
        meta.receivedAt,
        recordedAt,
        meta.addendum ? 1 : 0,
        JSON.stringify(body),
      )!;
      const stored: StoredEntry = {
        ...body,
        codeId: meta.codeId,
        userId: meta.userId,
        ...(meta.userName !== undefined ? { userName: meta.userName } : {}),
        cursor,
        receivedAt: meta.receivedAt,
        recordedAt,
        addendum: meta.addendum,
      };
      // Read after the insert took the write lock, so no other writer can take the same position.
      const link = this.appendLink(stored);
      this.extendSeal(meta.codeId, 'entries', { entries: link.position - 1, head: link.prevHash }, { entries: link.position, head: link.hash });
      afterInsert?.(stored);
      return { entry: stored, duplicate: false };
    });
    return commit();
  }

  /** Chains one stored entry after the code's last link. Call inside the entry's transaction. */
  private appendLink(stored: StoredEntry): { position: number; prevHash: string; hash: string } {
    const last = this.hot.lastLink.get(stored.codeId);
    const prevHash = last?.hash ?? CHAIN_START;
    let hash: string;
    try {
      hash = entryLinkHash(prevHash, stored);
    } catch (err) {
      // The shared schemas and the edge's JSON limits refuse what cannot be canonicalised; this is
      // the last guard. A 400 rolls the entry back; a 500 would have the device resend it forever.
      if (err instanceof NotCanonicalisable) throw new BadRequestException(`The entry cannot be stored: ${err.message}`);
      throw err;
    }
    const position = (last?.position ?? 0) + 1;
    this.hot.insertLink.run(stored.id, stored.codeId, position, prevHash, hash);
    return { position, prevHash, hash };
  }

  // --- the record's seal -----------------------------------------------------------------------

  sealOf(codeId: string): StoredSeal | undefined {
    return this.hot.seal.get(codeId);
  }

  /** What the record is made of now, counted the way the seal counts it. */
  sealState(codeId: string): SealState {
    const last = this.hot.lastLink.get(codeId);
    return {
      entries: last?.position ?? 0,
      head: last?.hash ?? CHAIN_START,
      signatures: this.hot.countSignatures.get(codeId)?.n ?? 0,
      attachments: attachmentsDigest(this.hot.attachmentList.all(codeId)),
      detailAddenda: detailAddendaDigest(this.detailAddendaOf(codeId)),
    };
  }

  private writeSeal(codeId: string, state: SealState): void {
    this.hot.writeSeal.run(codeId, state.entries, state.head, state.signatures, state.attachments, state.detailAddenda, this.sealKey.mac(codeId, state), new Date().toISOString());
  }

  /**
   * Moves one part of the seal from `from` to `to`, inside the transaction that made the change.
   * Only a seal that verifies and still says `from` for that part is moved: a seal already at
   * odds with the record (a row removed or rewritten outside the application) is left as it is,
   * so the next write never launders the evidence. The write itself always goes ahead.
   */
  private extendSeal(codeId: string, part: SealPart, from: Partial<SealState>, to: Partial<SealState>): void {
    const seal = this.sealOf(codeId);
    if (!seal || !this.sealKey.verifies(seal)) return;
    const { codeId: _codeId, mac: _mac, ...sealed } = seal;
    if (differingParts(sealed, { ...sealed, ...from }).includes(part)) return;
    this.writeSeal(codeId, { ...sealed, ...to });
  }

  /**
   * Runs a write that adds a signature or an attachment, and moves that part of the seal in the
   * same transaction.
   */
  sealedWrite<T>(codeId: string, part: 'signatures' | 'attachments' | 'detailAddenda', write: () => T): T {
    return this.database.sqlite.transaction(() => {
      const before = this.sealState(codeId);
      const result = write();
      const after = this.sealState(codeId);
      if (differingParts(before, after).includes(part)) this.extendSeal(codeId, part, before, after);
      return result;
    })();
  }

  /** Seals every code as it stands (the first start with seals, on a database made before them). Returns how many. */
  sealAsFound(): number {
    const ids = this.database.sqlite.prepare<[], string>('SELECT id FROM codes').pluck().all();
    const sealAll = this.database.sqlite.transaction(() => {
      for (const id of ids) this.writeSeal(id, this.sealState(id));
    });
    sealAll.immediate();
    return ids.length;
  }

  // --- the registry details (Utstein) ------------------------------------------------------------

  /** The details as stored on the code (as they stood at the first signature, once signed). */
  utsteinOf(codeId: string): UtsteinDetails | undefined {
    const row = this.db.select({ utstein: codes.utstein }).from(codes).where(eq(codes.id, codeId)).get();
    return (row?.utstein ?? undefined);
  }

  setUtstein(codeId: string, details: UtsteinDetails): void {
    this.db.update(codes).set({ utstein: Object.keys(details).length ? details : null }).where(eq(codes.id, codeId)).run();
  }

  /** Changes after the first signature, oldest first. */
  detailAddendaOf(codeId: string): UtsteinAddendum[] {
    return this.hot.detailAddenda.all(codeId).map(({ codeId: _c, changes, ...row }) => ({ ...row, changes: JSON.parse(changes) as UtsteinAddendum['changes'] }));
  }

  /** Stores one addendum and moves the seal's addenda digest in the same transaction. */
  addDetailAddendum(codeId: string, addendum: UtsteinAddendum): void {
    this.sealedWrite(codeId, 'detailAddenda', () => {
      this.db.insert(utsteinAddenda).values({ ...addendum, codeId, changes: addendum.changes as Record<string, { from: unknown; to: unknown }> }).run();
    });
  }

  /** Keeps the facility name a record was first signed under (see codes.facility_name). */
  freezeFacility(codeId: string, name: string): void {
    this.db.update(codes).set({ facilityName: name }).where(and(eq(codes.id, codeId), isNull(codes.facilityName))).run();
  }

  frozenFacility(codeId: string): string | null {
    return this.db.select({ name: codes.facilityName }).from(codes).where(eq(codes.id, codeId)).get()?.name ?? null;
  }

  /** The code's links in position order. */
  linksOf(codeId: string): EntryLink[] {
    return this.reader.linksOf(codeId);
  }

  /**
   * Links entries stored before the chain existed (or by a build without it): per code in cursor
   * order, continuing from the code's last link. Inserts only. Returns how many links were added;
   * a code whose entries cannot be hashed is left as it is and named in `failed`.
   */
  backfillLinks(): { added: number; codes: number; failed: { codeId: string; error: string }[] } {
    const { sqlite } = this.database;
    const codeIds = sqlite
      .prepare<[], string>('SELECT DISTINCT e.code_id FROM entries e WHERE NOT EXISTS (SELECT 1 FROM entry_links l WHERE l.entry_id = e.id)')
      .pluck()
      .all();
    const rowsOf = sqlite.prepare<[string], RawEntryRow>(
      'SELECT e.* FROM entries e WHERE e.code_id = ? AND NOT EXISTS (SELECT 1 FROM entry_links l WHERE l.entry_id = e.id) ORDER BY e.cursor',
    );
    const linkCode = sqlite.transaction((codeId: string): number => {
      const rows = rowsOf.all(codeId);
      for (const row of rows) this.appendLink(fromRawEntry(row));
      return rows.length;
    });
    let added = 0;
    let linkedCodes = 0;
    const failed: { codeId: string; error: string }[] = [];
    for (const codeId of codeIds) {
      try {
        // Write lock first: another process on the file (the user:add command) cannot interleave.
        added += linkCode.immediate(codeId);
        linkedCodes++;
      } catch (err) {
        failed.push({ codeId, error: (err as Error).message });
      }
    }
    return { added, codes: linkedCodes, failed };
  }

  /** Every code's id, oldest first (the backup check walks them all). */
  allCodeIds(): string[] {
    return this.reader.allCodeIds();
  }

  logReader(): LogReader {
    return this.reader;
  }

  /** The ids of a code's entries in cursor order: what a device compares its own copy with. */
  entryIdsOf(codeId: string): string[] {
    return this.database.sqlite.prepare<[string], string>('SELECT id FROM entries WHERE code_id = ? ORDER BY cursor').pluck().all(codeId);
  }

  entryCount(codeId: string): number {
    return this.hot.entryCount.get(codeId)?.n ?? 0;
  }

  entriesOf(codeId: string, afterCursor = 0): StoredEntry[] {
    return this.reader.entriesOf(codeId, afterCursor);
  }
}
