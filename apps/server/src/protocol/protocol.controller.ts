import { Controller, Get, Inject } from '@nestjs/common';
import type { ProtocolSettings } from '@steadyhand/shared';
import { Roles } from '../auth/auth.decorators.js';
import { ProtocolService } from './protocol.service.js';

@Controller('protocol')
export class ProtocolController {
  constructor(@Inject(ProtocolService) private readonly protocol: ProtocolService) {}

  /** Every screen computes timers and reminders from these settings. */
  @Roles('any')
  @Get()
  get(): { protocol: ProtocolSettings } {
    return { protocol: this.protocol.current() };
  }
}
