import { Inject, Injectable } from '@nestjs/common';
import { and, asc, count, eq, gte, lt } from 'drizzle-orm';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { loginFailures } from '../db/schema/index.js';

const WINDOW_MS = 60 * 60 * 1000;

/**
 * At most N failed sign-ins per account name per rolling hour, counted in SQLite so a restart
 * does not reset it. Names that do not exist are counted the same way, so the answer never
 * tells whether an account exists.
 */
@Injectable()
export class LoginThrottleService {
  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  private key(username: string): string {
    return username.trim().toLowerCase();
  }

  /** Seconds until the next attempt is allowed, or 0 when one is allowed now. */
  retryAfterSeconds(username: string, now = Date.now()): number {
    const since = now - WINDOW_MS;
    const where = and(eq(loginFailures.username, this.key(username)), gte(loginFailures.at, since));
    const failures = this.db.select({ n: count() }).from(loginFailures).where(where).get()?.n ?? 0;
    if (failures < this.config.loginAccountLimit) return 0;
    // The window frees one attempt when the oldest failure that still counts leaves it.
    const rows = this.db
      .select({ at: loginFailures.at })
      .from(loginFailures)
      .where(where)
      .orderBy(asc(loginFailures.at))
      .limit(failures - this.config.loginAccountLimit + 1)
      .all();
    const freeingAt = (rows[rows.length - 1]?.at ?? now) + WINDOW_MS;
    return Math.max(1, Math.ceil((freeingAt - now) / 1000));
  }

  recordFailure(username: string, ip: string | undefined, now = Date.now()): void {
    this.db.insert(loginFailures).values({ username: this.key(username), at: now, ip: ip ?? null }).run();
  }

  clear(username: string): void {
    this.db.delete(loginFailures).where(eq(loginFailures.username, this.key(username))).run();
  }

  prune(now = Date.now()): void {
    this.db.delete(loginFailures).where(lt(loginFailures.at, now - WINDOW_MS)).run();
  }
}
