import { describe, expect, it, vi } from 'vitest';
import { headerOf, mockFetch } from '../testing/fetch-mock';
import { api, ApiError, parseRetryAfter, setUnauthorizedHandler } from './api-client';

describe('api client', () => {
  it('attaches the x-csrf-token from GET /api/auth/csrf to a POST', async () => {
    const fetchMock = mockFetch((url) => {
      if (url === '/api/auth/csrf') return { body: { token: 'tok-1' } };
      if (url === '/api/codes') return { status: 201, body: { code: { id: 'c1' } } };
      return { status: 404 };
    });

    const body = await api.post('/api/codes', { category: 'adult' });

    expect(body).toEqual({ code: { id: 'c1' } });
    const post = fetchMock.mock.calls.find(([url]) => url === '/api/codes');
    expect(post?.[1]?.method).toBe('POST');
    expect(headerOf(post?.[1], 'x-csrf-token')).toBe('tok-1');
    expect(headerOf(post?.[1], 'content-type')).toBe('application/json');
    expect(post?.[1]?.credentials).toBe('same-origin');
    expect(post?.[1]?.body).toBe('{"category":"adult"}');
  });

  it('sends a FormData upload as it is, with the token and without a JSON content type', async () => {
    const fetchMock = mockFetch((url) => (url === '/api/auth/csrf' ? { body: { token: 'tok-2' } } : { status: 201, body: { attachment: { id: 'a1' } } }));
    const form = new FormData();
    form.append('file', new Blob(['%PDF-1.4'], { type: 'application/pdf' }), 'strip.pdf');

    await api.post('/api/codes/c1/attachments', form);

    const post = fetchMock.mock.calls.find(([url]) => url === '/api/codes/c1/attachments');
    expect(post?.[1]?.body).toBe(form);
    expect(headerOf(post?.[1], 'content-type')).toBeNull();
    expect(headerOf(post?.[1], 'x-csrf-token')).toBe('tok-2');
  });

  it('fetches the token once and reuses it, and sends none on GET', async () => {
    const fetchMock = mockFetch((url) => (url === '/api/auth/csrf' ? { body: { token: 'tok-1' } } : { body: {} }));

    await api.post('/api/a');
    await api.delete('/api/b');
    await api.get('/api/c');

    expect(fetchMock.mock.calls.filter(([url]) => url === '/api/auth/csrf')).toHaveLength(1);
    const get = fetchMock.mock.calls.find(([url]) => url === '/api/c');
    expect(headerOf(get?.[1], 'x-csrf-token')).toBeNull();
  });

  it('fetches a new token and retries once when the server rejects the token', async () => {
    let tokens = 0;
    let posts = 0;
    const fetchMock = mockFetch((url, init) => {
      if (url === '/api/auth/csrf') return { body: { token: `tok-${String(++tokens)}` } };
      posts += 1;
      if (headerOf(init, 'x-csrf-token') === 'tok-1') return { status: 403, body: { error: 'csrf', message: 'Bad token' } };
      return { status: 201, body: { ok: true } };
    });

    await expect(api.post('/api/codes', {})).resolves.toEqual({ ok: true });
    expect(posts).toBe(2);
    const last = fetchMock.mock.calls.at(-1);
    expect(headerOf(last?.[1], 'x-csrf-token')).toBe('tok-2');
  });

  it('does not retry a 403 that is not about the token', async () => {
    let posts = 0;
    mockFetch((url) => {
      if (url === '/api/auth/csrf') return { body: { token: 'tok-1' } };
      posts += 1;
      return { status: 403, body: { message: 'Recorders and leaders only' } };
    });

    await expect(api.post('/api/codes', {})).rejects.toMatchObject({ status: 403, message: 'Recorders and leaders only' });
    expect(posts).toBe(1);
  });

  it('takes a new token after signing in', async () => {
    let tokens = 0;
    const fetchMock = mockFetch((url) => {
      if (url === '/api/auth/csrf') return { body: { token: `tok-${String(++tokens)}` } };
      if (url === '/api/auth/login') return { body: { user: {} } };
      return { status: 204 };
    });

    await api.post('/api/auth/login', { username: 'a', password: 'b' });
    await api.post('/api/auth/logout');

    const logout = fetchMock.mock.calls.find(([url]) => url === '/api/auth/logout');
    expect(headerOf(logout?.[1], 'x-csrf-token')).toBe('tok-2');
  });

  it('turns an error answer into an ApiError with the message and Retry-After', async () => {
    mockFetch(() => ({ status: 429, body: { message: 'Slow down' }, headers: { 'retry-after': '120' } }));

    const error: unknown = await api.get('/api/codes').catch((e: unknown) => e);

    expect(error).toBeInstanceOf(ApiError);
    expect(error).toMatchObject({ status: 429, message: 'Slow down', retryAfterSeconds: 120 });
  });

  it('reports a 401 from a data route, but not from an auth route', async () => {
    const onUnauthorized = vi.fn();
    setUnauthorizedHandler(onUnauthorized);
    mockFetch(() => ({ status: 401, body: { message: 'Unauthorized' } }));

    await expect(api.get('/api/auth/me')).rejects.toBeInstanceOf(ApiError);
    expect(onUnauthorized).not.toHaveBeenCalled();

    await expect(api.get('/api/codes?status=active')).rejects.toBeInstanceOf(ApiError);
    expect(onUnauthorized).toHaveBeenCalledTimes(1);
  });

  it('reads Retry-After as seconds or as an HTTP date', () => {
    const now = Date.parse('2025-01-01T00:00:00Z');
    expect(parseRetryAfter('90', now)).toBe(90);
    expect(parseRetryAfter('Wed, 01 Jan 2025 00:05:00 GMT', now)).toBe(300);
    expect(parseRetryAfter(null, now)).toBeNull();
    expect(parseRetryAfter('soon', now)).toBeNull();
  });
});
