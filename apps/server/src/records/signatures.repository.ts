import { Inject, Injectable } from '@nestjs/common';
import type Database from 'better-sqlite3';
import type { SignatureMeaning } from '@steadyhand/shared';
import { and, asc, eq, inArray, like } from 'drizzle-orm';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { attachments, auditEvents, qualityReviews, settings, signatures } from '../db/schema/index.js';
import type { RecordAttachment } from './record-canonical.js';

export type SignatureRow = typeof signatures.$inferSelect;

export const DEFAULT_FACILITY = 'Steadyhand';

/** Whether any record was ever signed in this database; read before the app is built (see assertRecordKeysPresent). */
export function databaseHasSignatures(sqlite: Database.Database): boolean {
  return sqlite.prepare('SELECT 1 FROM signatures LIMIT 1').get() !== undefined;
}

/** Signatures (append-only by trigger) and the other rows a record is made of. */
@Injectable()
export class SignaturesRepository {
  constructor(@Inject(DB) private readonly db: Db) {}

  insert(row: SignatureRow): void {
    this.db.insert(signatures).values(row).run();
  }

  /** In signing order. */
  ofCode(codeId: string): SignatureRow[] {
    return this.db.select().from(signatures).where(eq(signatures.codeId, codeId)).orderBy(asc(signatures.signedAt), asc(signatures.id)).all();
  }

  /** Signatures of many codes in one query (the records list), each code's in signing order. */
  ofCodes(codeIds: readonly string[]): Map<string, SignatureRow[]> {
    const byCode = new Map<string, SignatureRow[]>(codeIds.map((id) => [id, []]));
    if (codeIds.length === 0) return byCode;
    const rows = this.db.select().from(signatures).where(inArray(signatures.codeId, [...codeIds])).orderBy(asc(signatures.signedAt), asc(signatures.id)).all();
    for (const row of rows) byCode.get(row.codeId)?.push(row);
    return byCode;
  }

  /** Codes with a signature over this digest (verification by digest alone). */
  codesSignedWithDigest(digest: string): string[] {
    const rows = this.db.selectDistinct({ codeId: signatures.codeId }).from(signatures).where(eq(signatures.recordDigest, digest)).all();
    return rows.map((r) => r.codeId);
  }

  attachmentsOf(codeId: string): RecordAttachment[] {
    return this.db
      .select({
        id: attachments.id,
        sha256: attachments.sha256,
        filename: attachments.filename,
        mediaType: attachments.mediaType,
        sizeBytes: attachments.sizeBytes,
        uploadedAt: attachments.uploadedAt,
      })
      .from(attachments)
      .where(eq(attachments.codeId, codeId))
      .orderBy(asc(attachments.uploadedAt), asc(attachments.id))
      .all();
  }

  /** The facility settings: `{ name, timeZone? }` (the time zone prints clock times on paper). */
  facility(): { name: string; timeZone: string | undefined } {
    const row = this.db.select({ value: settings.value }).from(settings).where(eq(settings.key, 'facility')).get();
    const value = (row?.value ?? {}) as { name?: unknown; timeZone?: unknown };
    const name = typeof value.name === 'string' && value.name.trim() ? value.name.trim() : DEFAULT_FACILITY;
    return { name, timeZone: typeof value.timeZone === 'string' ? value.timeZone : undefined };
  }

  /** When and for whom a printed copy with these exact bytes was issued (from the audit trail). */
  findIssuedCopy(codeId: string, fileSha256: string): { at: string; username: string | null } | undefined {
    return this.db
      .select({ at: auditEvents.at, username: auditEvents.username })
      .from(auditEvents)
      .where(and(eq(auditEvents.action, 'record.printed'), eq(auditEvents.codeId, codeId), like(auditEvents.detail, `%"fileSha256":"${fileSha256}"%`)))
      .get();
  }

  /**
   * When the quality review of a code was signed off, or null. Read here rather than through the
   * quality module, which reads records' tables itself (no module cycle).
   */
  qualitySignedOffAt(codeId: string): string | null {
    return this.db.select({ at: qualityReviews.reviewedAt }).from(qualityReviews).where(eq(qualityReviews.codeId, codeId)).get()?.at ?? null;
  }

  meaningsOf(codeId: string): SignatureMeaning[] {
    return this.ofCode(codeId).map((r) => r.meaning);
  }
}
