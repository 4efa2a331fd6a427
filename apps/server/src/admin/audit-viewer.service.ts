import { Inject, Injectable } from '@nestjs/common';
import { AUDIT_PAGE_SIZE, csvCell, type AuditEvent, type AuditPage, type auditQuerySchema } from '@steadyhand/shared';
import { and, count, desc, eq, gte, like, lt, or, type SQL } from 'drizzle-orm';
import type { z } from 'zod';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { auditEvents } from '../db/schema/index.js';

export type AuditFilter = z.output<typeof auditQuerySchema>;

const CSV_MAX_ROWS = 100_000;
const CSV_COLUMNS = ['id', 'at', 'action', 'username', 'userId', 'codeId', 'ip', 'detail'] as const;

const isDay = (v: string) => /^\d{4}-\d{2}-\d{2}$/.test(v);
/** A day starts at 00:00 UTC; `to` as a day includes that whole day. */
function bound(value: string, end: boolean): string {
  if (!isDay(value)) return new Date(value).toISOString();
  const day = new Date(`${value}T00:00:00.000Z`);
  if (end) day.setUTCDate(day.getUTCDate() + 1);
  return day.toISOString();
}

/** Reads the append-only audit trail: filtered, newest first, a page at a time or as CSV. */
@Injectable()
export class AuditViewerService {
  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  private where(f: AuditFilter): SQL | undefined {
    const parts: (SQL | undefined)[] = [];
    if (f.person) parts.push(or(eq(auditEvents.userId, f.person), eq(auditEvents.username, f.person)));
    if (f.codeId) parts.push(eq(auditEvents.codeId, f.codeId));
    // A family of actions ("user.") or one action ("user.disabled").
    if (f.action) parts.push(f.action.endsWith('.') ? like(auditEvents.action, `${f.action.replace(/[%_]/g, '')}%`) : eq(auditEvents.action, f.action));
    if (f.from) parts.push(gte(auditEvents.at, bound(f.from, false)));
    if (f.to) parts.push(lt(auditEvents.at, bound(f.to, true)));
    return parts.length ? and(...parts) : undefined;
  }

  page(f: AuditFilter): AuditPage {
    const where = this.where(f);
    const total = this.db.select({ n: count() }).from(auditEvents).where(where).get()?.n ?? 0;
    const events = this.db
      .select()
      .from(auditEvents)
      .where(where)
      .orderBy(desc(auditEvents.id))
      .limit(AUDIT_PAGE_SIZE)
      .offset((f.page - 1) * AUDIT_PAGE_SIZE)
      .all() as AuditEvent[];
    return { events, total, page: f.page, pageSize: AUDIT_PAGE_SIZE };
  }

  /** The export is itself a privileged act, so it is recorded (with the filters used). */
  csv(actor: SessionUser, f: AuditFilter, ip: string | undefined): string {
    const rows = this.db.select().from(auditEvents).where(this.where(f)).orderBy(desc(auditEvents.id)).limit(CSV_MAX_ROWS).all();
    const { page: _page, ...filters } = f;
    this.audit.record({ action: 'audit.exported', userId: actor.id, username: actor.username, ip: ip ?? null, detail: { filters, rows: rows.length } });
    const lines = [CSV_COLUMNS.join(','), ...rows.map((r) => CSV_COLUMNS.map((c) => csvCell(r[c])).join(','))];
    return lines.join('\r\n') + '\r\n';
  }
}
