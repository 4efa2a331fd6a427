import { Module } from '@nestjs/common';
import { APP_GUARD } from '@nestjs/core';
import { UsersModule } from '../users/users.module.js';
import { AccessGuard } from './access.guard.js';
import { AccountController } from './account.controller.js';
import { AccountService } from './account.service.js';
import { AuthPassportService } from './auth-passport.service.js';
import { AuthController } from './auth.controller.js';
import { AuthService } from './auth.service.js';
import { LoginThrottleService } from './login-throttle.service.js';
import { PasswordCheckService } from './password-check.service.js';
import { SessionDirectoryService } from './session-directory.service.js';
import { SessionService } from './session.service.js';
import { TotpService } from './totp.service.js';

@Module({
  imports: [UsersModule],
  controllers: [AuthController, AccountController],
  providers: [
    AuthService,
    AuthPassportService,
    LoginThrottleService,
    PasswordCheckService,
    SessionService,
    TotpService,
    AccountService,
    SessionDirectoryService,
    { provide: APP_GUARD, useClass: AccessGuard },
  ],
  exports: [SessionService, AuthPassportService, TotpService, SessionDirectoryService, PasswordCheckService],
})
export class AuthModule {}
