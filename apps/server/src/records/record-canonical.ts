import type { CanonicalRecord, SignatureMeaning } from '@steadyhand/shared';
import { canonicalText, sha256Hex } from '../common/canonical-json.js';

// The record's shape is shared with the screens; the server adds how it is hashed and signed.
export { RECORD_FORMAT, type CanonicalRecord, type RecordAttachment, type RecordCode } from '@steadyhand/shared';
export { canonicalText, sha256Hex };

export function recordDigest(record: CanonicalRecord): string {
  return sha256Hex(canonicalText(record));
}

/**
 * The record as it stood at a moment: the entries and attachments stored by then. After the first
 * signature the code's details are frozen and the log only grows (addenda), so this rebuilds
 * exactly what each signer signed.
 */
export function recordAsOf(record: CanonicalRecord, at: string): CanonicalRecord {
  const t = Date.parse(at);
  const { detailAddenda, ...rest } = record;
  // Registry-details addenda only ever follow the first signature; the key is there only when some are.
  const addenda = (detailAddenda ?? []).filter((a) => Date.parse(a.recordedAt) <= t);
  return {
    ...rest,
    entries: record.entries.filter((e) => Date.parse(e.recordedAt) <= t),
    attachments: record.attachments.filter((a) => Date.parse(a.uploadedAt) <= t),
    ...(addenda.length ? { detailAddenda: addenda } : {}),
  };
}

export interface SignaturePayload {
  recordId: string;
  digest: string;
  signerId: string;
  printedName: string;
  meaning: SignatureMeaning;
  signedAt: string;
}

/** What the server's Ed25519 signature of a person's signature covers: it names its record, so it cannot move. */
export function signaturePayloadText(p: SignaturePayload): string {
  return canonicalText({
    recordId: p.recordId,
    digest: p.digest,
    signerId: p.signerId,
    printedName: p.printedName,
    meaning: p.meaning,
    signedAt: p.signedAt,
  });
}

export interface PdfStamp {
  recordId: string;
  digest: string;
  generatedAt: string;
}

/** What the server signs when it makes a printed copy. */
export function pdfStampText(p: PdfStamp): string {
  return canonicalText({ recordId: p.recordId, digest: p.digest, generatedAt: p.generatedAt });
}

/** A stamp as written into a PDF: the server signature over the stamp and the id of the key that made it. */
export interface SignedPdfStamp extends PdfStamp {
  signature: string;
  /** Absent in copies printed before key ids: those were stamped by the first key. */
  keyId?: string;
}

/** The stamp as written into the PDF's Keywords and read back from the file's bytes. */
export function formatPdfStamp(p: SignedPdfStamp): string {
  return `steadyhand-record:${p.recordId} sha256:${p.digest} sig:${p.signature} at:${p.generatedAt}${p.keyId ? ` key:${p.keyId}` : ''}`;
}

const STAMP_PATTERN =
  /steadyhand-record:([0-9A-Za-z-]{1,64}) sha256:([0-9a-f]{64}) sig:([A-Za-z0-9_-]{20,200}) at:(\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(?:\.\d{1,3})?Z)(?: key:([0-9a-f]{16}))?/;

/** Finds the stamp in a PDF's bytes (the document information dictionary is not compressed). */
export function readPdfStamp(bytes: Buffer): SignedPdfStamp | undefined {
  const match = STAMP_PATTERN.exec(bytes.toString('latin1'));
  if (!match) return undefined;
  const [, recordId, digest, signature, generatedAt, keyId] = match as unknown as [string, string, string, string, string, string | undefined];
  return { recordId, digest, signature, generatedAt, ...(keyId ? { keyId } : {}) };
}
