#!/usr/bin/env node
// `npm test`: install, then every test: lint, typecheck, unit, API (real server on a temporary
// SQLite file) and end-to-end (Debian's Chromium). Prints one closing line: "N passed, N failed".
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import { ROOT, installDependencies, mustRun, pnpm, run, step } from './lib.mjs';

/** Debian packages the tests use, and a file that shows each is there. */
const SYSTEM_PACKAGES = [
  { name: 'chromium', file: '/usr/bin/chromium' },
  { name: 'poppler-utils', file: '/usr/bin/pdftotext' },
  { name: 'fonts-dejavu-core', file: '/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf' },
];

async function ensureSystemPackages() {
  const missing = SYSTEM_PACKAGES.filter((p) => !existsSync(p.file)).map((p) => p.name);
  if (missing.length === 0) return;
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;
  if (!isRoot) {
    process.stderr.write(`Missing Debian packages for the tests; install them with: sudo apt-get install -y --no-install-recommends ${missing.join(' ')}\n`);
    process.exit(1);
  }
  step(`Installing Debian packages: ${missing.join(' ')}`);
  await mustRun('apt-get', ['update', '-q']);
  await mustRun('apt-get', ['install', '-y', '-q', '--no-install-recommends', ...missing], {
    env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
  });
}

const resultsDir = path.join(ROOT, 'test-results');
rmSync(resultsDir, { recursive: true, force: true });
mkdirSync(resultsDir, { recursive: true });

await installDependencies();
await ensureSystemPackages();
step('Building (the API and end-to-end tests run the built server and web app)');
await pnpm(['run', 'build']);
step('Lint');
await pnpm(['run', 'lint']);
step('Typecheck');
await pnpm(['run', 'typecheck']);

const tiers = [
  { title: 'Unit tests', project: 'unit-*' },
  { title: 'API and live-socket tests (real server, real SQLite file)', project: 'api' },
  { title: 'End-to-end tests (Chromium)', project: 'e2e' },
];
let passed = 0;
let failed = 0;
let failedTiers = [];
for (const tier of tiers) {
  step(tier.title);
  const report = path.join(resultsDir, `vitest-${tier.project.replace(/\W/g, '')}.json`);
  const code = await run('npx', [
    '--yes', 'pnpm@12.4.2', 'exec', 'vitest', 'run', '--project', tier.project,
    '--reporter=default', '--reporter=json', `--outputFile.json=${report}`,
  ]);
  if (existsSync(report)) {
    const r = JSON.parse(readFileSync(report, 'utf8'));
    passed += r.numPassedTests ?? 0;
    failed += r.numFailedTests ?? 0;
  }
  if (code !== 0) failedTiers.push(tier.title);
}
process.stdout.write(`\n${failedTiers.length ? `Failed tiers: ${failedTiers.join(', ')}\n` : ''}`);
process.stdout.write(`${passed} passed, ${failed} failed\n`);
process.exit(failedTiers.length || failed ? 1 : 0);
