import { createHash, randomBytes } from 'node:crypto';
import { HttpException, HttpStatus, Inject, Injectable, type OnModuleDestroy } from '@nestjs/common';
import { and, asc, count, eq, gte, isNull, lt, max, type SQL } from 'drizzle-orm';
import type { Request } from 'express';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { knownDevices, loginFailures } from '../db/schema/index.js';

const ACCOUNT_WINDOW_MS = 60 * 60 * 1000;
const ADDRESS_WINDOW_MS = 15 * 60 * 1000;
/** Failures from one address on one account before each next try must wait. */
export const PAIR_FREE_FAILURES = 5;
/** The longest wait the back-off asks for: 1 s, 2 s, 4 s ... up to 15 minutes. */
const PAIR_MAX_DELAY_S = 15 * 60;
const KNOWN_DEVICE_DAYS = 180;

/** The cookie that marks a device someone has signed in from. */
export const DEVICE_COOKIE = 'steadyhand.device';

export const THROTTLED_MESSAGE = 'Too many sign-in attempts. Wait a while and try again.';

/** A 429 that says how many seconds to wait; the API filter sends it as Retry-After. */
export class TooManyAttemptsException extends HttpException {
  constructor(readonly retryAfterSeconds: number) {
    super({ statusCode: HttpStatus.TOO_MANY_REQUESTS, error: 'Too Many Requests', message: THROTTLED_MESSAGE }, HttpStatus.TOO_MANY_REQUESTS);
  }
}

/** Where a password attempt comes from: the client address and the device cookie, if any. */
export interface PasswordAttempt {
  ip: string | undefined;
  deviceId: string | undefined;
}

/** The device cookie's value from a request (no cookie parser runs before the routes). */
export function attemptOf(req: Request): PasswordAttempt {
  const header = req.headers.cookie ?? '';
  const match = new RegExp(`(?:^|;\\s*)${DEVICE_COOKIE.replace('.', '\\.')}=([A-Za-z0-9_-]{20,100})(?:;|$)`).exec(header);
  return { ip: req.ip, deviceId: match?.[1] };
}

const hashDevice = (deviceId: string) => createHash('sha256').update(deviceId).digest('hex');

/**
 * Throttles password guessing without letting a stranger lock the owner out. Only real password
 * failures count (a wrong sign-in, a wrong password typed again to sign or to change it; never a
 * malformed or CSRF-refused request), in SQLite so a restart does not reset them:
 *
 * - per address: at most LOGIN_IP_LIMIT failures in 15 minutes, then every attempt from that
 *   address waits (the only hard lock);
 * - per account and address: after PAIR_FREE_FAILURES failures, each next try waits twice as
 *   long as the last (1 s, 2 s, 4 s ... 15 min), so the owner elsewhere is never held back;
 * - per account: at most LOGIN_ACCOUNT_LIMIT failures in an hour from devices the account has
 *   not signed in from before; a known device (its cookie) is not held back by it.
 *
 * Names that do not exist are counted the same way, so the answer never tells whether an
 * account exists.
 */
@Injectable()
export class LoginThrottleService implements OnModuleDestroy {
  private readonly pruneTimer: NodeJS.Timeout;

