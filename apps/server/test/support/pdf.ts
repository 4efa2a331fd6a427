import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { SignedInAgent } from './test-app.js';

/** Collects a binary response body (supertest parses only text and JSON by default). */
type ParseFn = Extract<Parameters<ReturnType<SignedInAgent['agent']['get']>['parse']>[0], (res: never, cb: never) => void>;
export const binary: ParseFn = (res, done) => {
  const stream = res as unknown as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
};

const workDir = mkdtempSync(path.join(tmpdir(), 'steadyhand-pdf-text-'));
let count = 0;

/** The text of a PDF through poppler's pdftotext, laid out as on the page. */
export function pdfText(bytes: Buffer): string {
  const file = path.join(workDir, `record-${++count}.pdf`);
  writeFileSync(file, bytes);
  return execFileSync('/usr/bin/pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
}

/** A fresh printed copy of a code's record, as the reader downloads it. */
export async function recordPdf(who: SignedInAgent, codeId: string): Promise<Buffer> {
  const res = await who.agent.get(`/api/codes/${codeId}/record.pdf`).buffer(true).parse(binary).expect(200);
  return res.body as Buffer;
}
