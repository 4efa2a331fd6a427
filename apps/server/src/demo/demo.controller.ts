import { Controller, Get, Inject } from '@nestjs/common';
import { Public } from '../auth/auth.decorators.js';
import { DemoService, type DemoInfo } from './demo.service.js';

@Controller('auth')
export class DemoController {
  constructor(@Inject(DemoService) private readonly demo: DemoService) {}

  /** Whether demo mode is on and, only then, the demo accounts and their password. */
  @Public()
  @Get('demo')
  info(): DemoInfo {
    return this.demo.info();
  }
}
