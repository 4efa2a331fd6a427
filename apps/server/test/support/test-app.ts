import { mkdtempSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Role } from '@steadyhand/shared';
import request from 'supertest';
import { createApp, type CreatedApp } from '../../src/app.factory.js';
import { loadConfig, type AppConfig } from '../../src/config/config.js';
import { UsersService } from '../../src/users/users.service.js';
import { passSecondFactor } from './second-factor.js';

export const TEST_PASSWORD = 'correct horse battery staple';

export function tempDataDir(): string {
  return mkdtempSync(path.join(tmpdir(), 'steadyhand-test-'));
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address();
      srv.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
    });
  });
}

export interface TestApp extends CreatedApp {
  config: AppConfig;
  baseUrl: string;
  close(): Promise<void>;
}

/** The real server on a real SQLite file in a temporary folder, listening on loopback. */
export async function startTestApp(options: { dataDir?: string; env?: Record<string, string> } = {}): Promise<TestApp> {
  const dataDir = options.dataDir ?? tempDataDir();
  const port = await freePort();
  const config = loadConfig({ DATA_DIR: dataDir, PORT: String(port), LOG_LEVEL: 'silent', WEB_DIST: path.join(dataDir, 'no-web'), ...options.env });
  const created = await createApp(config);
  await created.app.listen(port, '127.0.0.1');
  return {
    ...created,
    config,
    baseUrl: `http://127.0.0.1:${port}`,
    close: () => created.app.close(),
  };
}

export async function addUser(app: TestApp, username: string, roles: Role[], password = TEST_PASSWORD) {
  return app.app.get(UsersService).create({ username, displayName: `Test ${username}`, password, roles }, { userId: null, username: 'test' });
}

export interface SignedInAgent {
  agent: ReturnType<typeof request.agent>;
  csrf: string;
}

export async function csrfFor(agent: ReturnType<typeof request.agent>): Promise<string> {
  const res = await agent.get('/api/auth/csrf').expect(200);
  return (res.body as { token: string }).token;
}

/** A cookie-keeping client signed in as the user, with the CSRF token of its new session. */
export async function signIn(app: TestApp, username: string, password = TEST_PASSWORD): Promise<SignedInAgent> {
  const agent = request.agent(app.baseUrl);
  const before = await csrfFor(agent);
  const login = await agent.post('/api/auth/login').set('x-csrf-token', before).send({ username, password }).expect(200);
  // Admins need the second factor for admin routes: enrol it, or pass it, so the agent is fully signed in.
  await passSecondFactor(app, username, agent, await csrfFor(agent), login.body as { user: { roles: string[] }; secondFactor?: string });
  return { agent, csrf: await csrfFor(agent) };
}
