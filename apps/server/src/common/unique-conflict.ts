import { ArgumentsHost, Catch, ConflictException, HttpStatus } from '@nestjs/common';
import { BaseExceptionFilter } from '@nestjs/core';
import type { Response } from 'express';

const UNIQUE_CODES = new Set(['SQLITE_CONSTRAINT_UNIQUE', 'SQLITE_CONSTRAINT_PRIMARYKEY']);

/**
 * A write that lost a race against another with the same unique value (two admins adding one
 * username at once): the check before the insert passed for both, the database refused the
 * second. That is a conflict (409) that says what was taken, never a 500.
 */
export function uniqueConflict(err: unknown): ConflictException | undefined {
  if (!(err instanceof Error) || !UNIQUE_CODES.has((err as Error & { code?: string }).code ?? '')) return undefined;
  const columns = /constraint failed: (.+)$/.exec(err.message)?.[1] ?? 'a unique value';
  return new ConflictException({
    statusCode: HttpStatus.CONFLICT,
    error: 'Conflict',
    message: `${columns} is taken already: another request stored the same value first`,
  });
}

/** Every HTTP route: a unique-constraint failure is a 409; anything else goes on to Nest's own handling. */
@Catch()
export class UniqueConflictFilter extends BaseExceptionFilter {
  override catch(exception: unknown, host: ArgumentsHost): void {
    const conflict = host.getType() === 'http' ? uniqueConflict(exception) : undefined;
    if (!conflict) return super.catch(exception, host);
    host.switchToHttp().getResponse<Response>().status(HttpStatus.CONFLICT).json(conflict.getResponse());
  }
}
