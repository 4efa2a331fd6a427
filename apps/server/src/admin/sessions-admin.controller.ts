import { Controller, Delete, Get, HttpCode, Inject, Param, Req } from '@nestjs/common';
import type { SessionInfo } from '@steadyhand/shared';
import type { Request } from 'express';
import { CurrentUser, Roles } from '../auth/auth.decorators.js';
import { SessionDirectoryService } from '../auth/session-directory.service.js';
import type { SessionUser } from '../auth/session-user.js';

/** Every signed-in session, and ending one (a lost tablet). */
@Controller('admin/sessions')
@Roles('admin')
export class SessionsAdminController {
  constructor(@Inject(SessionDirectoryService) private readonly directory: SessionDirectoryService) {}

  @Get()
  list(@Req() req: Request): { sessions: SessionInfo[] } {
    return { sessions: this.directory.list(req.sessionID) };
  }

  @Delete(':sessionId')
  @HttpCode(204)
  end(@Req() req: Request, @CurrentUser() actor: SessionUser, @Param('sessionId') sessionId: string): void {
    this.directory.end(actor, sessionId, { anyone: true, ip: req.ip });
  }
}
