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
// Mail goes to the fake relay inside the server (read it at /api/dev/outbox) unless SMTP_HOST names a real one.
const realRelay = Boolean(process.env.SMTP_HOST) && !['127.0.0.1', 'localhost', '::1'].includes(process.env.SMTP_HOST);
const env = {
  ...process.env,
  STEADYHAND_DEMO: process.env.STEADYHAND_DEMO ?? '1',
  FAKE_SMTP: process.env.FAKE_SMTP ?? (realRelay ? '0' : '1'),
};
const server = spawn(process.execPath, [path.join(ROOT, 'apps/server/dist/main.js')], { cwd: ROOT, env, stdio: 'inherit' });
for (const signal of ['SIGINT', 'SIGTERM']) process.on(signal, () => server.kill(signal));
server.on('exit', (code, signal) => process.exit(code ?? (signal ? 0 : 1)));
