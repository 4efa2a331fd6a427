import type { NewEntry, StoredEntryFields, EntryKind } from './entries.js';
import { AMENDABLE_FIELDS, entrySchemaByKind, unamendableReason } from './entries.js';

/**
 * An entry as a screen knows it: stored ones carry the server's fields; an entry still in a
 * device's outbox does not yet.
 */
export type LogEntry = NewEntry & Partial<StoredEntryFields>;

export type ClinicalKind = Exclude<EntryKind, 'void' | 'amend'>;
export type ClinicalEntry = Extract<LogEntry, { kind: ClinicalKind }>;

export interface AppliedAmendment {
  id: string;
  at: string;
  reason: string;
  changes: Record<string, unknown>;
  userId?: string;
}

/** A clinical entry with every later correction applied; the original stays beside it. */
export type EffectiveEntry = ClinicalEntry & {
  original: ClinicalEntry;
  amendments: AppliedAmendment[];
  voided: { id: string; at: string; reason: string; userId?: string } | null;
};

export function entryTimeMs(entry: { at: string }): number {
  return Date.parse(entry.at);
}

/**
 * Log order: when it happened (`at`), then the server's order, then the device's sequence.
 * Two devices recording one code merge by `at`.
 */
export function compareLogOrder(a: LogEntry, b: LogEntry): number {
  const byTime = entryTimeMs(a) - entryTimeMs(b);
  if (byTime !== 0) return byTime;
  const ca = a.cursor ?? Number.MAX_SAFE_INTEGER;
  const cb = b.cursor ?? Number.MAX_SAFE_INTEGER;
  if (ca !== cb) return ca - cb;
  return (a.seq ?? 0) - (b.seq ?? 0);
}

/** Order in which corrections are applied: the server's order, outbox entries last. */
function compareWriteOrder(a: LogEntry, b: LogEntry): number {
  const ca = a.cursor ?? Number.MAX_SAFE_INTEGER;
  const cb = b.cursor ?? Number.MAX_SAFE_INTEGER;
  if (ca !== cb) return ca - cb;
  return entryTimeMs(a) - entryTimeMs(b);
}

/**
 * Applies an amendment's changes to an entry and checks the result is still a valid entry of
 * the same kind. Only the kind's own clinical fields and `at` may change: who wrote an entry,
 * when the server stored it and whether it was an addendum are the server's, never a correction's.
 * Returns the amended entry, or an error message.
 */
export function amendEntry(
  target: ClinicalEntry,
  changes: Record<string, unknown>,
): { ok: true; entry: ClinicalEntry } | { ok: false; error: string } {
  const allowed = AMENDABLE_FIELDS[target.kind];
  for (const field of Object.keys(changes)) {
    const why = unamendableReason(field);
    if (why) return { ok: false, error: why };
    if (!allowed.includes(field)) {
      return { ok: false, error: `${field} is not a field of a ${target.kind} entry (it has ${allowed.join(', ')})` };
    }
  }
  const merged = { ...target, ...changes };
  const schema = entrySchemaByKind[target.kind];
  const parsed = schema.safeParse(merged);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return { ok: false, error: `${issue?.path.join('.') || 'changes'}: ${issue?.message ?? 'invalid'}` };
  }
  // Keep the server's fields (cursor, recordedAt...) that the schema strips.
  return { ok: true, entry: { ...merged, ...(parsed.data as object) } };
}

/**
 * The fields of `changes` that hold what the entry says already (times compared as instants): an
 * amendment of those would print "was X, now X".
 */
export function unchangedFields(current: ClinicalEntry, changes: Record<string, unknown>): string[] {
  const now = current as Record<string, unknown>;
  return Object.keys(changes).filter((field) => {
    const next = changes[field];
    if (field === 'at') return typeof next === 'string' && Date.parse(next) === Date.parse(current.at);
    return JSON.stringify(next) === JSON.stringify(now[field]);
  });
}

/**
 * The log as it now reads: clinical entries in log order, with voids and amendments applied.
 * Voided entries stay in the list, marked, so nothing is hidden; computations skip them.
 * Voiding an amendment takes that amendment back.
 */
export function effectiveEntries(entries: readonly LogEntry[]): EffectiveEntry[] {
  const corrections = entries
    .filter((e): e is Extract<LogEntry, { kind: 'void' | 'amend' }> => e.kind === 'void' || e.kind === 'amend')
    .sort(compareWriteOrder);

  const voidedIds = new Map<string, { id: string; at: string; reason: string; userId?: string }>();
  for (const c of corrections) {
    if (c.kind === 'void' && !voidedIds.has(c.target)) {
      voidedIds.set(c.target, { id: c.id, at: c.at, reason: c.reason, userId: c.userId });
    }
  }

  const byId = new Map<string, EffectiveEntry>();
  const result: EffectiveEntry[] = [];
  for (const e of entries) {
    if (e.kind === 'void' || e.kind === 'amend') continue;
    if (byId.has(e.id)) continue; // a repeat of the same tap counts once
    const eff: EffectiveEntry = { ...e, original: e, amendments: [], voided: voidedIds.get(e.id) ?? null };
    byId.set(e.id, eff);
    result.push(eff);
  }

  for (const c of corrections) {
    if (c.kind !== 'amend' || voidedIds.has(c.id)) continue;
    const current = byId.get(c.target);
    if (!current) continue;
    const { original, amendments, voided, ...currentEntry } = current;
    const applied = amendEntry(currentEntry, c.changes);
    if (!applied.ok) continue;
    const next: EffectiveEntry = {
      ...applied.entry,
      original,
      voided,
      amendments: [...amendments, { id: c.id, at: c.at, reason: c.reason, changes: c.changes, userId: c.userId }],
    };
    byId.set(c.target, next);
    const idx = result.findIndex((r) => r.id === c.target);
    result[idx] = next;
  }

  // Parse each time once rather than inside the comparator: this runs every second on every screen.
  const times = new Map(result.map((e) => [e.id, entryTimeMs(e)]));
  return result.sort((a, b) => (times.get(a.id) ?? 0) - (times.get(b.id) ?? 0) || compareLogOrder(a, b));
}

/** Effective entries that count: not voided. */
export function liveEntries(entries: readonly LogEntry[]): EffectiveEntry[] {
  return effectiveEntries(entries).filter((e) => e.voided === null);
}
