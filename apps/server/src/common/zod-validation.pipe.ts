import { BadRequestException, type PipeTransform } from '@nestjs/common';
import type { z } from 'zod';

/** Turns a zod issue list into one readable sentence: "weightKg: must be above 0; category: ...". */
export function describeZodError(error: z.ZodError): string {
  return error.issues
    .slice(0, 5)
    .map((i) => (i.path.length ? `${i.path.join('.')}: ${i.message}` : i.message))
    .join('; ');
}

/** A 400 for problems found after the schema (rules across fields): each named by its path. */
export function fieldProblemsError(problems: readonly { path: string; message: string }[]): BadRequestException {
  return new BadRequestException({
    statusCode: 400,
    error: 'Bad Request',
    message: problems.map((p) => `${p.path}: ${p.message}`).join('; '),
    issues: problems,
  });
}

/** Validates a request part with a schema from the shared package; bad input is a 400 that says what is wrong. */
export class ZodValidationPipe<T extends z.ZodType> implements PipeTransform<unknown, z.output<T>> {
  constructor(private readonly schema: T) {}

  transform(value: unknown): z.output<T> {
    const result = this.schema.safeParse(value);
    if (!result.success) {
      throw new BadRequestException({
        statusCode: 400,
        error: 'Bad Request',
        message: describeZodError(result.error),
        issues: result.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })),
      });
    }
    return result.data;
  }
}
