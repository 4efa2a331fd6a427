import { createHash } from 'node:crypto';
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import type { Response } from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { tinyPdf, tinyPng } from './support/sample-files.js';
import { addUser, signIn, startTestApp, type SignedInAgent, type TestApp } from './support/test-app.js';

const sha256 = (bytes: Buffer) => createHash('sha256').update(bytes).digest('hex');

/** Reads any answer as raw bytes (superagent would parse or drop a PDF body). */
function binary(res: Response, done: (err: Error | null, body: Buffer) => void): void {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => done(null, Buffer.concat(chunks)));
}

interface Listed {
  id: string;
  filename: string;
  mediaType: string;
  sizeBytes: number;
  sha256: string;
  uploadedAt: string;
  uploadedBy: string;
}

describe('attachments: monitor strips and photos on a code', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let leader: SignedInAgent;
  let pharmacist: SignedInAgent;
  let uploads: string;
  /** Every distinct file this suite has had accepted: the store must hold exactly these. */
  const accepted = new Set<string>();

  beforeAll(async () => {
    // A small cap keeps the over-the-limit upload small.
    app = await startTestApp({ env: { ATTACHMENT_MAX_MB: '0.25' } });
    await addUser(app, 'att.recorder', ['recorder']);
    await addUser(app, 'att.leader', ['leader']);
    await addUser(app, 'att.pharmacist', ['pharmacist']);
    recorder = await signIn(app, 'att.recorder');
    leader = await signIn(app, 'att.leader');
    pharmacist = await signIn(app, 'att.pharmacist');
    uploads = path.join(app.config.dataDir, 'uploads');
  }, 60_000);
  afterAll(() => app.close());

  async function startCode(): Promise<string> {
    const res = await recorder.agent.post('/api/codes').set('x-csrf-token', recorder.csrf).send({ category: 'adult', location: '4 West Medical, bed 12' }).expect(201);
    return (res.body as { code: { id: string } }).code.id;
  }

  const upload = (who: SignedInAgent, codeId: string, bytes: Buffer, filename: string) =>
    who.agent.post(`/api/codes/${codeId}/attachments`).set('x-csrf-token', who.csrf).attach('file', bytes, filename);

  const listOf = async (who: SignedInAgent, codeId: string) =>
    ((await who.agent.get(`/api/codes/${codeId}/attachments`).expect(200)).body as { attachments: Listed[] }).attachments;

  const storedFiles = () => readdirSync(uploads).sort();

  it('stores a PNG and a PDF under their SHA-256 and lists them with the uploader', async () => {
    const codeId = await startCode();
    const png = tinyPng([220, 40, 40]);
    const pdf = tinyPdf('Defibrillator strip 07:43:52 VF 200 J');

    const first = await upload(recorder, codeId, png, 'strip-0743.png').expect(201);
    const second = await upload(leader, codeId, pdf, 'strip-0743.pdf').expect(201);
    accepted.add(sha256(png)).add(sha256(pdf));

    expect(first.body.attachment).toMatchObject({ filename: 'strip-0743.png', mediaType: 'image/png', sizeBytes: png.length, sha256: sha256(png), uploadedBy: 'Test att.recorder' });
    expect(second.body.attachment).toMatchObject({ filename: 'strip-0743.pdf', mediaType: 'application/pdf', sizeBytes: pdf.length, sha256: sha256(pdf), uploadedBy: 'Test att.leader' });

    const listed = await listOf(pharmacist, codeId);
    expect(listed.map((a) => [a.filename, a.mediaType, a.sha256, a.uploadedBy])).toEqual([
      ['strip-0743.png', 'image/png', sha256(png), 'Test att.recorder'],
      ['strip-0743.pdf', 'application/pdf', sha256(pdf), 'Test att.leader'],
    ]);
    expect(Date.parse(listed[0]!.uploadedAt)).not.toBeNaN();
    // On disk by digest, byte for byte.
    expect(readFileSync(path.join(uploads, sha256(png)))).toEqual(png);
    expect(readFileSync(path.join(uploads, sha256(pdf)))).toEqual(pdf);
    expect(storedFiles()).toEqual([...accepted].sort());

    const audit = app.database.sqlite
      .prepare("SELECT username, detail FROM audit_events WHERE action = 'attachment.added' AND code_id = ? ORDER BY id")
      .all(codeId) as { username: string; detail: string }[];
    expect(audit.map((a) => [a.username, JSON.parse(a.detail).sha256])).toEqual([
      ['att.recorder', sha256(png)],
      ['att.leader', sha256(pdf)],
    ]);
  });

  it('keeps the same bytes once on disk; a resend to the same code answers with the stored attachment', async () => {
    const png = tinyPng([30, 160, 90]);
    const codeA = await startCode();
    const codeB = await startCode();
    const first = await upload(recorder, codeA, png, 'photo-of-sheet.png').expect(201);
    const resent = await upload(recorder, codeA, png, 'photo-of-sheet.png').expect(200);
    const elsewhere = await upload(leader, codeB, png, 'same-photo.png').expect(201);
    accepted.add(sha256(png));

    expect(resent.body.attachment.id).toBe(first.body.attachment.id);
    expect(elsewhere.body.attachment.id).not.toBe(first.body.attachment.id);
    expect(elsewhere.body.attachment.sha256).toBe(sha256(png));
    expect(await listOf(recorder, codeA)).toHaveLength(1);
    expect(await listOf(recorder, codeB)).toHaveLength(1);
    // One file for the three uploads, and no temporary file left behind.
    expect(storedFiles()).toEqual([...accepted].sort());
  });

  it('refuses a file whose name contradicts its bytes, and one whose bytes are not an allowed type', async () => {
    const codeId = await startCode();
    const misnamed = await upload(recorder, codeId, tinyPng([1, 2, 3]), 'strip.pdf').expect(400);
    expect(misnamed.body.message).toMatch(/strip\.pdf/);
    expect(misnamed.body.message).toMatch(/PNG image \(image\/png\)/);

    const text = await upload(recorder, codeId, Buffer.from('VF at 07:43, shocked 200 J\n'), 'photo.png').expect(415);
    expect(text.body.message).toMatch(/photo\.png/);
    expect(text.body.message).toMatch(/plain text/);

    const gif = await upload(recorder, codeId, Buffer.from('GIF89a\x01\x00\x01\x00\x00\x00\x00;', 'latin1'), 'strip.gif').expect(415);
    expect(gif.body.message).toMatch(/image\/gif/);

    expect(await listOf(recorder, codeId)).toEqual([]);
    expect(storedFiles()).toEqual([...accepted].sort());
  });

  it('answers 413 with the limit for a file over ATTACHMENT_MAX_MB, and stores nothing', async () => {
    const codeId = await startCode();
    const big = Buffer.concat([tinyPng(), Buffer.alloc(300 * 1024, 7)]);
    const res = await upload(recorder, codeId, big, 'huge-photo.png').expect(413);
    expect(res.body.message).toMatch(/huge-photo\.png is larger than the 0\.25 MB limit/);
    expect(await listOf(recorder, codeId)).toEqual([]);
    expect(storedFiles()).toEqual([...accepted].sort());
  });

  it('says how to send the file when the field is missing or named otherwise', async () => {
    const codeId = await startCode();
    const none = await recorder.agent.post(`/api/codes/${codeId}/attachments`).set('x-csrf-token', recorder.csrf).send({ file: 'not a file' }).expect(400);
    expect(none.body.message).toMatch(/multipart\/form-data in the field "file"/);
    const other = await recorder.agent.post(`/api/codes/${codeId}/attachments`).set('x-csrf-token', recorder.csrf).attach('strip', tinyPng(), 'a.png').expect(400);
    expect(other.body.message).toMatch(/field "file"/);
  });

  it('lets a pharmacist read and download but not upload; downloads are the same bytes with nosniff', async () => {
    const codeId = await startCode();
    const png = tinyPng([10, 10, 200]);
    const pdf = tinyPdf('Pharmacy copy');
    await upload(pharmacist, codeId, png, 'strip.png').expect(403);
    expect(await listOf(pharmacist, codeId)).toEqual([]);

    const image = (await upload(recorder, codeId, png, 'Rhythmusstreifen über Bett 12.png').expect(201)).body.attachment as Listed;
    const document = (await upload(recorder, codeId, pdf, 'defib "report".pdf').expect(201)).body.attachment as Listed;
    accepted.add(sha256(png)).add(sha256(pdf));
    expect(image.filename).toBe('Rhythmusstreifen über Bett 12.png');
    expect((await listOf(pharmacist, codeId)).map((a) => a.id)).toEqual([image.id, document.id]);

    const shown = await pharmacist.agent.get(`/api/attachments/${image.id}/content`).buffer(true).parse(binary).expect(200);
    expect(shown.headers['content-type']).toBe('image/png');
    expect(shown.headers['x-content-type-options']).toBe('nosniff');
    expect(shown.headers['content-disposition']).toMatch(/^inline; filename="Rhythmusstreifen _ber Bett 12\.png"; filename\*=UTF-8''Rhythmusstreifen%20%C3%BCber%20Bett%2012\.png$/);
    expect(Buffer.compare(shown.body as Buffer, png)).toBe(0);

    const saved = await pharmacist.agent.get(`/api/attachments/${document.id}/content`).buffer(true).parse(binary).expect(200);
    expect(saved.headers['content-type']).toBe('application/pdf');
    expect(saved.headers['x-content-type-options']).toBe('nosniff');
    expect(saved.headers['content-disposition']).toBe(`attachment; filename="defib _report_.pdf"; filename*=UTF-8''defib%20%22report%22.pdf`);
    expect(Number(saved.headers['content-length'])).toBe(pdf.length);
    expect(Buffer.compare(saved.body as Buffer, pdf)).toBe(0);
  });

  it('stores and serves a name without bidirectional controls, so a PDF never shows as a .png', async () => {
    const codeId = await startCode();
    const bytes = tinyPdf('Bidi name');
    accepted.add(sha256(bytes));
    const res = await upload(recorder, codeId, bytes, 'strip\u202egnp.pdf').expect(201);
    expect(res.body.attachment.filename).toBe('stripgnp.pdf');
    expect((await listOf(leader, codeId))[0]!.filename).toBe('stripgnp.pdf');
    const served = await pharmacist.agent.get(`/api/attachments/${res.body.attachment.id as string}/content`).buffer(true).parse(binary).expect(200);
    expect(served.headers['content-disposition']).toBe(`attachment; filename="stripgnp.pdf"; filename*=UTF-8''stripgnp.pdf`);
  });

  it('answers 404 for an unknown code or attachment', async () => {
    const unknown = crypto.randomUUID();
    const res = await upload(recorder, unknown, tinyPng([5, 5, 5]), 'strip.png').expect(404);
    expect(res.body.message).toMatch(unknown);
    await recorder.agent.get(`/api/codes/${unknown}/attachments`).expect(404);
    await recorder.agent.get(`/api/attachments/${unknown}/content`).expect(404);
    expect(storedFiles()).toEqual([...accepted].sort());
  });
});
