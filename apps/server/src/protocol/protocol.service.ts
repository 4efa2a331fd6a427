import { isDeepStrictEqual } from 'node:util';
import { Inject, Injectable, NotFoundException, OnModuleInit } from '@nestjs/common';
import {
  DEFAULT_PROTOCOL,
  parseStoredProtocol,
  type ProtocolDocument,
  type ProtocolSettings,
  type ProtocolVersion,
} from '@steadyhand/shared';
import { desc, eq } from 'drizzle-orm';
import { AuditService } from '../audit/audit.service.js';
import type { SessionUser } from '../auth/session-user.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { protocolVersions, settings, users } from '../db/schema/index.js';

/** Where the settings lived before versions: read once, to make version 1. */
const LEGACY_PROTOCOL_KEY = 'protocol';

/**
 * The local protocol, one numbered version per save. The newest version is in force for new
 * codes; a code keeps the version it started with (codes started before versions existed use
 * version 1), so an admin's change never alters a past code.
 */
@Injectable()
export class ProtocolService implements OnModuleInit {
  /** Parsed versions by number: a version never changes once written. */
  private readonly cache = new Map<number, ProtocolSettings>();

  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  /** Version 1: the settings an admin had saved before versions existed, or the published defaults. */
  onModuleInit(): void {
    if (this.db.select({ version: protocolVersions.version }).from(protocolVersions).limit(1).get()) return;
    const legacy = this.db.select().from(settings).where(eq(settings.key, LEGACY_PROTOCOL_KEY)).get();
    const parsed = legacy ? parseStoredProtocol(legacy.value) : null;
    this.db
      .insert(protocolVersions)
      .values({
        version: 1,
        settings: parsed?.success ? parsed.data : DEFAULT_PROTOCOL,
        savedAt: legacy?.updatedAt ?? new Date().toISOString(),
        savedBy: parsed?.success ? (legacy?.updatedBy ?? null) : null,
      })
      .run();
  }

  /** The number of the version in force. */
  currentVersion(): number {
    return this.db.select({ version: protocolVersions.version }).from(protocolVersions).orderBy(desc(protocolVersions.version)).limit(1).get()?.version ?? 1;
  }

  /** The version if this server has it, else undefined (a device may name one a restored server lacks). */
  knownVersion(version: number | undefined): number | undefined {
    if (version === undefined) return undefined;
    return this.db.select({ version: protocolVersions.version }).from(protocolVersions).where(eq(protocolVersions.version, version)).get()?.version;
  }

  current(): ProtocolSettings {
    return this.settingsOf(this.currentVersion());
  }

  /** A code's own protocol: the version it started with. */
  forCode(code: { protocolVersion: number | null }): ProtocolSettings {
    return this.settingsOf(code.protocolVersion ?? 1);
  }

  /** The settings of one version; 404 when there is no such version. */
  settingsOf(version: number): ProtocolSettings {
    const cached = this.cache.get(version);
    if (cached) return cached;
    const row = this.db.select({ settings: protocolVersions.settings }).from(protocolVersions).where(eq(protocolVersions.version, version)).get();
    if (!row) throw new NotFoundException(`No protocol version ${version}`);
    const parsed = parseStoredProtocol(row.settings);
    // A stored version that no longer reads must not break the codes that used it: say so, use the defaults.
    const value = parsed.success ? parsed.data : DEFAULT_PROTOCOL;
    this.cache.set(version, value);
    return value;
  }

  version(version: number): ProtocolVersion {
    const row = this.db
      .select({ version: protocolVersions.version, savedAt: protocolVersions.savedAt, savedBy: users.displayName })
      .from(protocolVersions)
      .leftJoin(users, eq(users.id, protocolVersions.savedBy))
      .where(eq(protocolVersions.version, version))
      .get();
    if (!row) throw new NotFoundException(`No protocol version ${version}`);
    return { version: row.version, protocol: this.settingsOf(row.version), savedAt: row.savedAt, savedBy: row.savedBy ?? null };
  }

  /** The version in force, with who saved it (by display name, as the admin page shows it). */
  document(): ProtocolDocument {
    const v = this.version(this.currentVersion());
    return { protocol: v.protocol, version: v.version, updatedAt: v.version === 1 && v.savedBy === null ? null : v.savedAt, updatedBy: v.savedBy };
  }

  /** Saves the whole settings (already validated) as a new version, and audits what changed. */
  save(user: SessionUser, next: ProtocolSettings, action = 'protocol.changed'): ProtocolDocument {
    const before = this.current();
    const changed = (Object.keys(next) as (keyof ProtocolSettings)[]).filter((k) => !isDeepStrictEqual(before[k], next[k]));
    const now = new Date().toISOString();
    const version = this.db.transaction((tx) => {
      const last = tx.select({ version: protocolVersions.version }).from(protocolVersions).orderBy(desc(protocolVersions.version)).limit(1).get();
      const number = (last?.version ?? 0) + 1;
      tx.insert(protocolVersions).values({ version: number, settings: next, savedAt: now, savedBy: user.id }).run();
      return number;
    });
    // Old and new values of the changed top-level fields only, so the trail stays readable.
    this.audit.record({
      action,
      userId: user.id,
      username: user.username,
      detail: { version, ...Object.fromEntries(changed.map((k) => [k, { from: before[k], to: next[k] }])) },
    });
    return this.document();
  }

  /** Back to the published defaults; saved as a new version, so the page shows who did it and when. */
  reset(user: SessionUser): ProtocolDocument {
    return this.save(user, DEFAULT_PROTOCOL, 'protocol.reset');
  }
}
