import { spawnSync } from 'node:child_process';
import path from 'node:path';
import request from 'supertest';
import { describe, expect, it } from 'vitest';
import { REPO_ROOT } from '../src/config/config.js';
import { csrfFor, startTestApp, tempDataDir } from './support/test-app.js';

const CLI = path.join(REPO_ROOT, 'apps/server/dist/cli/user-add.js');

function userAdd(dataDir: string, args: string[], password?: string) {
  return spawnSync(process.execPath, [CLI, ...args], {
    env: { ...process.env, DATA_DIR: dataDir, STEADYHAND_PASSWORD: password ?? '', LOG_LEVEL: 'silent' },
    encoding: 'utf8',
  });
}

describe('the user:add command (built server)', () => {
  it('creates a person with several roles who can then sign in with the password from the environment', async () => {
    const dataDir = tempDataDir();
    const done = userAdd(dataDir, ['--username', 'night.recorder', '--name', 'Night Recorder', '--roles', 'recorder,leader'], 'a long enough passphrase');
    expect(done.stderr).toBe('');
    expect(done.status).toBe(0);
    expect(done.stdout).toMatch(/Created night\.recorder .* leader, recorder/);

    const app = await startTestApp({ dataDir });
    try {
      const agent = request.agent(app.baseUrl);
      const token = await csrfFor(agent);
      const res = await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username: 'night.recorder', password: 'a long enough passphrase' }).expect(200);
      expect(res.body.user.roles).toEqual(['leader', 'recorder']);
    } finally {
      await app.close();
    }
  });

  it('refuses a short password, an unknown role, a missing password and a taken name, saying why', () => {
    const dataDir = tempDataDir();
    const short = userAdd(dataDir, ['--username', 'a.b', '--name', 'A B', '--roles', 'recorder'], 'short');
    expect(short.status).toBe(1);
    expect(short.stderr).toMatch(/at least 12 characters/);
    const badRole = userAdd(dataDir, ['--username', 'a.b', '--name', 'A B', '--roles', 'surgeon'], 'a long enough passphrase');
    expect(badRole.status).toBe(2);
    expect(badRole.stderr).toMatch(/recorder|Invalid option/);
    const noPassword = userAdd(dataDir, ['--username', 'a.b', '--name', 'A B', '--roles', 'recorder']);
    expect(noPassword.status).toBe(1);
    const first = userAdd(dataDir, ['--username', 'a.b', '--name', 'A B', '--roles', 'recorder'], 'a long enough passphrase');
    expect(first.status).toBe(0);
    const taken = userAdd(dataDir, ['--username', 'a.b', '--name', 'A B', '--roles', 'recorder'], 'a long enough passphrase');
    expect(taken.status).toBe(1);
    expect(taken.stderr).toMatch(/already exists/);
  });
});
