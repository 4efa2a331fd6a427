import { createHash } from 'node:crypto';
import canonicalize from 'canonicalize';

// Shared by the signed record and the entry chain (codes module), so neither feature imports the other for it.

/** Deeper than anything the product stores (the edge refuses bodies past JSON_MAX_DEPTH). */
const CANONICAL_MAX_DEPTH = 200;

/** A value RFC 8785 cannot serialise, and where in it the trouble is. */
export class NotCanonicalisable extends Error {
  constructor(
    /** Dotted path from the value's root, e.g. `code.patient.name`; empty for the root. */
    readonly path: string,
    /** What is wrong there, as a sentence part: "holds text that is not well-formed Unicode...". */
    readonly why: string,
  ) {
    super(`${path || 'the value'} ${why}`);
  }
}

const LONE_SURROGATE = /\p{Cs}/u;

/**
 * The first place in a JSON value that RFC 8785 cannot serialise: a lone surrogate (in a value or
 * a key), a number that is not finite, or nesting deep enough to exhaust the stack. Iterative, so
 * it can describe a value that made canonicalisation itself overflow.
 */
export function findNotCanonicalisable(value: unknown, maxDepth = CANONICAL_MAX_DEPTH): NotCanonicalisable | undefined {
  const stack: { value: unknown; path: string[]; depth: number }[] = [{ value, path: [], depth: 0 }];
  while (stack.length) {
    const item = stack.pop()!;
    const where = item.path.join('.');
    if (typeof item.value === 'string') {
      if (LONE_SURROGATE.test(item.value)) return new NotCanonicalisable(where, 'holds text that is not well-formed Unicode (a lone surrogate)');
      continue;
    }
    if (typeof item.value === 'number') {
      if (!Number.isFinite(item.value)) return new NotCanonicalisable(where, 'holds a number that is not finite');
      continue;
    }
    if (item.value === null || typeof item.value !== 'object') continue;
    if (item.depth >= maxDepth) return new NotCanonicalisable(where, `is nested more than ${maxDepth} levels deep`);
    for (const [key, child] of Object.entries(item.value)) {
      if (LONE_SURROGATE.test(key)) return new NotCanonicalisable(where, 'has a field name that is not well-formed Unicode (a lone surrogate)');
      stack.push({ value: child, path: [...item.path, key], depth: item.depth + 1 });
    }
  }
  return undefined;
}

/**
 * RFC 8785 (JSON Canonicalization Scheme): the same value always gives the same bytes. A value it
 * cannot serialise throws `NotCanonicalisable`, naming where and why, never a bare stack overflow.
 */
export function canonicalText(value: unknown): string {
  let text: string | undefined;
  try {
    text = canonicalize(value);
  } catch (err) {
    // Rare, so the value is walked only now, to say where.
    throw findNotCanonicalisable(value) ?? new NotCanonicalisable('', `cannot be canonicalised: ${(err as Error).message}`);
  }
  if (text === undefined) throw new NotCanonicalisable('', 'cannot be canonicalised');
  return text;
}

export function sha256Hex(text: string | Buffer): string {
  return createHash('sha256').update(text).digest('hex');
}
