import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { addUser, csrfFor, signIn, startTestApp, TEST_PASSWORD, type TestApp } from './support/test-app.js';

function sessionCookie(res: request.Response): string | undefined {
  const cookies = res.headers['set-cookie'] as unknown as string[] | undefined;
  return cookies?.find((c) => c.includes('steadyhand.sid='));
}

describe('sign-in over HTTP', () => {
  let app: TestApp;
  beforeAll(async () => {
    app = await startTestApp({ env: { LOGIN_ACCOUNT_LIMIT: '3', LOGIN_IP_LIMIT: '1000' } });
    await addUser(app, 'nurse.one', ['recorder']);
    await addUser(app, 'lead.one', ['leader', 'recorder']);
  });
  afterAll(() => app.close());

  it('answers health and time without sign-in', async () => {
    const health = await request(app.baseUrl).get('/api/health').expect(200);
    expect(health.body).toMatchObject({ status: 'ok', database: 'ok' });
    const before = Date.now();
    const time = await request(app.baseUrl).get('/api/time').expect(200);
    expect(time.body.serverTime).toBeGreaterThanOrEqual(before - 5);
    expect(time.body.serverTime).toBeLessThanOrEqual(Date.now() + 5);
  });

  it('keeps the demo accounts and password to itself unless demo mode is on', async () => {
    const off = await request(app.baseUrl).get('/api/auth/demo').expect(200);
    expect(off.body).toEqual({ enabled: false });
    const demo = await startTestApp({ env: { STEADYHAND_DEMO: '1' } });
    try {
      const on = await request(demo.baseUrl).get('/api/auth/demo').expect(200);
      expect(on.body.enabled).toBe(true);
      expect(on.body.password).toEqual(expect.any(String));
      expect(on.body.accounts.map((a: { username: string }) => a.username)).toContain('maren.holt');
    } finally {
      await demo.close();
    }
  });

  it('sends security headers on every answer', async () => {
    const res = await request(app.baseUrl).get('/api/health');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-powered-by']).toBeUndefined();
  });

  it('signs in with the right password, under a new session id, with an HttpOnly SameSite cookie', async () => {
    const agent = request.agent(app.baseUrl);
    const first = await agent.get('/api/auth/csrf').expect(200);
    const anonymousCookie = sessionCookie(first);
    expect(anonymousCookie).toBeDefined();
    const login = await agent
      .post('/api/auth/login')
      .set('x-csrf-token', first.body.token)
      .send({ username: 'lead.one', password: TEST_PASSWORD })
      .expect(200);
    expect(login.body.user).toMatchObject({ username: 'lead.one', displayName: 'Test lead.one', roles: ['leader', 'recorder'] });
    expect(Object.keys(login.body.user).sort()).toEqual(['displayName', 'id', 'roles', 'username']);
    const signedInCookie = sessionCookie(login)!;
    expect(signedInCookie).toMatch(/HttpOnly/i);
    expect(signedInCookie).toMatch(/SameSite=Lax/i);
    expect(signedInCookie.split(';')[0]).not.toBe(anonymousCookie!.split(';')[0]);
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.user.username).toBe('lead.one');
  });

  it('refuses a wrong password and an unknown account with the same 401 message', async () => {
    const agent = request.agent(app.baseUrl);
    const token = await csrfFor(agent);
    const wrong = await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username: 'nurse.one', password: 'not the password' }).expect(401);
    const unknown = await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username: 'nobody.here', password: 'not the password' }).expect(401);
    expect(wrong.body.message).toBe(unknown.body.message);
    await agent.get('/api/auth/me').expect(401);
  });

  it('says what is wrong with a malformed sign-in body', async () => {
    const agent = request.agent(app.baseUrl);
    const token = await csrfFor(agent);
    const res = await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username: '' }).expect(400);
    expect(res.body.message).toMatch(/username/);
    expect(res.body.message).toMatch(/password/);
  });

  it('refuses a state-changing request without the CSRF token, or from a foreign Origin', async () => {
    const agent = request.agent(app.baseUrl);
    const token = await csrfFor(agent);
    const missing = await agent.post('/api/auth/login').send({ username: 'nurse.one', password: TEST_PASSWORD }).expect(403);
    expect(missing.body.message).toMatch(/CSRF/);
    await agent.post('/api/auth/login').set('x-csrf-token', 'forged').send({ username: 'nurse.one', password: TEST_PASSWORD }).expect(403);
    await agent
      .post('/api/auth/login')
      .set('x-csrf-token', token)
      .set('origin', 'https://elsewhere.example')
      .send({ username: 'nurse.one', password: TEST_PASSWORD })
      .expect(403);
  });

  it('signs out: 204, the session is gone, and signing out again is harmless', async () => {
    const { agent, csrf } = await signIn(app, 'nurse.one');
    await agent.get('/api/auth/me').expect(200);
    await agent.post('/api/auth/logout').set('x-csrf-token', csrf).expect(204);
    await agent.get('/api/auth/me').expect(401);
    const fresh = await csrfFor(agent);
    await agent.post('/api/auth/logout').set('x-csrf-token', fresh).expect(204);
  });

  it('throttles an account after the limit of failed attempts, even with the right password, saying when to retry', async () => {
    await addUser(app, 'locked.out', ['recorder']);
    const agent = request.agent(app.baseUrl);
    const token = await csrfFor(agent);
    for (let i = 0; i < 3; i++) {
      await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username: 'locked.out', password: 'wrong password here' }).expect(401);
    }
    const blocked = await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username: 'locked.out', password: TEST_PASSWORD }).expect(429);
    expect(Number(blocked.headers['retry-after'])).toBeGreaterThan(0);
    expect(Number(blocked.headers['retry-after'])).toBeLessThanOrEqual(3600);
    // An account that does not exist is throttled the same way, with the same words.
    for (let i = 0; i < 3; i++) {
      await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username: 'ghost.user', password: 'wrong password here' }).expect(401);
    }
    const ghost = await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username: 'ghost.user', password: 'x' }).expect(429);
    expect(ghost.body.message).toBe(blocked.body.message);
    // Other accounts are not affected.
    await signIn(app, 'nurse.one');
  });

  it('ends a session after the absolute time limit however active it was', async () => {
    const { agent } = await signIn(app, 'nurse.one');
    await agent.get('/api/auth/me').expect(200);
    vi.useFakeTimers({ toFake: ['Date'], now: Date.now() + app.config.sessionAbsoluteMs + 60_000 });
    try {
      await agent.get('/api/auth/me').expect(401);
    } finally {
      vi.useRealTimers();
    }
  });
});

