import { Controller, Get, Header, HttpCode, Inject, Param, Post, Res, StreamableFile, UploadedFile, UseInterceptors } from '@nestjs/common';
import { WRITER_ROLES } from '@steadyhand/shared';
import type { Response } from 'express';
import { CurrentUser, Roles } from '../auth/auth.decorators.js';
import type { SessionUser } from '../auth/session-user.js';
import { AttachmentsService } from './attachments.service.js';
import type { Attachment } from './attachments.repository.js';
import { AttachmentUploadInterceptor } from './upload.interceptor.js';

const [RECORDER, LEADER] = WRITER_ROLES as ['recorder', 'leader'];

@Controller()
export class AttachmentsController {
  constructor(@Inject(AttachmentsService) private readonly attachments: AttachmentsService) {}

  /** 201 for a new attachment; 200 with the stored one when the code has these bytes already. */
  @Roles(RECORDER, LEADER)
  @Post('codes/:id/attachments')
  @HttpCode(201)
  @UseInterceptors(AttachmentUploadInterceptor)
  async add(
    @CurrentUser() user: SessionUser,
    @Param('id') codeId: string,
    @UploadedFile() file: Express.Multer.File | undefined,
    @Res({ passthrough: true }) res: Response,
  ): Promise<{ attachment: Attachment }> {
    const { attachment, created } = await this.attachments.add(user, codeId, file);
    if (!created) res.status(200);
    return { attachment };
  }

  @Roles('any')
  @Get('codes/:id/attachments')
  list(@Param('id') codeId: string): { attachments: Attachment[] } {
    return { attachments: this.attachments.list(codeId) };
  }

  // nosniff: a browser must never read an upload as anything but its checked type.
  @Roles('any')
  @Get('attachments/:attachmentId/content')
  @Header('X-Content-Type-Options', 'nosniff')
  @Header('Cache-Control', 'private, no-store')
  content(@Param('attachmentId') id: string): Promise<StreamableFile> {
    return this.attachments.content(id);
  }
}
