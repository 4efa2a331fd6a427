import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler } from 'express';

export const CSRF_HEADER = 'x-csrf-token';
const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

export function ensureCsrfToken(req: Request): string {
  req.session.csrfToken ??= randomBytes(32).toString('base64url');
  return req.session.csrfToken;
}

function sameToken(a: string, b: string): boolean {
  const ba = Buffer.from(a);
  const bb = Buffer.from(b);
  return ba.length === bb.length && timingSafeEqual(ba, bb);
}

/**
 * Synchronizer-token CSRF check on every state-changing /api request, with the Origin header
 * checked against the allowlist as a second layer.
 */
export function csrfProtection(allowedOrigins: readonly string[]): RequestHandler {
  return (req, res, next) => {
    if (SAFE_METHODS.has(req.method) || !req.path.startsWith('/api/')) return next();
    const origin = req.get('origin');
    if (origin && !allowedOrigins.includes(origin)) {
      res.status(403).json({ statusCode: 403, error: 'csrf', message: `Requests from ${origin} are not allowed` });
      return;
    }
    const sent = req.get(CSRF_HEADER);
    const expected = req.session?.csrfToken;
    if (!sent || !expected || !sameToken(sent, expected)) {
      res.status(403).json({
        statusCode: 403,
        error: 'csrf',
        message: `Missing or wrong CSRF token: get one from GET /api/auth/csrf and send it in the ${CSRF_HEADER} header`,
      });
      return;
    }
    next();
  };
}
