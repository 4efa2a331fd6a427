import { Inject, Injectable, Logger, type OnApplicationShutdown } from '@nestjs/common';
import { ModuleRef } from '@nestjs/core';
import { createTransport, type Transporter } from 'nodemailer';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { FakeSmtpServer } from '../mail/fake-smtp-server.js';
import { PharmacyRepository } from './pharmacy.repository.js';

const LOOPBACK = new Set(['127.0.0.1', '::1', 'localhost']);

/**
 * The discrepancy e-mail to the pharmacy lead. MailService (mail module) has no general send
 * yet, so this sends through nodemailer to the same relay (the fake one when FAKE_SMTP=1) and
 * records each message in mail_log like MailService does. Never throws.
 */
@Injectable()
export class PharmacyMailer implements OnApplicationShutdown {
  private readonly logger = new Logger(PharmacyMailer.name);
  private transport: { port: number; transporter: Transporter } | undefined;

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(PharmacyRepository) private readonly repo: PharmacyRepository,
    @Inject(ModuleRef) private readonly moduleRef: ModuleRef,
  ) {}

  async send(message: { subject: string; text: string; codeId: string }): Promise<'sent' | 'failed'> {
    const to = this.config.mail.pharmacy;
    const sentAt = new Date().toISOString();
    try {
      const info = (await this.transporter().sendMail({ from: this.config.mail.from, to, subject: message.subject, text: message.text })) as { messageId?: string };
      this.repo.logMail({ sentAt, to, subject: message.subject, codeId: message.codeId, messageId: info.messageId ?? null, status: 'sent', error: null });
      return 'sent';
    } catch (err) {
      const error = err instanceof Error ? err.message : String(err);
      this.logger.warn(`Discrepancy mail for code ${message.codeId} failed: ${error}`);
      this.repo.logMail({ sentAt, to, subject: message.subject, codeId: message.codeId, messageId: null, status: 'failed', error });
      return 'failed';
    }
  }

  private relayPort(): number | undefined {
    if (!this.config.fakeSmtp) return undefined;
    try {
      return this.moduleRef.get(FakeSmtpServer, { strict: false }).port;
    } catch {
      return undefined;
    }
  }

  private transporter(): Transporter {
    const host = this.config.fakeSmtp ? '127.0.0.1' : this.config.smtp.host;
    const port = this.relayPort() ?? this.config.smtp.port;
    if (this.transport?.port !== port) {
      this.transport?.transporter.close();
      const transporter = createTransport({
        host,
        port,
        secure: port === 465,
        ignoreTLS: LOOPBACK.has(host),
        connectionTimeout: 10_000,
        greetingTimeout: 10_000,
        socketTimeout: 20_000,
      });
      this.transport = { port, transporter };
    }
    return this.transport.transporter;
  }

  onApplicationShutdown(): void {
    this.transport?.transporter.close();
  }
}
