#!/usr/bin/env node
// The quality reviewer's list over a year of a large hospital.
//
//   node bench/quality-list.mjs [--codes 2000] [--entries 300] [--reps 200]
//
// Seeds a SQLite file through the real schema (the migrations in drizzle/) with `codes` ended
// codes of `entries` entries each, inserted directly in one transaction, then computes every
// code's metrics row with the server's own code (apps/server/dist/quality). Then times the list
// two ways, with typical filters: the repository's query in this process, and
// GET /api/quality/codes through the built server (signed in as a reviewer) over loopback.
// Build first (pnpm build). Results go to bench/results/quality-list-<date>.json (git-ignored).
import { spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const DIST = path.join(ROOT, 'apps/server/dist');
const load = (rel) => import(pathToFileURL(path.join(DIST, rel)).href);

const { values: args } = parseArgs({
  options: {
    codes: { type: 'string', default: '2000' },
    entries: { type: 'string', default: '300' },
    reps: { type: 'string', default: '200' },
    keep: { type: 'boolean', default: false },
  },
});
const CODES = Number(args.codes);
const ENTRIES = Number(args.entries);
const REPS = Number(args.reps);
const PASSWORD = 'bench-reviewer-password';

// A fixed-seed generator, so every run seeds the same hospital.
let seed = 42;
const rand = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
const between = (a, b) => a + Math.floor(rand() * (b - a + 1));
const pick = (list) => list[Math.floor(rand() * list.length)];

const UNITS = ['4 West Medical', 'Cardiac Step-Down 3B', 'Emergency Bay 2', 'Intensive Care 6 North', 'Pediatric Ward 5 East', '7 East Surgical', 'Oncology 8 West', 'Renal 2 South'];

/** One code's log: 2-minute cycles of compressions, rhythm checks, shocks and drugs, then the end. */
function codeLog(arrestMs) {
  const out = [];
  const push = (s, fields) => out.push({ id: randomUUID(), at: new Date(arrestMs + s * 1000).toISOString(), ...fields });
  const shockable = rand() < 0.25; // about a quarter of IHCAs start in VF/pVT
  let t = between(5, 60);
  let cycle = 0;
  while (out.length < ENTRIES - 1) {
    push(t, { kind: 'cpr', action: 'start' });
    push(t + 30, { kind: 'etco2', mmHg: between(8, 30) });
    push(t + 60, { kind: 'cpr', action: 'swap' });
    push(t + 90, { kind: 'etco2', mmHg: between(8, 30) });
    const checkAt = t + (cycle === 0 ? between(40, 150) : 118);
    push(checkAt, { kind: 'cpr', action: 'stop', reason: 'rhythm-check' });
    push(checkAt + 2, { kind: 'rhythm', rhythm: shockable ? pick(['vf', 'vf', 'pvt']) : pick(['pea', 'asystole']), pulse: false });
    let next = checkAt + between(6, 12);
    if (shockable) {
      push(checkAt + between(4, 14), { kind: 'shock', joules: 200, synchronized: false });
      next = checkAt + 16;
    }
    if (cycle % 2 === (shockable ? 1 : 0)) push(checkAt + between(20, 200), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: pick(['iv', 'io']) });
    if (shockable && cycle === 2) push(checkAt + 30, { kind: 'drug', drug: 'amiodarone', dose: 300, unit: 'mg', route: 'iv' });
    push(checkAt + 40, { kind: 'note', text: `cycle ${cycle + 1}` });
    t = next;
    cycle++;
  }
  const endS = t + between(30, 120);
  const outcome = pick(['died', 'died', 'sustained-rosc', 'transferred']);
  if (outcome !== 'died') out.splice(out.length - 1, 0, { id: randomUUID(), at: new Date(arrestMs + (t - 5) * 1000).toISOString(), kind: 'rosc' });
  push(endS, { kind: 'end', outcome });
  return { entries: out.slice(0, ENTRIES), endMs: arrestMs + endS * 1000, outcome };
}

function stats(samples) {
  const s = [...samples].sort((a, b) => a - b);
  const q = (p) => s[Math.min(s.length - 1, Math.floor(p * s.length))];
  return { n: s.length, p50: +q(0.5).toFixed(2), p99: +q(0.99).toFixed(2), max: +s[s.length - 1].toFixed(2) };
}

function freePort() {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address();
      srv.close(() => resolve(port));
    });
    srv.on('error', reject);
  });
}

const QUERIES = [
  ['newest first, no filter', 'sort=arrestAt&dir=desc'],
  ['last quarter, one unit', 'from=2026-07-01&to=2026-09-30&unitId=UNIT'],
  ['any target missed, by compression fraction', 'missed=any&sort=compressionFraction&dir=asc'],
  ['VF, shock target missed, page 3', 'firstRhythm=vf&missed=time-to-shock&page=3'],
  ['by unit name, page 20', 'sort=unit&dir=asc&page=20'],
];