describe('throttling per client address', () => {
  it('answers 429 with Retry-After once one address has failed too often', async () => {
    const app = await startTestApp({ env: { LOGIN_IP_LIMIT: '2' } });
    try {
      const agent = request.agent(app.baseUrl);
      const token = await csrfFor(agent);
      for (const name of ['a.one', 'b.two']) {
        await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username: name, password: 'nope nope nope' }).expect(401);
      }
      const res = await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username: 'c.three', password: 'nope nope nope' }).expect(429);
      expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
      expect(res.body.message).toMatch(/Too many sign-in attempts/);
    } finally {
      await app.close();
    }
  });
});

describe('sessions live in SQLite', () => {
  it('keeps people signed in across a server restart on the same data folder', async () => {
    const first = await startTestApp();
    await addUser(first, 'night.nurse', ['recorder']);
    const { agent } = await signIn(first, 'night.nurse');
    const cookie = (await agent.get('/api/auth/me').expect(200)).request.cookies;
    const dataDir = first.config.dataDir;
    await first.close();

    const second = await startTestApp({ dataDir });
    try {
      const res = await request(second.baseUrl).get('/api/auth/me').set('cookie', cookie).expect(200);
      expect(res.body.user.username).toBe('night.nurse');
    } finally {
      await second.close();
    }
  });

  it('uses a __Host- Secure cookie when served over https', async () => {
    const app = await startTestApp({ env: { PUBLIC_ORIGIN: 'https://steadyhand.test', TRUST_PROXY: '1' } });
    try {
      await addUser(app, 'secure.nurse', ['recorder']);
      const agent = request.agent(app.baseUrl);
      const res = await agent.get('/api/auth/csrf').set('x-forwarded-proto', 'https').expect(200);
      const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith('__Host-steadyhand.sid='));
      expect(cookie).toMatch(/Secure/);
      expect(cookie).toMatch(/Path=\//);
      expect(cookie).not.toMatch(/Domain=/i);
      expect(res.headers['strict-transport-security']).toBeDefined();
    } finally {
      await app.close();
    }
  });
});
