import { ROLES, type Role } from '@steadyhand/shared';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROUTE_ACCESS, routeKey, type Caller } from './support/route-access.js';
import { listHttpRoutes } from './support/list-routes.js';
import { addUser, signIn, startTestApp, type SignedInAgent, type TestApp } from './support/test-app.js';
import { seedFixtures, type Fixtures } from './support/fixtures.js';

/**
 * Every HTTP route, called by an anonymous caller and by a user of each single role. A route
 * without a row here fails the test, and so does a guard that lets the wrong caller in or keeps
 * the right one out.
 */
describe('role matrix: every route for every role', () => {
  let app: TestApp;
  let agents: Record<Role, SignedInAgent>;
  let fixtures: Fixtures;

  beforeAll(async () => {
    app = await startTestApp();
    for (const role of ROLES) await addUser(app, `only.${role}`, [role]);
    agents = {} as Record<Role, SignedInAgent>;
    for (const role of ROLES) agents[role] = await signIn(app, `only.${role}`);
    fixtures = await seedFixtures(app, agents);
  }, 120_000);
  afterAll(() => app.close());

  it('has a row for every route the server exposes, and no row for a route that is gone', () => {
    const served = listHttpRoutes(app).map(({ method, path }) => routeKey(method, path)).sort();
    expect(served).toEqual(Object.keys(ROUTE_ACCESS).sort());
  });

  const callers: Caller[] = ['anonymous', ...ROLES];
  for (const [key, rule] of Object.entries(ROUTE_ACCESS)) {
    it(`${key}: ${rule.allowed === 'public' ? 'open to all' : rule.allowed === 'any' ? 'any signed-in user' : rule.allowed.join(', ')}`, async () => {
      const [method, pathTemplate] = key.split(' ') as [string, string];
      for (const caller of callers) {
        const path = pathTemplate.replace(/:(\w+)/g, (_m, name: string) => fixtures.param(name, caller));
        let agent: ReturnType<typeof request.agent>;
        let csrf: string;
        if (caller === 'anonymous') {
          agent = request.agent(app.baseUrl);
          csrf = ((await agent.get('/api/auth/csrf')).body as { token: string }).token;
        } else if (rule.endsSession) {
          // Routes that end the session get a session of their own.
          ({ agent, csrf } = await signIn(app, `only.${caller}`));
        } else {
          ({ agent, csrf } = agents[caller]);
        }
        const body = typeof rule.body === 'function' ? rule.body() : rule.body;
        const call = agent[method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete'](path).set('x-csrf-token', csrf);
        const res = await (rule.attach
          ? call.attach(rule.attach.field, rule.attach.content, rule.attach.filename)
          : body === undefined
            ? call
            : call.send(body as object));

        const expectAllowed =
          rule.allowed === 'public' || (caller !== 'anonymous' && (rule.allowed === 'any' || rule.allowed.includes(caller)));
        const label = `${caller} → ${method} ${path} answered ${res.status}: ${JSON.stringify(res.body).slice(0, 200)}`;
        if (expectAllowed) {
          expect([401, 403], label).not.toContain(res.status);
          expect(res.status, label).toBeLessThan(500);
        } else {
          expect(res.status, label).toBe(caller === 'anonymous' ? 401 : 403);
        }
      }
      // Rows that sign in afresh for each role hash a password each time (scrypt, on purpose slow).
    }, rule.endsSession ? 180_000 : 60_000);
  }
});
