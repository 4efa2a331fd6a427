import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, statSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll } from 'vitest';
import { DEMO_PASSWORD } from '../../src/demo/demo-data.js';

export { DEMO_PASSWORD };

const SERVER_DIR = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
export const SERVER_MAIN = path.join(SERVER_DIR, 'dist/main.js');

/** Children still alive when the test process ends are killed, whatever happened in between. */
const alive = new Set<ChildProcess>();
process.once('exit', () => {
  for (const child of alive) child.kill('SIGKILL');
});

/** A port free right now on loopback; the server keeps it across restarts. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address();
      srv.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
    });
  });
}

function newestMtime(dir: string): number {
  let newest = 0;
  for (const name of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, name.name);
    if (name.isDirectory()) newest = Math.max(newest, newestMtime(full));
    // Unit specs are not part of the build.
    else if (!name.name.endsWith('.spec.ts')) newest = Math.max(newest, statSync(full).mtimeMs);
  }
  return newest;
}

let warnedStale = false;

/** The process tests run the built server, as production does; a missing build is a clear failure. */
function checkBuilt(): void {
  if (!existsSync(SERVER_MAIN)) {
    throw new Error(`${SERVER_MAIN} is missing: build the server first (pnpm build)`);
  }
  if (!warnedStale && newestMtime(path.join(SERVER_DIR, 'src')) > statSync(SERVER_MAIN).mtimeMs) {
    warnedStale = true;
    console.warn(`warning: apps/server/src is newer than ${SERVER_MAIN}; these tests run the build (pnpm build)`);
  }
}

export interface ServerProcessOptions {
  dataDir?: string;
  port?: number;
  env?: Record<string, string>;
  /** How long a start may take before it counts as failed (demo seeding hashes passwords). */
  startTimeoutMs?: number;
}

export interface ServerProcess {
  /** Chosen at the first start, then kept. */
  readonly port: number;
  readonly dataDir: string;
  readonly databaseFile: string;
  /** http://127.0.0.1:<port>, valid once started. */
  readonly baseUrl: string;
  readonly running: boolean;
  /** How many times the server was started. */
  readonly starts: number;
  start(): Promise<void>;
  /** SIGTERM, then SIGKILL if it has not gone after a while. */
  stop(): Promise<void>;
  /** SIGKILL: no shutdown hook runs, as on a crash or a pulled plug of the process. */
  kill(): Promise<void>;
  restart(how?: 'kill' | 'stop'): Promise<void>;
  /** The last lines the server printed, for failure messages. */
  output(): string;
}

/**
 * The built server (dist/main.js) as a child process on a fixed port and data folder, so it can
 * be killed and started again on the same database. Call it in a describe block: it registers an
 * afterAll that kills the server.
 */
