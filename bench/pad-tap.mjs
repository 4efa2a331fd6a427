#!/usr/bin/env node
// A tap on the recorder pad, measured in the browser: click -> the row on the pad (from memory),
// -> "on this tablet" (IndexedDB committed), -> "saved" (server acknowledged), -> the row on the
// wall of the same code (another page). Beside them, in the same run, the floors: a bare page that
// writes one IndexedDB record (strict durability) and inserts a row, and a bare socket.io round
// trip (`time:ping`) through the same server.
//
//   node bench/pad-tap.mjs [--taps 40]
//
// Runs the built server (apps/server/dist/main.js and apps/web/dist; `pnpm build` first) in demo
// mode on a temporary data folder, and Debian's headless Chromium through playwright-core. Every
// time is taken inside the page with performance.now() (a capture-phase click listener and a
// MutationObserver), on one machine clock (performance.timeOrigin), never by playwright round trips.
// Functions passed to page.evaluate run in the browser.
/* global window, document, Element, MutationObserver, indexedDB, requestAnimationFrame */
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { createServer } from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { parseArgs } from 'node:util';

const out = (line = '') => process.stdout.write(line + '\n');
const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const requireWeb = createRequire(path.join(ROOT, 'apps/web/package.json'));
const { chromium } = requireWeb('playwright-core');
const { io } = requireWeb('socket.io-client');

const { values: args } = parseArgs({ options: { taps: { type: 'string', default: '40' } } });
const TAPS = Math.max(30, Number(args.taps));
const BUTTONS = ['etco2-20', 'etco2-30', 'cpr-swap', 'etco2-40', 'event-rosc'];

const freePort = () =>
  new Promise((resolve, reject) => {
    const srv = createServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const { port } = srv.address();
      srv.close(() => resolve(port));
    });
  });

async function startServer() {
  const dataDir = mkdtempSync(path.join(os.tmpdir(), 'steadyhand-padtap-'));
  const port = await freePort();
  const baseUrl = `http://127.0.0.1:${port}`;
  const child = spawn(process.execPath, [path.join(ROOT, 'apps/server/dist/main.js')], {
    cwd: ROOT,
    env: {
      ...process.env,
      DATA_DIR: dataDir,
      PORT: String(port),
      HOST: '127.0.0.1',
      STEADYHAND_DEMO: '1',
      LOG_LEVEL: 'warn',
      PUBLIC_ORIGIN: baseUrl,
    },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  const deadline = Date.now() + 120_000;
  for (;;) {
    try {
      if ((await fetch(`${baseUrl}/api/health`)).ok) break;
    } catch {
      // not up yet
    }
    if (Date.now() > deadline || child.exitCode !== null)
      throw new Error('the server did not start');
    await new Promise((r) => setTimeout(r, 100));
  }
  const stop = () =>
    new Promise((resolve) => {
      child.once('exit', resolve);
      child.kill('SIGTERM');
    }).then(() => rmSync(dataDir, { recursive: true, force: true }));
  return { baseUrl, stop };
}

async function signIn(page, username, password) {
  await page.goto('/sign-in');
  await page.getByLabel('Username').fill(username);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.getByTestId('home-heading').waitFor();
}

/** In the pad page: the click time per tap, and when its row appeared and changed stage. */
function installPadProbe() {
  const w = window;
  w.__taps = [];
  w.__rows = {};
  document.addEventListener(
    'click',
    (e) => {
      if (e.target instanceof Element && e.target.closest('[data-pad-action]'))
        w.__taps.push({ clickAt: performance.timeOrigin + performance.now() });
    },
    true,
  );
  const look = () => {
    const now = performance.timeOrigin + performance.now();
    for (const el of document.querySelectorAll('[data-testid="entry-row"]')) {
      const id = el.getAttribute('data-entry-id');
      const stage = el.getAttribute('data-stage');
      let r = w.__rows[id];
      if (!r) r = w.__rows[id] = { tap: w.__taps.length - 1, rowAt: now, stages: {} };
      if (stage && r.stages[stage] === undefined) r.stages[stage] = now;
    }
  };
  new MutationObserver(look).observe(document.body, {
    subtree: true,
    childList: true,
    attributes: true,
    attributeFilter: ['data-stage'],
  });
  look();
}

function installWallProbe() {
  const w = window;
  w.__seen = {};
  const look = () => {
    const now = performance.timeOrigin + performance.now();
    for (const el of document.querySelectorAll('[data-entry-id]')) {
      const id = el.getAttribute('data-entry-id');
      if (w.__seen[id] === undefined) w.__seen[id] = now;
    }
  };
  new MutationObserver(look).observe(document.body, { subtree: true, childList: true });
  look();
}

const pct = (values, p) => {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)];
};
const line = (name, values) =>
  `${name.padEnd(34)} n=${String(values.length).padStart(3)}  p50 ${pct(values, 50).toFixed(1).padStart(6)} ms  p95 ${pct(values, 95).toFixed(1).padStart(6)} ms  max ${Math.max(
    ...values,
  )
    .toFixed(1)
    .padStart(6)} ms`;

