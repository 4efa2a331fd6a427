import { Catch, HttpException, HttpStatus, type ArgumentsHost } from '@nestjs/common';
import { BaseExceptionFilter } from '@nestjs/core';
import type { Response } from 'express';
import { uniqueConflict } from './unique-conflict.js';

/**
 * Every HTTP route: a unique-constraint failure is a 409 naming what was taken, and an
 * exception that carries `retryAfterSeconds` (a throttled attempt) sends it as Retry-After.
 * Anything else goes on to Nest's own handling.
 */
@Catch()
export class ApiExceptionFilter extends BaseExceptionFilter {
  override catch(exception: unknown, host: ArgumentsHost): void {
    if (host.getType() === 'http') {
      const res = host.switchToHttp().getResponse<Response>();
      const conflict = uniqueConflict(exception);
      if (conflict) {
        res.status(HttpStatus.CONFLICT).json(conflict.getResponse());
        return;
      }
      const retryAfter = (exception as { retryAfterSeconds?: unknown }).retryAfterSeconds;
      if (exception instanceof HttpException && typeof retryAfter === 'number') res.setHeader('Retry-After', String(retryAfter));
    }
    super.catch(exception, host);
  }
}
