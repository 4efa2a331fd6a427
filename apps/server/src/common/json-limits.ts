import type { RequestHandler } from 'express';

/**
 * Bounds on what a client may send, checked at the edge before any handler sees it. The deepest
 * body the product takes is the protocol settings (5 levels: drugs, a drug, its pediatric rules,
 * a rule); nothing legitimate comes near these.
 */
export const JSON_MAX_DEPTH = 16;
/** The largest JSON body (the protocol settings with the whole drug catalogue are about 10 kB). */
export const JSON_MAX_BYTES = 100 * 1024;

/** How deep a value's objects and arrays go (a bare object is 1), counted without recursion and stopping past `limit`. */
export function jsonDepth(value: unknown, limit = JSON_MAX_DEPTH): number {
  let deepest = 0;
  const stack: [unknown, number][] = [[value, 1]];
  while (stack.length) {
    const [item, depth] = stack.pop()!;
    if (item === null || typeof item !== 'object') continue;
    deepest = Math.max(deepest, depth);
    if (deepest > limit) return deepest;
    for (const child of Object.values(item)) if (child !== null && typeof child === 'object') stack.push([child, depth + 1]);
  }
  return deepest;
}

/** Why a parsed message is refused, or undefined when it is within the bounds. */
export function jsonShapeProblem(value: unknown, what = 'The JSON body'): string | undefined {
  if (jsonDepth(value) > JSON_MAX_DEPTH) return `${what} is nested more than ${JSON_MAX_DEPTH} levels deep; at most ${JSON_MAX_DEPTH} are accepted`;
  return undefined;
}

/** After the JSON parser: a body nested too deep is a 400 that says so, before any route runs. */
export function jsonDepthLimit(): RequestHandler {
  return (req, res, next) => {
    const body: unknown = req.body;
    const problem = body !== null && typeof body === 'object' ? jsonShapeProblem(body) : undefined;
    if (!problem) return next();
    res.status(400).json({ statusCode: 400, error: 'Bad Request', message: problem });
  };
}
