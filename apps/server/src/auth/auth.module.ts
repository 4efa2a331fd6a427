import { Module } from '@nestjs/common';
import { APP_GUARD } from '@nestjs/core';
import { UsersModule } from '../users/users.module.js';
import { AccessGuard } from './access.guard.js';
import { AuthPassportService } from './auth-passport.service.js';
import { AuthController } from './auth.controller.js';
import { AuthService } from './auth.service.js';
import { LoginThrottleService } from './login-throttle.service.js';
import { SessionService } from './session.service.js';

@Module({
  imports: [UsersModule],
  controllers: [AuthController],
  providers: [AuthService, AuthPassportService, LoginThrottleService, SessionService, { provide: APP_GUARD, useClass: AccessGuard }],
  exports: [SessionService, AuthPassportService],
})
export class AuthModule {}