async function main() {
  const { openDatabase } = await load('db/database.js');
  const { computeCodeMetrics } = await load('quality/quality-metrics.js');
  const { QualityRepository } = await load('quality/quality.repository.js');
  const { toStoredEntry } = await load('codes/codes.repository.js');
  const { hashPassword } = await load('auth/password.js');
  const shared = await import(pathToFileURL(path.join(ROOT, 'packages/shared/dist/index.js')).href);

  const dataDir = mkdtempSync(path.join(os.tmpdir(), 'steadyhand-bench-quality-'));
  const file = path.join(dataDir, 'steadyhand.db');
  const { sqlite, db } = openDatabase(file, path.join(ROOT, 'drizzle'));
  const now = new Date().toISOString();

  // --- seed ---
  let t0 = performance.now();
  const userId = randomUUID();
  const unitIds = UNITS.map(() => randomUUID());
  const passwordHash = await hashPassword(PASSWORD);
  const insertCode = sqlite.prepare(
    `INSERT INTO codes (id, status, category, weight_kg, location, unit_id, patient, arrest_at, created_at, created_by, ended_at, outcome)
     VALUES (?, 'ended', 'adult', NULL, ?, ?, NULL, ?, ?, ?, ?, ?)`,
  );
  const insertEntry = sqlite.prepare(
    `INSERT INTO entries (id, code_id, kind, at, at_ms, device_id, seq, user_id, received_at, recorded_at, addendum, body)
     VALUES (?, ?, ?, ?, ?, 'bench-tablet', ?, ?, ?, ?, 0, ?)`,
  );
  const yearStart = Date.parse('2025-10-01T00:00:00.000Z');
  sqlite.transaction(() => {
    sqlite.prepare('INSERT INTO users (id, username, display_name, password_hash, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?)').run(userId, 'bench.reviewer', 'Bench Reviewer', passwordHash, now, now);
    for (const role of ['recorder', 'reviewer']) sqlite.prepare('INSERT INTO user_roles (user_id, role) VALUES (?, ?)').run(userId, role);
    UNITS.forEach((name, i) => sqlite.prepare('INSERT INTO units (id, name, active, created_at) VALUES (?, ?, 1, ?)').run(unitIds[i], name, now));
    for (let c = 0; c < CODES; c++) {
      const arrestMs = yearStart + Math.floor(rand() * 365 * 86_400_000);
      const codeId = randomUUID();
      const { entries, endMs, outcome } = codeLog(arrestMs);
      insertCode.run(codeId, `Bed ${between(1, 30)}`, pick(unitIds), new Date(arrestMs).toISOString(), now, userId, new Date(endMs).toISOString(), outcome);
      entries.forEach((e, seq) => insertEntry.run(e.id, codeId, e.kind, e.at, Date.parse(e.at), seq, userId, e.at, e.at, JSON.stringify(e)));
    }
  })();
  const seedMs = performance.now() - t0;
  const entryCount = sqlite.prepare('SELECT count(*) AS n FROM entries').get().n;

  // --- metrics, with the server's own code ---
  t0 = performance.now();
  const repo = new QualityRepository(db);
  const codeRows = sqlite.prepare('SELECT id, arrest_at, ended_at, unit_id, category, weight_kg FROM codes').all();
  const entriesOf = sqlite.prepare('SELECT * FROM entries WHERE code_id = ? ORDER BY cursor');
  const camel = (row) => ({ cursor: row.cursor, codeId: row.code_id, userId: row.user_id, receivedAt: row.received_at, recordedAt: row.recorded_at, addendum: !!row.addendum, body: JSON.parse(row.body) });
  sqlite.transaction(() => {
    for (const c of codeRows) {
      const log = entriesOf.all(c.id).map((r) => toStoredEntry(camel(r)));
      const code = { id: c.id, arrestAt: c.arrest_at, endedAt: c.ended_at, unitId: c.unit_id, category: c.category, weightKg: c.weight_kg };
      repo.upsertMetrics(computeCodeMetrics(code, shared.foldLog(code, log, shared.DEFAULT_PROTOCOL)));
    }
  })();
  const metricsMs = performance.now() - t0;
  const missedShare = sqlite.prepare('SELECT avg(targets_missed_count > 0) AS s FROM code_metrics').get().s;
  sqlite.pragma('optimize');
  const unit = unitIds[0];

  // --- the query in this process ---
  const inProcess = {};
  for (const [label, qs] of QUERIES) {
    const query = shared.qualityListQuerySchema.parse(Object.fromEntries(new URLSearchParams(qs.replace('UNIT', unit))));
    for (let i = 0; i < 10; i++) repo.list(query); // warm-up
    const samples = [];
    const cpu = [];
    let total = 0;
    for (let i = 0; i < REPS; i++) {
      const c = process.cpuUsage();
      const s = performance.now();
      total = repo.list(query).total;
      repo.units();
      samples.push(performance.now() - s);
      const used = process.cpuUsage(c);
      cpu.push((used.user + used.system) / 1000);
    }
    // CPU time of this one thread: what the query costs whatever else the machine is doing.
    inProcess[label] = { ...stats(samples), cpu: stats(cpu), total };
  }
  sqlite.close();

  // --- through the built server, over HTTP ---
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const child = spawn(process.execPath, [path.join(DIST, 'main.js')], {
    env: { PATH: process.env.PATH ?? '', HOME: os.homedir(), DATA_DIR: dataDir, PORT: String(port), HOST: '127.0.0.1', LOG_LEVEL: 'warn', WEB_DIST: path.join(dataDir, 'no-web') },
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  const http = {};
  try {
    for (let i = 0; ; i++) {
      try {
        if ((await fetch(`${baseUrl}/api/health`)).ok) break;
      } catch {
        // not listening yet
      }
      if (i > 600) throw new Error('the server did not start');
      await new Promise((r) => setTimeout(r, 100));
    }
    const cookieOf = (res) => res.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
    const first = await fetch(`${baseUrl}/api/auth/csrf`);
    const { token } = await first.json();
    const login = await fetch(`${baseUrl}/api/auth/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-csrf-token': token, cookie: cookieOf(first), origin: baseUrl },
      body: JSON.stringify({ username: 'bench.reviewer', password: PASSWORD }),
    });
    if (login.status !== 200) throw new Error(`sign-in failed: ${login.status}`);
    const cookie = cookieOf(login);
    for (const [label, qs] of QUERIES) {
      const url = `${baseUrl}/api/quality/codes?${qs.replace('UNIT', unit)}`;
      for (let i = 0; i < 10; i++) await (await fetch(url, { headers: { cookie } })).arrayBuffer();
      const samples = [];
      for (let i = 0; i < REPS; i++) {
        const s = performance.now();
        const res = await fetch(url, { headers: { cookie } });
        const body = await res.json();
        if (res.status !== 200 || !Array.isArray(body.items)) throw new Error(`${url}: ${res.status}`);
        samples.push(performance.now() - s);
      }
      http[label] = stats(samples);
    }
  } finally {
    child.kill('SIGTERM');
  }

  const machine = {
    cpu: os.cpus()[0]?.model.trim() ?? 'unknown',
    cores: os.cpus().length,
    node: process.versions.node,
    platform: `${os.platform()} ${os.arch()}`,
    memoryGiB: Math.round(os.totalmem() / 2 ** 30),
    loadAverage1m: +os.loadavg()[0].toFixed(1),
  };
  const out = (s) => process.stdout.write(s + '\n');
  out(`machine: ${machine.cpu}, ${machine.cores} cores, Node ${machine.node} (${machine.platform}, ${machine.memoryGiB} GiB), load ${machine.loadAverage1m}`);
  out(`seeded ${CODES} codes, ${entryCount} entries in ${(seedMs / 1000).toFixed(1)} s; metrics of every code in ${(metricsMs / 1000).toFixed(1)} s; ${(missedShare * 100).toFixed(0)}% miss a target`);
  out(`list, ${REPS} repetitions each (ms):        in process wall p50 / p99 (CPU p50)  |  HTTP wall p50 / p99`);
  for (const [label] of QUERIES) {
    const a = inProcess[label];
    const b = http[label];
    out(`  ${label.padEnd(44)} ${String(a.p50).padStart(6)} / ${String(a.p99).padEnd(7)} (${String(a.cpu.p50).padStart(5)})  |  ${String(b.p50).padStart(6)} / ${b.p99}   (${a.total} codes match)`);
  }
  const date = new Date();
  mkdirSync(path.join(ROOT, 'bench/results'), { recursive: true });
  const resultFile = path.join(ROOT, 'bench/results', `quality-list-${date.toISOString().replace(/[:.]/g, '-').slice(0, 19)}.json`);
  writeFileSync(resultFile, JSON.stringify({ date: date.toISOString(), machine, codes: CODES, entries: entryCount, seedMs, metricsMs, unit: 'ms', inProcess, http }, null, 2) + '\n');
  out(`wrote ${path.relative(ROOT, resultFile)}`);
  if (!args.keep) rmSync(dataDir, { recursive: true, force: true });
  else out(`kept ${dataDir}`);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
