import { setTimeout as sleep } from 'node:timers/promises';
import Database from 'better-sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seededRandom, seedFrom, startChaosProxy, type ChaosProxy } from './support/chaos-proxy.js';
import { OutboxClient, type TapFields } from './support/outbox-client.js';
import { serverProcess, signInHttp, startCodeHttp, type HttpSession } from './support/server-process.js';

// Replays a run: STEADYHAND_FAULT_SEED=<seed printed by the failing run>.
const SEED_ENV = 'STEADYHAND_FAULT_SEED';

interface Row {
  cursor: number;
  id: string;
  code_id: string;
  device_id: string | null;
  seq: number | null;
  kind: string;
}

/** A short-lived connection of our own to the server's database file (WAL lets it read beside the server). */
function withDatabase<T>(file: string, work: (db: Database.Database) => T): T {
  const db = new Database(file);
  try {
    db.pragma('busy_timeout = 5000');
    return work(db);
  } finally {
    db.close();
  }
}

function integrity(db: Database.Database): string {
  return (db.pragma('integrity_check') as { integrity_check: string }[]).map((r) => r.integrity_check).join('; ');
}

/** Ids among `ids` that the database does not hold. */
function missingIds(db: Database.Database, ids: string[]): string[] {
  const has = db.prepare('SELECT count(*) FROM entries WHERE id = ?').pluck();
  return ids.filter((id) => has.get(id) !== 1);
}

function rowsOf(db: Database.Database, codeIds: string[]): Row[] {
  const marks = codeIds.map(() => '?').join(', ');
  return db
    .prepare(`SELECT cursor, id, code_id, device_id, seq, kind FROM entries WHERE code_id IN (${marks}) ORDER BY cursor`)
    .all(...codeIds) as Row[];
}

/** Per device, the sequence numbers in the order the database stored them (by cursor). */
function seqsByDevice(rows: Row[]): Map<string, number[]> {
  const byDevice = new Map<string, number[]>();
  for (const row of rows) {
    const list = byDevice.get(row.device_id ?? '') ?? [];
    list.push(row.seq ?? -1);
    byDevice.set(row.device_id ?? '', list);
  }
  return byDevice;
}

const range = (n: number) => Array.from({ length: n }, (_, i) => i + 1);

async function until(done: () => boolean, timeoutMs: number, what: string): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!done()) {
    if (Date.now() > deadline) throw new Error(`gave up waiting for ${what} after ${timeoutMs} ms`);
    await sleep(10);
  }
}