  constructor(
    @Inject(DB) private readonly db: Db,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {
    this.pruneTimer = setInterval(() => this.prune(), 10 * 60 * 1000);
    this.pruneTimer.unref();
  }

  onModuleDestroy(): void {
    clearInterval(this.pruneTimer);
  }

  private key(username: string): string {
    return username.trim().toLowerCase();
  }

  /** Seconds until this attempt may be made, or 0 when it may be made now. */
  retryAfterSeconds(username: string, attempt: PasswordAttempt, now = Date.now()): number {
    const user = this.key(username);
    const waits = [this.addressWait(attempt.ip, now), this.pairWait(user, attempt.ip, now)];
    if (!this.isKnownDevice(user, attempt.deviceId)) waits.push(this.accountWait(user, now));
    const waitMs = Math.max(0, ...waits);
    return waitMs > 0 ? Math.max(1, Math.ceil(waitMs / 1000)) : 0;
  }

  /** Throws a 429 with the wait when this attempt must wait. */
  assertMayTry(username: string, attempt: PasswordAttempt): void {
    const seconds = this.retryAfterSeconds(username, attempt);
    if (seconds > 0) throw new TooManyAttemptsException(seconds);
  }

  recordFailure(username: string, ip: string | undefined, now = Date.now()): void {
    this.db.insert(loginFailures).values({ username: this.key(username), at: now, ip: ip ?? null }).run();
  }

  /**
   * The right password from this address: its back-off starts again (failures from elsewhere
   * still count), and the device is remembered for the account. Returns the device id to keep
   * in the cookie (a new one when the device had none).
   */
  succeeded(username: string, attempt: PasswordAttempt, now = Date.now()): string {
    const user = this.key(username);
    this.db.delete(loginFailures).where(and(eq(loginFailures.username, user), this.fromAddress(attempt.ip))).run();
    const deviceId = attempt.deviceId ?? randomBytes(32).toString('base64url');
    this.db
      .insert(knownDevices)
      .values({ deviceHash: hashDevice(deviceId), username: user, lastSeenAt: now })
      .onConflictDoUpdate({ target: [knownDevices.deviceHash, knownDevices.username], set: { lastSeenAt: now } })
      .run();
    return deviceId;
  }

  /** How long the device cookie lives, in milliseconds. */
  get deviceCookieMaxAgeMs(): number {
    return KNOWN_DEVICE_DAYS * 24 * 3600 * 1000;
  }

  prune(now = Date.now()): void {
    this.db.delete(loginFailures).where(lt(loginFailures.at, now - ACCOUNT_WINDOW_MS)).run();
    this.db.delete(knownDevices).where(lt(knownDevices.lastSeenAt, now - this.deviceCookieMaxAgeMs)).run();
  }

  private fromAddress(ip: string | undefined) {
    return ip === undefined ? isNull(loginFailures.ip) : eq(loginFailures.ip, ip);
  }

  private isKnownDevice(user: string, deviceId: string | undefined): boolean {
    if (!deviceId) return false;
    const since = Date.now() - this.deviceCookieMaxAgeMs;
    const row = this.db
      .select({ at: knownDevices.lastSeenAt })
      .from(knownDevices)
      .where(and(eq(knownDevices.deviceHash, hashDevice(deviceId)), eq(knownDevices.username, user)))
      .get();
    return row !== undefined && row.at >= since;
  }

  /** The hard lock per address: the window frees one attempt when the oldest counted failure leaves it. */
  private addressWait(ip: string | undefined, now: number): number {
    if (ip === undefined) return 0;
    return this.windowWait(and(eq(loginFailures.ip, ip), gte(loginFailures.at, now - ADDRESS_WINDOW_MS)), this.config.loginIpLimit, ADDRESS_WINDOW_MS, now);
  }

  private accountWait(user: string, now: number): number {
    return this.windowWait(and(eq(loginFailures.username, user), gte(loginFailures.at, now - ACCOUNT_WINDOW_MS)), this.config.loginAccountLimit, ACCOUNT_WINDOW_MS, now);
  }

  private windowWait(where: SQL | undefined, limit: number, windowMs: number, now: number): number {
    const failures = this.db.select({ n: count() }).from(loginFailures).where(where).get()?.n ?? 0;
    if (failures < limit) return 0;
    const rows = this.db.select({ at: loginFailures.at }).from(loginFailures).where(where).orderBy(asc(loginFailures.at)).limit(failures - limit + 1).all();
    return (rows[rows.length - 1]?.at ?? now) + windowMs - now;
  }

  /** Exponential back-off for one account from one address. */
  private pairWait(user: string, ip: string | undefined, now: number): number {
    const row = this.db
      .select({ n: count(), last: max(loginFailures.at) })
      .from(loginFailures)
      .where(and(eq(loginFailures.username, user), this.fromAddress(ip), gte(loginFailures.at, now - ACCOUNT_WINDOW_MS)))
      .get();
    const n = row?.n ?? 0;
    if (n < PAIR_FREE_FAILURES || row?.last === null || row?.last === undefined) return 0;
    const delayS = Math.min(2 ** (n - PAIR_FREE_FAILURES), PAIR_MAX_DELAY_S);
    return row.last + delayS * 1000 - now;
  }
}
