import { copyFileSync, existsSync, readdirSync } from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import type { BackupList } from '@steadyhand/shared';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { backupUploadsDir, checkCopy } from '../src/backups/backup-copy.js';
import { BackupsService } from '../src/backups/backups.service.js';
import { makeEntry } from './support/entries.js';
import { tinyPng } from './support/sample-files.js';
import { runBuiltCommand, serverProcess, signInHttp, startCodeHttp, type HttpSession } from './support/server-process.js';
import { addUser, signIn, startTestApp, tempDataDir, type SignedInAgent, type TestApp } from './support/test-app.js';

/** Breaks one entry of a copy behind the append-only triggers' back, as a damaged disk or a hand edit would. */
function tamper(file: string, codeId: string): void {
  const db = new Database(file);
  try {
    db.exec('DROP TRIGGER entries_refuse_update');
    db.prepare(`UPDATE entries SET body = json_set(body, '$.text', 'changed later') WHERE code_id = ? AND kind = 'note'`).run(codeId);
  } finally {
    db.close();
  }
}

describe('scheduled backups inside the server, their checks and the admin list', () => {
  let app: TestApp;
  let recorder: SignedInAgent;
  let admin: SignedInAgent;
  let codeId: string;

  beforeAll(async () => {
    app = await startTestApp({ env: { BACKUP_INTERVAL_MINUTES: '0', BACKUP_KEEP: '2' } });
    await addUser(app, 'rec.backup', ['recorder']);
    await addUser(app, 'admin.backup', ['admin']);
    recorder = await signIn(app, 'rec.backup');
    admin = await signIn(app, 'admin.backup');
    const code = await recorder.agent.post('/api/codes').set('x-csrf-token', recorder.csrf).send({ category: 'adult' }).expect(201);
    codeId = code.body.code.id as string;
    for (const fields of [{ kind: 'cpr', action: 'start' }, { kind: 'note', text: 'IV in left arm' }] as const) {
      await recorder.agent.post(`/api/codes/${codeId}/entries`).set('x-csrf-token', recorder.csrf).send(makeEntry(fields)).expect(201);
    }
    await recorder.agent.post(`/api/codes/${codeId}/attachments`).set('x-csrf-token', recorder.csrf).attach('file', tinyPng([1, 2, 3]), 'strip.png').expect(201);
  }, 60_000);
  afterAll(() => app.close());

  it('copies the database and its attachments while serving, checks the copy, keeps BACKUP_KEEP copies and lists them for admins', async () => {
    const backups = app.app.get(BackupsService);
    const first = await backups.backupNow();
    expect(first.check).toMatchObject({ ok: true, integrity: ['ok'], codes: 1, entries: 2, brokenChains: [], attachments: { count: 1, missing: [] } });
    expect(readdirSync(backupUploadsDir(app.config.backup.dir)).filter((n) => !n.startsWith('.'))).toHaveLength(1);
    // The copy is one file that opens on its own.
    const copy = new Database(first.file, { readonly: true });
    expect(copy.pragma('journal_mode', { simple: true })).toBe('delete');
    expect(copy.prepare('SELECT count(*) FROM entries').pluck().get()).toBe(2);
    copy.close();

    await recorder.agent.post(`/api/codes/${codeId}/entries`).set('x-csrf-token', recorder.csrf).send(makeEntry({ kind: 'rosc' })).expect(201);
    const second = await backups.backupNow();
    const third = await backups.backupNow();
    expect(third.check.entries).toBe(3);
    expect(third.removed).toEqual([path.basename(first.file)]);

    const list = (await admin.agent.get('/api/admin/backups').expect(200)).body as BackupList;
    expect(list).toMatchObject({ dir: app.config.backup.dir, intervalMinutes: 0, keep: 2 });
    expect(list.copies.map((c) => c.file)).toEqual([path.basename(third.file), path.basename(second.file)]);
    expect(list.copies[0]).toMatchObject({ sizeBytes: third.sizeBytes, check: { ok: true, codes: 1, entries: 3 } });
    await recorder.agent.get('/api/admin/backups').expect(403);
  });

  it('fails the check of a copy whose entry no longer matches its chain, naming the code and the place', async () => {
    const { file } = await app.app.get(BackupsService).backupNow();
    const broken = path.join(tempDataDir(), 'broken.db');
    copyFileSync(file, broken);
    tamper(broken, codeId);
    const check = await checkCopy(broken, backupUploadsDir(app.config.backup.dir));
    expect(check.ok).toBe(false);
    expect(check.integrity).toEqual(['ok']);
    expect(check.brokenChains).toEqual([{ codeId, brokenAt: expect.objectContaining({ position: 2, reason: expect.stringMatching(/does not match its hash/) }) }]);
  });
});

