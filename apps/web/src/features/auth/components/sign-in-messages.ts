import { isApiError } from '../../../lib/api-client';

export const MISMATCH_MESSAGE = 'That username and password do not match.';

export function tooManyAttemptsMessage(retryAfterSeconds: number | null): string {
  if (retryAfterSeconds === null) return 'Too many attempts. Try again in a few minutes.';
  const minutes = Math.max(1, Math.ceil(retryAfterSeconds / 60));
  return `Too many attempts. Try again in about ${String(minutes)} ${minutes === 1 ? 'minute' : 'minutes'}.`;
}

/** Words for a failed sign-in. Never says whether the username or the password was wrong. */
export function signInErrorMessage(error: unknown): string {
  if (isApiError(error)) {
    if (error.status === 401) return MISMATCH_MESSAGE;
    if (error.status === 429) return tooManyAttemptsMessage(error.retryAfterSeconds);
    if (error.status === 400) return 'Check the username and password, then try again.';
    if (error.status >= 500) return 'Steadyhand could not sign you in just now. Try again in a moment.';
    return error.message;
  }
  return 'Cannot reach Steadyhand. Check the network connection and try again.';
}
