import 'reflect-metadata';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { ConsoleLogger, type LogLevel } from '@nestjs/common';
import { NestFactory } from '@nestjs/core';
import type { NestExpressApplication } from '@nestjs/platform-express';
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import helmet from 'helmet';
import { AppModule } from './app.module.js';
import { AuthPassportService } from './auth/auth-passport.service.js';
import { csrfProtection } from './auth/csrf.js';
import { SessionService } from './auth/session.service.js';
import type { AppConfig } from './config/config.js';
import { openDatabase, type DatabaseHandle } from './db/database.js';
import { JSON_MAX_BYTES, jsonDepthLimit } from './common/json-limits.js';
import { requestLogger } from './common/request-logger.js';
import { ApiExceptionFilter } from './common/api-exception.filter.js';
import { assertRecordKeysPresent } from './records/record-keys.js';
import { databaseHasSignatures } from './records/signatures.repository.js';

const NEST_LEVELS: Record<AppConfig['logLevel'], LogLevel[] | false> = {
  fatal: ['fatal'],
  error: ['fatal', 'error'],
  warn: ['fatal', 'error', 'warn'],
  info: ['fatal', 'error', 'warn', 'log'],
  debug: ['fatal', 'error', 'warn', 'log', 'debug'],
  trace: ['fatal', 'error', 'warn', 'log', 'debug', 'verbose'],
  silent: false,
};

export interface CreatedApp {
  app: NestExpressApplication;
  database: DatabaseHandle;
}

/**
 * Builds the whole server (used by main.ts and by the API tests): the database opened, checked
 * and migrated; sessions, sign-in, CSRF and security headers in front of the /api routes; the
 * built web app served for every other path.
 */
export async function createApp(config: AppConfig): Promise<CreatedApp> {
  const database = openDatabase(config.databaseFile, config.migrationsDir);
  try {
    assertRecordKeysPresent(config.dataDir, databaseHasSignatures(database.sqlite));
  } catch (err) {
    database.sqlite.close();
    throw err;
  }
  const levels = NEST_LEVELS[config.logLevel];
  const app = await NestFactory.create<NestExpressApplication>(AppModule.forRoot(config, database), {
    logger: levels === false ? false : new ConsoleLogger({ json: true, logLevels: levels }),
    abortOnError: false,
  });
  app.enableShutdownHooks();
  app.set('trust proxy', config.trustProxy ? 1 : false);
  app.disable('x-powered-by');
  // /metrics sits beside /api, where Prometheus looks by default.
  app.setGlobalPrefix('api', { exclude: ['metrics'] });
  app.useGlobalFilters(new ApiExceptionFilter(app.getHttpAdapter()));

  app.use(requestLogger(config.logLevel));
  app.use(
    helmet({
      contentSecurityPolicy: {
        useDefaults: true,
        directives: {
          'style-src': ["'self'", "'unsafe-inline'"], // the UI library injects its styles at run time
          'img-src': ["'self'", 'data:', 'blob:'],
          'font-src': ["'self'", 'data:'],
          'connect-src': ["'self'", ...config.allowedOrigins.map((o) => o.replace(/^http/, 'ws'))],
          // Only over https: on plain http it would send the browser to an https port that is not there.
          'upgrade-insecure-requests': config.secureCookies ? [] : null,
        },
      },
      strictTransportSecurity: config.secureCookies,
    }),
  );

  // The JSON parser first (Nest would add its own at init, after these), then the depth bound.
  app.useBodyParser('json', { limit: JSON_MAX_BYTES });
  app.use(jsonDepthLimit());

  const sessions = app.get(SessionService);
  const { passport } = app.get(AuthPassportService);
  app.use(sessions.middleware);
  app.use(absoluteSessionTimeout(config.sessionAbsoluteMs, sessions));
  app.use(passport.initialize());
  app.use(passport.session());
  app.use(csrfProtection(config.allowedOrigins));
  serveWebApp(app, config.webDist);
  return { app, database };
}

/** Ends a session that has lasted longer than the absolute limit, however active it was. */
function absoluteSessionTimeout(limitMs: number, sessions: SessionService): RequestHandler {
  return (req, _res, next) => {
    const startedAt = req.session?.signedInAt;
    if (!startedAt || Date.now() - startedAt <= limitMs) return next();
    const oldSid = req.sessionID;
    req.session.regenerate((err) => {
      sessions.ended([oldSid]);
      next(err);
    });
  };
}

/** Paths the server answers itself, never with the web app. */
const isServerPath = (p: string) => p.startsWith('/api/') || p.startsWith('/socket.io') || p === '/metrics';

function serveWebApp(app: NestExpressApplication, webDist: string): void {
  const indexHtml = path.join(webDist, 'index.html');
  if (!existsSync(indexHtml)) {
    app.use((req: Request, res: Response, next: NextFunction) => {
      if (req.method !== 'GET' || isServerPath(req.path)) return next();
      res.status(503).type('text').send('The web app is not built yet: run `npm start` (or `pnpm build`).');
    });
    return;
  }
  // Hashed file names under assets/ never change, so browsers may keep them.
  app.useStaticAssets(path.join(webDist, 'assets'), { prefix: '/assets/', immutable: true, maxAge: '365d', index: false });
  app.useStaticAssets(webDist, { index: false, maxAge: 0 });
  app.use((req: Request, res: Response, next: NextFunction) => {
    if (req.method !== 'GET' || isServerPath(req.path)) return next();
    res.setHeader('Cache-Control', 'no-cache');
    res.sendFile(indexHtml);
  });
}
