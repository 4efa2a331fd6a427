#!/usr/bin/env node
// Tap-to-other-screen latency of the live log, beside its floor, measured in one run.
//
//   node bench/live-latency.mjs [--seconds 30] [--load 1] [--codes 20] [--warmup 3] [--skip-floor]
//
// Runs the built server (apps/server/dist/main.js; build it first) as a child process on a
// temporary data folder. Every code has 4 screens (the recorder's device and 3 watchers, each its
// own socket); each recorder taps `load` entries per second. Latency is the time from the emit on
// the recorder to `entry:added` on each of the other 3 screens, all on this process's clock.
// The floor is a bare socket.io server (no sign-in, no validation) in its own process that does
// one SQLite insert per message (journal_mode=WAL, synchronous=FULL) and broadcasts to the same
// rooms: what any design with a durable commit before the broadcast pays. The server process's
// CPU time over the measured seconds is read from /proc (Linux), as a share of one core. Results go to
// bench/results/live-latency-<date>.json (git-ignored).
import { spawn } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { createServer as createHttpServer } from 'node:http';
import { createRequire } from 'node:module';
import { createServer as createNetServer } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';

const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
// The root package does not depend on these; the server package does.
const require = createRequire(path.join(ROOT, 'apps/server/package.json'));
const SERVER_MAIN = path.join(ROOT, 'apps/server/dist/main.js');

const { values: args } = parseArgs({
  options: {
    seconds: { type: 'string', default: '30' },
    load: { type: 'string', default: '1' },
    codes: { type: 'string', default: '20' },
    warmup: { type: 'string', default: '3' },
    // Large runs: the floor doubles the time and the load on a small machine.
    'skip-floor': { type: 'boolean', default: false },
    // Internal: this script run as the floor server.
    'serve-floor': { type: 'boolean', default: false },
    port: { type: 'string' },
    db: { type: 'string' },
  },
});

const WATCHERS = 3;
const ROOM = (codeId) => `code:${codeId}`;

/** The floor: socket.io plus one durable SQLite insert per tap, nothing else. */
function serveFloor(port, file) {
  const { Server } = require('socket.io');
  const Database = require('better-sqlite3');
  const db = new Database(file);
  db.pragma('journal_mode = WAL');
  db.pragma('synchronous = FULL');
  if (db.pragma('journal_mode', { simple: true }) !== 'wal' || db.pragma('synchronous', { simple: true }) !== 2) {
    throw new Error('the floor database is not in WAL mode with synchronous=FULL');
  }
  db.exec('CREATE TABLE entries (cursor INTEGER PRIMARY KEY AUTOINCREMENT, id TEXT NOT NULL UNIQUE, code_id TEXT NOT NULL, body TEXT NOT NULL)');
  const insert = db.prepare('INSERT INTO entries (id, code_id, body) VALUES (?, ?, ?)');
  const http = createHttpServer((req, res) => {
    res.writeHead(req.url === '/api/health' ? 200 : 404, { 'content-type': 'application/json' });
    res.end('{"status":"ok"}');
  });
  const io = new Server(http, { transports: ['websocket'], pingInterval: 4000, pingTimeout: 4000 });
  const nsp = io.of('/live');
  nsp.on('connection', (socket) => {
    socket.on('code:join', (payload, ack) => {
      void socket.join(ROOM(payload.codeId));
      ack({ ok: true, entries: [], cursor: 0 });
    });
    socket.on('entry:add', (payload, ack) => {
      const { codeId, entry } = payload;
      const cursor = Number(insert.run(entry.id, codeId, JSON.stringify(entry)).lastInsertRowid);
      const stored = { ...entry, codeId, cursor };
      nsp.to(ROOM(codeId)).emit('entry:added', { codeId, entry: stored, cursor });
      ack({ ok: true, entry: stored, duplicate: false });
    });
  });
  http.listen(port, '127.0.0.1');
  process.on('SIGTERM', () => {
    void io.close();
    db.close();
    process.exit(0);
  });
}

