import { Body, Controller, Delete, Get, HttpCode, Inject, Param, Post, Req } from '@nestjs/common';
import {
  changePasswordSchema,
  totpConfirmSchema,
  type ChangePasswordRequest,
  type SessionInfo,
  type TotpEnrolment,
  type TotpStatus,
} from '@steadyhand/shared';
import type { Request } from 'express';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { AccountService } from './account.service.js';
import { AllowDuringPasswordChange, CurrentUser, Roles } from './auth.decorators.js';
import { SessionDirectoryService } from './session-directory.service.js';
import type { SessionUser } from './session-user.js';
import { TotpService } from './totp.service.js';

/** My account: my sessions, my password, my second factor. Open to anyone signed in. */
@Controller('account')
@Roles('any')
export class AccountController {
  constructor(
    @Inject(AccountService) private readonly account: AccountService,
    @Inject(SessionDirectoryService) private readonly directory: SessionDirectoryService,
    @Inject(TotpService) private readonly totp: TotpService,
  ) {}

  @Get('sessions')
  sessions(@Req() req: Request, @CurrentUser() user: SessionUser): { sessions: SessionInfo[] } {
    return { sessions: this.directory.list(req.sessionID, user.id) };
  }

  @Delete('sessions/:sessionId')
  @HttpCode(204)
  endSession(@Req() req: Request, @CurrentUser() user: SessionUser, @Param('sessionId') sessionId: string): void {
    this.directory.end(user, sessionId, { anyone: false, ip: req.ip });
  }

  @AllowDuringPasswordChange()
  @Post('password')
  @HttpCode(204)
  changePassword(@Req() req: Request, @CurrentUser() user: SessionUser, @Body(new ZodValidationPipe(changePasswordSchema)) body: ChangePasswordRequest): Promise<void> {
    return this.account.changePassword(req, user, body);
  }

  @Get('totp')
  totpStatus(@CurrentUser() user: SessionUser): TotpStatus {
    return this.totp.status(user.id);
  }

  @Post('totp/start')
  @HttpCode(200)
  startTotp(@CurrentUser() user: SessionUser): Promise<TotpEnrolment> {
    return this.totp.start(user);
  }

  /** A good first code turns the second factor on, counts for this session, and shows the recovery codes once. */
  @Post('totp/confirm')
  @HttpCode(200)
  async confirmTotp(@Req() req: Request, @CurrentUser() user: SessionUser, @Body(new ZodValidationPipe(totpConfirmSchema)) body: { code: string }): Promise<{ recoveryCodes: string[] }> {
    const recoveryCodes = await this.totp.confirm(user, body.code, req.ip);
    req.session.secondFactorAt = Date.now();
    return { recoveryCodes };
  }
}
