import { Inject, Injectable } from '@nestjs/common';
import { eq } from 'drizzle-orm';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { codes, mailLog } from '../db/schema/index.js';

export type MailLogRow = typeof mailLog.$inferSelect;

@Injectable()
export class MailRepository {
  constructor(@Inject(DB) private readonly db: Db) {}

  log(row: typeof mailLog.$inferInsert): void {
    this.db.insert(mailLog).values(row).run();
  }

  logOf(codeId: string): MailLogRow[] {
    return this.db.select().from(mailLog).where(eq(mailLog.codeId, codeId)).all();
  }

  /** Where and when the code happened, for the subject and body; no patient details go by mail. */
  codeHeadline(codeId: string): { location: string | null; arrestAt: string } | undefined {
    return this.db.select({ location: codes.location, arrestAt: codes.arrestAt }).from(codes).where(eq(codes.id, codeId)).get();
  }
}
