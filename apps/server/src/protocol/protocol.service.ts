import { isDeepStrictEqual } from 'node:util';
import { Inject, Injectable } from '@nestjs/common';
import { DEFAULT_PROTOCOL, protocolSettingsSchema, type ProtocolDocument, type ProtocolSettings } from '@steadyhand/shared';
import { eq } from 'drizzle-orm';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { settings, users } from '../db/schema/index.js';

const PROTOCOL_KEY = 'protocol';

/** The local protocol in force: the admin's saved settings, or the published defaults. */
@Injectable()
export class ProtocolService {
  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  current(): ProtocolSettings {
    return this.document().protocol;
  }

  /** The settings with who saved them last (by display name, as the admin page shows it). */
  document(): ProtocolDocument {
    const row = this.db
      .select({ value: settings.value, updatedAt: settings.updatedAt, updatedBy: users.displayName })
      .from(settings)
      .leftJoin(users, eq(users.id, settings.updatedBy))
      .where(eq(settings.key, PROTOCOL_KEY))
      .get();
    if (!row) return { protocol: DEFAULT_PROTOCOL, updatedAt: null, updatedBy: null };
    const parsed = protocolSettingsSchema.safeParse(row.value);
    // A stored value that no longer passes the schema must not break every screen: fall back.
    if (!parsed.success) return { protocol: DEFAULT_PROTOCOL, updatedAt: null, updatedBy: null };
    return { protocol: parsed.data, updatedAt: row.updatedAt, updatedBy: row.updatedBy ?? null };
  }

  /** Saves the whole settings (already validated by the shared schema) and audits what changed. */
  save(user: SessionUser, next: ProtocolSettings, action = 'protocol.changed'): ProtocolDocument {
    const before = this.current();
    const changed = (Object.keys(next) as (keyof ProtocolSettings)[]).filter((k) => !isDeepStrictEqual(before[k], next[k]));
    const now = new Date().toISOString();
    this.db.transaction((tx) => {
      tx.insert(settings)
        .values({ key: PROTOCOL_KEY, value: next, updatedAt: now, updatedBy: user.id })
        .onConflictDoUpdate({ target: settings.key, set: { value: next, updatedAt: now, updatedBy: user.id } })
        .run();
    });
    // Old and new values of the changed top-level fields only, so the trail stays readable.
    this.audit.record({
      action,
      userId: user.id,
      username: user.username,
      detail: Object.fromEntries(changed.map((k) => [k, { from: before[k], to: next[k] }])),
    });
    return this.document();
  }

  /** Back to the published defaults; stored as a save, so the page shows who did it and when. */
  reset(user: SessionUser): ProtocolDocument {
    return this.save(user, DEFAULT_PROTOCOL, 'protocol.reset');
  }
}
