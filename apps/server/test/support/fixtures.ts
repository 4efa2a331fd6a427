import type { Places, Role } from '@steadyhand/shared';
import { makeEntry } from './entries.js';
import type { Caller } from './route-access.js';
import { tinyPng } from './sample-files.js';
import { addUser, type SignedInAgent, type TestApp } from './test-app.js';

export interface Fixtures {
  /** The value to put in a route's `:name` parameter for this caller. */
  param(name: string, caller: Caller): string;
}

/** Records the role matrix needs to call routes with parameters. */
export async function seedFixtures(app: TestApp, agents: Record<Role, SignedInAgent>): Promise<Fixtures> {
  const { agent, csrf } = agents.recorder;
  const code = await agent.post('/api/codes').set('x-csrf-token', csrf).send({ category: 'pediatric', weightKg: 12 }).expect(201);
  const codeId = (code.body as { code: { id: string } }).code.id;
  const upload = await agent.post(`/api/codes/${codeId}/attachments`).set('x-csrf-token', csrf).attach('file', tinyPng(), 'fixture.png').expect(201);
  const values: Record<string, string> = { id: codeId, attachmentId: (upload.body as { attachment: { id: string } }).attachment.id };
  // Pharmacy: the leader takes part in the code (leaders read the reconciliation of their codes); a tray template.
  await agents.leader.agent.post(`/api/codes/${codeId}/entries`).set('x-csrf-token', agents.leader.csrf).send(makeEntry({ kind: 'note', text: 'fixture' })).expect(201);
  const tray = await agents.admin.agent
    .post('/api/pharmacy/trays')
    .set('x-csrf-token', agents.admin.csrf)
    .send({ name: 'Fixture tray', items: [{ drugKey: 'epinephrine', label: 'Epinephrine', strengthAmount: 1, strengthUnit: 'mg', volumeMl: 10, quantity: 10 }] })
    .expect(201);
  values.trayId = (tray.body as { tray: { id: string } }).tray.id;
  // Admin: a person to manage (a recorder, so never the last admin), and a unit with a room and a bed.
  values.userId = (await addUser(app, 'matrix.target', ['recorder'])).id;
  values.sessionId = 'no-such-session';
  values.version = '1';
  const admin = (method: 'post', path: string, body: object) => agents.admin.agent[method](path).set('x-csrf-token', agents.admin.csrf).send(body).expect(201);
  const placesAfter = async (path: string, name: string) => (await admin('post', path, { name })).body as Places;
  const unit = (await placesAfter('/api/admin/units', 'Fixture Ward')).units.find((u) => u.name === 'Fixture Ward')!;
  const room = (await placesAfter(`/api/admin/units/${unit.id}/rooms`, 'Fixture room')).units.find((u) => u.id === unit.id)!.rooms[0]!;
  const bed = (await placesAfter(`/api/admin/rooms/${room.id}/beds`, 'Fixture bed')).units.find((u) => u.id === unit.id)!.rooms[0]!.beds[0]!;
  Object.assign(values, { unitId: unit.id, roomId: room.id, bedId: bed.id });
  values.unitId ??= 'fixture-unit-not-stored';
  return {
    param(name) {
      const value = values[name];
      if (!value) throw new Error(`No fixture for route parameter :${name}; add one in test/support/fixtures.ts`);
      return value;
    },
  };
}
