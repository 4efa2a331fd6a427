import { BadRequestException, Inject, Injectable } from '@nestjs/common';
import type { ChangePasswordRequest } from '@steadyhand/shared';
import type { Request } from 'express';
import { AuditService } from '../audit/audit.service.js';
import { UsersService } from '../users/users.service.js';
import { assertNotCommonPassword } from './common-passwords.js';
import { attemptOf } from './login-throttle.service.js';
import { PasswordCheckService } from './password-check.service.js';
import { SessionService } from './session.service.js';
import type { SessionUser } from './session-user.js';

/** What anyone signed in may do to their own account. */
@Injectable()
export class AccountService {
  constructor(
    @Inject(UsersService) private readonly users: UsersService,
    @Inject(SessionService) private readonly sessions: SessionService,
    @Inject(AuditService) private readonly audit: AuditService,
    @Inject(PasswordCheckService) private readonly passwords: PasswordCheckService,
  ) {}

  /** Needs the current password; ends every other session of this person (a reset may mean a leaked one). */
  async changePassword(req: Request, user: SessionUser, body: ChangePasswordRequest): Promise<void> {
    assertNotCommonPassword(body.newPassword); // before the slow password check
    // A wrong current password counts with the failed sign-ins of this account and address.
    if (!(await this.passwords.matches(user, body.currentPassword, attemptOf(req)))) {
      this.audit.record({ action: 'account.password-change-failed', userId: user.id, username: user.username, ip: req.ip ?? null });
      // 400, not 401: the person is still signed in.
      throw new BadRequestException('Your current password is not right');
    }
    await this.users.setPassword(user.id, body.newPassword, false);
    this.sessions.endAllForUser(user.id, req.sessionID);
    this.audit.record({ action: 'account.password-changed', userId: user.id, username: user.username, ip: req.ip ?? null });
  }
}
