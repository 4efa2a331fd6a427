import { Inject, Injectable } from '@nestjs/common';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { auditEvents } from '../db/schema/index.js';

export interface AuditRecord {
  action: string;
  userId?: string | null;
  username?: string | null;
  codeId?: string | null;
  ip?: string | null;
  detail?: Record<string, unknown>;
}

@Injectable()
export class AuditRepository {
  constructor(@Inject(DB) private readonly db: Db) {}

  insert(record: AuditRecord, at: string): void {
    this.db
      .insert(auditEvents)
      .values({
        at,
        action: record.action,
        userId: record.userId ?? null,
        username: record.username ?? null,
        codeId: record.codeId ?? null,
        ip: record.ip ?? null,
        detail: record.detail ?? null,
      })
      .run();
  }
}
