import { BadRequestException } from '@nestjs/common';
import { dictionary } from '@zxcvbn-ts/language-common';

export const TOO_COMMON_MESSAGE = 'this password is too common';

let common: Set<string> | undefined;

/** The common-password list that ships with zxcvbn-ts, compared in lower case (loaded on first use). */
export function isCommonPassword(password: string): boolean {
  common ??= new Set(dictionary['passwords-common'].map((p) => p.toLowerCase()));
  return common.has(password.normalize('NFKC').toLowerCase());
}

/** Length is checked by the shared schema; this adds the list check (ASVS 2.1.7), no composition rules. */
export function assertNotCommonPassword(password: string): void {
  if (isCommonPassword(password)) {
    throw new BadRequestException({ statusCode: 400, error: 'Bad Request', message: TOO_COMMON_MESSAGE });
  }
}
