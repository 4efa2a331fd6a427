import { Module } from '@nestjs/common';
import { CodesModule } from '../codes/codes.module.js';
import { AttachmentStore } from './attachment-store.js';
import { AttachmentsController } from './attachments.controller.js';
import { AttachmentsRepository } from './attachments.repository.js';
import { AttachmentsService } from './attachments.service.js';
import { AttachmentUploadInterceptor } from './upload.interceptor.js';

@Module({
  imports: [CodesModule],
  controllers: [AttachmentsController],
  providers: [AttachmentsRepository, AttachmentsService, AttachmentStore, AttachmentUploadInterceptor],
  exports: [AttachmentsService],
})
export class AttachmentsModule {}