async function main() {
  const server = await startServer();
  const { DEMO_PASSWORD } = await import(
    pathToFileURL(path.join(ROOT, 'apps/server/dist/demo/demo-data.js')).href
  );
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    headless: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-dev-shm-usage',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
      '--no-first-run',
    ],
  });
  try {
    const ctxOptions = {
      baseURL: server.baseUrl,
      viewport: { width: 1180, height: 820 },
      locale: 'en-GB',
      timezoneId: 'UTC',
    };
    const padCtx = await browser.newContext(ctxOptions);
    const wallCtx = await browser.newContext({
      ...ctxOptions,
      viewport: { width: 1920, height: 1080 },
    });
    const pad = await padCtx.newPage();
    const wall = await wallCtx.newPage();
    await signIn(pad, 'maren.holt', DEMO_PASSWORD);
    await signIn(wall, 'kofi.asante', DEMO_PASSWORD);
    await pad.getByRole('button', { name: 'Start a code' }).click();
    await pad.getByTestId('start-adult').click();
    await pad.waitForURL(/\/codes\/[^/]+\/record$/);
    const codeId = decodeURIComponent(
      /\/codes\/([^/]+)\/record$/.exec(new URL(pad.url()).pathname)[1],
    );
    await wall.goto(`/codes/${codeId}/wall`);
    await pad.waitForFunction(
      () =>
        document.querySelector('[data-testid="sync-state"]')?.getAttribute('data-connected') ===
        'true',
    );
    await wall.waitForSelector('[data-testid="wall-arrest-clock"]');
    await pad.evaluate(installPadProbe);
    await wall.evaluate(installWallProbe);

    for (let i = 0; i < TAPS; i++) {
      await pad.getByTestId(BUTTONS[i % BUTTONS.length]).click();
      // Wait until this tap is saved and on the wall before the next one (one tap at a time).
      await pad.waitForFunction(
        (n) => Object.values(window.__rows).filter((r) => r.stages.saved !== undefined).length >= n,
        i + 1,
      );
      const id = await pad.evaluate(
        (n) => Object.entries(window.__rows).find(([, r]) => r.tap === n)?.[0],
        i,
      );
      await wall.waitForFunction((entryId) => window.__seen[entryId] !== undefined, id);
      await pad.waitForTimeout(150);
    }
    const padData = await pad.evaluate(() => ({ taps: window.__taps, rows: window.__rows }));
    const seen = await wall.evaluate(() => window.__seen);
    const own = [];
    const device = [];
    const saved = [];
    const onWall = [];
    for (const [id, r] of Object.entries(padData.rows)) {
      const click = padData.taps[r.tap]?.clickAt;
      if (click === undefined) continue;
      own.push(r.rowAt - click);
      // A fast write can skip a frame: "on this tablet" is then the first stage past recording.
      const dev = r.stages['on-device'] ?? r.stages.saved;
      if (dev !== undefined) device.push(dev - click);
      if (r.stages.saved !== undefined) saved.push(r.stages.saved - click);
      if (seen[id] !== undefined) onWall.push(seen[id] - click);
    }

    // Floor 1: a bare page on the same origin writes one IndexedDB record and inserts a row.
    const bare = await padCtx.newPage();
    await bare.goto('/api/health');
    await bare.evaluate(async () => {
      const db = await new Promise((resolve, reject) => {
        const req = indexedDB.open('floor', 1);
        req.onupgradeneeded = () => req.result.createObjectStore('rows', { keyPath: 'id' });
        req.onsuccess = () => resolve(req.result);
        req.onerror = () => reject(req.error);
      });
      document.body.innerHTML =
        '<button id="tap" style="width:80px;height:80px">tap</button><ol id="rows"></ol>';
      window.__floor = [];
      document.getElementById('tap').addEventListener('click', () => {
        const clickAt = performance.now();
        const tx = db.transaction('rows', 'readwrite', { durability: 'strict' });
        tx.objectStore('rows').put({
          id: crypto.randomUUID(),
          at: Date.now(),
          kind: 'etco2',
          mmHg: 20,
        });
        tx.oncomplete = () => {
          const li = document.createElement('li');
          li.textContent = 'kept';
          document.getElementById('rows').prepend(li);
          const insertedAt = performance.now();
          requestAnimationFrame(() =>
            setTimeout(() =>
              window.__floor.push({
                committed: insertedAt - clickAt,
                painted: performance.now() - clickAt,
              }),
            ),
          );
        };
      });
    });
    for (let i = 0; i < TAPS; i++) {
      await bare.click('#tap');
      await bare.waitForFunction((n) => window.__floor.length >= n, i + 1);
    }
    const floorIdb = await bare.evaluate(() => window.__floor);

    // Floor 2: a socket.io round trip through the same server (time:ping, no database).
    const cookies = (await padCtx.cookies()).map((c) => `${c.name}=${c.value}`).join('; ');
    const socket = io(`${server.baseUrl}/live`, {
      transports: ['websocket'],
      extraHeaders: { cookie: cookies, origin: server.baseUrl },
      forceNew: true,
      reconnection: false,
    });
    await new Promise((resolve, reject) => {
      socket.once('connect', resolve);
      socket.once('connect_error', reject);
    });
    const rtt = [];
    for (let i = 0; i < TAPS; i++) {
      const t0 = performance.now();
      await new Promise((resolve) => socket.emit('time:ping', { t0: Date.now() }, resolve));
      rtt.push(performance.now() - t0);
      await new Promise((r) => setTimeout(r, 20));
    }
    socket.close();

    const cpus = os.cpus();
    out(
      `pad-tap: ${TAPS} taps, ${os.cpus().length} cores (${cpus[0]?.model ?? '?'}), node ${process.version}, load ${os
        .loadavg()
        .map((l) => l.toFixed(2))
        .join(' ')}`,
    );
    out(line('click -> own row (memory)', own));
    out(line('click -> "on this tablet" (IDB)', device));
    out(line('click -> "saved" (server ack)', saved));
    out(line('click -> row on the wall', onWall));
    out(
      line(
        'floor: IDB write + row inserted',
        floorIdb.map((f) => f.committed),
      ),
    );
    out(
      line(
        'floor: IDB write + next frame',
        floorIdb.map((f) => f.painted),
      ),
    );
    out(line('floor: socket.io round trip', rtt));
  } finally {
    await browser.close();
    await server.stop();
  }
}

await main();
