import path from 'node:path';
import { fileTypeFromBuffer } from 'file-type';

/** What may be attached to a code: monitor strips and photos (images) and PDFs, by their bytes. */
export const ATTACHMENT_TYPES = {
  'image/png': { label: 'a PNG image', extensions: ['png'], inline: true },
  'image/jpeg': { label: 'a JPEG image', extensions: ['jpg', 'jpeg', 'jpe', 'jfif'], inline: true },
  'image/webp': { label: 'a WebP image', extensions: ['webp'], inline: true },
  'application/pdf': { label: 'a PDF document', extensions: ['pdf'], inline: false },
} as const;

export type AttachmentMediaType = keyof typeof ATTACHMENT_TYPES;

export const isAttachmentMediaType = (value: string): value is AttachmentMediaType => Object.hasOwn(ATTACHMENT_TYPES, value);

/** Why a file was refused: `unsupported` (its bytes are no allowed type) or `misnamed` (its name says another type). */
export class AttachmentRefused extends Error {
  constructor(
    readonly reason: 'unsupported' | 'misnamed',
    message: string,
  ) {
    super(message);
  }
}

/**
 * Bidirectional controls (Unicode UAX #9: ALM, LRM, RLM, the embeddings, overrides and
 * isolates) and the line and paragraph separators. In a file name they make the shown name
 * lie: "strip\u202Egnp.pdf" displays as "stripfdp.png".
 */
const BIDI_CONTROLS = /[\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069\u2028\u2029]/g;

/**
 * The client's file name made safe to store and to send back in a header: no folders, no
 * control characters, no bidirectional controls, not too long (the extension kept).
 */
export function cleanFilename(raw: string): string {
  const base = raw.split(/[\\/]/).pop() ?? '';
  // eslint-disable-next-line no-control-regex
  let name = base.normalize('NFC').replace(/[\u0000-\u001f\u007f-\u009f]/g, '').replace(BIDI_CONTROLS, '').trim();
  if (name.length > 180) {
    const ext = path.extname(name).slice(0, 12);
    name = name.slice(0, 180 - ext.length) + ext;
  }
  return name;
}

export const extensionOf = (filename: string): string => path.extname(filename).slice(1).toLowerCase();

/** Bytes with no NUL and valid UTF-8 at the start are most likely text. */
function looksLikeText(bytes: Buffer): boolean {
  const head = bytes.subarray(0, 4096);
  if (head.includes(0)) return false;
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(head.length === bytes.length ? head : trimPartialUtf8(head));
    return true;
  } catch {
    return false;
  }
}

/** Drops a multi-byte character cut off at the end of a sample. */
function trimPartialUtf8(head: Buffer): Buffer {
  let end = head.length;
  for (let i = 1; i <= 3 && end - i >= 0; i++) {
    const byte = head[end - i]!;
    if ((byte & 0xc0) === 0x80) continue;
    if (byte >= 0xc0) end -= i;
    break;
  }
  return head.subarray(0, end);
}

const ALLOWED_LIST = 'PNG, JPEG, WebP or PDF';

/**
 * Decides the type from the bytes, never from the name or the client's Content-Type. Refuses a
 * file whose bytes are no allowed type, and a file whose extension names another type than its
 * bytes (a PNG called strip.pdf), since the name is what people see in the record.
 */
export async function detectAttachmentType(bytes: Buffer, filename: string): Promise<{ mediaType: AttachmentMediaType; extension: string }> {
  const detected = await fileTypeFromBuffer(bytes);
  const shown = filename || 'The file';
  if (!detected || !isAttachmentMediaType(detected.mime)) {
    const found = detected
      ? `${detected.mime} (.${detected.ext})`
      : looksLikeText(bytes)
        ? 'plain text'
        : 'no known file format';
    throw new AttachmentRefused('unsupported', `${shown} was refused: its contents are ${found}, not a ${ALLOWED_LIST} file`);
  }
  const type = ATTACHMENT_TYPES[detected.mime];
  const ext = extensionOf(filename);
  if (ext && !(type.extensions as readonly string[]).includes(ext)) {
    throw new AttachmentRefused(
      'misnamed',
      `${shown} was refused: it is named .${ext} but its contents are ${type.label} (${detected.mime}); rename it to .${type.extensions[0]} or choose the right file`,
    );
  }
  return { mediaType: detected.mime, extension: type.extensions[0] };
}

/**
 * A Content-Disposition value that survives any file name: a plain-ASCII `filename` for old
 * clients and the exact name in `filename*` (RFC 6266, RFC 8187).
 */
export function contentDisposition(type: 'inline' | 'attachment', filename: string): string {
  const ascii = filename.replace(/[^\x20-\x7e]|["\\%]/g, '_');
  const encoded = encodeURIComponent(filename).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `${type}; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}
