import { spawn, type ChildProcess } from 'node:child_process';
import { mkdtempSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const REPO_ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../../..');
export const DEMO_PASSWORD = 'steady-hands-demo';

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createServer();
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address();
      srv.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
    });
  });
}

export interface RunningServer {
  baseUrl: string;
  dataDir: string;
  port: number;
  stop(): Promise<void>;
  /** SIGKILL: no shutdown hook runs, as when the machine dies. */
  kill(): Promise<void>;
  /** Starts the server again on the same port and data folder. */
  restart(): Promise<void>;
}

async function waitForHealth(baseUrl: string, child: ChildProcess, timeoutMs = 90_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (child.exitCode !== null || child.signalCode !== null)
      throw new Error(`server exited with ${child.exitCode ?? child.signalCode}`);
    try {
      const res = await fetch(`${baseUrl}/api/health`);
      if (res.ok) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`server did not answer /api/health within ${timeoutMs} ms`);
}

/** The built server (apps/server/dist) in demo mode, on a fresh data folder and a free port. */
export async function startServer(env: Record<string, string> = {}): Promise<RunningServer> {
  const dataDir = mkdtempSync(path.join(tmpdir(), 'steadyhand-e2e-'));
  const port = await freePort();
  const smtpPort = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  let child: ChildProcess;
  let output = '';
  const launch = async () => {
    child = spawn(process.execPath, [path.join(REPO_ROOT, 'apps/server/dist/main.js')], {
      cwd: REPO_ROOT,
      env: { ...process.env, DATA_DIR: dataDir, PORT: String(port), HOST: '127.0.0.1', STEADYHAND_DEMO: '1', LOG_LEVEL: 'warn', PUBLIC_ORIGIN: baseUrl, FAKE_SMTP: '1', SMTP_PORT: String(smtpPort), ...env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    child.stdout?.on('data', (d: Buffer) => (output += d.toString()));
    child.stderr?.on('data', (d: Buffer) => (output += d.toString()));
    try {
      await waitForHealth(baseUrl, child);
    } catch (err) {
      throw new Error(`${(err as Error).message}\n${output.slice(-2000)}`);
    }
  };
  const signal = (sig: NodeJS.Signals) =>
    new Promise<void>((resolve) => {
      // This process, not whichever one `child` names by the time the timer fires (after a restart).
      const proc = child;
      if (!proc || proc.exitCode !== null || proc.signalCode !== null) return resolve();
      proc.once('exit', () => resolve());
      proc.kill(sig);
      setTimeout(() => proc.kill('SIGKILL'), 5000).unref();
    });
  await launch();
  return { baseUrl, dataDir, port, stop: () => signal('SIGTERM'), kill: () => signal('SIGKILL'), restart: launch };
}
