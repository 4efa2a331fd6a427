import request from 'supertest';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { makeEntry } from './support/entries.js';
import { addUser, csrfFor, signIn, startTestApp, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

type Agent = ReturnType<typeof request.agent>;

/** A client at one address (the server trusts one proxy hop, as behind the hospital's reverse proxy). */
async function clientAt(app: TestApp, ip: string): Promise<{ agent: Agent; csrf: string; ip: string }> {
  const agent = request.agent(app.baseUrl);
  const csrf = (await agent.get('/api/auth/csrf').set('x-forwarded-for', ip).expect(200)).body.token as string;
  return { agent, csrf, ip };
}

const login = (c: { agent: Agent; csrf: string; ip: string }, username: string, password: string) =>
  c.agent.post('/api/auth/login').set('x-forwarded-for', c.ip).set('x-csrf-token', c.csrf).send({ username, password });

/** Freezes the clock the server reads (it runs in this process); back-off waits pass only when the test says. */
function frozenClock(): { advance(ms: number): void } {
  let now = Date.now();
  vi.useFakeTimers({ toFake: ['Date'], now });
  return {
    advance(ms) {
      now += ms;
      vi.setSystemTime(now);
    },
  };
}

afterEach(() => {
  vi.useRealTimers();
});

describe('the password typed again to sign', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let pharmacist: SignedInAgent;
  let reviewer: SignedInAgent;

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'sign.recorder', ['recorder']);
    await addUser(app, 'sign.pharmacist', ['pharmacist']);
    await addUser(app, 'sign.reviewer', ['reviewer']);
    recorder = await signIn(app, 'sign.recorder');
    pharmacist = await signIn(app, 'sign.pharmacist');
    reviewer = await signIn(app, 'sign.reviewer');
  }, 90_000);
  afterAll(() => app.close());

  const post = (who: SignedInAgent, url: string, body: object) => who.agent.post(url).set('x-csrf-token', who.csrf).send(body);

  async function endedCode(): Promise<string> {
    const res = await post(recorder, '/api/codes', { category: 'adult' }).expect(201);
    const id = (res.body as { code: { id: string } }).code.id;
    await post(recorder, `/api/codes/${id}/entries`, makeEntry({ kind: 'end', outcome: 'died' })).expect(201);
    return id;
  }

  /** Wrong passwords until the answer is 429; returns how many were answered 403 first. */
  async function guessUntilThrottled(send: (password: string) => request.Test): Promise<{ wrong: number; throttled: request.Response }> {
    for (let wrong = 0; wrong < 20; wrong++) {
      const res = await send(`wrong guess ${wrong}`);
      if (res.status === 429) return { wrong, throttled: res };
      expect(res.status).toBe(403);
      expect(res.body.error).toBe('password');
    }
    throw new Error('20 wrong passwords and still no 429');
  }

  it('is throttled on a record signature: after a few wrong tries even the right one waits (429, Retry-After), then it is taken', async () => {
    const id = await endedCode();
    const clock = frozenClock();
    const { wrong, throttled } = await guessUntilThrottled((password) => post(recorder, `/api/codes/${id}/signatures`, { meaning: 'recorded-by', password }));
    expect(wrong).toBe(5);
    expect(Number(throttled.headers['retry-after'])).toBeGreaterThan(0);
    expect(throttled.body.message).toMatch(/Too many/);
    const right = await post(recorder, `/api/codes/${id}/signatures`, { meaning: 'recorded-by', password: TEST_PASSWORD }).expect(429);
    expect(app.database.sqlite.prepare('SELECT count(*) FROM signatures WHERE code_id = ?').pluck().get(id)).toBe(0);
    // A short wait, and the owner signs.
    clock.advance(Number(right.headers['retry-after']) * 1000);
    await post(recorder, `/api/codes/${id}/signatures`, { meaning: 'recorded-by', password: TEST_PASSWORD }).expect(201);
  });

  it('counts with the sign-ins of the same account and address: wrong signature passwords hold back a sign-in there too', async () => {
    const id = await endedCode();
    frozenClock();
    await guessUntilThrottled((password) => post(pharmacist, `/api/codes/${id}/reconciliation/sign`, { password }));
    const here = request.agent(app.baseUrl);
    const token = await csrfFor(here);
    const res = await here.post('/api/auth/login').set('x-csrf-token', token).send({ username: 'sign.pharmacist', password: TEST_PASSWORD }).expect(429);
    expect(Number(res.headers['retry-after'])).toBeGreaterThan(0);
  });

  it('is throttled on a quality review sign-off as well', async () => {
    const id = await endedCode();
    frozenClock();
    const { wrong } = await guessUntilThrottled((password) => post(reviewer, `/api/quality/codes/${id}/review/sign`, { password }));
    expect(wrong).toBe(5);
    await post(reviewer, `/api/quality/codes/${id}/review/sign`, { password: TEST_PASSWORD }).expect(429);
  });
});

