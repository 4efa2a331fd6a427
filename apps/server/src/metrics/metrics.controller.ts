import { Controller, Get, Header, Inject, Req } from '@nestjs/common';
import type { Request } from 'express';
import { Public } from '../auth/auth.decorators.js';
import { MetricsService, PROMETHEUS_CONTENT_TYPE, requestAddresses } from './metrics.service.js';

/** GET /metrics (outside /api): no session; the address allowlist (METRICS_ALLOW) guards it. */
@Controller()
export class MetricsController {
  constructor(@Inject(MetricsService) private readonly metrics: MetricsService) {}

  @Public()
  @Get('metrics')
  @Header('Content-Type', PROMETHEUS_CONTENT_TYPE)
  @Header('Cache-Control', 'no-store')
  scrape(@Req() req: Request): Promise<string> {
    return this.metrics.scrape(requestAddresses(req.socket.remoteAddress, req.headers));
  }
}
