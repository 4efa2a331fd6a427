import { randomUUID } from 'node:crypto';
import { ROLES, type Role, type RecordView } from '@steadyhand/shared';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeEntry } from './support/entries.js';
import { seededRandom } from './support/chaos-proxy.js';
import { seedFixtures, type Fixtures } from './support/fixtures.js';
import { listHttpRoutes } from './support/list-routes.js';
import { connected, connectLive, cookieHeader, type LiveClient } from './support/live-client.js';
import { binary } from './support/pdf.js';
import { ROUTE_ACCESS, routeKey, type Caller } from './support/route-access.js';
import { tinyPdf, tinyPng } from './support/sample-files.js';
import { addUser, signIn, startTestApp, TEST_PASSWORD, type SignedInAgent, type TestApp } from './support/test-app.js';

/**
 * A seeded storm of hostile and half-valid requests over every HTTP route and every socket event,
 * by every kind of caller: no answer may be a 5xx (nor a socket acknowledgement with status 500),
 * and afterwards every record must still open, with every tamper check passing. The seed is
 * printed; FUZZ_SEED=<n> replays a run, FUZZ_REQUESTS=<n> sets its length.
 */
const SEED = Number(process.env.FUZZ_SEED ?? 20260304);
const HTTP_REQUESTS = Number(process.env.FUZZ_REQUESTS ?? 3000);
const SOCKET_MESSAGES = Math.round(HTTP_REQUESTS / 4);
/** Routes that hash a password (scrypt, slow on purpose) or render a PDF: a few calls each, not hundreds. */
const SLOW_ROUTES = new Set([
  'POST /api/auth/login',
  'POST /api/auth/totp',
  'POST /api/account/password',
  'POST /api/account/totp/confirm',
  'POST /api/admin/users',
  'POST /api/admin/users/:userId/password',
  'POST /api/codes/:id/signatures',
  'POST /api/codes/:id/reconciliation/sign',
  'POST /api/quality/codes/:id/review/sign',
  'GET /api/codes/:id/record.pdf',
  'GET /api/codes/:id/reconciliation/restock.pdf',
  'GET /api/pharmacy/carts/:unitId/restock.pdf',
  'POST /api/records/verify',
]);
const SLOW_BUDGET = 8;
/** Fuller bodies than the role matrix's, so every text field of a route gets its turn. */
const RICH_BODIES: Record<string, () => unknown> = {
  'POST /api/codes': () => ({ category: 'adult', location: '4 West, bed 2', patient: { name: 'Ada Lovelace', mrn: 'MRN-1', birthDate: '1950-01-01', sex: 'female' }, weightKg: 70 }),
  'PATCH /api/codes/:id': () => ({ location: 'Bay 3', patient: { name: 'Grace Hopper', mrn: 'MRN-2' }, weightKg: 12, category: 'pediatric' }),
  'PATCH /api/codes/:id/review': () => ({ team: [{ name: 'Dr Kofi Asante', role: 'Team leader' }], debriefNotes: 'Went well', patient: { name: 'Ada' }, location: 'Bay 4', outcome: 'died' }),
  'PUT /api/admin/places/facility': () => ({ name: 'Harbourview General Hospital' }),
  'PATCH /api/admin/users/:userId': () => ({ displayName: 'Matrix Target' }),
  'PUT /api/quality/codes/:id/review': () => ({ notes: 'Notes', debriefPoints: ['Point one'] }),
  'PUT /api/codes/:id/reconciliation': () => ({ notes: 'n', lines: [{ drugKey: 'epinephrine', unitsOpened: 2, unitsWasted: 0, wasteWitness: 'W', lotNumbers: 'L1', note: 'x' }] }),
  'POST /api/codes/:id/reconciliation/addenda': () => ({ text: 'Found one more vial', lines: [{ drugKey: 'epinephrine', unitsOpened: 3, unitsWasted: 0 }] }),
};

/** Seeded choices, so a failing run can be replayed exactly. */
function prng(seed: number) {
  const next = seededRandom(seed);
  const int = (n: number) => Math.floor(next() * n);
  const pick = <T>(list: readonly T[]): T => list[int(list.length)]!;
  const chance = (p: number) => next() < p;
  return { next, int, pick, chance };
}

