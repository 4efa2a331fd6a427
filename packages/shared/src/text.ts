import { z } from 'zod';

/**
 * Text the product accepts from anyone. A lone surrogate (half of a UTF-16 pair, e.g. "\ud800"
 * in JSON) is not Unicode: it cannot be canonicalised (RFC 8785), hashed, signed or printed, so
 * every string schema starts from `textSchema()` and refuses it where it comes in.
 */
const LONE_SURROGATE = /\p{Cs}/u;

export const NOT_WELL_FORMED = 'must be well-formed text (a lone surrogate was found)';

export function isWellFormedText(value: string): boolean {
  return !LONE_SURROGATE.test(value);
}

/** `z.string()` that refuses a lone surrogate; chain `.trim()`, `.min()`, `.max()` as usual. */
export function textSchema(params?: Parameters<typeof z.string>[0]): z.ZodString {
  return z.string(params).refine(isWellFormedText, NOT_WELL_FORMED);
}
