import { Controller, Get, Inject, ServiceUnavailableException } from '@nestjs/common';
import { Public } from '../auth/auth.decorators.js';
import { DATABASE } from '../db/database.module.js';
import type { DatabaseHandle } from '../db/database.js';

const startedAt = Date.now();

@Controller()
export class HealthController {
  constructor(@Inject(DATABASE) private readonly database: DatabaseHandle) {}

  @Public()
  @Get('health')
  health(): { status: 'ok'; database: 'ok'; uptimeSeconds: number; time: string } {
    try {
      this.database.sqlite.prepare('SELECT 1').get();
    } catch {
      throw new ServiceUnavailableException({ status: 'error', database: 'unavailable' });
    }
    return { status: 'ok', database: 'ok', uptimeSeconds: Math.round((Date.now() - startedAt) / 1000), time: new Date().toISOString() };
  }

  /** The server clock, for devices to measure their offset. */
  @Public()
  @Get('time')
  time(): { serverTime: number } {
    return { serverTime: Date.now() };
  }
}
