import { ForbiddenException, Inject, Injectable } from '@nestjs/common';
import { AuditService } from '../audit/audit.service.js';
import { UsersService } from '../users/users.service.js';
import { LoginThrottleService, type PasswordAttempt } from './login-throttle.service.js';
import { verifyPassword } from './password.js';
import type { SessionUser } from './session-user.js';

/**
 * The password typed again by someone signed in: to sign (record, reconciliation, quality
 * review, 21 CFR 11.200) or to change it. Throttled with the sign-in failures of the same account
 * and address (429 with Retry-After), so a stolen session cannot guess the password at the
 * signature dialog.
 */
@Injectable()
export class PasswordCheckService {
  constructor(
    @Inject(UsersService) private readonly users: UsersService,
    @Inject(LoginThrottleService) private readonly throttle: LoginThrottleService,
    @Inject(AuditService) private readonly audit: AuditService,
  ) {}

  /** Whether the password is right; a wrong one is counted. Throws 429 when this attempt must wait. */
  async matches(user: SessionUser, password: string, attempt: PasswordAttempt): Promise<boolean> {
    this.throttle.assertMayTry(user.username, attempt);
    const row = this.users.findById(user.id);
    if (row && !row.disabledAt && (await verifyPassword(password, row.passwordHash))) {
      this.throttle.succeeded(user.username, attempt);
      return true;
    }
    this.throttle.recordFailure(user.username, attempt.ip);
    return false;
  }

  /**
   * For a signature: a wrong password is audited under `failedAction` and answered 403 with
   * `error: "password"`, never 401: a typo must not sign the person out of the page they are on.
   */
  async confirm(
    user: SessionUser,
    password: string,
    attempt: PasswordAttempt,
    failure: { failedAction: string; codeId: string; detail?: Record<string, unknown> },
  ): Promise<void> {
    if (await this.matches(user, password, attempt)) return;
    this.audit.record({
      action: failure.failedAction,
      userId: user.id,
      username: user.username,
      codeId: failure.codeId,
      ip: attempt.ip ?? null,
      detail: { ...failure.detail, reason: 'password does not match' },
    });
    throw new ForbiddenException({ statusCode: 403, error: 'password', message: 'The password does not match. Nothing was signed.' });
  }
}
