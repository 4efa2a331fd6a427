import { ForbiddenException, Inject, Injectable, Logger, UnauthorizedException, type CanActivate, type ExecutionContext } from '@nestjs/common';
import { Reflector } from '@nestjs/core';
import { hasAnyRole, type Role } from '@steadyhand/shared';
import type { Request } from 'express';
import { DURING_PASSWORD_CHANGE, IS_PUBLIC, ROLES_KEY } from './auth.decorators.js';

/**
 * The one global guard for HTTP routes: sign-in is required unless @Public(); then the route's
 * @Roles() decide. A route with neither is refused, so a missing decorator cannot open a route.
 * Someone who must change their password reaches only the routes marked for it; admin routes
 * also need the second factor passed in this session.
 * Socket messages are authorised in the gateway, per message.
 */
@Injectable()
export class AccessGuard implements CanActivate {
  private readonly logger = new Logger(AccessGuard.name);

  constructor(@Inject(Reflector) private readonly reflector: Reflector) {}

  canActivate(context: ExecutionContext): boolean {
    if (context.getType() !== 'http') return true;
    const targets = [context.getHandler(), context.getClass()];
    if (this.reflector.getAllAndOverride<boolean>(IS_PUBLIC, targets)) return true;

    const req = context.switchToHttp().getRequest<Request>();
    if (!req.user) throw new UnauthorizedException('Sign in to continue');
    if (req.user.mustChangePassword && !this.reflector.getAllAndOverride<boolean>(DURING_PASSWORD_CHANGE, targets)) {
      throw new ForbiddenException({ statusCode: 403, error: 'password-change-required', message: 'Choose a new password to continue' });
    }

    const roles = this.reflector.getAllAndOverride<(Role | 'any')[] | undefined>(ROLES_KEY, targets);
    if (!roles) {
      this.logger.error(`Route ${req.method} ${req.path} declares no roles; refusing`);
      throw new ForbiddenException('This route is not open to any role');
    }
    if (roles.includes('any')) return true;
    if (!hasAnyRole(req.user.roles, roles as Role[])) {
      throw new ForbiddenException(`This needs one of these roles: ${roles.join(', ')}`);
    }
    // Admin power needs the second factor in this session; another role that opens the route does not.
    const withoutAdmin = req.user.roles.filter((r) => r !== 'admin');
    if (!hasAnyRole(withoutAdmin, roles as Role[]) && !req.session?.secondFactorAt) {
      throw new ForbiddenException({ statusCode: 403, error: 'second-factor-required', message: 'Confirm it is you with your authenticator app to use the admin pages' });
    }
    return true;
  }
}
