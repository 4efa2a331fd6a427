import { vi } from 'vitest';

export interface MockAnswer {
  status?: number;
  body?: unknown;
  headers?: Record<string, string>;
}

export type Responder = (url: string, init: RequestInit | undefined) => MockAnswer;

/** Replaces fetch for one test; every call is recorded as [url, init]. Unit tests only. */
export function mockFetch(responder: Responder) {
  const fetchMock = vi.fn((input: RequestInfo | URL, init?: RequestInit) => {
    const url = typeof input === 'string' ? input : input instanceof URL ? input.href : input.url;
    const { status = 200, body, headers = {} } = responder(url, init);
    const hasBody = body !== undefined && status !== 204;
    return Promise.resolve(
      new Response(hasBody ? JSON.stringify(body) : null, {
        status,
        headers: hasBody ? { 'content-type': 'application/json', ...headers } : headers,
      }),
    );
  });
  vi.stubGlobal('fetch', fetchMock);
  return fetchMock;
}

export function headerOf(init: RequestInit | undefined, name: string): string | null {
  return new Headers(init?.headers).get(name);
}
