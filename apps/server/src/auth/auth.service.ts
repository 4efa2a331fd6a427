import { HttpException, HttpStatus, Inject, Injectable, UnauthorizedException } from '@nestjs/common';
import type { LoginRequest, PublicUser } from '@steadyhand/shared';
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { AuditService } from '../audit/audit.service.js';
import { toPublicUser } from '../users/users.service.js';
import { AuthPassportService } from './auth-passport.service.js';
import { ensureCsrfToken } from './csrf.js';
import { LoginThrottleService } from './login-throttle.service.js';
import { SessionService } from './session.service.js';
import type { SessionUser } from './session-user.js';

export const THROTTLED_MESSAGE = 'Too many sign-in attempts. Wait a while and try again.';

@Injectable()
export class AuthService {
  constructor(
    @Inject(AuthPassportService) private readonly auth: AuthPassportService,
    @Inject(LoginThrottleService) private readonly throttle: LoginThrottleService,
    @Inject(SessionService) private readonly sessions: SessionService,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  /** Checks the password through passport-local and starts a new session (new id) on success. */
  async login(req: Request, res: Response, body: LoginRequest): Promise<PublicUser> {
    const retryAfter = this.throttle.retryAfterSeconds(body.username);
    if (retryAfter > 0) {
      res.setHeader('Retry-After', String(retryAfter));
      throw new HttpException(THROTTLED_MESSAGE, HttpStatus.TOO_MANY_REQUESTS);
    }
    req.body = body; // passport-local reads username and password from the (validated) body
    const user = await new Promise<SessionUser | false>((resolve, reject) => {
      const fail = (err: unknown) => reject(err instanceof Error ? err : new Error(String(err)));
      const next: NextFunction = (err?: unknown) => (err ? fail(err) : resolve(false));
      const authenticate = this.auth.passport.authenticate(
        'local',
        { session: false },
        (err: unknown, u: SessionUser | false) => (err ? fail(err) : resolve(u)),
      ) as RequestHandler;
      authenticate(req, res, next);
    });
    if (!user) {
      this.throttle.recordFailure(body.username, req.ip);
      this.audit.record({ action: 'auth.login-failed', username: body.username.slice(0, 64), ip: req.ip });
      throw new UnauthorizedException('Wrong username or password');
    }
    // passport 0.7 regenerates the session on logIn, so a session id from before sign-in is never reused.
    await new Promise<void>((resolve, reject) => req.logIn(user, (err) => (err ? reject(err as Error) : resolve())));
    req.session.signedInAt = Date.now();
    ensureCsrfToken(req);
    await new Promise<void>((resolve, reject) => req.session.save((err) => (err ? reject(err as Error) : resolve())));
    this.sessions.store.setUserAgent(req.sessionID, req.get('user-agent'));
    this.throttle.clear(body.username);
    this.audit.record({ action: 'auth.login', userId: user.id, username: user.username, ip: req.ip });
    return toPublicUser(user);
  }

  /** Destroys the session and closes its live connections. */
  async logout(req: Request, res: Response, cookieName: string): Promise<void> {
    const sid = req.sessionID;
    const user = req.user;
    if (req.session) {
      await new Promise<void>((resolve, reject) => req.session.destroy((err) => (err ? reject(err as Error) : resolve())));
    }
    res.clearCookie(cookieName, { path: '/' });
    if (sid) this.sessions.ended([sid]);
    if (user) this.audit.record({ action: 'auth.logout', userId: user.id, username: user.username, ip: req.ip });
  }
}