async function main() {
  const seconds = Number(args.seconds);
  const load = Number(args.load);
  const codes = Number(args.codes);
  const warmup = Number(args.warmup);
  for (const [name, value] of Object.entries({ seconds, load, codes, warmup })) {
    if (!Number.isFinite(value) || value < 0 || (name !== 'warmup' && value <= 0)) throw new Error(`--${name} must be a positive number`);
  }
  if (!existsSync(SERVER_MAIN)) {
    process.stderr.write(`${SERVER_MAIN} is missing: build the server first (pnpm build)\n`);
    process.exit(1);
  }
  const machine = {
    cpu: os.cpus()[0]?.model.trim() ?? 'unknown',
    cores: os.cpus().length,
    node: process.version,
    platform: `${os.platform()} ${os.arch()}`,
    memoryGiB: Math.round(os.totalmem() / 2 ** 30),
    // Other work on the machine skews both columns; the load average shows how much there was.
    loadAverageAtStart: os.loadavg().map((v) => round(v, 2)),
  };
  const shape = { codes, screensPerCode: WATCHERS + 1, tapsPerSecondPerCode: load, measuredSeconds: seconds, warmupSeconds: warmup };
  const out = (line = '') => process.stdout.write(line + '\n');
  out(`machine: ${machine.cpu}, ${machine.cores} cores, Node ${machine.node} (${machine.platform}, ${machine.memoryGiB} GiB), load average ${machine.loadAverageAtStart.join(' ')}`);
  out(`load: ${codes} codes x ${WATCHERS + 1} screens, ${load} tap/s per code (${codes * load} taps/s), ${seconds} s measured after ${warmup} s warm-up`);

  const steadyhand = await withSteadyhand((target) => measure(target, shape));
  const report = (name, r) =>
    out(`${name}: ${r.deliveries} deliveries measured, ${r.missing} missing, ${r.errors} failed taps${r.errors ? ` ${JSON.stringify(r.errorKinds)}` : ''}${Object.keys(r.disconnects).length ? `, disconnects ${JSON.stringify(r.disconnects)}` : ''}`);
  report('Steadyhand', steadyhand);
  if (args['skip-floor']) {
    const r = steadyhand;
    out();
    out(`tap -> entry:added on the other ${WATCHERS} screens (ms): p50 ${r.latency.p50}, p90 ${r.latency.p90}, p99 ${r.latency.p99}, max ${r.latency.max}, n ${r.deliveries}; tap -> ack p50 / p99 ${r.ack.p50} / ${r.ack.p99}`);
    out(`server CPU over the measured seconds: ${r.serverCpuPercent}% of one core`);
    machine.loadAverageAtEnd = os.loadavg().map((v) => round(v, 2));
    out(`load average at the end: ${machine.loadAverageAtEnd.join(' ')}`);
    writeResult({ machine, shape, steadyhand }, `codes${codes}-load${load}`);
    return;
  }
  const floor = await withFloor((target) => measure(target, shape));
  report('floor', floor);

  const keys = ['p50', 'p90', 'p99', 'max'];
  const ratio = Object.fromEntries(keys.map((k) => [k, round(steadyhand.latency[k] / floor.latency[k], 2)]));
  const cell = (v) => String(v).padStart(9);
  out();
  out(`tap -> entry:added on the other ${WATCHERS} screens (ms)`);
  out(`${''.padEnd(12)}${keys.map(cell).join('')}${cell('n')}   tap -> ack p50 / p99`);
  for (const [name, r] of [['Steadyhand', steadyhand], ['floor', floor]]) {
    out(`${name.padEnd(12)}${keys.map((k) => cell(r.latency[k])).join('')}${cell(r.deliveries)}   ${r.ack.p50} / ${r.ack.p99}`);
  }
  out(`${'ratio'.padEnd(12)}${keys.map((k) => cell(`${ratio[k]}x`)).join('')}`);
  out(`server CPU over the measured seconds: Steadyhand ${steadyhand.serverCpuPercent}%, floor ${floor.serverCpuPercent}% of one core`);
  out(`design aim at 1 tap/s per code: within 1.5x the floor (p50 ${ratio.p50}x, p99 ${ratio.p99}x)`);

  machine.loadAverageAtEnd = os.loadavg().map((v) => round(v, 2));
  out(`load average at the end: ${machine.loadAverageAtEnd.join(' ')}`);
  writeResult({ machine, shape, steadyhand, floor, ratio }, `load${load}`);
}

function writeResult(result, suffix) {
  const date = new Date();
  const stamp = date.toISOString().replace(/:/g, '-').replace(/\..*/, '');
  const resultsDir = path.join(ROOT, 'bench/results');
  mkdirSync(resultsDir, { recursive: true });
  const file = path.join(resultsDir, `live-latency-${stamp}-${suffix}.json`);
  writeFileSync(file, JSON.stringify({ date: date.toISOString(), unit: 'ms', ...result }, null, 2) + '\n');
  process.stdout.write(`written to ${path.relative(ROOT, file)}\n`);
}

/** User plus system CPU seconds of a process so far (Linux /proc), or null elsewhere. */
function cpuSeconds(pid) {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').replace(/^.*\) /, '').split(' ');
    // After the command name: state is field 3, utime 14, stime 15 (1-based in proc(5)).
    return (Number(fields[11]) + Number(fields[12])) / CLOCK_TICKS;
  } catch {
    return null;
  }
}
const CLOCK_TICKS = 100;

