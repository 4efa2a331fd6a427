import { Body, Controller, Get, HttpCode, Inject, Post, Req, Res } from '@nestjs/common';
import { loginRequestSchema, type LoginRequest, type PublicUser } from '@steadyhand/shared';
import type { Request, Response } from 'express';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { toPublicUser } from '../users/users.service.js';
import { CurrentUser, Public, Roles } from './auth.decorators.js';
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
  ): Promise<{ user: PublicUser }> {
    return { user: await this.auth.login(req, res, body) };
  }

  @Roles('any')
  @Get('me')
  me(@CurrentUser() user: SessionUser): { user: PublicUser & { mustChangePassword: boolean } } {
    return { user: { ...toPublicUser(user), mustChangePassword: user.mustChangePassword } };
  }

  /** Open to anyone so that signing out twice, or after the session expired, is not an error. */
  @Public()
  @Post('logout')
  @HttpCode(204)
  async logout(@Req() req: Request, @Res({ passthrough: true }) res: Response): Promise<void> {
    await this.auth.logout(req, res, this.config.secureCookies ? SECURE_SESSION_COOKIE : SESSION_COOKIE);
  }
}
