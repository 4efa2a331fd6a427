import { spawn } from 'node:child_process';
import { createRequire } from 'node:module';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { newContext, screenshot, signInAs, useServerAndBrowser } from './support/browser.js';
import { poll, recentIds, startCodeFromHome, storedLog, tap } from './support/pad.js';
import { REPO_ROOT } from './support/server.js';

// better-sqlite3 is the server's dependency; the test reads the restored database with it.
const Database = createRequire(path.join(REPO_ROOT, 'apps/server/package.json'))('better-sqlite3') as typeof import('better-sqlite3');

/** A root pnpm script as an IT team types it (pnpm through npx, as `npm test` runs it). */
function pnpmScript(args: string[], dataDir: string): Promise<{ code: number | null; out: string }> {
  return new Promise((resolve) => {
    const child = spawn('npx', ['--yes', 'pnpm@12.4.2', ...args], {
      cwd: REPO_ROOT,
      env: { ...process.env, DATA_DIR: dataDir, LOG_LEVEL: 'silent' },
    });
    let out = '';
    child.stdout.on('data', (d: Buffer) => (out += d.toString()));
    child.stderr.on('data', (d: Buffer) => (out += d.toString()));
    child.on('exit', (code) => resolve({ code, out }));
  });
}

describe('restore drill: a tablet refills a server restored from an older copy, in Chromium', () => {
  const run = useServerAndBrowser({ env: { BACKUP_INTERVAL_MINUTES: '0' } });

  it('records, takes a backup, records more, loses the server, restores the copy, and finds every tap once', async () => {
    const ctx = await newContext(run.browser, run.server.baseUrl);
    const pad = await ctx.newPage();
    await signInAs(pad, 'maren.holt');
    const codeA = await startCodeFromHome(pad);
    await poll(() => pad.getByTestId('sync-state').getAttribute('data-connected')).toBe('true');
    const beforeCopy = [await tap(pad, 'cpr-start'), await tap(pad, 'cpr-pause-rhythm-check')];
    await poll(() => pad.getByTestId('sync-tile').innerText()).toContain('All saved');

    const backup = await pnpmScript(['db:backup'], run.server.dataDir);
    expect(backup.code, backup.out).toBe(0);
    const copy = backup.out.trim().split('\n').at(-1)!;
    expect(copy).toMatch(/steadyhand-\d{8}T\d{9}Z\.db$/);

    // Acknowledged by the server, then lost with it: the copy predates them.
    const afterCopyA = [await tap(pad, 'rhythm-vf'), await tap(pad, 'shock-200'), await tap(pad, 'cpr-start')];
    await poll(() => pad.getByTestId('sync-tile').innerText()).toContain('All saved');
    await pad.goto('/');
    const codeB = await startCodeFromHome(pad);
    const afterCopyB = [await tap(pad, 'cpr-start'), await tap(pad, 'rhythm-pea')];
    await poll(() => pad.getByTestId('sync-tile').innerText()).toContain('All saved');

    await run.server.kill();
    const restore = await pnpmScript(['db:restore', copy], run.server.dataDir);
    expect(restore.code, restore.out).toBe(0);
    expect(restore.out).toContain('every chain verifies');
    await run.server.restart();

    // The pad reconnects on its own, starts code B again and sends back what the copy lacks.
    const idsOf = (taps: { id: string }[]) => taps.map((t) => t.id);
    await poll(async () => (await storedLog(pad, codeB)).entries.map((e) => e.id), { timeout: 30_000 }).toEqual(idsOf(afterCopyB));
    await poll(async () => (await storedLog(pad, codeA)).entries.map((e) => e.id), { timeout: 30_000 }).toEqual(idsOf([...beforeCopy, ...afterCopyA]));
    await poll(() => pad.getByTestId('sync-tile').innerText()).toContain('All saved');

    // The pad's own view of code A follows the restored server (its cursors started over).
    await pad.goto(`/codes/${codeA}/record`);
    await poll(async () => (await recentIds(pad)).slice().reverse()).toEqual(idsOf([...beforeCopy, ...afterCopyA]));
    console.warn(`[screenshot] ${await screenshot(pad, 'restore-drill-refilled')}`);

    const db = new Database(path.join(run.server.dataDir, 'steadyhand.db'), { readonly: true });
    try {
      const audited = (action: string) => db.prepare('SELECT code_id AS codeId, detail FROM audit_events WHERE action = ?').all(action) as { codeId: string; detail: string }[];
      const refilled = audited('entry.refilled').map((r) => (JSON.parse(r.detail) as { entryId: string; firstStoredAt: string | null }));
      expect(refilled.map((r) => r.entryId).sort()).toEqual(idsOf([...afterCopyA, ...afterCopyB]).sort());
      expect(refilled.every((r) => r.firstStoredAt !== null)).toBe(true);
      expect(audited('code.refilled').map((r) => r.codeId)).toEqual([codeB]);
      // Every tap once, and each code's chain continued in the order the taps came back.
      expect(db.prepare('SELECT count(*) FROM entries WHERE code_id IN (?, ?)').pluck().get(codeA, codeB)).toBe(7);
      expect(db.prepare('SELECT count(*) FROM entry_links WHERE code_id IN (?, ?)').pluck().get(codeA, codeB)).toBe(7);
    } finally {
      db.close();
    }
    await ctx.close();
  }, 180_000);
});
