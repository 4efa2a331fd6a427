/**
 * Just enough of RFC 5322 / MIME to show a received message in the development outbox: the
 * headers, encoded words in the subject, and the first text/plain part (7bit, 8bit,
 * quoted-printable or base64). Not a general mail parser.
 */
export interface ReadMessage {
  headers: Map<string, string>;
  subject: string;
  text: string;
}

function splitHead(raw: string): { head: string; body: string } {
  const match = /\r?\n\r?\n/.exec(raw);
  if (!match) return { head: raw, body: '' };
  return { head: raw.slice(0, match.index), body: raw.slice(match.index + match[0].length) };
}

function parseHeaders(head: string): Map<string, string> {
  const headers = new Map<string, string>();
  // Folded lines continue the header above them.
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const colon = line.indexOf(':');
    if (colon <= 0) continue;
    const name = line.slice(0, colon).trim().toLowerCase();
    if (!headers.has(name)) headers.set(name, line.slice(colon + 1).trim());
  }
  return headers;
}

function param(value: string, name: string): string | undefined {
  const match = new RegExp(`;\\s*${name}\\s*=\\s*(?:"([^"]*)"|([^;\\s]+))`, 'i').exec(value);
  return match ? (match[1] ?? match[2]) : undefined;
}

function decodeBytes(bytes: Buffer, charset = 'utf-8'): string {
  try {
    return new TextDecoder(charset).decode(bytes);
  } catch {
    return bytes.toString('utf8');
  }
}

function quotedPrintableBytes(text: string, underscoreIsSpace = false): Buffer {
  const source = text.replace(/=\r?\n/g, '');
  const out: number[] = [];
  for (let i = 0; i < source.length; i++) {
    const c = source[i]!;
    const hex = source.slice(i + 1, i + 3);
    if (c === '=' && /^[0-9A-Fa-f]{2}$/.test(hex)) {
      out.push(parseInt(hex, 16));
      i += 2;
    } else if (c === '_' && underscoreIsSpace) {
      out.push(0x20);
    } else {
      out.push(...Buffer.from(c, 'latin1'));
    }
  }
  return Buffer.from(out);
}

/** RFC 2047 encoded words; whitespace between two of them is dropped. */
export function decodeEncodedWords(value: string): string {
  return value
    .replace(/(=\?[^?]+\?[BbQq]\?[^?]*\?=)\s+(?==\?)/g, '$1')
    .replace(/=\?([^?*]+)(?:\*[^?]*)?\?([BbQq])\?([^?]*)\?=/g, (_m, charset: string, enc: string, data: string) =>
      decodeBytes(enc.toUpperCase() === 'B' ? Buffer.from(data, 'base64') : quotedPrintableBytes(data, true), charset),
    );
}

function decodeBody(body: string, headers: Map<string, string>): string {
  const encoding = (headers.get('content-transfer-encoding') ?? '7bit').toLowerCase();
  const charset = param(headers.get('content-type') ?? '', 'charset') ?? 'utf-8';
  if (encoding === 'base64') return decodeBytes(Buffer.from(body.replace(/\s+/g, ''), 'base64'), charset);
  if (encoding === 'quoted-printable') return decodeBytes(quotedPrintableBytes(body), charset);
  return decodeBytes(Buffer.from(body, 'latin1'), charset);
}

/** The first text/plain part, looking inside multipart bodies. */
function plainText(headers: Map<string, string>, body: string, depth = 0): string | undefined {
  const type = headers.get('content-type') ?? 'text/plain';
  if (/^multipart\//i.test(type) && depth < 5) {
    const boundary = param(type, 'boundary');
    if (!boundary) return undefined;
    for (const part of body.split(`--${boundary}`).slice(1)) {
      if (part.startsWith('--')) break;
      const { head, body: partBody } = splitHead(part.replace(/^\r?\n/, ''));
      const found = plainText(parseHeaders(head), partBody.replace(/\r?\n$/, ''), depth + 1);
      if (found !== undefined) return found;
    }
    return undefined;
  }
  return /^text\/plain/i.test(type) ? decodeBody(body, headers) : undefined;
}

export function readMessage(raw: Buffer): ReadMessage {
  // Latin-1 keeps every byte as one character, so encoded bodies decode to the right bytes.
  const { head, body } = splitHead(raw.toString('latin1'));
  const headers = parseHeaders(head);
  const subject = decodeEncodedWords(decodeBytes(Buffer.from(headers.get('subject') ?? '', 'latin1')));
  const text = (plainText(headers, body) ?? '').replace(/\r\n/g, '\n').replace(/\n$/, '');
  return { headers, subject, text };
}
