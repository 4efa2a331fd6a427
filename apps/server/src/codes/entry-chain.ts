import type { EntryChainBreak, EntryChainStatus, StoredEntry } from '@steadyhand/shared';
import { canonicalText, sha256Hex } from '../common/canonical-json.js';

/** The `prev_hash` of a code's first link. */
export const CHAIN_START = '0'.repeat(64);

/** One row of `entry_links`, as the chain check reads it. */
export interface EntryLink {
  entryId: string;
  position: number;
  prevHash: string;
  hash: string;
}

/**
 * SHA-256 over the previous hash, a newline and the RFC 8785 text of the stored entry exactly as
 * the canonical record holds it, so the chain and the record's digest read the same bytes.
 */
export function entryLinkHash(prevHash: string, entry: StoredEntry): string {
  return sha256Hex(`${prevHash}\n${canonicalText(entry)}`);
}

/**
 * Walks a code's entries in cursor order beside its links in position order: positions run
 * 1..n without gaps, each link names the entry at its position, its `prevHash` is the hash before
 * it and its hash recomputes from the entry. The first failure is reported.
 */
export function verifyEntryChain(entries: readonly StoredEntry[], links: readonly EntryLink[]): EntryChainStatus {
  const log = [...entries].sort((a, b) => a.cursor - b.cursor);
  const chain = [...links].sort((a, b) => a.position - b.position);
  const head = chain.length ? chain[chain.length - 1]!.hash : null;
  const broken = (brokenAt: EntryChainBreak): EntryChainStatus => ({ valid: false, length: chain.length, head, brokenAt });

  let prevHash = CHAIN_START;
  for (let i = 0; i < Math.max(log.length, chain.length); i++) {
    const position = i + 1;
    const entry = log[i];
    const link = chain[i];
    if (!link) return broken({ position, entryId: entry!.id, reason: 'this entry has no link' });
    if (link.position !== position) {
      return broken({ position, entryId: entry?.id ?? link.entryId, reason: `the link positions skip from ${position - 1} to ${link.position}` });
    }
    if (!entry) return broken({ position, entryId: link.entryId, reason: 'the link names an entry that is not in the log' });
    if (link.entryId !== entry.id) {
      return broken({ position, entryId: entry.id, reason: `the link at this position names another entry (${link.entryId})` });
    }
    if (link.prevHash !== prevHash) {
      return broken({ position, entryId: entry.id, reason: "the link's previous hash is not the hash of the link before it" });
    }
    if (entryLinkHash(prevHash, entry) !== link.hash) {
      return broken({ position, entryId: entry.id, reason: 'the stored entry does not match its hash: it changed after it was written' });
    }
    prevHash = link.hash;
  }
  return { valid: true, length: chain.length, head };
}