/** The Steadyhand server as production runs it, on a fresh data folder with the demo people. */
async function withSteadyhand(work) {
  const dataDir = mkdtempSync(path.join(os.tmpdir(), 'steadyhand-bench-'));
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const env = { PATH: process.env.PATH ?? '', HOME: os.homedir(), DATA_DIR: dataDir, PORT: String(port), HOST: '127.0.0.1', STEADYHAND_DEMO: '1', LOG_LEVEL: 'warn', WEB_DIST: path.join(dataDir, 'no-web') };
  const child = await startChild([SERVER_MAIN], env, baseUrl);
  try {
    const recorder = await signIn(baseUrl, 'maren.holt');
    const watcher = await signIn(baseUrl, 'priya.venkat');
    return await work({
      name: 'Steadyhand',
      pid: child.pid,
      baseUrl,
      headers: (role) => ({ cookie: (role === 'recorder' ? recorder : watcher).cookie, origin: baseUrl }),
      createCode: async () => {
        const res = await fetch(`${baseUrl}/api/codes`, {
          method: 'POST',
          headers: { 'content-type': 'application/json', 'x-csrf-token': recorder.csrf, cookie: recorder.cookie, origin: baseUrl },
          body: JSON.stringify({ category: 'adult' }),
        });
        if (res.status !== 201) throw new Error(`starting a code failed: ${res.status} ${await res.text()}`);
        return (await res.json()).code.id;
      },
    });
  } finally {
    await stopChild(child);
    rmSync(dataDir, { recursive: true, force: true });
  }
}

async function withFloor(work) {
  const dir = mkdtempSync(path.join(os.tmpdir(), 'steadyhand-floor-'));
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const child = await startChild([fileURLToPath(import.meta.url), '--serve-floor', '--port', String(port), '--db', path.join(dir, 'floor.db')], { PATH: process.env.PATH ?? '' }, baseUrl);
  try {
    return await work({ name: 'floor', pid: child.pid, baseUrl, headers: () => ({}), createCode: () => Promise.resolve(randomUUID()) });
  } finally {
    await stopChild(child);
    rmSync(dir, { recursive: true, force: true });
  }
}

/** One measured run against a server: connect every screen, tap on schedule, time the broadcasts. */
async function measure(target, shape) {
  const { io } = require('socket.io-client');
  const sockets = [];
  const connect = (role) => {
    const socket = io(`${target.baseUrl}/live`, { transports: ['websocket'], extraHeaders: target.headers(role), forceNew: true, reconnection: false });
    sockets.push(socket);
    socket.on('disconnect', (reason) => {
      if (reason !== 'io client disconnect') disconnects[reason] = (disconnects[reason] ?? 0) + 1;
    });
    return new Promise((resolve, reject) => {
      socket.once('connect', () => resolve(socket));
      socket.once('connect_error', reject);
    });
  };

  const sent = new Map(); // entry id -> { t, measured, seen }
  const latencies = [];
  const acks = [];
  let errors = 0;
  const errorKinds = {};
  const noteError = (what) => {
    errors++;
    errorKinds[what] = (errorKinds[what] ?? 0) + 1;
  };
  const disconnects = {};
  const rooms = [];
  for (let i = 0; i < shape.codes; i++) {
    const codeId = await target.createCode();
    const recorder = await connect('recorder');
    const watchers = await Promise.all(Array.from({ length: WATCHERS }, () => connect('watcher')));
    for (const socket of [recorder, ...watchers]) {
      const join = await socket.emitWithAck('code:join', { codeId });
      if (!join.ok) throw new Error(`${target.name}: code:join failed: ${join.error}`);
    }
    for (const watcher of watchers) {
      watcher.on('entry:added', (event) => {
        const now = performance.now();
        const tap = sent.get(event.entry.id);
        if (!tap) return;
        tap.seen++;
        if (tap.measured) latencies.push(now - tap.t);
      });
    }
    rooms.push({ codeId, recorder, device: `bench-${i}` });
  }

  const period = 1000 / shape.tapsPerSecondPerCode;
  const warmupTaps = Math.round(shape.warmupSeconds * shape.tapsPerSecondPerCode);
  const measuredTaps = Math.round(shape.measuredSeconds * shape.tapsPerSecondPerCode);
  const start = performance.now() + 200;
  const kinds = [
    { kind: 'cpr', action: 'swap' },
    { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' },
    { kind: 'shock', joules: 200, synchronized: false },
    { kind: 'rhythm', rhythm: 'vf', pulse: false },
  ];
  // The server's CPU from the first measured tap to the last tap.
  let cpuAtStart = null;
  let wallAtStart = 0;
  const cpuTimer = setTimeout(() => {
    cpuAtStart = cpuSeconds(target.pid);
    wallAtStart = performance.now();
  }, Math.max(0, start + warmupTaps * period - performance.now()));
  // Codes tap on the same beat but at spread-out phases, as independent teams would.
  await Promise.all(
    rooms.map(async ({ codeId, recorder, device }, i) => {
      const phase = (period * i) / rooms.length;
      for (let k = 0; k < warmupTaps + measuredTaps; k++) {
        const due = start + phase + k * period;
        const wait = due - performance.now();
        if (wait > 0) await new Promise((r) => setTimeout(r, wait));
        const entry = { id: randomUUID(), at: new Date().toISOString(), deviceId: device, seq: k + 1, ...kinds[k % kinds.length] };
        const t = performance.now();
        const measured = k >= warmupTaps;
        sent.set(entry.id, { t, measured, seen: 0 });
        recorder.emitWithAck('entry:add', { codeId, entry }).then(
          (ack) => {
            if (!ack.ok) noteError(`${ack.status} ${ack.error}`);
            else if (measured) acks.push(performance.now() - t);
          },
          (err) => noteError(err instanceof Error ? err.message : String(err)),
        );
      }
    }),
  );

  clearTimeout(cpuTimer);
  const cpuAtEnd = cpuSeconds(target.pid);
  const serverCpuPercent =
    cpuAtStart !== null && cpuAtEnd !== null ? round((100 * (cpuAtEnd - cpuAtStart)) / ((performance.now() - wallAtStart) / 1000), 1) : null;
  // Let the last broadcasts arrive.
  const expected = (warmupTaps + measuredTaps) * rooms.length * WATCHERS;
  const deadline = performance.now() + 10_000;
  const seen = () => [...sent.values()].reduce((n, s) => n + s.seen, 0);
  while (seen() < expected && performance.now() < deadline) await new Promise((r) => setTimeout(r, 50));
  for (const socket of sockets) socket.disconnect();

  return {
    taps: measuredTaps * rooms.length,
    deliveries: latencies.length,
    missing: expected - seen(),
    errors,
    errorKinds,
    disconnects,
    latency: summary(latencies),
    ack: summary(acks),
    serverCpuPercent,
  };
}

function summary(values) {
  const sorted = Float64Array.from(values).sort();
  const at = (p) => (sorted.length ? round(sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil(p * sorted.length) - 1))], 2) : NaN);
  return { p50: at(0.5), p90: at(0.9), p99: at(0.99), max: at(1), count: sorted.length };
}