const HOSTILE_TEXT = [
  '',
  ' ',
  'a',
  'x'.repeat(5000),
  '\ud800',
  'half \udc00 pair',
  'strip\u202egnp.pdf',
  "=cmd|' /C calc'!A0",
  '-2+3+1',
  '@SUM(1+1)',
  '<script>alert(1)</script>',
  "'; DROP TABLE entries; --",
  '../../etc/passwd',
  '\u0000\u0001',
  '👪 Ärztin',
  'NaN',
  '2026-02-30',
  '2026-03-04T07:42:10.000Z',
  '1e309',
  'null',
  '__proto__',
];
const HOSTILE_NUMBERS = [0, -1, 1, 1.5, 250, 400, 401, 1e308, -1e308, 2 ** 53 + 1, 0.000001, 100000];
const HOSTILE_KEYS = ['__proto__', 'constructor', 'prototype', 'userId', 'addendum', 'recordedAt', 'id', 'kind', 'x'.repeat(300), '\ud800'];
const BAD_PARAMS = ['', 'x', '0', '-1', '..', '..%2F..%2Fetc', '%ED%A0%80', '%00', 'a'.repeat(300), '00000000-0000-4000-8000-000000000000', 'null', '%E2%80%AE'];

describe(`fuzzing every route and socket event (seed ${SEED})`, () => {
  let app: TestApp;
  let agents: Record<Role, SignedInAgent>;
  let fixtures: Fixtures;
  const rnd = prng(SEED);
  const codeIds: string[] = [];
  const entryIds: string[] = [];

  beforeAll(async () => {
    // High enough that the storm's own failed passwords never lock the test out; throttling answers (429) are fine.
    app = await startTestApp({ env: { LOGIN_IP_LIMIT: '10000', LOGIN_ACCOUNT_LIMIT: '1000' } });
    for (const role of ROLES) await addUser(app, `fuzz.${role}`, [role]);
    agents = {} as Record<Role, SignedInAgent>;
    for (const role of ROLES) agents[role] = await signIn(app, `fuzz.${role}`);
    fixtures = await seedFixtures(app, agents);
    codeIds.push(fixtures.param('id', 'recorder'));
    process.stdout.write(`fuzz seed ${SEED}: replay with FUZZ_SEED=${SEED}\n`);
  }, 120_000);
  afterAll(() => app.close());

  function randomValue(depth = 0): unknown {
    switch (rnd.int(depth > 3 ? 4 : 7)) {
      case 0:
        return rnd.pick(HOSTILE_TEXT);
      case 1:
        return rnd.pick(HOSTILE_NUMBERS);
      case 2:
        return rnd.chance(0.5);
      case 3:
        return null;
      case 4:
        return Array.from({ length: rnd.int(4) }, () => randomValue(depth + 1));
      case 5: {
        const out: Record<string, unknown> = {};
        for (let i = rnd.int(4); i > 0; i--) out[rnd.pick(HOSTILE_KEYS)] = randomValue(depth + 1);
        return out;
      }
      default: {
        // Deeper than the edge's bound now and then.
        let v: unknown = 1;
        for (let i = rnd.int(40); i > 0; i--) v = { a: v };
        return v;
      }
    }
  }

  /** The same shape with some of its text swapped for hostile text: the bodies that get past the types. */
  function hostileText(value: unknown): unknown {
    if (typeof value === 'string') return rnd.chance(0.5) ? rnd.pick(HOSTILE_TEXT) : value;
    if (Array.isArray(value)) return value.map(hostileText);
    if (value !== null && typeof value === 'object') return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, hostileText(v)]));
    return value;
  }

  /** A valid body now and then (so state grows), else a mutation of it. */
  function mutate(sample: unknown): unknown {
    if (sample === undefined || rnd.chance(0.3)) return sample;
    if (rnd.chance(0.3)) return hostileText(sample);
    if (rnd.chance(0.15)) return randomValue();
    if (sample === null || typeof sample !== 'object' || Array.isArray(sample)) return randomValue();
    const copy: Record<string, unknown> = { ...(sample as Record<string, unknown>) };
    const keys = Object.keys(copy);
    for (let i = 1 + rnd.int(2); i > 0; i--) {
      const op = rnd.int(4);
      if (op === 0 && keys.length) delete copy[rnd.pick(keys)];
      else if (op === 1 && keys.length) copy[rnd.pick(keys)] = randomValue();
      else if (op === 2) copy[rnd.pick(HOSTILE_KEYS)] = randomValue();
      else if (keys.length) {
        const key = rnd.pick(keys);
        copy[key] = mutate(copy[key]);
      }
    }
    return copy;
  }

  /** An entry as a device might send it: mostly valid taps, corrections of stored entries, and garbage. */
  function entryBody(): unknown {
    const target = entryIds.length ? rnd.pick(entryIds) : randomUUID();
    const valid = [
      () => makeEntry({ kind: 'cpr', action: rnd.pick(['start', 'stop', 'swap'] as const) }),
      () => makeEntry({ kind: 'rhythm', rhythm: rnd.pick(['vf', 'pvt', 'pea', 'asystole', 'organized', 'other'] as const), pulse: rnd.chance(0.3) }),
      () => makeEntry({ kind: 'shock', joules: rnd.pick([120, 150, 200, 360]), synchronized: rnd.chance(0.2) }),
      () => makeEntry({ kind: 'drug', drug: rnd.pick(['epinephrine', 'amiodarone', 'atropine', 'free text drug']), dose: rnd.pick([0, 1, 300, 0.5]), unit: rnd.pick(['mg', 'ug', 'g', 'meq', 'mL'] as const), route: 'iv' }),
      () => makeEntry({ kind: 'etco2', mmHg: rnd.int(200) }),
      () => makeEntry({ kind: 'note', text: rnd.pick(['Family informed', '👪 present', "=cmd|' /C calc'!A0"]) }),
      () => makeEntry({ kind: 'rosc' }),
      () => makeEntry({ kind: 'end', outcome: rnd.pick(['sustained-rosc', 'died', 'transferred', 'other'] as const) }),
      () => makeEntry({ kind: 'void', target, reason: 'fuzz' }),
      () => makeEntry({ kind: 'amend', target, changes: { [rnd.pick(['joules', 'dose', 'text', 'at', 'rhythm', 'userId', 'addendum'])]: randomValue() }, reason: 'fuzz' }),
      () => makeEntry({ kind: 'amend', target, changes: { joules: rnd.pick([150, 200, 360]) }, reason: 'fuzz' }),
    ];
    const entry = rnd.pick(valid)();
    return rnd.chance(0.7) ? entry : mutate(entry);
  }

  function paramValue(name: string, caller: Caller): string {
    if (rnd.chance(0.2)) return rnd.pick(BAD_PARAMS);
    if (name === 'id' && codeIds.length) return rnd.pick(codeIds);
    return fixtures.param(name, caller);
  }

  const callers: Caller[] = ['anonymous', ...ROLES];
  let anonymous: { agent: ReturnType<typeof request.agent>; csrf: string } | undefined;
  async function agentFor(caller: Caller, endsSession: boolean) {
    if (caller !== 'anonymous' && !endsSession) return agents[caller];
    // Fresh for a call that ends its session; one shared otherwise.
    if (anonymous && !endsSession) return anonymous;
    const agent = request.agent(app.baseUrl);
    const csrf = ((await agent.get('/api/auth/csrf')).body as { token: string }).token;
    const made = { agent, csrf };
    if (!endsSession) anonymous = made;
    return made;
  }

  it('answers every request below 500', async () => {
    const routes = listHttpRoutes(app).map(({ method, path }) => ({ method, path, key: routeKey(method, path) }));
    const slowCalls = new Map<string, number>();
    const failures: string[] = [];
    const statuses = new Map<number, number>();

    for (let n = 0; n < HTTP_REQUESTS; n++) {
      // Every route once first, then at random.
      let route = n < routes.length ? routes[n]! : rnd.pick(routes);
      while (SLOW_ROUTES.has(route.key) && (slowCalls.get(route.key) ?? 0) >= SLOW_BUDGET) route = rnd.pick(routes);
      if (SLOW_ROUTES.has(route.key)) slowCalls.set(route.key, (slowCalls.get(route.key) ?? 0) + 1);
      const rule = ROUTE_ACCESS[route.key]!;
      // Mostly someone the route lets in, so the requests get past the guard to the code behind it.
      const allowed = rule.allowed === 'public' ? callers : rule.allowed === 'any' ? ROLES : rule.allowed;
      const caller: Caller = rnd.chance(0.8) ? rnd.pick(allowed) : rnd.pick(callers);
      const { agent, csrf } = await agentFor(caller, rule.endsSession === true);
      const path = route.path.replace(/:(\w+)/g, (_m, name: string) => paramValue(name, caller));
      const method = route.method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
      let call = agent[method](path);
      if (!rnd.chance(0.03)) call = call.set('x-csrf-token', csrf);
      if (method === 'get' && rnd.chance(0.3)) call = call.query({ [rnd.pick(['status', 'page', 'pageSize', 'from', 'to', 'since', 'sort', 'unitId', 'person'])]: String(rnd.pick([...HOSTILE_TEXT.slice(0, 6), '2026-03-04', '-5', '99999999'])) });
      if (route.key.endsWith('/record.pdf') || route.key.endsWith('.pdf')) call = call.buffer(true).parse(binary);

      let body: unknown;
      if (rule.attach) {
        const bytes = rnd.pick([tinyPng([rnd.int(256), rnd.int(256), 9]), tinyPdf(`fuzz ${n}`), Buffer.from('not a picture'), Buffer.alloc(0)]);
        call = call.attach(rnd.chance(0.9) ? 'file' : 'other', bytes, rnd.pick(['strip.png', 'scan.pdf', 'strip\u202egnp.pdf', '../../x.png', 'a'.repeat(400), 'noext']));
      } else if (route.key === 'POST /api/records/verify' && rnd.chance(0.5)) {
        call = call.attach('file', rnd.pick([tinyPdf('not a record'), Buffer.from('%PDF-1.4 steadyhand-record:x')]), 'record.pdf');
      } else if (route.key === 'POST /api/codes/:id/entries' || route.key === 'POST /api/codes/:id/addenda') {
        body = entryBody();
      } else {
        const rich = RICH_BODIES[route.key];
        const sample = rich && rnd.chance(0.7) ? rich() : typeof rule.body === 'function' ? (rule.body as () => unknown)() : rule.body;
        // Signatures with the right password now and then, so records get signed and take addenda.
        body = route.key.endsWith('/signatures') && rnd.chance(0.5) ? { meaning: rnd.pick(['recorded-by', 'reviewed-confirmed']), password: TEST_PASSWORD } : mutate(sample ?? (rnd.chance(0.2) ? randomValue() : undefined));
      }
      const res = await (body === undefined
        ? call
        : body !== null && typeof body === 'object'
          ? call.send(body)
          : call.set('content-type', 'application/json').send(JSON.stringify(body)));
      statuses.set(res.status, (statuses.get(res.status) ?? 0) + 1);
      if (res.status >= 500) failures.push(`${caller} ${route.method} ${path} ${JSON.stringify(body)?.slice(0, 300)} → ${res.status} ${JSON.stringify(res.body).slice(0, 200)}`);
      if (res.status === 201 && route.key === 'POST /api/codes') codeIds.push((res.body as { code: { id: string } }).code.id);
      if ((res.status === 201 || res.status === 200) && (route.key === 'POST /api/codes/:id/entries' || route.key === 'POST /api/codes/:id/addenda')) {
        entryIds.push((res.body as { entry: { id: string } }).entry.id);
      }
    }
    process.stdout.write(`fuzz HTTP answers by status: ${JSON.stringify(Object.fromEntries([...statuses].sort((a, b) => a[0] - b[0])))}\n`);
    expect(failures, `seed ${SEED}`).toEqual([]);
  }, 120_000);

  it('answers every socket message, never with status 500', async () => {
    const sockets = new Map<Role, LiveClient>();
    const open = async (role: Role) => {
      let socket = sockets.get(role);
      if (socket?.connected) return socket;
      socket = connectLive(app.baseUrl, { cookie: cookieHeader(agents[role], app.baseUrl), origin: app.baseUrl });
      await connected(socket);
      sockets.set(role, socket);
      return socket;
    };
    const failures: string[] = [];
    try {
      for (let n = 0; n < SOCKET_MESSAGES; n++) {
        const role = rnd.pick(['recorder', 'leader', 'pharmacist', 'reviewer'] as const);
        const socket = await open(role);
        const event = rnd.pick(['code:join', 'entry:add', 'entry:add', 'time:ping', 'code:leave', 'no:such-event']);
        const codeId = rnd.chance(0.85) && codeIds.length ? rnd.pick(codeIds) : rnd.pick(BAD_PARAMS);
        const payload =
          event === 'entry:add'
            ? rnd.chance(0.8) ? { codeId, entry: entryBody() } : mutate({ codeId, entry: entryBody() })
            : event === 'code:join'
              ? mutate({ codeId, after: rnd.pick([0, 5, -1, 1e12]) })
              : event === 'time:ping'
                ? mutate({ t0: Date.now() })
                : randomValue();
        const emitter = socket as unknown as {
          emit(event: string, payload: unknown): void;
          timeout(ms: number): { emitWithAck(event: string, payload: unknown): Promise<unknown> };
        };
        if (event === 'code:leave' || event === 'no:such-event') {
          emitter.emit(event, payload);
          continue;
        }
        let ack: unknown;
        try {
          ack = await emitter.timeout(5_000).emitWithAck(event, payload);
        } catch {
          failures.push(`${role} ${event} ${JSON.stringify(payload)?.slice(0, 300)} → no acknowledgement`);
          continue;
        }
        const status = (ack as { status?: unknown } | null)?.status;
        if (status === 500) failures.push(`${role} ${event} ${JSON.stringify(payload)?.slice(0, 300)} → ${JSON.stringify(ack)}`);
        if ((ack as { ok?: boolean; duplicate?: boolean } | null)?.ok && event === 'entry:add') entryIds.push((ack as { entry: { id: string } }).entry.id);
      }
    } finally {
      for (const s of sockets.values()) s.disconnect();
    }
    expect(failures, `seed ${SEED}`).toEqual([]);
  }, 120_000);

  it('leaves every record openable, with every tamper check passing, and its summary computable', async () => {
    const reader = agents.reviewer;
    const ids = app.database.sqlite.prepare('SELECT id FROM codes').pluck().all() as string[];
    expect(ids.length).toBeGreaterThan(1);
    const problems: string[] = [];
    for (const id of ids) {
      const view = await reader.agent.get(`/api/codes/${id}/record`);
      if (view.status !== 200) problems.push(`${id}: record ${view.status} ${JSON.stringify(view.body).slice(0, 200)}`);
      else if (!(view.body as RecordView).integrity.valid) problems.push(`${id}: ${(view.body as RecordView).integrity.problems.join(' ')}`);
      for (const part of ['summary', 'dosing']) {
        const res = await reader.agent.get(`/api/codes/${id}/${part}`);
        if (res.status !== 200) problems.push(`${id}: ${part} ${res.status}`);
      }
    }
    // A printed copy of a few (rendering is the slow part): the signed ones first.
    const signed = app.database.sqlite.prepare('SELECT DISTINCT code_id FROM signatures').pluck().all() as string[];
    for (const id of [...signed, ...ids].slice(0, 6)) {
      const res = await reader.agent.get(`/api/codes/${id}/record.pdf`).buffer(true).parse(binary);
      if (res.status !== 200) problems.push(`${id}: record.pdf ${res.status}`);
    }
    expect(problems, `seed ${SEED}`).toEqual([]);
  }, 120_000);
});
