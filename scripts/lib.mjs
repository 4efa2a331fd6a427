// Shared by the README's two commands: get the pinned pnpm without a global install, and run steps.
import { spawn, spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
export const PNPM_VERSION = '12.4.2';

/** better-sqlite3 compiles from source here: point node-gyp at the Node headers on this machine. */
function installEnv() {
  const env = { ...process.env };
  if (!env.npm_config_nodedir && existsSync('/usr/include/node/node.h')) env.npm_config_nodedir = '/usr';
  return env;
}

export function step(title) {
  process.stdout.write(`\n== ${title}\n`);
}

/** Runs a command with inherited output; resolves with its exit code. */
export function run(cmd, args, options = {}) {
  return new Promise((resolve, reject) => {
    const child = spawn(cmd, args, { cwd: ROOT, stdio: 'inherit', env: installEnv(), ...options });
    child.on('error', reject);
    child.on('exit', (code, signal) => resolve(code ?? (signal ? 1 : 0)));
  });
}

export async function mustRun(cmd, args, options) {
  const code = await run(cmd, args, options);
  if (code !== 0) {
    process.stderr.write(`\n${cmd} ${args.join(' ')} failed with exit code ${code}\n`);
    process.exit(code);
  }
}

/** pnpm at the pinned version through npx: no global install, no corepack. */
export function pnpm(args, options) {
  return mustRun('npx', ['--yes', `pnpm@${PNPM_VERSION}`, ...args], options);
}

export async function installDependencies() {
  step(`Installing dependencies (pnpm ${PNPM_VERSION}, lockfile frozen)`);
  await pnpm(['install', '--frozen-lockfile']);
}

export function commandExists(cmd) {
  return spawnSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' }).status === 0;
}
