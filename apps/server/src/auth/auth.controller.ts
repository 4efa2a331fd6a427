import { Body, Controller, Get, HttpCode, Inject, Post, Req, Res } from '@nestjs/common';
import {
  loginRequestSchema,
  secondFactorRequestSchema,
  type LoginRequest,
  type LoginResponse,
  type MeUser,
  type PublicUser,
  type SecondFactorRequest,
} from '@steadyhand/shared';
import type { Request, Response } from 'express';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { AllowDuringPasswordChange, CurrentUser, Public, Roles } from './auth.decorators.js';
import { AuthService } from './auth.service.js';
import { ensureCsrfToken } from './csrf.js';
import { SECURE_SESSION_COOKIE, SESSION_COOKIE } from './session.service.js';
import type { SessionUser } from './session-user.js';

@Controller('auth')
export class AuthController {
  constructor(
    @Inject(AuthService) private readonly auth: AuthService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  @Public()
  @Get('csrf')
  csrf(@Req() req: Request): { token: string } {
    return { token: ensureCsrfToken(req) };
  }

  @Public()
  @Post('login')
  @HttpCode(200)
  async login(
    @Req() req: Request,
    @Res({ passthrough: true }) res: Response,
    @Body(new ZodValidationPipe(loginRequestSchema)) body: LoginRequest,
  ): Promise<LoginResponse> {
    return this.auth.login(req, res, body);
  }

  /** The second step of a sign-in (or a step-up); open because the half-done session has no user yet. */
  @Public()
  @Post('totp')
  @HttpCode(200)
  secondFactor(@Req() req: Request, @Body(new ZodValidationPipe(secondFactorRequestSchema)) body: SecondFactorRequest): Promise<{ user: PublicUser }> {
    return this.auth.secondFactor(req, body);
  }

  @Roles('any')
  @AllowDuringPasswordChange()
  @Get('me')
  me(@Req() req: Request, @CurrentUser() user: SessionUser): { user: MeUser } {
    return { user: this.auth.me(req, user) };
  }

  /** Open to anyone so that signing out twice, or after the session expired, is not an error. */
  @Public()
  @Post('logout')
  @HttpCode(204)
  async logout(@Req() req: Request, @Res({ passthrough: true }) res: Response): Promise<void> {
    await this.auth.logout(req, res, this.config.secureCookies ? SECURE_SESSION_COOKIE : SESSION_COOKIE);
  }
}