/** A varied stream of what a recorder taps during a code (never `end`, which would close it). */
function tapFor(random: () => number, n: number): TapFields {
  const pick = Math.floor(random() * 6);
  switch (pick) {
    case 0:
      return { kind: 'cpr', action: 'swap' };
    case 1:
      return { kind: 'rhythm', rhythm: 'vf', pulse: false };
    case 2:
      return { kind: 'shock', joules: 200, synchronized: false };
    case 3:
      return { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' };
    case 4:
      return { kind: 'etco2', mmHg: 10 + (n % 40) };
    default:
      return { kind: 'note', text: `tap ${n}` };
  }
}

describe('fault tolerance of the live log (built server as a process, killed with SIGKILL)', () => {
  const server = serverProcess();
  const clients: OutboxClient[] = [];
  const proxies: ChaosProxy[] = [];
  let maren: HttpSession;
  let kofi: HttpSession;

  beforeAll(async () => {
    // The first start seeds the demo hospital (password hashing), hence the long hook timeout.
    await server.start();
    maren = await signInHttp(server.baseUrl, 'maren.holt');
    kofi = await signInHttp(server.baseUrl, 'kofi.asante');
  }, 180_000);

  afterAll(async () => {
    for (const client of clients) client.close();
    for (const proxy of proxies) await proxy.close();
    await server.kill();
  });

  it('keeps every acknowledged tap through a SIGKILL mid-stream, and stores the resends once', async () => {
    const seed = seedFrom(SEED_ENV);
    const random = seededRandom(seed);
    const codeId = await startCodeHttp(server.baseUrl, maren);
    const pad = new OutboxClient({ url: server.baseUrl, cookie: maren.cookie, origin: server.baseUrl, deviceId: 'pad-crash', codes: [codeId], window: 4 });
    clients.push(pad);

    const TAPS = 300;
    const killAfterAcks = 60 + Math.floor(random() * 120);
    // Taps keep coming every few milliseconds whether the server is up or not.
    const tapping = (async () => {
      for (let i = 1; i <= TAPS; i++) {
        pad.tap(codeId, tapFor(random, i));
        await sleep(5);
      }
    })();

    await until(() => pad.stats.acks >= killAfterAcks, 60_000, `${killAfterAcks} acknowledgements`);
    await server.kill();
    const savedAtKill = pad.savedIds();
    const unsavedAtKill = pad.pending;

    // Straight from the file the killed process left, before any resend could fill a gap.
    const afterKill = withDatabase(server.databaseFile, (db) => ({
      missing: missingIds(db, savedAtKill),
      rows: rowsOf(db, [codeId]).length,
      integrity: integrity(db),
    }));
    expect(afterKill.missing).toEqual([]);
    expect(afterKill.integrity).toBe('ok');
    expect(afterKill.rows).toBeGreaterThanOrEqual(savedAtKill.length);

    // The device also lost its record of its last acknowledgements: it must send those again.
    const forgotten = pad.forgetSaved(10);
    await server.start();
    await tapping;
    await pad.whenIdle(60_000);

    const end = withDatabase(server.databaseFile, (db) => ({
      rows: rowsOf(db, [codeId]),
      missing: missingIds(db, savedAtKill),
      integrity: integrity(db),
    }));
    const tapped = pad.outbox.map((item) => item.entry.id);
    expect(end.missing).toEqual([]);
    expect(end.rows.length).toBe(TAPS);
    expect(new Set(end.rows.map((r) => r.id))).toEqual(new Set(tapped));
    expect(seqsByDevice(end.rows).get('pad-crash')).toEqual(range(TAPS));
    expect(end.integrity).toBe('ok');
    expect(pad.stats.duplicates).toBeGreaterThanOrEqual(forgotten);
    expect(pad.stats.errors).toEqual([]);

    process.stdout.write(
      `crash test: seed ${seed}; killed after ${savedAtKill.length} acknowledged (${unsavedAtKill} unsaved on the device, ${afterKill.rows} rows on disk at the kill); ` +
        `${TAPS} taps -> ${end.rows.length} rows, each id once; ${pad.stats.resends} resends, ${pad.stats.duplicates} answered as already stored; integrity ${end.integrity}\n`,
    );
  }, 180_000);

  it('stores every tap exactly once and in order through resets, lost acknowledgements and SIGKILLs', async () => {
    const started = Date.now();
    const seed = seedFrom(SEED_ENV);
    const random = seededRandom(seed);
    const proxy = await startChaosProxy({
      targetPort: server.port,
      seed: (seed ^ 0x9e3779b9) >>> 0,
      dropChance: 0.01,
      resetMeanMs: 2500,
      durationMs: 60_000,
      maxFaults: 80,
    });
    proxies.push(proxy);

    const sharedCode = await startCodeHttp(server.baseUrl, maren);
    const soloCode = await startCodeHttp(server.baseUrl, kofi);
    const marenAgain = await signInHttp(server.baseUrl, 'maren.holt');
    const device = (deviceId: string, session: HttpSession, codes: string[], window: number) => {
      const client = new OutboxClient({ url: proxy.url, cookie: session.cookie, origin: server.baseUrl, deviceId, codes, window, ackTimeoutMs: 8000 });
      clients.push(client);
      return client;
    };
    // Two devices write the same code; the third writes its own and also shows the shared one.
    const plan = [
      { client: device('pad-a', maren, [sharedCode], 4), codeId: sharedCode, shows: [sharedCode], taps: 700 },
      { client: device('pad-b', kofi, [sharedCode], 1), codeId: sharedCode, shows: [sharedCode], taps: 700 },
      { client: device('pad-c', marenAgain, [soloCode, sharedCode], 2), codeId: soloCode, shows: [soloCode, sharedCode], taps: 600 },
    ];
    const totalTaps = plan.reduce((n, p) => n + p.taps, 0);

    const tapping = Promise.all(
      plan.map(async ({ client, codeId, taps }, i) => {
        const own = seededRandom((seed + i + 1) >>> 0);
        for (let n = 1; n <= taps; n++) {
          client.tap(codeId, tapFor(own, n));
          await sleep(5 + Math.floor(own() * 30));
        }
      }),
    );

    const kills: { savedAtKill: number; missing: string[]; integrity: string }[] = [];
    const killCount = 3 + Math.floor(random() * 2);
    const killing = (async () => {
      for (let k = 0; k < killCount; k++) {
        // On a slow machine each restart takes long: past the budget, two kills are enough.
        if (k >= 2 && Date.now() - started > 40_000) break;
        await sleep(1000 + Math.floor(random() * 2500));
        await server.kill();
        const saved = plan.flatMap((p) => p.client.savedIds());
        kills.push(withDatabase(server.databaseFile, (db) => ({ savedAtKill: saved.length, missing: missingIds(db, saved), integrity: integrity(db) })));
        await sleep(Math.floor(random() * 500));
        await server.start();
      }
    })();

    await Promise.all([tapping, killing]);
    proxy.calm();
    await Promise.all(plan.map((p) => p.client.whenIdle(60_000)));

    // Every screen must reach the end of every code it shows, through broadcasts or its rejoin.
    const lastCursor = withDatabase(server.databaseFile, (db) => {
      const max = db.prepare('SELECT max(cursor) FROM entries WHERE code_id = ?').pluck();
      return new Map([sharedCode, soloCode].map((c) => [c, max.get(c) as number]));
    });
    for (const { client, shows } of plan) {
      for (const codeId of shows) await client.whenCaughtUp(codeId, lastCursor.get(codeId)!, 30_000);
    }

    const db = withDatabase(server.databaseFile, (conn) => ({
      rows: rowsOf(conn, [sharedCode, soloCode]),
      repeated: conn
        .prepare(`SELECT id, count(*) AS n FROM entries WHERE code_id IN (?, ?) GROUP BY id HAVING n <> 1`)
        .all(sharedCode, soloCode),
      elsewhere: conn
        .prepare(`SELECT count(*) FROM entries WHERE device_id IN ('pad-a', 'pad-b', 'pad-c') AND code_id NOT IN (?, ?)`)
        .pluck()
        .get(sharedCode, soloCode) as number,
      integrity: integrity(conn),
    }));

    for (const kill of kills) {
      expect(kill.missing).toEqual([]);
      expect(kill.integrity).toBe('ok');
    }
    const tapped = plan.flatMap((p) => p.client.outbox.map((item) => item.entry.id));
    expect(tapped.length).toBe(totalTaps);
    expect(db.repeated).toEqual([]);
    expect(db.rows.length).toBe(totalTaps);
    expect(db.elsewhere).toBe(0);
    expect(new Set(db.rows.map((r) => r.id))).toEqual(new Set(tapped));
    const bySeq = seqsByDevice(db.rows);
    for (const { client, taps } of plan) expect(bySeq.get(client.deviceId)).toEqual(range(taps));
    for (const { client, shows } of plan) {
      expect(client.stats.errors).toEqual([]);
      for (const codeId of shows) {
        const expected = db.rows.filter((r) => r.code_id === codeId).map((r) => `${r.cursor}:${r.id}:${r.device_id}:${r.seq}:${r.kind}`);
        const shown = client.view(codeId).map((e) => `${e.cursor}:${e.id}:${e.deviceId}:${e.seq}:${e.kind}`);
        expect(shown).toEqual(expected);
      }
    }
    expect(db.integrity).toBe('ok');

    const sum = (key: 'connects' | 'resends' | 'duplicates') => plan.reduce((n, p) => n + p.client.stats[key], 0);
    process.stdout.write(
      `fault harness: seed ${seed}; ${totalTaps} taps from ${plan.length} devices on 2 codes -> ${db.rows.length} rows, each id once, per-device order kept; ` +
        `${kills.length} SIGKILLs (server started ${server.starts} times); proxy ${proxy.stats.connections} connections, ${proxy.stats.resets} resets, ` +
        `${proxy.stats.drops} dropped server chunks, ${proxy.stats.refused} refused while down; clients ${sum('connects')} connects, ${sum('resends')} resends, ` +
        `${sum('duplicates')} answered as already stored; every screen equals the database; integrity ${db.integrity}; ${((Date.now() - started) / 1000).toFixed(1)} s\n`,
    );
  }, 240_000);
});
