import { Module } from '@nestjs/common';
import { CodesModule } from '../codes/codes.module.js';
import { QualityModule } from '../quality/quality.module.js';
import { RecordsModule } from '../records/records.module.js';
import { UsersModule } from '../users/users.module.js';
import { DemoController } from './demo.controller.js';
import { DemoService } from './demo.service.js';

@Module({
  imports: [UsersModule, CodesModule, RecordsModule, QualityModule],
  controllers: [DemoController],
  providers: [DemoService],
  exports: [DemoService],
})
export class DemoModule {}
