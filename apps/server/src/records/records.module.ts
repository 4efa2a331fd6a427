import { Module } from '@nestjs/common';
import { AttachmentsModule } from '../attachments/attachments.module.js';
import { AuthModule } from '../auth/auth.module.js';
import { CodesModule } from '../codes/codes.module.js';
import { UsersModule } from '../users/users.module.js';
import { RecordsController } from './records.controller.js';
import { RecordsService } from './records.service.js';
import { SignaturesRepository } from './signatures.repository.js';

/** The signed record: review details, signatures, addenda, the PDF and its verification. */
@Module({
  imports: [AuthModule, AttachmentsModule, CodesModule, UsersModule],
  controllers: [RecordsController],
  providers: [RecordsService, SignaturesRepository],
  exports: [RecordsService],
})
export class RecordsModule {}
