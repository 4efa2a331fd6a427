import { EventEmitter } from 'node:events';
import { Inject, Injectable, type OnModuleDestroy } from '@nestjs/common';
import session from 'express-session';
import type { RequestHandler } from 'express';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { DB } from '../db/database.module.js';
import type { Db } from '../db/database.js';
import { SqliteSessionStore } from './sqlite-session-store.js';

export const SESSION_COOKIE = 'steadyhand.sid';
/** Over https the cookie takes the __Host- prefix: Secure, no Domain, Path=/. */
export const SECURE_SESSION_COOKIE = '__Host-steadyhand.sid';

/**
 * The one session middleware, shared by Express and the live socket, and the events that let
 * live connections close when their session ends.
 */
@Injectable()
export class SessionService implements OnModuleDestroy {
  readonly store: SqliteSessionStore;
  readonly middleware: RequestHandler;
  /** Emits 'ended' with a session id when a session is destroyed (sign-out, timeout, admin). */
  readonly events = new EventEmitter();
  private readonly pruneTimer: NodeJS.Timeout;

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(DB) db: Db,
  ) {
    this.store = new SqliteSessionStore(db, config.sessionIdleMs, config.sessionAbsoluteMs);
    this.middleware = session({
      name: config.secureCookies ? SECURE_SESSION_COOKIE : SESSION_COOKIE,
      secret: config.sessionSecret,
      store: this.store,
      resave: false,
      saveUninitialized: false,
      // The idle timeout is the store's (server side): every request pushes it forward, and so
      // does a tap on the live socket, which cannot refresh a cookie. The cookie itself lasts
      // as long as the absolute timeout.
      rolling: true,
      proxy: config.trustProxy,
      cookie: {
        httpOnly: true,
        sameSite: 'lax',
        secure: config.secureCookies,
        path: '/',
        maxAge: config.sessionAbsoluteMs,
      },
    });
    this.pruneTimer = setInterval(() => this.store.prune(), 10 * 60 * 1000);
    this.pruneTimer.unref();
  }

  /** Ends the given sessions and tells live connections to close. */
  ended(sids: string[]): void {
    for (const sid of sids) this.events.emit('ended', sid);
  }

  endAllForUser(userId: string, exceptSid?: string): void {
    this.ended(this.store.destroyForUser(userId, exceptSid));
  }

  /** Ends every session of a disabled person and tells live connections to drop them, whatever session they came on. */
  userDisabled(userId: string): void {
    this.endAllForUser(userId);
    this.events.emit('user-disabled', userId);
  }

  onModuleDestroy(): void {
    clearInterval(this.pruneTimer);
    this.events.removeAllListeners();
  }
}
