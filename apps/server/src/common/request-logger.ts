import { randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { RequestHandler } from 'express';
import { pino, type Level } from 'pino';
import { pinoHttp } from 'pino-http';

/** One JSON line per request: id, method, path, status, time taken and who asked. No cookies, no bodies. */
export function requestLogger(level: Level | 'silent'): RequestHandler {
  const logger = pino({ level, base: { service: 'steadyhand' } });
  return pinoHttp({
    logger,
    genReqId: (req: IncomingMessage) => (req.headers['x-request-id'] as string | undefined)?.slice(0, 64) ?? randomUUID(),
    serializers: {
      req: (req: { id: string; method: string; url: string }) => ({ id: req.id, method: req.method, path: req.url.split('?')[0] }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
    customProps: (req: IncomingMessage & { user?: { id: string } }) => ({ userId: req.user?.id }),
    customLogLevel: (_req: IncomingMessage, res: ServerResponse, err?: Error) =>
      err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info',
    autoLogging: { ignore: (req: IncomingMessage) => req.url === '/api/health' },
  });
}