describe('db:backup and db:restore against the built server', () => {
  const server = serverProcess();
  let maren: HttpSession;

  beforeAll(async () => {
    await server.start();
    maren = await signInHttp(server.baseUrl, 'maren.holt');
  }, 180_000);

  const addEntry = async (codeId: string, entry: object) => {
    const res = await fetch(`${server.baseUrl}/api/codes/${codeId}/entries`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-csrf-token': maren.csrf, cookie: maren.cookie, origin: maren.origin },
      body: JSON.stringify(entry),
    });
    expect(res.status).toBe(201);
  };
  const countEntries = (codeId: string) => {
    const db = new Database(server.databaseFile, { readonly: true });
    try {
      return db.prepare('SELECT count(*) FROM entries WHERE code_id = ?').pluck().get(codeId);
    } finally {
      db.close();
    }
  };

  it('copies while the server runs, refuses to restore while it runs, refuses a damaged copy, restores a good one keeping the replaced file', async () => {
    const codeId = await startCodeHttp(server.baseUrl, maren);
    await addEntry(codeId, makeEntry({ kind: 'cpr', action: 'start' }));
    await addEntry(codeId, makeEntry({ kind: 'note', text: 'before the copy' }));

    const backup = await runBuiltCommand('db-backup.js', [], server.dataDir);
    expect(backup.code, backup.stderr).toBe(0);
    const lines = backup.stdout.trim().split('\n');
    const file = lines[lines.length - 1]!;
    expect(path.dirname(file)).toBe(path.join(server.dataDir, 'backups'));
    expect(existsSync(file)).toBe(true);
    expect(backup.stdout).toMatch(/Check: passed: integrity ok, \d+ codes and \d+ entries, every chain verifies/);

    await addEntry(codeId, makeEntry({ kind: 'rosc' }));
    const refused = await runBuiltCommand('db-restore.js', [file], server.dataDir);
    expect(refused.code).toBe(1);
    expect(refused.stderr).toMatch(/open in another process.*Nothing was changed/);
    expect(countEntries(codeId)).toBe(3);

    await server.kill();
    const damaged = path.join(server.dataDir, 'damaged.db');
    copyFileSync(file, damaged);
    tamper(damaged, codeId);
    const refusedDamaged = await runBuiltCommand('db-restore.js', [damaged], server.dataDir);
    expect(refusedDamaged.code).toBe(1);
    expect(refusedDamaged.stderr).toMatch(/fails its check; nothing was changed[\s\S]*1 broken chains \(code /);

    // By name in BACKUP_DIR, as the admin page lists it.
    const restored = await runBuiltCommand('db-restore.js', [path.basename(file)], server.dataDir);
    expect(restored.code, restored.stderr).toBe(0);
    const kept = /kept as (.+)\n/.exec(restored.stdout)?.[1];
    expect(kept && existsSync(kept)).toBe(true);
    const replaced = new Database(kept, { readonly: true });
    expect(replaced.prepare('SELECT count(*) FROM entries WHERE code_id = ?').pluck().get(codeId)).toBe(3);
    replaced.close();

    await server.start();
    expect(countEntries(codeId)).toBe(2);
    const health = await fetch(`${server.baseUrl}/api/health`);
    expect(health.status).toBe(200);
  }, 120_000);
});