export function serverProcess(options: ServerProcessOptions = {}): ServerProcess {
  const dataDir = options.dataDir ?? mkdtempSync(path.join(tmpdir(), 'steadyhand-process-'));
  let port = options.port ?? 0;
  const startTimeoutMs = options.startTimeoutMs ?? 90_000;
  const lines: string[] = [];
  let child: ChildProcess | undefined;
  let exited: Promise<void> = Promise.resolve();
  let starts = 0;

  const remember = (chunk: Buffer) => {
    lines.push(...chunk.toString('utf8').split('\n').filter(Boolean));
    if (lines.length > 200) lines.splice(0, lines.length - 200);
  };

  async function healthy(): Promise<boolean> {
    try {
      const res = await fetch(`http://127.0.0.1:${port}/api/health`, { signal: AbortSignal.timeout(2000) });
      return res.ok && ((await res.json()) as { status?: string }).status === 'ok';
    } catch {
      return false;
    }
  }

  async function start(): Promise<void> {
    if (child) throw new Error('the server is running already');
    checkBuilt();
    if (port === 0) port = await freePort();
    // A clean environment: nothing from the caller's shell may change the server under test.
    const env: Record<string, string> = {
      PATH: process.env.PATH ?? '',
      HOME: process.env.HOME ?? tmpdir(),
      DATA_DIR: dataDir,
      PORT: String(port),
      HOST: '127.0.0.1',
      STEADYHAND_DEMO: '1',
      LOG_LEVEL: 'warn',
      WEB_DIST: path.join(dataDir, 'no-web'),
      ...options.env,
    };
    const proc = spawn(process.execPath, [SERVER_MAIN], { env, cwd: dataDir, stdio: ['ignore', 'pipe', 'pipe'] });
    child = proc;
    starts++;
    alive.add(proc);
    proc.stdout.on('data', remember);
    proc.stderr.on('data', remember);
    let gone = false;
    exited = new Promise<void>((resolve) =>
      proc.once('exit', (code, signal) => {
        gone = true;
        alive.delete(proc);
        if (child === proc) child = undefined;
        lines.push(`[server exited: ${signal ?? `code ${code}`}]`);
        resolve();
      }),
    );
    const deadline = Date.now() + startTimeoutMs;
    while (!(await healthy())) {
      if (gone) throw new Error(`the server stopped while starting:\n${lines.slice(-30).join('\n')}`);
      if (Date.now() > deadline) {
        proc.kill('SIGKILL');
        await exited;
        throw new Error(`the server did not answer /api/health within ${startTimeoutMs} ms:\n${lines.slice(-30).join('\n')}`);
      }
      await new Promise((r) => setTimeout(r, 100));
    }
  }

  async function signal(sig: NodeJS.Signals, graceMs: number): Promise<void> {
    const proc = child;
    if (!proc) return;
    proc.kill(sig);
    const timer = setTimeout(() => proc.kill('SIGKILL'), graceMs);
    await exited;
    clearTimeout(timer);
  }

  const handle: ServerProcess = {
    get port() {
      return port;
    },
    dataDir,
    databaseFile: path.join(dataDir, 'steadyhand.db'),
    get baseUrl() {
      return `http://127.0.0.1:${port}`;
    },
    get running() {
      return child !== undefined;
    },
    get starts() {
      return starts;
    },
    start,
    stop: () => signal('SIGTERM', 10_000),
    kill: () => signal('SIGKILL', 10_000),
    async restart(how = 'kill') {
      await (how === 'kill' ? handle.kill() : handle.stop());
      await start();
    },
    output: () => lines.join('\n'),
  };
  afterAll(() => handle.kill());
  return handle;
}

/** A signed-in HTTP session against a running server: its cookie and CSRF token. */
export interface HttpSession {
  cookie: string;
  csrf: string;
  /** The Origin a browser on this server would send. */
  origin: string;
}

function cookiesOf(res: Response): string[] {
  return res.headers.getSetCookie().map((c) => c.split(';')[0]!);
}

/** Signs in the way the web app does: CSRF token, login, then the new session's token. */
export async function signInHttp(baseUrl: string, username: string, password = DEMO_PASSWORD): Promise<HttpSession> {
  const first = await fetch(`${baseUrl}/api/auth/csrf`);
  const preCookie = cookiesOf(first).join('; ');
  const { token } = (await first.json()) as { token: string };
  const login = await fetch(`${baseUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': token, cookie: preCookie, origin: baseUrl },
    body: JSON.stringify({ username, password }),
  });
  if (login.status !== 200) throw new Error(`sign-in of ${username} failed: ${login.status} ${await login.text()}`);
  const cookie = cookiesOf(login).join('; ') || preCookie;
  const again = await fetch(`${baseUrl}/api/auth/csrf`, { headers: { cookie } });
  const { token: csrf } = (await again.json()) as { token: string };
  return { cookie, csrf, origin: baseUrl };
}

export async function startCodeHttp(baseUrl: string, session: HttpSession, body: Record<string, unknown> = { category: 'adult' }): Promise<string> {
  const res = await fetch(`${baseUrl}/api/codes`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', 'x-csrf-token': session.csrf, cookie: session.cookie, origin: session.origin },
    body: JSON.stringify(body),
  });
  if (res.status !== 201) throw new Error(`starting a code failed: ${res.status} ${await res.text()}`);
  return ((await res.json()) as { code: { id: string } }).code.id;
}

/** Runs one of the built commands (dist/cli/<script>) on a data folder; resolves with its exit code and output. */
export function runBuiltCommand(script: string, args: string[], dataDir: string): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, [path.join(path.dirname(SERVER_MAIN), 'cli', script), ...args], {
      env: { PATH: process.env.PATH ?? '', DATA_DIR: dataDir, LOG_LEVEL: 'silent' },
      cwd: dataDir,
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('exit', (code) => resolve({ code, stdout, stderr }));
  });
}
