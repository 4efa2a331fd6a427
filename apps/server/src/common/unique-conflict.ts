import { ConflictException, HttpStatus } from '@nestjs/common';

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
