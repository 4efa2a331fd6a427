import type { AdminUser, AuditPage, Places, SessionInfo } from '@steadyhand/shared';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { connected, connectLive, cookieHeader, refused, type LiveClient } from './support/live-client.js';
import { addUser, csrfFor, signIn, startTestApp, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

const NEW_PASSWORD = 'a fresh passphrase of mine';

describe('admin: people, places, sessions and the audit trail', () => {
  let app: TestApp;
  let admin: SignedInAgent;
  const sockets: LiveClient[] = [];

  const post = (who: SignedInAgent, path: string, body?: object) => who.agent.post(path).set('x-csrf-token', who.csrf).send(body);
  const put = (who: SignedInAgent, path: string, body: object) => who.agent.put(path).set('x-csrf-token', who.csrf).send(body);
  const userId = async (username: string) =>
    ((await admin.agent.get('/api/admin/users').expect(200)).body.users as AdminUser[]).find((u) => u.username === username)!.id;
  const audit = async (query: Record<string, string>) => (await admin.agent.get('/api/admin/audit').query(query).expect(200)).body as AuditPage;

  beforeAll(async () => {
    app = await startTestApp();
    await addUser(app, 'admin.one', ['admin']);
    await addUser(app, 'nurse.one', ['recorder']);
    admin = await signIn(app, 'admin.one'); // the helper enrols the admin's second factor
  }, 60_000);
  afterAll(async () => {
    for (const s of sockets) s.disconnect();
    await app.close();
  });

  it('adds a person with roles, refuses a common or short password, renames and changes roles, all in the audit trail', async () => {
    const common = await post(admin, '/api/admin/users', { username: 'new.nurse', displayName: 'New Nurse', password: 'qwerty123456', roles: ['recorder'] });
    expect(common.status).toBe(400);
    expect(common.body.message).toBe('this password is too common');
    await post(admin, '/api/admin/users', { username: 'new.nurse', displayName: 'New Nurse', password: 'short one', roles: [] }).expect(400);

    const created = await post(admin, '/api/admin/users', { username: 'new.nurse', displayName: 'New Nurse', password: 'a long enough phrase', roles: ['recorder'] }).expect(201);
    expect(created.body.user).toMatchObject({ username: 'new.nurse', roles: ['recorder'], mustChangePassword: true, disabledAt: null });
    await post(admin, '/api/admin/users', { username: 'new.nurse', displayName: 'Again', password: 'a long enough phrase', roles: [] }).expect(409);

    const id = created.body.user.id as string;
    const renamed = await admin.agent.patch(`/api/admin/users/${id}`).set('x-csrf-token', admin.csrf).send({ displayName: 'Nell Newby, RN' }).expect(200);
    expect(renamed.body.user.displayName).toBe('Nell Newby, RN');
    const roles = await put(admin, `/api/admin/users/${id}/roles`, { roles: ['leader', 'recorder'] }).expect(200);
    expect(roles.body.user.roles).toEqual(['leader', 'recorder']);

    const trail = await audit({ person: 'admin.one', action: 'user.' });
    expect(trail.events.map((e) => e.action)).toEqual(['user.roles-changed', 'user.renamed', 'user.created']);
    expect(trail.events[0]!.detail).toMatchObject({ username: 'new.nurse', from: ['recorder'], to: ['leader', 'recorder'] });
  });

  it('resets a password: the person is signed out, then must choose a new one before anything else', async () => {
    const nurse = await signIn(app, 'nurse.one');
    const id = await userId('nurse.one');
    await post(admin, `/api/admin/users/${id}/password`, { password: 'temporary passphrase' }).expect(200);
    await nurse.agent.get('/api/auth/me').expect(401);

    const again = await signIn(app, 'nurse.one', 'temporary passphrase');
    const blocked = await again.agent.get('/api/codes').expect(403);
    expect(blocked.body.error).toBe('password-change-required');
    // The live socket refuses the same session until the password is changed.
    const early = connectLive(app.baseUrl, { origin: app.baseUrl, cookie: cookieHeader(again, app.baseUrl) });
    sockets.push(early);
    expect((await refused(early)).message).toMatch(/password-change-required/);
    expect((await again.agent.get('/api/auth/me').expect(200)).body.user.mustChangePassword).toBe(true);

    const tooCommon = await post(again, '/api/account/password', { currentPassword: 'temporary passphrase', newPassword: 'qwerty123456' }).expect(400);
    expect(tooCommon.body.message).toBe('this password is too common');
    await post(again, '/api/account/password', { currentPassword: 'temporary passphrase', newPassword: NEW_PASSWORD }).expect(204);
    await again.agent.get('/api/codes').expect(200);
    expect((await again.agent.get('/api/auth/me').expect(200)).body.user.mustChangePassword).toBe(false);
    expect((await audit({ action: 'user.password-reset' })).events[0]?.detail).toMatchObject({ username: 'nurse.one' });
  });

  it('never removes the last enabled admin, nor lets an admin disable themself', async () => {
    const me = await userId('admin.one');
    expect((await put(admin, `/api/admin/users/${me}/roles`, { roles: ['recorder'] }).expect(409)).body.message).toContain('last enabled administrator');
    await post(admin, `/api/admin/users/${me}/disable`).expect(409);

    // A second admin who is disabled does not count.
    const second = (await addUser(app, 'admin.two', ['admin'])).id;
    await post(admin, `/api/admin/users/${second}/disable`).expect(200);
    await put(admin, `/api/admin/users/${me}/roles`, { roles: ['recorder'] }).expect(409);
    await post(admin, `/api/admin/users/${second}/enable`).expect(200);
    // With another enabled admin, the other one's admin role may go, but then not the last one's.
    await put(admin, `/api/admin/users/${second}/roles`, { roles: ['reviewer'] }).expect(200);
    await put(admin, `/api/admin/users/${me}/roles`, { roles: ['reviewer'] }).expect(409);
  });

  it('disabling a person ends their sessions and drops their live socket within a second', async () => {
    await addUser(app, 'nurse.two', ['recorder']);
    const nurse = await signIn(app, 'nurse.two');
    const socket = connectLive(app.baseUrl, { cookie: cookieHeader(nurse, app.baseUrl), origin: app.baseUrl });
    sockets.push(socket);
    await connected(socket);
    const id = await userId('nurse.two');

    const started = Date.now();
    const gone = new Promise<number>((resolve) => socket.once('disconnect', () => resolve(Date.now() - started)));
    const res = await post(admin, `/api/admin/users/${id}/disable`).expect(200);
    expect(res.body.user.disabledAt).toEqual(expect.any(String));
    expect(await gone).toBeLessThan(1000);

    await nurse.agent.get('/api/auth/me').expect(401);
    const agent = request.agent(app.baseUrl);
    const token = await csrfFor(agent);
    await agent.post('/api/auth/login').set('x-csrf-token', token).send({ username: 'nurse.two', password: TEST_PASSWORD }).expect(401);
    expect((await audit({ action: 'user.disabled' })).events[0]?.detail).toMatchObject({ username: 'nurse.two' });
  });

  it('lists sessions (who, device, last seen); an admin ends any, a person only their own', async () => {
    await addUser(app, 'lead.one', ['leader']);
    const tablet = await signIn(app, 'lead.one');
    const desk = await signIn(app, 'lead.one');

    const mine = (await desk.agent.get('/api/account/sessions').expect(200)).body.sessions as SessionInfo[];
    expect(mine).toHaveLength(2);
    expect(mine.filter((s) => s.current)).toHaveLength(1);
    expect(mine[0]).toMatchObject({ username: 'lead.one', lastSeenAt: expect.any(String) });
    expect(mine[0]).toHaveProperty('userAgent');
    const tabletSession = mine.find((s) => !s.current)!;

    // Someone else's session is not yours to end.
    const adminSessions = (await admin.agent.get('/api/admin/sessions').expect(200)).body.sessions as SessionInfo[];
    const adminOwn = adminSessions.find((s) => s.current)!;
    await desk.agent.delete(`/api/account/sessions/${adminOwn.id}`).set('x-csrf-token', desk.csrf).expect(404);

    await desk.agent.delete(`/api/account/sessions/${tabletSession.id}`).set('x-csrf-token', desk.csrf).expect(204);
    await tablet.agent.get('/api/auth/me').expect(401);

    const deskSession = ((await admin.agent.get('/api/admin/sessions').expect(200)).body.sessions as SessionInfo[]).find((s) => s.username === 'lead.one')!;
    await admin.agent.delete(`/api/admin/sessions/${deskSession.id}`).set('x-csrf-token', admin.csrf).expect(204);
    await desk.agent.get('/api/auth/me').expect(401);
    expect((await audit({ action: 'session.ended' })).events.map((e) => e.detail?.by)).toEqual(['admin', 'self']);
  });

  it('keeps places: facility, units (deactivated, not deleted), rooms and beds; the picker sees only active units', async () => {
    let places = (await put(admin, '/api/admin/places/facility', { name: 'Harbourview General Hospital' }).expect(200)).body as Places;
    places = (await post(admin, '/api/admin/units', { name: '4 West Medical' }).expect(201)).body as Places;
    await post(admin, '/api/admin/units', { name: '4 West Medical' }).expect(409);
    const unit = places.units.find((u) => u.name === '4 West Medical')!;
    places = (await post(admin, `/api/admin/units/${unit.id}/rooms`, { name: 'Room 12' }).expect(201)).body as Places;
    const room = places.units.find((u) => u.id === unit.id)!.rooms[0]!;
    places = (await post(admin, `/api/admin/rooms/${room.id}/beds`, { name: 'Bed 12' }).expect(201)).body as Places;
    await post(admin, `/api/admin/rooms/${room.id}/beds`, { name: 'Bed 2' }).expect(201);

    const picker = (await admin.agent.get('/api/places').expect(200)).body as Places;
    expect(picker.facility.name).toBe('Harbourview General Hospital');
    expect(picker.units.find((u) => u.id === unit.id)?.rooms[0]?.beds.map((b) => b.name)).toEqual(['Bed 2', 'Bed 12']);

    await admin.agent.delete(`/api/admin/rooms/${room.id}`).set('x-csrf-token', admin.csrf).expect(409);
    await admin.agent.patch(`/api/admin/units/${unit.id}`).set('x-csrf-token', admin.csrf).send({ active: false }).expect(200);
    expect(((await admin.agent.get('/api/places').expect(200)).body as Places).units.some((u) => u.id === unit.id)).toBe(false);
    expect(((await admin.agent.get('/api/admin/places').expect(200)).body as Places).units.find((u) => u.id === unit.id)?.active).toBe(false);
    expect((await audit({ action: 'places.' })).events.map((e) => e.action)).toContain('places.unit-changed');
  });

  it('shows the audit trail newest first, filtered by person, code and date, and exports it as CSV', async () => {
    await addUser(app, 'rec.audit', ['recorder']);
    const rec = await signIn(app, 'rec.audit');
    const code = (await post(rec, '/api/codes', { category: 'adult' }).expect(201)).body.code.id as string;
    const failed = request.agent(app.baseUrl);
    const token = await csrfFor(failed);
    await failed.post('/api/auth/login').set('x-csrf-token', token).send({ username: 'rec.audit', password: 'not the password' }).expect(401);

    const byPerson = await audit({ person: 'rec.audit' });
    expect(byPerson.events.map((e) => e.action)).toEqual(['auth.login-failed', 'code.created', 'auth.login']);
    const byCode = await audit({ codeId: code });
    expect(byCode.events).toHaveLength(1);
    expect(byCode.events[0]).toMatchObject({ action: 'code.created', username: 'rec.audit', codeId: code });
    const today = new Date().toISOString().slice(0, 10);
    expect((await audit({ person: 'rec.audit', from: today, to: today })).total).toBe(3);
    expect((await audit({ person: 'rec.audit', to: '2000-01-01' })).total).toBe(0);
    await admin.agent.get('/api/admin/audit').query({ from: 'yesterday' }).expect(400);

    const csv = await admin.agent.get('/api/admin/audit.csv').query({ person: 'rec.audit' }).expect(200);
    expect(csv.headers['content-type']).toContain('text/csv');
    expect(csv.headers['content-disposition']).toContain('attachment');
    const lines = csv.text.trim().split('\r\n');
    expect(lines[0]).toBe('id,at,action,username,userId,codeId,ip,detail');
    expect(lines).toHaveLength(4);
    expect(lines[2]).toContain(`code.created,rec.audit,`);
    expect((await audit({ action: 'audit.exported' })).total).toBe(1);
  });

  it('keeps audit rows append-only: the database refuses UPDATE and DELETE (see also src/db/database.spec.ts)', () => {
    const { sqlite } = app.database;
    const before = sqlite.prepare('SELECT count(*) FROM audit_events').pluck().get();
    expect(() => sqlite.prepare("UPDATE audit_events SET action = 'hidden'").run()).toThrow(/append-only/);
    expect(() => sqlite.prepare('DELETE FROM audit_events').run()).toThrow(/append-only/);
    expect(sqlite.prepare('SELECT count(*) FROM audit_events').pluck().get()).toBe(before);
  });
});
