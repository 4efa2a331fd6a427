import { Module } from '@nestjs/common';
import { AuthModule } from '../auth/auth.module.js';
import { UsersModule } from '../users/users.module.js';
import { AuditViewerController } from './audit-viewer.controller.js';
import { AuditViewerService } from './audit-viewer.service.js';
import { PlacesAdminController, PlacesController } from './places.controller.js';
import { PlacesService } from './places.service.js';
import { SessionsAdminController } from './sessions-admin.controller.js';
import { UsersAdminController } from './users-admin.controller.js';
import { UsersAdminService } from './users-admin.service.js';

/** The admin area: people and roles, places, sessions, the audit trail (every route admin-only but GET /api/places). */
@Module({
  imports: [UsersModule, AuthModule],
  controllers: [UsersAdminController, PlacesController, PlacesAdminController, SessionsAdminController, AuditViewerController],
  providers: [UsersAdminService, PlacesService, AuditViewerService],
  exports: [PlacesService],
})
export class AdminModule {}