function round(v, digits) {
  const f = 10 ** digits;
  return Math.round(v * f) / f;
}

function freePort() {
  return new Promise((resolve, reject) => {
    const srv = createNetServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address();
      srv.close(() => resolve(port));
    });
  });
}

const children = new Set();
process.once('exit', () => {
  for (const child of children) child.kill('SIGKILL');
});
process.once('SIGINT', () => process.exit(130));

async function startChild(argv, env, baseUrl) {
  const child = spawn(process.execPath, argv, { env, stdio: ['ignore', 'pipe', 'pipe'] });
  children.add(child);
  let output = '';
  const keep = (chunk) => {
    output = (output + chunk.toString()).slice(-4000);
  };
  child.stdout.on('data', keep);
  child.stderr.on('data', keep);
  let exited = false;
  child.once('exit', () => {
    exited = true;
    children.delete(child);
  });
  const deadline = Date.now() + 120_000;
  for (;;) {
    try {
      const res = await fetch(`${baseUrl}/api/health`, { signal: AbortSignal.timeout(2000) });
      if (res.ok) return child;
    } catch {
      // not listening yet
    }
    if (exited || Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`the server at ${baseUrl} did not start:\n${output}`);
    }
    await new Promise((r) => setTimeout(r, 100));
  }
}

function stopChild(child) {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((resolve) => {
    const timer = setTimeout(() => child.kill('SIGKILL'), 10_000);
    child.once('exit', () => {
      clearTimeout(timer);
      resolve();
    });
    child.kill('SIGTERM');
  });
}

async function signIn(baseUrl, username) {
  const { DEMO_PASSWORD } = await import(pathToFileURL(path.join(ROOT, 'apps/server/dist/demo/demo-data.js')).href);
  const cookiesOf = (res) => res.headers.getSetCookie().map((c) => c.split(';')[0]);
  const first = await fetch(`${baseUrl}/api/auth/csrf`);
  const preCookie = cookiesOf(first).join('; ');
  const { token } = await first.json();
  const login = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': token, cookie: preCookie, origin: baseUrl },
    body: JSON.stringify({ username, password: DEMO_PASSWORD }),
  });
  if (login.status !== 200) throw new Error(`sign-in of ${username} failed: ${login.status} ${await login.text()}`);
  const cookie = cookiesOf(login).join('; ') || preCookie;
  const again = await fetch(`${baseUrl}/api/auth/csrf`, { headers: { cookie } });
  return { cookie, csrf: (await again.json()).token };
}

if (args['serve-floor']) serveFloor(Number(args.port), args.db);
else await main();
