import session from 'express-session';
import { and, eq, gt, lt, ne, sql } from 'drizzle-orm';
import type { Db } from '../db/database.js';
import { sessions } from '../db/schema/index.js';

type Callback = (err?: unknown) => void;

/**
 * express-session's store on our SQLite file, so a server restart signs nobody out. The signed-in
 * user's id is kept in its own column so a person's sessions can be listed and ended.
 */
export class SqliteSessionStore extends session.Store {
  constructor(
    private readonly db: Db,
    /** The idle timeout, kept here on the server: every request (and every tap on the socket) pushes it forward. */
    private readonly idleMs: number,
    /** The absolute timeout, from sign-in. */
    private readonly absoluteMs: number,
  ) {
    super();
    // Prepared once: the live socket asks on every tap.
    this.liveQuery = db
      .select({ data: sessions.data, userId: sessions.userId, expiresAt: sessions.expiresAt })
      .from(sessions)
      .where(eq(sessions.sid, sql.placeholder('sid')))
      .prepare();
    this.touchQuery = db
      .update(sessions)
      .set({ expiresAt: sql`${sql.placeholder('expiresAt')}`, lastSeenAt: sql`${sql.placeholder('now')}` })
      .where(and(eq(sessions.sid, sql.placeholder('sid')), gt(sessions.expiresAt, sql.placeholder('now'))))
      .prepare();
  }

  private readonly liveQuery;
  private readonly touchQuery;

  private expiresAt(): number {
    return Date.now() + this.idleMs;
  }

  override get(sid: string, cb: (err: unknown, session?: session.SessionData | null) => void): void {
    try {
      const row = this.db.select().from(sessions).where(eq(sessions.sid, sid)).get();
      if (!row || row.expiresAt <= Date.now()) return cb(null, null);
      cb(null, JSON.parse(row.data) as session.SessionData);
    } catch (err) {
      cb(err);
    }
  }

  override set(sid: string, sess: session.SessionData, cb?: Callback): void {
    try {
      const now = Date.now();
      const values = {
        data: JSON.stringify(sess),
        userId: sess.passport?.user ?? null,
        expiresAt: this.expiresAt(),
        lastSeenAt: now,
      };
      this.db
        .insert(sessions)
        .values({ sid, createdAt: now, ...values })
        .onConflictDoUpdate({ target: sessions.sid, set: values })
        .run();
      cb?.();
    } catch (err) {
      cb?.(err);
    }
  }

  override touch(sid: string, _sess: session.SessionData, cb?: Callback): void {
    try {
      this.db
        .update(sessions)
        .set({ expiresAt: this.expiresAt(), lastSeenAt: Date.now() })
        .where(eq(sessions.sid, sid))
        .run();
      cb?.();
    } catch (err) {
      cb?.(err);
    }
  }

  override destroy(sid: string, cb?: Callback): void {
    try {
      this.db.delete(sessions).where(eq(sessions.sid, sid)).run();
      cb?.();
    } catch (err) {
      cb?.(err);
    }
  }

  /**
   * The signed-in person of a session that is still alive (within its idle and absolute
   * timeouts), or undefined: what a live socket checks before each write.
   */
  liveSession(sid: string, now = Date.now()): { userId: string } | undefined {
    const row = this.liveQuery.get({ sid });
    if (!row?.userId || row.expiresAt <= now) return undefined;
    const signedInAt = (JSON.parse(row.data) as { signedInAt?: number }).signedInAt;
    if (signedInAt === undefined || now - signedInAt > this.absoluteMs) return undefined;
    return { userId: row.userId };
  }

  /** Activity on a live socket (a tap) counts like a request: the idle timeout starts again. */
  touchIdle(sid: string): void {
    const now = Date.now();
    this.touchQuery.run({ sid, now, expiresAt: now + this.idleMs });
  }

  /** Removes expired rows; called on a timer. */
  prune(now = Date.now()): number {
    return this.db.delete(sessions).where(lt(sessions.expiresAt, now)).run().changes;
  }

  /** Ends every session of one user except, optionally, one. */
  destroyForUser(userId: string, exceptSid?: string): string[] {
    const where = exceptSid ? and(eq(sessions.userId, userId), ne(sessions.sid, exceptSid)) : eq(sessions.userId, userId);
    const rows = this.db.select({ sid: sessions.sid }).from(sessions).where(where).all();
    this.db.delete(sessions).where(where).run();
    return rows.map((r) => r.sid);
  }

  /** Records the browser of a signed-in session, for the session list. */
  setUserAgent(sid: string, userAgent: string | undefined): void {
    this.db.update(sessions).set({ userAgent: userAgent?.slice(0, 300) ?? null }).where(eq(sessions.sid, sid)).run();
  }
}
