import { DEMO_PASSWORD } from './server.js';

/** A signed-in HTTP session from Node, as the web app makes one (CSRF, sign-in, new token). */
export async function apiSession(baseUrl: string, username: string) {
  const cookieOf = (res: Response) =>
    res.headers
      .getSetCookie()
      .map((c) => c.split(';')[0])
      .join('; ');
  const first = await fetch(`${baseUrl}/api/auth/csrf`);
  const pre = cookieOf(first);
  const { token } = (await first.json()) as { token: string };
  const login = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: {
      'content-type': 'application/json',
      'x-csrf-token': token,
      cookie: pre,
      origin: baseUrl,
    },
    body: JSON.stringify({ username, password: DEMO_PASSWORD }),
  });
  if (login.status !== 200) throw new Error(`sign-in of ${username}: ${login.status}`);
  const cookie = cookieOf(login) || pre;
  const { token: csrf } = (await (
    await fetch(`${baseUrl}/api/auth/csrf`, { headers: { cookie } })
  ).json()) as { token: string };
  const call = async (method: string, path: string, body?: unknown) => {
    const res = await fetch(`${baseUrl}${path}`, {
      method,
      headers: {
        'content-type': 'application/json',
        'x-csrf-token': csrf,
        cookie,
        origin: baseUrl,
      },
      body: body === undefined ? undefined : JSON.stringify(body),
    });
    if (res.status >= 300) throw new Error(`${method} ${path}: ${res.status} ${await res.text()}`);
    return (await res.json()) as Record<string, unknown>;
  };
  return {
    get: (path: string) => call('GET', path),
    post: (path: string, body: unknown) => call('POST', path, body),
    patch: (path: string, body: unknown) => call('PATCH', path, body),
  };
}
