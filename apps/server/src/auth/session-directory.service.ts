import { createHash } from 'node:crypto';
import { Inject, Injectable, NotFoundException } from '@nestjs/common';
import type { SessionInfo } from '@steadyhand/shared';
import { and, desc, eq, gt, isNotNull } from 'drizzle-orm';
import { AuditService } from '../audit/audit.service.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { sessions, users } from '../db/schema/index.js';
import { SessionService } from './session.service.js';
import type { SessionUser } from './session-user.js';

/** The id shown for a session: a hash, because the session id itself signs someone in. */
export const sessionHandle = (sid: string) => createHash('sha256').update(sid).digest('base64url').slice(0, 24);

/** Signed-in sessions as people see them (who, which device, last seen), and ending one. */
@Injectable()
export class SessionDirectoryService {
  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(SessionService) private readonly sessions: SessionService,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  private rows(userId?: string) {
    const live = and(isNotNull(sessions.userId), gt(sessions.expiresAt, Date.now()));
    return this.db
      .select({
        sid: sessions.sid,
        userId: sessions.userId,
        username: users.username,
        displayName: users.displayName,
        userAgent: sessions.userAgent,
        createdAt: sessions.createdAt,
        lastSeenAt: sessions.lastSeenAt,
      })
      .from(sessions)
      .innerJoin(users, eq(users.id, sessions.userId))
      .where(userId ? and(live, eq(sessions.userId, userId)) : live)
      .orderBy(desc(sessions.lastSeenAt))
      .all();
  }

  list(currentSid: string, userId?: string): SessionInfo[] {
    return this.rows(userId).map((r) => ({
      id: sessionHandle(r.sid),
      userId: r.userId ?? '',
      username: r.username,
      displayName: r.displayName,
      userAgent: r.userAgent,
      createdAt: new Date(r.createdAt).toISOString(),
      lastSeenAt: new Date(r.lastSeenAt).toISOString(),
      current: r.sid === currentSid,
    }));
  }

  /** Ends one session (only the caller's own unless `anyone`) and closes its live sockets. */
  end(actor: SessionUser, handle: string, options: { anyone: boolean; ip?: string }): void {
    const row = this.rows(options.anyone ? undefined : actor.id).find((r) => sessionHandle(r.sid) === handle);
    if (!row) throw new NotFoundException('No such session (it may have ended already)');
    this.sessions.store.destroy(row.sid);
    this.sessions.ended([row.sid]);
    this.audit.record({
      action: 'session.ended',
      userId: actor.id,
      username: actor.username,
      ip: options.ip ?? null,
      detail: { session: handle, of: row.username, by: options.anyone ? 'admin' : 'self' },
    });
  }
}
