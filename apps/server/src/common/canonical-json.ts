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
 * a key), a number that is not finite, or nesting deeper than `maxDepth` (deep enough to exhaust
 * the stack, at a depth that depends on the stack). Iterative, so depth is refused the same way
 * every time, whatever the stack.
 */
export function findNotCanonicalisable(value: unknown, maxDepth = CANONICAL_MAX_DEPTH): NotCanonicalisable | undefined {
  interface Item {
    value: unknown;
    parent: Item | undefined;
    key: string;
    depth: number;
  }
  const pathOf = (item: Item | undefined): string => {
    const keys: string[] = [];
    for (let at = item; at?.parent; at = at.parent) keys.push(at.key);
    keys.reverse();
    // A path hundreds of levels long says no more than its start.
    return keys.length > 8 ? `${keys.slice(0, 6).join('.')}.….${keys.at(-1)}` : keys.join('.');
  };
  const stack: Item[] = [{ value, parent: undefined, key: '', depth: 0 }];
  while (stack.length) {
    const item = stack.pop()!;
    if (typeof item.value === 'string') {
      if (LONE_SURROGATE.test(item.value)) return new NotCanonicalisable(pathOf(item), 'holds text that is not well-formed Unicode (a lone surrogate)');
      continue;
    }
    if (typeof item.value === 'number') {
      if (!Number.isFinite(item.value)) return new NotCanonicalisable(pathOf(item), 'holds a number that is not finite');
      continue;
    }
    if (item.value === null || typeof item.value !== 'object') continue;
    if (item.depth >= maxDepth) return new NotCanonicalisable(pathOf(item), `is nested more than ${maxDepth} levels deep`);
    for (const [key, child] of Object.entries(item.value)) {
      if (LONE_SURROGATE.test(key)) return new NotCanonicalisable(pathOf(item), 'has a field name that is not well-formed Unicode (a lone surrogate)');
      stack.push({ value: child, parent: item, key, depth: item.depth + 1 });
    }
  }
  return undefined;
}

/**
 * RFC 8785 (JSON Canonicalization Scheme): the same value always gives the same bytes. A value it
 * cannot serialise throws `NotCanonicalisable`, naming where and why, never a stack overflow.
 */
export function canonicalText(value: unknown): string {
  const found = findNotCanonicalisable(value);
  if (found) throw found;
  const text = canonicalize(value);
  if (text === undefined) throw new NotCanonicalisable('', 'cannot be canonicalised');
  return text;
}

export function sha256Hex(text: string | Buffer): string {
  return createHash('sha256').update(text).digest('hex');
}
