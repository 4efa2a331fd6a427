import { Global, Module } from '@nestjs/common';
import { FakeSmtpServer } from './fake-smtp-server.js';
import { MailRepository } from './mail.repository.js';
import { MailService } from './mail.service.js';
import { OutboxController } from './outbox.controller.js';

/** Global, so the records feature (and any other) can inject MailService without importing this module. */
@Global()
@Module({
  controllers: [OutboxController],
  providers: [MailRepository, MailService, FakeSmtpServer],
  exports: [MailService],
})
export class MailModule {}
