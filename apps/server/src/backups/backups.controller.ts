import { Controller, Get, Inject } from '@nestjs/common';
import type { BackupList } from '@steadyhand/shared';
import { Roles } from '../auth/auth.decorators.js';
import { BackupsService } from './backups.service.js';

@Controller('admin')
@Roles('admin')
export class BackupsController {
  constructor(@Inject(BackupsService) private readonly backups: BackupsService) {}

  @Get('backups')
  list(): BackupList {
    return this.backups.list();
  }
}
