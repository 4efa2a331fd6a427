import { mkdtempSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { describe, expect, it } from 'vitest';
import { REPO_ROOT } from '../config/config.js';
import { BUSY_TIMEOUT_MS, openDatabase, readPragmas } from './database.js';

const migrations = path.join(REPO_ROOT, 'drizzle');

function tempFile(): string {
  return path.join(mkdtempSync(path.join(tmpdir(), 'steadyhand-db-')), 'test.db');
}

describe('openDatabase', () => {
  it('sets WAL, synchronous=FULL, foreign keys and a busy timeout on a new file', () => {
    const file = tempFile();
    const { sqlite } = openDatabase(file, migrations);
    expect(readPragmas(sqlite)).toEqual({ journal_mode: 'wal', synchronous: 2, foreign_keys: 1, busy_timeout: BUSY_TIMEOUT_MS });
    sqlite.close();
  });

  it('sets them again when an existing WAL file is reopened (a plain reopen comes back with synchronous=NORMAL)', () => {
    const file = tempFile();
    openDatabase(file, migrations).sqlite.close();

    const plain = new Database(file);
    expect(plain.pragma('synchronous', { simple: true })).not.toBe(2);
    plain.close();

    const { sqlite } = openDatabase(file, migrations);
    expect(readPragmas(sqlite)).toEqual({ journal_mode: 'wal', synchronous: 2, foreign_keys: 1, busy_timeout: BUSY_TIMEOUT_MS });
    expect(sqlite.pragma('integrity_check', { simple: true })).toBe('ok');
    sqlite.close();
  });

  it('applies every migration once, so opening twice is harmless', () => {
    const file = tempFile();
    openDatabase(file, migrations).sqlite.close();
    const { sqlite } = openDatabase(file, migrations);
    const tables = sqlite.prepare("SELECT name FROM sqlite_master WHERE type = 'table' ORDER BY name").pluck().all();
    expect(tables).toEqual(expect.arrayContaining(['users', 'user_roles', 'sessions', 'codes', 'entries', 'audit_events']));
    sqlite.close();
  });

  it('refuses UPDATE and DELETE on the entry log and the audit trail', () => {
    const { sqlite } = openDatabase(tempFile(), migrations);
    const now = new Date().toISOString();
    sqlite.prepare("INSERT INTO users (id, username, display_name, password_hash, created_at, updated_at) VALUES ('u1', 'u', 'U', 'x', ?, ?)").run(now, now);
    sqlite.prepare("INSERT INTO codes (id, status, category, arrest_at, created_at, created_by) VALUES ('c1', 'active', 'adult', ?, ?, 'u1')").run(now, now);
    sqlite
      .prepare(
        "INSERT INTO entries (id, code_id, kind, at, at_ms, user_id, received_at, recorded_at, body) VALUES ('e1', 'c1', 'note', ?, 0, 'u1', ?, ?, '{}')",
      )
      .run(now, now, now);
    sqlite.prepare("INSERT INTO audit_events (at, action) VALUES (?, 'test')").run(now);

    expect(() => sqlite.prepare("UPDATE entries SET kind = 'rosc' WHERE id = 'e1'").run()).toThrow(/append-only/);
    expect(() => sqlite.prepare("DELETE FROM entries WHERE id = 'e1'").run()).toThrow(/append-only/);
    expect(() => sqlite.prepare("UPDATE audit_events SET action = 'x'").run()).toThrow(/append-only/);
    expect(() => sqlite.prepare('DELETE FROM audit_events').run()).toThrow(/append-only/);
    expect(sqlite.prepare('SELECT count(*) FROM entries').pluck().get()).toBe(1);
    sqlite.close();
  });
});
