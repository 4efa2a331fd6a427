import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';

// Shared by the signed record and the entry chain (codes module), so neither feature imports the other for it.

/** RFC 8785 (JSON Canonicalization Scheme): the same value always gives the same bytes. */
export function canonicalText(value: unknown): string {
  const text = canonicalize(value);
  if (text === undefined) throw new Error('The value cannot be canonicalised');
  return text;
}

export function sha256Hex(text: string | Buffer): string {
  return createHash('sha256').update(text).digest('hex');
}
