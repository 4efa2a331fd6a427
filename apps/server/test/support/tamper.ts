import { createHash } from 'node:crypto';
import type { StoredEntry } from '@steadyhand/shared';
import canonicalize from 'canonicalize';
import type Database from 'better-sqlite3';

/** Runs `work` with the named triggers dropped, then puts them back exactly as the migrations made them. */
export function withoutTriggers(sqlite: Database.Database, names: string[], work: () => void): void {
  const saved = names.map((name) => {
    const sql = sqlite.prepare("SELECT sql FROM sqlite_master WHERE type = 'trigger' AND name = ?").pluck().get(name) as string | undefined;
    if (!sql) throw new Error(`no trigger ${name}`);
    return sql;
  });
  for (const name of names) sqlite.exec(`DROP TRIGGER ${name}`);
  try {
    work();
  } finally {
    for (const sql of saved) sqlite.exec(sql);
  }
}

/** A link hash as anyone can compute it (no key): SHA-256 of the previous hash, a newline and the RFC 8785 text. */
export function linkHash(prevHash: string, entry: StoredEntry): string {
  return createHash('sha256').update(`${prevHash}\n${canonicalize(entry)!}`, 'utf8').digest('hex');
}

/**
 * Throws away a code's links and writes new ones over its entries as they are now: what someone
 * with write access to the database but without the server's keys can do to hide an edit.
 */
export function relinkChain(sqlite: Database.Database, codeId: string, entries: StoredEntry[]): void {
  withoutTriggers(sqlite, ['entry_links_refuse_delete'], () => {
    sqlite.prepare('DELETE FROM entry_links WHERE code_id = ?').run(codeId);
    let prev = '0'.repeat(64);
    entries.forEach((e, i) => {
      const hash = linkHash(prev, e);
      sqlite.prepare('INSERT INTO entry_links (entry_id, code_id, position, prev_hash, hash) VALUES (?, ?, ?, ?, ?)').run(e.id, codeId, i + 1, prev, hash);
      prev = hash;
    });
  });
}
