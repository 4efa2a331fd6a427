import { Body, Controller, Get, HttpCode, Inject, Post, Put } from '@nestjs/common';
import { protocolSettingsSchema, type ProtocolDocument, type ProtocolSettings } from '@steadyhand/shared';
import { CurrentUser, Roles } from '../auth/auth.decorators.js';
import type { SessionUser } from '../auth/session-user.js';
import { ZodValidationPipe } from '../common/zod-validation.pipe.js';
import { ProtocolService } from './protocol.service.js';

@Controller('protocol')
export class ProtocolController {
  constructor(@Inject(ProtocolService) private readonly protocol: ProtocolService) {}

  /** Every screen computes timers and reminders from these settings. */
  @Roles('any')
  @Get()
  get(): ProtocolDocument {
    return this.protocol.document();
  }

  /** The whole settings, never a patch: the admin page always sends what it shows. */
  @Roles('admin')
  @Put()
  save(@CurrentUser() user: SessionUser, @Body(new ZodValidationPipe(protocolSettingsSchema)) body: ProtocolSettings): ProtocolDocument {
    return this.protocol.save(user, body);
  }

  @Roles('admin')
  @Post('reset')
  @HttpCode(200)
  reset(@CurrentUser() user: SessionUser): ProtocolDocument {
    return this.protocol.reset(user);
  }
}
