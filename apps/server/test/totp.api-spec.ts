import type { TotpEnrolment } from '@steadyhand/shared';
import { generate } from 'otplib';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { connectLive, cookieHeader, refused } from './support/live-client.js';
import { addUser, csrfFor, startTestApp, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

type Agent = ReturnType<typeof request.agent>;

/** The password step only, as the browser does it (no help from the test sign-in helper). */
async function passwordStep(app: TestApp, username: string) {
  const agent = request.agent(app.baseUrl);
  const token = await csrfFor(agent);
  const login = await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username, password: TEST_PASSWORD }).expect(200);
  return { agent, csrf: await csrfFor(agent), body: login.body as { user: { username: string }; secondFactor?: string } };
}
const codeAt = (secret: string, offsetSteps = 0) => generate({ secret, epoch: Math.floor(Date.now() / 1000) + offsetSteps * 30 });
const send = (who: { agent: Agent; csrf: string }, path: string, body?: object) => who.agent.post(path).set('x-csrf-token', who.csrf).send(body);

describe('second factor (TOTP) for admins', () => {
  let app: TestApp;
  let secret: string;
  let recoveryCodes: string[];

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'admin.totp', ['admin']);
    await addUser(app, 'nurse.plain', ['recorder']);
  }, 60_000);
  afterAll(() => app.close());

  it('keeps admin routes closed until the admin enrols; enrolment shows a QR code and the secret, then 10 recovery codes once', async () => {
    const admin: SignedInAgent & { body: unknown } = await passwordStep(app, 'admin.totp');
    expect(admin.body).not.toHaveProperty('secondFactor');
    const refusedRes = await admin.agent.get('/api/admin/users').expect(403);
    expect(refusedRes.body.error).toBe('second-factor-required');
    expect((await admin.agent.get('/api/auth/me').expect(200)).body.user.secondFactor).toEqual({ enrolled: false, satisfied: false });

    const start = (await send(admin, '/api/account/totp/start').expect(200)).body as TotpEnrolment;
    expect(start.qrDataUrl).toMatch(/^data:image\/png;base64,/);
    expect(start.otpauthUrl).toContain('otpauth://totp/');
    expect(start.secret).toMatch(/^[A-Z2-7]{32}$/);
    secret = start.secret;
    const stored = app.database.sqlite.prepare('SELECT secret_encrypted FROM user_totp').pluck().get() as string;
    expect(stored).not.toContain(secret);

    await send(admin, '/api/account/totp/confirm', { code: '000000' }).expect(400);
    const confirm = await send(admin, '/api/account/totp/confirm', { code: await codeAt(secret) }).expect(200);
    recoveryCodes = confirm.body.recoveryCodes as string[];
    expect(recoveryCodes).toHaveLength(10);
    expect(new Set(recoveryCodes).size).toBe(10);
    const hashes = app.database.sqlite.prepare('SELECT recovery_codes FROM user_totp').pluck().get() as string;
    expect(hashes).not.toContain(recoveryCodes[0]);

    await admin.agent.get('/api/admin/users').expect(200);
    await send(admin, '/api/account/totp/start').expect(409);
    expect((await admin.agent.get('/api/account/totp').expect(200)).body).toMatchObject({ enrolled: true, recoveryCodesLeft: 10 });
  });

  it('makes sign-in two steps: half signed in after the password, fully after a computed code; a used code is refused', async () => {
    const half = await passwordStep(app, 'admin.totp');
    expect(half.body).toMatchObject({ user: { username: 'admin.totp' }, secondFactor: 'required' });
    await half.agent.get('/api/auth/me').expect(401);
    await half.agent.get('/api/admin/users').expect(401);
    const socketError = await refused(connectLive(app.baseUrl, { cookie: cookieHeader(half, app.baseUrl), origin: app.baseUrl }));
    expect(socketError.message).toContain('unauthorized');

    expect((await send(half, '/api/auth/totp', { code: '123456' === (await codeAt(secret, 1)) ? '654321' : '123456' }).expect(401)).body.message).toBe(
      'That code is not right',
    );
    const code = await codeAt(secret, 1); // the next step: the enrolment used this one
    await send(half, '/api/auth/totp', { code }).expect(200);
    const full = { agent: half.agent, csrf: await csrfFor(half.agent) };
    expect((await full.agent.get('/api/auth/me').expect(200)).body.user.secondFactor).toEqual({ enrolled: true, satisfied: true });
    await full.agent.get('/api/admin/users').expect(200);

    const replay = await passwordStep(app, 'admin.totp');
    await send(replay, '/api/auth/totp', { code }).expect(401);
    // A recovery code works once.
    await send(replay, '/api/auth/totp', { recoveryCode: recoveryCodes[0]! }).expect(200);
    const again = await passwordStep(app, 'admin.totp');
    await send(again, '/api/auth/totp', { recoveryCode: recoveryCodes[0]! }).expect(401);

    const actions = (app.database.sqlite.prepare("SELECT action FROM audit_events WHERE username = 'admin.totp' ORDER BY id").pluck().all() as string[]);
    expect(actions).toEqual(expect.arrayContaining(['totp.enrolled', 'auth.password-accepted', 'auth.second-factor-failed', 'auth.login', 'totp.recovery-code-used']));
  });

  it('throttles wrong codes: after five, even the right code waits', async () => {
    const half = await passwordStep(app, 'admin.totp');
    // Four more wrong codes on top of the one failure left from the last test (the recovery code reused).
    for (let i = 0; i < 4; i++) await send(half, '/api/auth/totp', { code: '000001' }).expect(401);
    await send(half, '/api/auth/totp', { code: await codeAt(secret, -1) }).expect(429);
  });

  it('leaves sign-in for a person without a second factor exactly as it was', async () => {
    const plain = await passwordStep(app, 'nurse.plain');
    expect(Object.keys(plain.body)).toEqual(['user']);
    await plain.agent.get('/api/codes').expect(200);
    await send(plain, '/api/auth/totp', { code: '000000' }).expect(409);
  });
});
