import type { Role } from '@steadyhand/shared';
import type { Caller } from './route-access.js';
import type { SignedInAgent, TestApp } from './test-app.js';

export interface Fixtures {
  /** The value to put in a route's `:name` parameter for this caller. */
  param(name: string, caller: Caller): string;
}

/** Records the role matrix needs to call routes with parameters. */
export async function seedFixtures(_app: TestApp, agents: Record<Role, SignedInAgent>): Promise<Fixtures> {
  const { agent, csrf } = agents.recorder;
  const code = await agent.post('/api/codes').set('x-csrf-token', csrf).send({ category: 'pediatric', weightKg: 12 }).expect(201);
  const values: Record<string, string> = { id: (code.body as { code: { id: string } }).code.id };
  return {
    param(name) {
      const value = values[name];
      if (!value) throw new Error(`No fixture for route parameter :${name}; add one in test/support/fixtures.ts`);
      return value;
    },
  };
}
