import { existsSync, mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { loadConfig } from '../config/config.js';
import { openDatabase } from '../db/database.js';
import { copiesToPrune, copyName, copyNames, copyTime } from './backup-copy.js';
import { BackupsService } from './backups.service.js';
import { databaseInUse } from './restore.js';

describe('copy names', () => {
  it('name a copy by the time it was taken, to the millisecond, and read that time back', () => {
    const at = new Date('2026-12-02T03:15:00.123Z');
    expect(copyName(at)).toBe('steadyhand-20261202T031500123Z.db');
    expect(copyTime(copyName(at))?.toISOString()).toBe(at.toISOString());
    expect(copyTime('steadyhand.db')).toBeNull();
    expect(copyTime('steadyhand-20261302T031500123Z.db')).toBeNull();
  });

  it('prune the oldest copies beyond the number kept, whatever order they are listed in', () => {
    const names = ['2026-12-02T03:15:00.000Z', '2026-12-02T03:45:00.000Z', '2026-12-02T03:30:00.000Z'].map((t) => copyName(new Date(t)));
    expect(copiesToPrune(names, 2)).toEqual([copyName(new Date('2026-12-02T03:15:00.000Z'))]);
    expect(copiesToPrune(names, 5)).toEqual([]);
  });
});

describe('the backup schedule and the in-use check, on a real database file', () => {
  afterEach(() => {
    vi.useRealTimers();
  });

  it('copies every BACKUP_INTERVAL_MINUTES once the app has started, and not before', async () => {
    const dataDir = mkdtempSync(path.join(tmpdir(), 'steadyhand-backups-'));
    const config = loadConfig({ DATA_DIR: dataDir, BACKUP_INTERVAL_MINUTES: '5', LOG_LEVEL: 'silent' });
    const database = openDatabase(config.databaseFile, config.migrationsDir);
    // Only the interval is faked: the copy itself runs on real timers and a worker thread.
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
    const service = new BackupsService(config, database);
    try {
      service.onApplicationBootstrap();
      vi.advanceTimersByTime(5 * 60_000 - 1);
      expect(copyNames(config.backup.dir)).toEqual([]);
      vi.advanceTimersByTime(1);
      await vi.waitFor(() => expect(copyNames(config.backup.dir)).toHaveLength(1), { timeout: 10_000 });
      await vi.waitFor(() => expect(service.list().copies[0]?.check?.ok).toBe(true), { timeout: 10_000 });
    } finally {
      service.onApplicationShutdown();
      database.sqlite.close();
    }
  });

  it('turns the schedule off at 0 minutes', () => {
    const dataDir = mkdtempSync(path.join(tmpdir(), 'steadyhand-backups-'));
    const config = loadConfig({ DATA_DIR: dataDir, BACKUP_INTERVAL_MINUTES: '0', LOG_LEVEL: 'silent' });
    const database = openDatabase(config.databaseFile, config.migrationsDir);
    vi.useFakeTimers({ toFake: ['setInterval', 'clearInterval'] });
    const service = new BackupsService(config, database);
    service.onApplicationBootstrap();
    vi.advanceTimersByTime(24 * 60 * 60_000);
    expect(existsSync(config.backup.dir)).toBe(false);
    service.onApplicationShutdown();
    database.sqlite.close();
  });

  it('sees a database open in this process as in use, and a closed one as free', () => {
    const file = path.join(mkdtempSync(path.join(tmpdir(), 'steadyhand-inuse-')), 'steadyhand.db');
    const database = openDatabase(file, loadConfig({ DATA_DIR: path.dirname(file) }).migrationsDir);
    expect(databaseInUse(file)).toBe(true);
    database.sqlite.close();
    expect(databaseInUse(file)).toBe(false);
    expect(databaseInUse(path.join(path.dirname(file), 'none.db'))).toBe(false);
  });
});
