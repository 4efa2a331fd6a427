#!/usr/bin/env node
// `npm start`: install, build, then serve. The server applies migrations when it starts and, in
// demo mode (on here unless STEADYHAND_DEMO says otherwise), loads the demo hospital into a new
// database. Safe to run again: the install and build are incremental and the demo loads only once.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { ROOT, installDependencies, pnpm, step } from './lib.mjs';

await installDependencies();
step('Building the shared package, the server and the web app');
await pnpm(['run', 'build']);

step('Starting Steadyhand');
const env = { ...process.env, STEADYHAND_DEMO: process.env.STEADYHAND_DEMO ?? '1' };
const server = spawn(process.execPath, [path.join(ROOT, 'apps/server/dist/main.js')], { cwd: ROOT, env, stdio: 'inherit' });
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => server.kill(signal));
server.on('exit', (code, signal) => process.exit(code ?? (signal ? 0 : 1)));
