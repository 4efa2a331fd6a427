import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import * as schema from './schema/index.js';

export type Db = BetterSQLite3Database<typeof schema>;
export interface DatabaseHandle {
  sqlite: Database.Database;
  db: Db;
}

export const BUSY_TIMEOUT_MS = 5000;

/**
 * The settings every connection must have. better-sqlite3 reopens a WAL file with
 * synchronous=NORMAL, which can lose the last commits on power loss, so they are set and then
 * read back at every open, not only when the file is created.
 */
export const REQUIRED_PRAGMAS = {
  journal_mode: 'wal',
  synchronous: 2, // FULL
  foreign_keys: 1,
  busy_timeout: BUSY_TIMEOUT_MS,
} as const;

export function applyPragmas(sqlite: Database.Database): void {
  sqlite.pragma('journal_mode = WAL');
  sqlite.pragma('synchronous = FULL');
  sqlite.pragma('foreign_keys = ON');
  sqlite.pragma(`busy_timeout = ${BUSY_TIMEOUT_MS}`);
  const actual = readPragmas(sqlite);
  for (const [name, expected] of Object.entries(REQUIRED_PRAGMAS)) {
    if (actual[name as keyof typeof REQUIRED_PRAGMAS] !== expected) {
      throw new Error(`SQLite pragma ${name} is ${String(actual[name as keyof typeof actual])}, expected ${expected}`);
    }
  }
}

export function readPragmas(sqlite: Database.Database): Record<keyof typeof REQUIRED_PRAGMAS, string | number> {
  return {
    journal_mode: sqlite.pragma('journal_mode', { simple: true }) as string,
    synchronous: sqlite.pragma('synchronous', { simple: true }) as number,
    foreign_keys: sqlite.pragma('foreign_keys', { simple: true }) as number,
    busy_timeout: sqlite.pragma('busy_timeout', { simple: true }) as number,
  };
}

/** Opens the database file, checks its settings and brings its tables up to date. */
export function openDatabase(file: string, migrationsDir: string): DatabaseHandle {
  const sqlite = new Database(file);
  try {
    applyPragmas(sqlite);
    const db = drizzle(sqlite, { schema });
    migrate(db, { migrationsFolder: migrationsDir });
    return { sqlite, db };
  } catch (err) {
    sqlite.close();
    throw err;
  }
}
