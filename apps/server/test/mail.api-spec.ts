import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { FakeSmtpServer, type ReceivedMail } from '../src/mail/fake-smtp-server.js';
import { MailService } from '../src/mail/mail.service.js';
import { addUser, freePort, signIn, startTestApp, type SignedInAgent, type TestApp } from './support/test-app.js';

interface MailLogRow {
  to: string;
  subject: string;
  code_id: string | null;
  status: string;
  error: string | null;
  message_id: string | null;
}

const mailLog = (app: TestApp) => app.database.sqlite.prepare('SELECT * FROM mail_log ORDER BY id').all() as MailLogRow[];

describe('mail: the signed-record notice through the local fake relay', () => {
  let app: TestApp;
  let admin: SignedInAgent;
  let recorder: SignedInAgent;
  let codeId: string;

  beforeAll(async () => {
    // SMTP_PORT=0: the relay takes a free port, and the transport must follow it.
    app = await startTestApp({ env: { FAKE_SMTP: '1', SMTP_PORT: '0', PHARMACY_EMAIL: 'pharmacy-night@harbourview.example' } });
    await addUser(app, 'mail.admin', ['admin']);
    await addUser(app, 'mail.recorder', ['recorder']);
    admin = await signIn(app, 'mail.admin');
    recorder = await signIn(app, 'mail.recorder');
    const code = await recorder.agent.post('/api/codes').set('x-csrf-token', recorder.csrf).send({ category: 'adult', location: 'Cardiac Step-Down 3B – bed 4' }).expect(201);
    codeId = code.body.code.id as string;
  }, 60_000);
  afterAll(() => app.close());

  it('sends one message to the pharmacy and the reviewers, with the link, and records it', async () => {
    const relay = app.app.get(FakeSmtpServer);
    expect(relay.port).toBeGreaterThan(0);

    const result = await app.app.get(MailService).sendRecordSigned({ codeId, link: `/codes/${codeId}/record`, signers: ['Maren Holt, RN', 'Dr Ilse Varga'] });
    expect(result).toMatchObject({ status: 'sent', subject: 'Code record signed: Cardiac Step-Down 3B – bed 4' });

    const [message] = relay.outbox();
    expect(message).toBeDefined();
    expect(message!.from).toBe('steadyhand@harbourview.example');
    expect(message!.to).toEqual(['pharmacy-night@harbourview.example', 'resus-committee@harbourview.example']);
    expect(message!.subject).toBe('Code record signed: Cardiac Step-Down 3B – bed 4');
    expect(message!.text).toContain(`Read the record: ${app.config.publicOrigin}/codes/${codeId}/record`);
    expect(message!.text).toContain('Signed by: Maren Holt, RN; Dr Ilse Varga');

    // Kept as an .eml file in DATA_DIR/mail too.
    const mailDir = path.join(app.config.dataDir, 'mail');
    const files = readdirSync(mailDir).filter((f) => f.endsWith('.eml'));
    expect(files).toHaveLength(1);
    expect(readFileSync(path.join(mailDir, files[0]!), 'latin1')).toMatch(/^To: pharmacy-night@harbourview\.example, resus-committee@harbourview\.example$/m);

    const [row] = mailLog(app);
    expect(row).toMatchObject({ to: 'pharmacy-night@harbourview.example, resus-committee@harbourview.example', code_id: codeId, status: 'sent', error: null });
    expect(row!.message_id).toBe(result.messageId);
  });

  it('shows the outbox, newest first, to an admin only', async () => {
    await app.app.get(MailService).sendRecordSigned({ codeId, link: 'https://steadyhand.harbourview.example/codes/x/record', signers: ['Leader Two'] });
    const other = await app.app.get(MailService).send({ to: ['pharmacy-lead@harbourview.example'], subject: 'Tray discrepancy\r\nBcc: someone@else.example', text: 'Two epinephrine vials unaccounted for.', codeId });
    expect(other.status).toBe('sent');
    const res = await admin.agent.get('/api/dev/outbox').expect(200);
    const messages = res.body.messages as ReceivedMail[];
    expect(messages).toHaveLength(3);
    // A line break in a subject cannot add a header (or a recipient).
    expect(messages[0]).toMatchObject({ to: ['pharmacy-lead@harbourview.example'], subject: 'Tray discrepancy Bcc: someone@else.example' });
    expect(messages[1]!.text).toContain('https://steadyhand.harbourview.example/codes/x/record');
    expect(messages[2]!.text).toContain(`${app.config.publicOrigin}/codes/${codeId}/record`);
    expect(Date.parse(messages[0]!.receivedAt)).toBeGreaterThanOrEqual(Date.parse(messages[1]!.receivedAt));
    expect(Object.keys(messages[0]!).sort()).toEqual(['from', 'receivedAt', 'subject', 'text', 'to']);

    const refused = await recorder.agent.get('/api/dev/outbox').expect(403);
    expect(refused.body.message).toMatch(/admin/);
  });

  it('records a failed send when the relay is down, and does not throw', async () => {
    await app.app.get(FakeSmtpServer).stop();
    const before = mailLog(app).length;
    const result = await app.app.get(MailService).sendRecordSigned({ codeId, link: `/codes/${codeId}/record`, signers: ['Maren Holt, RN'] });
    expect(result.status).toBe('failed');
    expect(result.error).toBeTruthy();
    const rows = mailLog(app);
    expect(rows).toHaveLength(before + 1);
    expect(rows.at(-1)).toMatchObject({ status: 'failed', code_id: codeId, subject: 'Code record signed: Cardiac Step-Down 3B – bed 4' });
    expect(rows.at(-1)!.error).toBe(result.error);
  });
});

describe('mail with the fake relay off', () => {
  let app: TestApp;
  let admin: SignedInAgent;

  beforeAll(async () => {
    // Nothing listens on this port: the relay is down from the start.
    app = await startTestApp({ env: { SMTP_PORT: String(await freePort()) } });
    await addUser(app, 'mail.admin2', ['admin']);
    admin = await signIn(app, 'mail.admin2');
  }, 60_000);
  afterAll(() => app.close());

  it('has no outbox (404 for an admin)', async () => {
    const res = await admin.agent.get('/api/dev/outbox').expect(404);
    expect(res.body.message).toMatch(/FAKE_SMTP=1/);
  });

  it('records the send as failed, for an unknown code too, without throwing', async () => {
    const mail = app.app.get(MailService);
    const unknown = crypto.randomUUID();
    await expect(mail.sendRecordSigned({ codeId: unknown, link: '/codes/none/record', signers: [] })).resolves.toMatchObject({
      status: 'failed',
      subject: `Code record signed: code ${unknown}`,
    });
    expect(mailLog(app)).toEqual([expect.objectContaining({ status: 'failed', code_id: unknown, error: expect.stringMatching(/ECONNREFUSED|connect/i) })]);
  });
});
