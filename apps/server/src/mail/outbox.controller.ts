import { Controller, Get, Inject } from '@nestjs/common';
import { Roles } from '../auth/auth.decorators.js';
import { FakeSmtpServer, type ReceivedMail } from './fake-smtp-server.js';

/** The development outbox: what the fake relay received. 404 unless FAKE_SMTP=1. */
@Controller('dev')
export class OutboxController {
  constructor(@Inject(FakeSmtpServer) private readonly relay: FakeSmtpServer) {}

  @Roles('admin')
  @Get('outbox')
  outbox(): { messages: ReceivedMail[] } {
    return { messages: this.relay.outbox() };
  }
}
