import { Inject, Injectable, Logger, type OnApplicationShutdown } from '@nestjs/common';
import { createTransport, type Transporter } from 'nodemailer';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { FakeSmtpServer } from './fake-smtp-server.js';
import { MailRepository } from './mail.repository.js';

export interface RecordSignedMail {
  codeId: string;
  /** Where the record is read; a path is taken relative to PUBLIC_ORIGIN. */
  link: string;
  /** Printed names of the people who signed. */
  signers: string[];
}

export interface MailResult {
  status: 'sent' | 'failed';
  to: string[];
  subject: string;
  messageId?: string;
  error?: string;
}

const LOOPBACK = new Set(['127.0.0.1', '::1', 'localhost']);
/** One line, printable: a code's location typed on a ward must not add mail headers. */
// eslint-disable-next-line no-control-regex
const oneLine = (value: string) => value.replace(/[\u0000-\u001f\u007f]+/g, ' ').trim();

/**
 * Mail to the pharmacy and the resuscitation committee. Sending never breaks the caller: every
 * failure is logged and recorded in mail_log, and the promise never rejects. Callers that must
 * not wait for the relay call it with `void`.
 */
@Injectable()
export class MailService implements OnApplicationShutdown {
  private readonly logger = new Logger(MailService.name);
  private transport: { port: number; transporter: Transporter } | undefined;

  constructor(
    @Inject(APP_CONFIG) private readonly config: AppConfig,
    @Inject(MailRepository) private readonly repo: MailRepository,
    @Inject(FakeSmtpServer) private readonly fakeRelay: FakeSmtpServer,
  ) {}

  /** Tells the pharmacy (reconcile the tray) and the reviewers (quality review) that a record was signed. */
  async sendRecordSigned(input: RecordSignedMail): Promise<MailResult> {
    const to = [this.config.mail.pharmacy, this.config.mail.reviewers];
    let subject = `Code record signed: code ${input.codeId}`;
    try {
      const code = this.repo.codeHeadline(input.codeId);
      const location = code?.location ? oneLine(code.location) : '';
      subject = `Code record signed: ${location || `code ${input.codeId}`}`;
      const link = new URL(input.link, this.config.publicOrigin).toString();
      const signers = input.signers.map(oneLine).filter(Boolean);
      const text = [
        'A code record has been signed in Steadyhand.',
        '',
        `Code: ${input.codeId}`,
        `Location: ${location || 'not recorded'}`,
        ...(code ? [`Arrest recognised: ${code.arrestAt}`] : []),
        `Signed by: ${signers.length ? signers.join('; ') : 'not named'}`,
        '',
        `Read the record: ${link}`,
        '',
        'Pharmacy: reconcile the drugs given against the code-cart tray and restock it.',
        'Resuscitation committee: the record is ready for quality review.',
        '',
        'Patient details are not sent by e-mail; sign in to Steadyhand to read them.',
      ].join('\n');
      return await this.send({ to, subject, text, codeId: input.codeId });
    } catch (err) {
      return this.recordFailure({ to, subject, codeId: input.codeId }, err);
    }
  }

  /** Any plain-text message through the same relay, recorded in mail_log; never rejects. */
  async send(input: { to: string[]; subject: string; text: string; codeId: string | null }): Promise<MailResult> {
    const message = { ...input, subject: oneLine(input.subject) };
    try {
      const info = (await this.transporter().sendMail({ from: this.config.mail.from, to: message.to, subject: message.subject, text: message.text })) as {
        messageId?: string;
      };
      this.record({ ...message, status: 'sent', messageId: info.messageId ?? null, error: null });
      return { status: 'sent', to: message.to, subject: message.subject, ...(info.messageId ? { messageId: info.messageId } : {}) };
    } catch (err) {
      return this.recordFailure(message, err);
    }
  }

  private recordFailure(message: { to: string[]; subject: string; codeId: string | null }, err: unknown): MailResult {
    const error = err instanceof Error ? err.message : String(err);
    this.logger.warn(`Mail "${message.subject}" to ${message.to.join(', ')} failed: ${error}`);
    this.record({ ...message, status: 'failed', messageId: null, error });
    return { status: 'failed', to: message.to, subject: message.subject, error };
  }

  private record(entry: { to: string[]; subject: string; codeId: string | null; status: 'sent' | 'failed'; messageId: string | null; error: string | null }): void {
    try {
      this.repo.log({
        sentAt: new Date().toISOString(),
        to: entry.to.join(', '),
        subject: entry.subject,
        codeId: entry.codeId,
        messageId: entry.messageId,
        status: entry.status,
        error: entry.error,
      });
    } catch (err) {
      this.logger.error(`Could not record mail "${entry.subject}" in mail_log: ${(err as Error).message}`);
    }
  }

  /**
   * The SMTP transport, made on first use: with the fake relay on, it follows the port the relay
   * really listens on (SMTP_PORT=0 in tests picks a free one).
   */
  private transporter(): Transporter {
    const host = this.config.fakeSmtp ? '127.0.0.1' : this.config.smtp.host;
    const port = (this.config.fakeSmtp ? this.fakeRelay.port : undefined) ?? this.config.smtp.port;
    if (this.transport?.port !== port) {
      this.transport?.transporter.close();
      const loopback = LOOPBACK.has(host);
      const transporter = createTransport({
        host,
        port,
        secure: port === 465,
        // No TLS to a relay on this machine; elsewhere STARTTLS is used when offered.
        ignoreTLS: loopback,
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
