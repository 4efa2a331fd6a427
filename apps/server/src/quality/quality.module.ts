import { Module } from '@nestjs/common';
import { AuthModule } from '../auth/auth.module.js';
import { CodesModule } from '../codes/codes.module.js';
import { UsersModule } from '../users/users.module.js';
import { FollowUpService } from './follow-up.service.js';
import { QualityMetricsService } from './quality-metrics.service.js';
import { QualityController } from './quality.controller.js';
import { QualityRepository } from './quality.repository.js';
import { QualityService } from './quality.service.js';

@Module({
  imports: [AuthModule, CodesModule, UsersModule],
  controllers: [QualityController],
  providers: [QualityRepository, QualityService, QualityMetricsService, FollowUpService],
  // The demo loader enters the demo hospital's follow-ups through the same service.
  exports: [FollowUpService],
})
export class QualityModule {}
