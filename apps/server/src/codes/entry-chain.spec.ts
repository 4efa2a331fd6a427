import { createHash } from 'node:crypto';
import type { StoredEntry } from '@steadyhand/shared';
import canonicalize from 'canonicalize';
import { describe, expect, it } from 'vitest';
import { CHAIN_START, entryLinkHash, verifyEntryChain, type EntryLink } from './entry-chain.js';

const ZEROS = '0000000000000000000000000000000000000000000000000000000000000000';

function note(n: number, text = `note ${n}`): StoredEntry {
  const at = new Date(Date.UTC(2026, 2, 4, 7, 42, n)).toISOString();
  return { id: `e${n}`, kind: 'note', text, at, deviceId: 'tablet', seq: n, codeId: 'c1', userId: 'u1', cursor: 10 * n, receivedAt: at, recordedAt: at, addendum: false };
}

/** Computed here from the definition, not through the module under test. */
function hashOf(prevHash: string, entry: StoredEntry): string {
  return createHash('sha256').update(`${prevHash}\n${canonicalize(entry)!}`, 'utf8').digest('hex');
}

function chainOf(entries: StoredEntry[]): EntryLink[] {
  const links: EntryLink[] = [];
  let prevHash = ZEROS;
  entries.forEach((e, i) => {
    const hash = hashOf(prevHash, e);
    links.push({ entryId: e.id, position: i + 1, prevHash, hash });
    prevHash = hash;
  });
  return links;
}

const log = () => [1, 2, 3, 4, 5].map((n) => note(n));

describe('the entry chain', () => {
  it('starts from 64 zeros and hashes the previous hash, a newline and the RFC 8785 text of the stored entry', () => {
    expect(CHAIN_START).toBe(ZEROS);
    const entry = note(1);
    expect(entryLinkHash(ZEROS, entry)).toBe(hashOf(ZEROS, entry));
    // Key order does not matter; any changed field does.
    const reordered = Object.fromEntries(Object.entries(entry).reverse()) as StoredEntry;
    expect(entryLinkHash(ZEROS, reordered)).toBe(hashOf(ZEROS, entry));
    expect(entryLinkHash(ZEROS, { ...entry, cursor: 11 })).not.toBe(hashOf(ZEROS, entry));
  });

  it('is valid for an empty log and for a complete chain, with the last hash as its head', () => {
    expect(verifyEntryChain([], [])).toEqual({ valid: true, length: 0, head: null });
    const entries = log();
    const links = chainOf(entries);
    expect(verifyEntryChain(entries, links)).toEqual({ valid: true, length: 5, head: links[4]!.hash });
    // Rows in any order are walked in cursor and position order.
    expect(verifyEntryChain([...entries].reverse(), [...links].reverse())).toMatchObject({ valid: true, length: 5 });
  });

  it('finds an entry changed after it was written', () => {
    const entries = log();
    const links = chainOf(entries);
    entries[2] = { ...note(3), text: 'changed' } as StoredEntry;
    expect(verifyEntryChain(entries, links)).toEqual({
      valid: false,
      length: 5,
      head: links[4]!.hash,
      brokenAt: { position: 3, entryId: 'e3', reason: expect.stringMatching(/does not match its hash/) as unknown },
    });
  });

  it('finds a missing link at the end, and a gap in the positions', () => {
    const entries = log();
    const links = chainOf(entries);
    expect(verifyEntryChain(entries, links.slice(0, 4))).toMatchObject({ valid: false, length: 4, brokenAt: { position: 5, entryId: 'e5', reason: 'this entry has no link' } });
    expect(verifyEntryChain(entries, links.filter((l) => l.position !== 2))).toMatchObject({
      valid: false,
      brokenAt: { position: 2, entryId: 'e2', reason: 'the link positions skip from 1 to 3' },
    });
    expect(verifyEntryChain(entries, [])).toMatchObject({ valid: false, length: 0, head: null, brokenAt: { position: 1, entryId: 'e1' } });
  });

  it('finds a link naming another entry, a wrong previous hash, and a link past the end of the log', () => {
    const entries = log();
    const swapped = chainOf([entries[0]!, entries[2]!, entries[1]!, entries[3]!, entries[4]!]);
    expect(verifyEntryChain(entries, swapped)).toMatchObject({ valid: false, brokenAt: { position: 2, entryId: 'e2', reason: 'the link at this position names another entry (e3)' } });

    // A link whose own hash is consistent but that hangs off another predecessor.
    const links = chainOf(entries);
    const forged = 'f'.repeat(64);
    links[3] = { ...links[3]!, prevHash: forged, hash: hashOf(forged, entries[3]!) };
    expect(verifyEntryChain(entries, links)).toMatchObject({ valid: false, brokenAt: { position: 4, entryId: 'e4', reason: expect.stringMatching(/previous hash/) as unknown } });

    const extra = chainOf([...entries, note(6)]);
    expect(verifyEntryChain(entries, extra)).toMatchObject({ valid: false, length: 6, brokenAt: { position: 6, entryId: 'e6', reason: 'the link names an entry that is not in the log' } });
  });
});
