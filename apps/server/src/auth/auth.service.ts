import { BadRequestException, Inject, Injectable, UnauthorizedException } from '@nestjs/common';
import type { LoginRequest, LoginResponse, MeUser, PublicUser, SecondFactorRequest } from '@steadyhand/shared';
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { AuditService } from '../audit/audit.service.js';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { toPublicUser } from '../users/users.service.js';
import { AuthPassportService } from './auth-passport.service.js';
import { ensureCsrfToken } from './csrf.js';
import { attemptOf, DEVICE_COOKIE, LoginThrottleService } from './login-throttle.service.js';
import { SessionService } from './session.service.js';
import type { SessionUser } from './session-user.js';
import { TotpService } from './totp.service.js';
import { UsersService } from '../users/users.service.js';

/** How long a half-done sign-in waits for its second factor. */
const SECOND_FACTOR_WAIT_MS = 5 * 60 * 1000;

const promised = (fn: (cb: (err?: unknown) => void) => void) =>
  new Promise<void>((resolve, reject) => fn((err) => (err ? reject(err instanceof Error ? err : new Error('session store failed')) : resolve())));

@Injectable()
export class AuthService {
  constructor(
    @Inject(AuthPassportService) private readonly auth: AuthPassportService,
    @Inject(LoginThrottleService) private readonly throttle: LoginThrottleService,
    @Inject(SessionService) private readonly sessions: SessionService,
    @Inject(AuditService) private readonly audit: AuditService,
    @Inject(TotpService) private readonly totp: TotpService,
    @Inject(UsersService) private readonly users: UsersService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  /**
   * Checks the password through passport-local and starts a new session (new id) on success. With
   * a second factor set up, the new session is only half signed in until POST /api/auth/totp.
   */
  async login(req: Request, res: Response, body: LoginRequest): Promise<LoginResponse> {
    const attempt = attemptOf(req);
    this.throttle.assertMayTry(body.username, attempt);
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
    const deviceId = this.throttle.succeeded(body.username, attempt);
    res.cookie(DEVICE_COOKIE, deviceId, {
      httpOnly: true,
      sameSite: 'strict',
      secure: this.config.secureCookies,
      path: '/api',
      maxAge: this.throttle.deviceCookieMaxAgeMs,
    });
    if (this.totp.isEnabled(user.id)) {
      // Nobody is signed in on this session yet: no route and no live socket sees a user.
      await promised((cb) => req.session.regenerate(cb));
      req.session.pendingSecondFactor = { userId: user.id, since: Date.now() };
      ensureCsrfToken(req);
      await promised((cb) => req.session.save(cb));
      this.audit.record({ action: 'auth.password-accepted', userId: user.id, username: user.username, ip: req.ip, detail: { secondFactor: 'pending' } });
      return { user: toPublicUser(user), secondFactor: 'required' };
    }
    await this.startSession(req, user, false);
    this.audit.record({ action: 'auth.login', userId: user.id, username: user.username, ip: req.ip });
    return { user: toPublicUser(user) };
  }

  /**
   * The second step: completes a half-done sign-in, or steps up a signed-in session that has not
   * passed the second factor yet (someone given the admin role since they signed in).
   */
  async secondFactor(req: Request, body: SecondFactorRequest): Promise<{ user: PublicUser }> {
    const pending = req.session?.pendingSecondFactor;
    if (pending && Date.now() - pending.since <= SECOND_FACTOR_WAIT_MS) {
      const user = this.users.sessionUser(pending.userId);
      if (!user) throw new UnauthorizedException('Sign in again');
      const method = await this.totp.verify(user, body, req.ip);
      delete req.session.pendingSecondFactor;
      await this.startSession(req, user, true);
      this.audit.record({ action: 'auth.login', userId: user.id, username: user.username, ip: req.ip, detail: { secondFactor: method } });
      return { user: toPublicUser(user) };
    }
    if (req.user) {
      if (req.session.secondFactorAt) return { user: toPublicUser(req.user) };
      const method = await this.totp.verify(req.user, body, req.ip);
      req.session.secondFactorAt = Date.now();
      this.audit.record({ action: 'auth.second-factor', userId: req.user.id, username: req.user.username, ip: req.ip, detail: { secondFactor: method } });
      return { user: toPublicUser(req.user) };
    }
    throw new BadRequestException('No sign-in is waiting for a second factor: sign in with your password first');
  }

  me(req: Request, user: SessionUser): MeUser {
    const enrolled = this.totp.isEnabled(user.id);
    return {
      ...toPublicUser(user),
      mustChangePassword: user.mustChangePassword,
      secondFactor: { enrolled, satisfied: enrolled && Boolean(req.session.secondFactorAt) },
    };
  }

  private async startSession(req: Request, user: SessionUser, passedSecondFactor: boolean): Promise<void> {
    // passport 0.7 regenerates the session on logIn, so a session id from before sign-in is never reused.
    await promised((cb) => req.logIn(user, cb));
    req.session.signedInAt = Date.now();
    if (passedSecondFactor) req.session.secondFactorAt = Date.now();
    ensureCsrfToken(req);
    await promised((cb) => req.session.save(cb));
    this.sessions.store.setUserAgent(req.sessionID, req.get('user-agent'));
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
