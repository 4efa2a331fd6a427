/**
 * The one way the browser talks to the Steadyhand server: same-origin JSON with the session
 * cookie, a CSRF token on every state-changing request, and errors as `ApiError`.
 */

export class ApiError extends Error {
  override readonly name = 'ApiError';
  readonly status: number;
  /** Seconds the server asked us to wait (Retry-After), when it said so. */
  readonly retryAfterSeconds: number | null;
  /** The parsed JSON body of the error answer, if there was one. */
  readonly body: unknown;

  constructor(status: number, message: string, retryAfterSeconds: number | null = null, body: unknown = null) {
    super(message);
    this.status = status;
    this.retryAfterSeconds = retryAfterSeconds;
    this.body = body;
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';

export interface RequestOptions {
  body?: unknown;
  signal?: AbortSignal;
}

const CSRF_PATH = '/api/auth/csrf';
const CSRF_HEADER = 'x-csrf-token';
/** Auth routes answer 401 as part of their job; they never trigger the sign-in redirect. */
const AUTH_PREFIX = '/api/auth/';
/** Signing in or out starts a new session, and with it a new CSRF token. */
const SESSION_CHANGING_PATHS = new Set(['/api/auth/login', '/api/auth/logout', '/api/auth/totp']);

let csrfToken: Promise<string> | null = null;
let onUnauthorized: (() => void) | null = null;

/** Called when a non-auth request answers 401; the app sends the user to the sign-in page. */
export function setUnauthorizedHandler(handler: (() => void) | null): void {
  onUnauthorized = handler;
}

/** Forget the cached CSRF token; the next state-changing request fetches a fresh one. */
export function resetCsrfToken(): void {
  csrfToken = null;
}

function getCsrfToken(): Promise<string> {
  if (!csrfToken) {
    const pending = fetchCsrfToken();
    csrfToken = pending;
    // A failed fetch must not stay cached, or every later request would fail the same way.
    pending.catch(() => {
      if (csrfToken === pending) csrfToken = null;
    });
  }
  return csrfToken;
}

async function fetchCsrfToken(): Promise<string> {
  const response = await fetch(CSRF_PATH, {
    method: 'GET',
    credentials: 'same-origin',
    headers: { accept: 'application/json' },
  });
  const body = await readBody(response);
  if (!response.ok) throw toApiError(response, body);
  if (isRecord(body) && typeof body.token === 'string' && body.token !== '') return body.token;
  throw new ApiError(response.status, 'The server did not send a security token.', null, body);
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

async function readBody(response: Response): Promise<unknown> {
  if (response.status === 204 || response.status === 205) return null;
  const text = await response.text();
  if (text === '') return null;
  const type = response.headers.get('content-type') ?? '';
  if (type.includes('json')) {
    try {
      return JSON.parse(text) as unknown;
    } catch {
      return text;
    }
  }
  return text;
}

/** Retry-After is either a number of seconds or an HTTP date. */
export function parseRetryAfter(value: string | null, now: number = Date.now()): number | null {
  if (value === null || value.trim() === '') return null;
  const trimmed = value.trim();
  if (/^\d+$/.test(trimmed)) return Number(trimmed);
  const when = Date.parse(trimmed);
  if (Number.isNaN(when)) return null;
  return Math.max(0, Math.ceil((when - now) / 1000));
}

function messageFor(status: number): string {
  if (status === 401) return 'You are not signed in.';
  if (status === 403) return 'You do not have permission to do that.';
  if (status === 404) return 'That was not found.';
  if (status === 429) return 'Too many requests. Wait a moment and try again.';
  if (status >= 500) return 'The server had a problem. Try again in a moment.';
  return `The request failed (${String(status)}).`;
}

function toApiError(response: Response, body: unknown): ApiError {
  let message = messageFor(response.status);
  if (isRecord(body)) {
    const m = body.message;
    if (typeof m === 'string' && m !== '') message = m;
    // Some validation pipes answer with a list of messages.
    else if (Array.isArray(m) && m.length > 0 && m.every((x) => typeof x === 'string')) message = m.join(' ');
  }
  return new ApiError(response.status, message, parseRetryAfter(response.headers.get('retry-after')), body);
}

function isCsrfRejection(status: number, body: unknown): boolean {
  if (status !== 403 || !isRecord(body)) return false;
  return [body.error, body.code].some((v) => typeof v === 'string' && /csrf/i.test(v));
}

function isStateChanging(method: Method): boolean {
  return method !== 'GET';
}

async function send(method: Method, path: string, options: RequestOptions, token: string | null): Promise<Response> {
  const headers: Record<string, string> = { accept: 'application/json' };
  // A FormData body (a file upload) sets its own multipart content type and boundary.
  const isForm = typeof FormData !== 'undefined' && options.body instanceof FormData;
  if (options.body !== undefined && !isForm) headers['content-type'] = 'application/json';
  if (token !== null) headers[CSRF_HEADER] = token;
  return fetch(path, {
    method,
    credentials: 'same-origin',
    headers,
    body: options.body === undefined ? undefined : isForm ? (options.body as FormData) : JSON.stringify(options.body),
    signal: options.signal,
  });
}

/** One request; resolves to the parsed JSON body (null for an empty answer). */
export async function request(method: Method, path: string, options: RequestOptions = {}): Promise<unknown> {
  const needsToken = isStateChanging(method);
  let response = await send(method, path, options, needsToken ? await getCsrfToken() : null);
  let body = await readBody(response);

  if (needsToken && isCsrfRejection(response.status, body)) {
    // The token expired or the session changed under us: fetch a fresh token and try once more.
    resetCsrfToken();
    response = await send(method, path, options, await getCsrfToken());
    body = await readBody(response);
  }

  if (response.ok && SESSION_CHANGING_PATHS.has(path)) resetCsrfToken();

  if (!response.ok) {
    if (response.status === 401 && !path.startsWith(AUTH_PREFIX)) onUnauthorized?.();
    throw toApiError(response, body);
  }
  return body;
}

export const api = {
  get: (path: string, options?: Omit<RequestOptions, 'body'>) => request('GET', path, options),
  post: (path: string, body?: unknown, options?: Omit<RequestOptions, 'body'>) =>
    request('POST', path, { ...options, body }),
  put: (path: string, body?: unknown, options?: Omit<RequestOptions, 'body'>) =>
    request('PUT', path, { ...options, body }),
  patch: (path: string, body?: unknown, options?: Omit<RequestOptions, 'body'>) =>
    request('PATCH', path, { ...options, body }),
  delete: (path: string, options?: Omit<RequestOptions, 'body'>) => request('DELETE', path, options),
};
