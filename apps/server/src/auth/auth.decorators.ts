import { createParamDecorator, SetMetadata, type ExecutionContext } from '@nestjs/common';
import type { Role } from '@steadyhand/shared';
import type { Request } from 'express';
import { attemptOf, type PasswordAttempt } from './login-throttle.service.js';
import type { SessionUser } from './session-user.js';

export const IS_PUBLIC = 'steadyhand:public';
export const ROLES_KEY = 'steadyhand:roles';
export const DURING_PASSWORD_CHANGE = 'steadyhand:during-password-change';

/** Open to anyone, signed in or not. */
export const Public = (): MethodDecorator & ClassDecorator => SetMetadata(IS_PUBLIC, true);

/**
 * Who may call this route. Every route that is not @Public() must say; the guard refuses a
 * route that says nothing, so a forgotten decorator fails closed.
 * `Roles('any')` means any signed-in user.
 */
export const Roles = (...roles: [Role | 'any', ...(Role | 'any')[]]): MethodDecorator & ClassDecorator =>
  SetMetadata(ROLES_KEY, roles);

/** Still open to someone who must change their password first (who am I, change my password). */
export const AllowDuringPasswordChange = (): MethodDecorator => SetMetadata(DURING_PASSWORD_CHANGE, true);

export const CurrentUser = createParamDecorator((_data: unknown, ctx: ExecutionContext): SessionUser => {
  const req = ctx.switchToHttp().getRequest<Request>();
  return req.user as SessionUser;
});

/** Where a password attempt comes from (client address, device cookie), for the throttle. */
export const Attempt = createParamDecorator((_data: unknown, ctx: ExecutionContext): PasswordAttempt => attemptOf(ctx.switchToHttp().getRequest<Request>()));
