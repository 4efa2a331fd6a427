import { randomBytes } from 'node:crypto';
import { mkdir, writeFile } from 'node:fs/promises';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { Inject, Injectable, Logger, NotFoundException, type OnApplicationShutdown, type OnModuleInit } from '@nestjs/common';
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server';
import { APP_CONFIG } from '../config/config.module.js';
import type { AppConfig } from '../config/config.js';
import { readMessage } from './eml-reader.js';

export interface ReceivedMail {
  receivedAt: string;
  /** The envelope sender and recipients: what the relay was asked to deliver. */
  from: string;
  to: string[];
  subject: string;
  text: string;
}

/** Enough for a day of development; older messages stay in DATA_DIR/mail. */
const KEPT_IN_MEMORY = 200;
const MAX_MESSAGE_BYTES = 25 * 1024 * 1024;

/**
 * The local fake mail relay (FAKE_SMTP=1): an SMTP server on 127.0.0.1:SMTP_PORT inside the
 * server process that delivers nowhere. It keeps what it receives in memory for the development
 * outbox and as .eml files in DATA_DIR/mail. Never on in production.
 */
@Injectable()
export class FakeSmtpServer implements OnModuleInit, OnApplicationShutdown {
  private readonly logger = new Logger(FakeSmtpServer.name);
  private server: SMTPServer | undefined;
  private listeningPort: number | undefined;
  private readonly received: ReceivedMail[] = [];
  private readonly mailDir: string;

  constructor(@Inject(APP_CONFIG) private readonly config: AppConfig) {
    this.mailDir = path.join(config.dataDir, 'mail');
  }

  get enabled(): boolean {
    return this.config.fakeSmtp;
  }

  /** The port it listens on (the real one when SMTP_PORT was 0), or undefined when it is not listening. */
  get port(): number | undefined {
    return this.listeningPort;
  }

  async onModuleInit(): Promise<void> {
    if (!this.enabled) return;
    try {
      await this.start();
    } catch (err) {
      // The server must come up without mail: sends will then be recorded as failed.
      this.logger.error(`The fake mail relay could not listen on 127.0.0.1:${this.config.smtp.port}: ${(err as Error).message}`);
    }
  }

  async start(): Promise<void> {
    if (this.server) return;
    const server = new SMTPServer({
      authOptional: true,
      // Any credentials are accepted: it is a local fake, and plain text on loopback is fine.
      allowInsecureAuth: true,
      onAuth: (auth, _session, callback) => callback(null, { user: auth.username ?? 'anonymous' }),
      disabledCommands: ['STARTTLS'],
      size: MAX_MESSAGE_BYTES,
      logger: false,
      banner: 'Steadyhand fake relay: development only, delivers nothing',
      closeTimeout: 1000,
      onData: (stream, session, callback) => this.receive(stream, session, callback),
    });
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(this.config.smtp.port, '127.0.0.1', () => {
        server.off('error', reject);
        resolve();
      });
    });
    server.on('error', (err: Error) => this.logger.warn(`fake mail relay: ${err.message}`));
    this.server = server;
    this.listeningPort = (server.server.address() as AddressInfo).port;
  }

  async stop(): Promise<void> {
    const server = this.server;
    if (!server) return;
    this.server = undefined;
    this.listeningPort = undefined;
    await new Promise<void>((resolve) => server.close(() => resolve()));
  }

  onApplicationShutdown(): Promise<void> {
    return this.stop();
  }

  /** What the relay received, newest first; 404 when the fake relay is off. */
  outbox(): ReceivedMail[] {
    if (!this.enabled) throw new NotFoundException('The development outbox exists only when the fake mail relay is on (FAKE_SMTP=1)');
    return [...this.received].reverse();
  }

  private receive(stream: SMTPServerDataStream, session: SMTPServerSession, callback: (err?: Error | null, message?: string) => void): void {
    const chunks: Buffer[] = [];
    stream.on('data', (chunk: Buffer) => chunks.push(chunk));
    stream.on('error', (err: Error) => callback(err));
    stream.on('end', () => {
      if (stream.sizeExceeded) {
        callback(Object.assign(new Error('Message too large for the fake relay'), { responseCode: 552 }));
        return;
      }
      const raw = Buffer.concat(chunks);
      const receivedAt = new Date().toISOString();
      const { subject, text } = readMessage(raw);
      const { mailFrom, rcptTo } = session.envelope;
      this.received.push({
        receivedAt,
        from: mailFrom ? mailFrom.address : '',
        to: rcptTo.map((r) => r.address),
        subject,
        text,
      });
      if (this.received.length > KEPT_IN_MEMORY) this.received.splice(0, this.received.length - KEPT_IN_MEMORY);
      const id = `${receivedAt.replace(/[:.]/g, '-')}-${randomBytes(4).toString('hex')}`;
      this.saveEml(`${id}.eml`, raw).then(
        () => callback(null, `Kept as ${id}`),
        (err: unknown) => {
          // The message is in the outbox already; a full disk should not fail the send.
          this.logger.warn(`fake mail relay could not write ${id}.eml: ${(err as Error).message}`);
          callback(null, `Kept in memory as ${id}`);
        },
      );
    });
  }

  private async saveEml(name: string, raw: Buffer): Promise<void> {
    await mkdir(this.mailDir, { recursive: true, mode: 0o700 });
    await writeFile(path.join(this.mailDir, name), raw, { mode: 0o600 });
  }
}
