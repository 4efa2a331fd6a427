import { Inject, Injectable } from '@nestjs/common';
import { and, asc, eq } from 'drizzle-orm';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { attachments, users } from '../db/schema/index.js';

/** An attachment as the API shows it; `uploadedBy` is the uploader's display name. */
export interface Attachment {
  id: string;
  codeId: string;
  filename: string;
  mediaType: string;
  sizeBytes: number;
  sha256: string;
  uploadedAt: string;
  uploadedBy: string;
}

const shown = {
  id: attachments.id,
  codeId: attachments.codeId,
  filename: attachments.filename,
  mediaType: attachments.mediaType,
  sizeBytes: attachments.sizeBytes,
  sha256: attachments.sha256,
  uploadedAt: attachments.uploadedAt,
  uploadedBy: users.displayName,
};

@Injectable()
export class AttachmentsRepository {
  constructor(@Inject(DB) private readonly db: Db) {}

  /**
   * Adds the row unless this code already has a file with the same digest (a retried upload);
   * either way answers with the stored row. One synchronous transaction, so two retries cannot both insert.
   */
  insertUnlessPresent(row: typeof attachments.$inferInsert): { attachment: Attachment; created: boolean } {
    return this.db.transaction((tx) => {
      const existing = tx
        .select({ id: attachments.id })
        .from(attachments)
        .where(and(eq(attachments.codeId, row.codeId), eq(attachments.sha256, row.sha256)))
        .get();
      if (!existing) tx.insert(attachments).values(row).run();
      const id = existing?.id ?? row.id;
      const attachment = tx.select(shown).from(attachments).innerJoin(users, eq(users.id, attachments.uploadedBy)).where(eq(attachments.id, id)).get();
      if (!attachment) throw new Error(`Attachment ${id} vanished inside its transaction`);
      return { attachment, created: !existing };
    });
  }

  find(id: string): Attachment | undefined {
    return this.db.select(shown).from(attachments).innerJoin(users, eq(users.id, attachments.uploadedBy)).where(eq(attachments.id, id)).get();
  }

  listByCode(codeId: string): Attachment[] {
    return this.db
      .select(shown)
      .from(attachments)
      .innerJoin(users, eq(users.id, attachments.uploadedBy))
      .where(eq(attachments.codeId, codeId))
      .orderBy(asc(attachments.uploadedAt), asc(attachments.id))
      .all();
  }
}
