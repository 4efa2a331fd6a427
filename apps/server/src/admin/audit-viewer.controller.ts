import { Controller, Get, Inject, Query, Req, Res } from '@nestjs/common';
import { auditQuerySchema, type AuditPage } from '@steadyhand/shared';
import type { Request, Response } from 'express';
import { CurrentUser, Roles } from '../auth/auth.decorators.js';
import type { SessionUser } from '../auth/session-user.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { AuditViewerService, type AuditFilter } from './audit-viewer.service.js';

@Controller('admin')
@Roles('admin')
export class AuditViewerController {
  constructor(@Inject(AuditViewerService) private readonly viewer: AuditViewerService) {}

  @Get('audit')
  page(@Query(new ZodValidationPipe(auditQuerySchema)) query: AuditFilter): AuditPage {
    return this.viewer.page(query);
  }

  @Get('audit.csv')
  csv(@Req() req: Request, @CurrentUser() actor: SessionUser, @Query(new ZodValidationPipe(auditQuerySchema)) query: AuditFilter, @Res({ passthrough: true }) res: Response): string {
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', `attachment; filename="steadyhand-audit-${new Date().toISOString().slice(0, 10)}.csv"`);
    return this.viewer.csv(actor, query, req.ip);
  }
}