describe('sign-in throttling that a stranger cannot turn against the owner', () => {
  let app: TestApp;

  beforeAll(async () => {
    app = await startTestApp({ env: { TRUST_PROXY: '1', LOGIN_ACCOUNT_LIMIT: '10', LOGIN_IP_LIMIT: '12' } });
    await addUser(app, 'ward.nurse', ['recorder']);
    await addUser(app, 'other.nurse', ['recorder']);
  }, 90_000);
  afterAll(() => app.close());

  it('lets the owner in from a device they used before, after wrong passwords from ten addresses; a new device waits', async () => {
    // The owner's tablet signed in once before, and signed out.
    const tablet = await clientAt(app, '10.0.0.5');
    await login(tablet, 'ward.nurse', TEST_PASSWORD).expect(200);
    await tablet.agent.post('/api/auth/logout').set('x-forwarded-for', tablet.ip).set('x-csrf-token', await csrfFor(tablet.agent)).expect(204);

    frozenClock();
    // Someone fails the account from ten addresses, once each: the account limit (10) is reached.
    for (let i = 1; i <= 10; i++) await login(await clientAt(app, `203.0.113.${i}`), 'ward.nurse', 'guess guess guess').expect(401);
    const stranger = await login(await clientAt(app, '203.0.113.50'), 'ward.nurse', TEST_PASSWORD).expect(429);
    expect(Number(stranger.headers['retry-after'])).toBeGreaterThan(0);

    // The owner's own tablet is not held back by failures from elsewhere.
    tablet.csrf = await csrfFor(tablet.agent);
    await login(tablet, 'ward.nurse', TEST_PASSWORD).expect(200);
  });

  it('backs off one account at one address exponentially, so a few typos cost seconds, not an hour', async () => {
    const clock = frozenClock();
    const desk = await clientAt(app, '10.0.0.7');
    for (let i = 0; i < 5; i++) await login(desk, 'other.nurse', 'typo typo typo').expect(401);
    const first = await login(desk, 'other.nurse', TEST_PASSWORD).expect(429);
    expect(first.headers['retry-after']).toBe('1');
    clock.advance(1_000);
    await login(desk, 'other.nurse', 'typo typo typo').expect(401);
    const second = await login(desk, 'other.nurse', TEST_PASSWORD).expect(429);
    expect(second.headers['retry-after']).toBe('2');
    // Meanwhile the same account from another address is not held back by this one.
    await login(await clientAt(app, '10.0.0.8'), 'other.nurse', TEST_PASSWORD).expect(200);
    clock.advance(2_000);
    await login(desk, 'other.nurse', TEST_PASSWORD).expect(200);
  });

  it('locks an address hard after too many failures there, whatever the account, and counts only real password failures', async () => {
    frozenClock();
    const noisy = await clientAt(app, '198.51.100.9');
    // Malformed and CSRF-refused requests are not password failures.
    for (let i = 0; i < 30; i++) {
      await noisy.agent.post('/api/auth/login').set('x-forwarded-for', noisy.ip).set('x-csrf-token', noisy.csrf).send({ username: '' }).expect(400);
      await noisy.agent.post('/api/auth/login').set('x-forwarded-for', noisy.ip).send({ username: 'ward.nurse', password: 'x' }).expect(403);
    }
    await login(noisy, 'other.nurse', TEST_PASSWORD).expect(200);

    const guesser = await clientAt(app, '198.51.100.10');
    for (let i = 0; i < 12; i++) await login(guesser, `name.${i}`, 'guess guess guess').expect(401);
    const locked = await login(guesser, 'other.nurse', TEST_PASSWORD).expect(429);
    expect(Number(locked.headers['retry-after'])).toBeGreaterThan(0);
    expect(Number(locked.headers['retry-after'])).toBeLessThanOrEqual(15 * 60);
  });
});
