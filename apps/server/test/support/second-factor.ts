import { generate } from 'otplib';
import type request from 'supertest';

type Agent = ReturnType<typeof request.agent>;

/** What the tests know of one person's authenticator: the secret, unused recovery codes, the last step used. */
interface Authenticator {
  secret: string;
  recoveryCodes: string[];
  lastStep: number;
}

// Per server instance, so two test apps never share what they know.
const known = new WeakMap<object, Map<string, Authenticator>>();

function store(app: object): Map<string, Authenticator> {
  let map = known.get(app);
  if (!map) known.set(app, (map = new Map()));
  return map;
}

/** The secret the tests hold for a person (after `passSecondFactor` enrolled them). */
export function authenticatorOf(app: object, username: string): Authenticator | undefined {
  return store(app).get(username);
}

/**
 * A fresh code as a phone would show it: the server takes each time step once, so a second
 * sign-in inside 30 s uses the next step (within its one-step tolerance), then a recovery code.
 */
export async function nextCode(auth: Authenticator): Promise<{ code: string } | { recoveryCode: string }> {
  const now = Math.floor(Date.now() / 30_000);
  const step = [now, now + 1].find((s) => s > auth.lastStep);
  if (step === undefined) {
    const recoveryCode = auth.recoveryCodes.shift();
    if (!recoveryCode) throw new Error('The test authenticator ran out of codes');
    return { recoveryCode };
  }
  auth.lastStep = step;
  return { code: await generate({ secret: auth.secret, epoch: step * 30 }) };
}

/** Enrols a TOTP authenticator for the signed-in agent's person; keeps its secret and recovery codes. */
export async function enrolSecondFactor(app: object, username: string, agent: Agent, csrf: string): Promise<Authenticator> {
  const start = await agent.post('/api/account/totp/start').set('x-csrf-token', csrf).expect(200);
  const auth: Authenticator = { secret: (start.body as { secret: string }).secret, recoveryCodes: [], lastStep: 0 };
  const confirm = await agent.post('/api/account/totp/confirm').set('x-csrf-token', csrf).send(await nextCode(auth)).expect(200);
  auth.recoveryCodes = (confirm.body as { recoveryCodes: string[] }).recoveryCodes;
  store(app).set(username, auth);
  return auth;
}

/**
 * After the password step: completes a sign-in that asks for the second factor, or enrols an
 * admin who has none yet (admin routes need it), so admin agents behave as before in every test.
 */
export async function passSecondFactor(
  app: object,
  username: string,
  agent: Agent,
  csrf: string,
  login: { user: { roles: string[] }; secondFactor?: string },
): Promise<void> {
  if (login.secondFactor === 'required') {
    const auth = store(app).get(username);
    if (!auth) throw new Error(`${username} has a second factor the tests do not know; sign in by hand`);
    await agent.post('/api/auth/totp').set('x-csrf-token', csrf).send(await nextCode(auth)).expect(200);
  } else if (login.user.roles.includes('admin')) {
    await enrolSecondFactor(app, username, agent, csrf);
  }
}
