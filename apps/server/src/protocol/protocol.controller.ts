import { Body, Controller, Get, HttpCode, HttpStatus, Inject, Param, ParseIntPipe, Post, Put } from '@nestjs/common';
import { protocolSettingsSchema, type ProtocolDocument, type ProtocolSettings, type ProtocolVersion } from '@steadyhand/shared';
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

  /** One saved version: a code's screens and record use the version it started with. */
  @Roles('any')
  @Get('versions/:version')
  version(@Param('version', new ParseIntPipe({ errorHttpStatusCode: HttpStatus.BAD_REQUEST })) version: number): ProtocolVersion {
    return this.protocol.version(version);
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
