import { index, integer, real, sqliteTable, text, uniqueIndex } from 'drizzle-orm/sqlite-core';
import { users } from './users.js';

export const codes = sqliteTable(
  'codes',
  {
    id: text('id').primaryKey(),
    status: text('status', { enum: ['active', 'ended'] }).notNull(),
    category: text('category', { enum: ['adult', 'pediatric'] }).notNull(),
    weightKg: real('weight_kg'),
    location: text('location'),
    unitId: text('unit_id'),
    patient: text('patient', { mode: 'json' }).$type<Record<string, unknown>>(),
    arrestAt: text('arrest_at').notNull(),
    createdAt: text('created_at').notNull(),
    createdBy: text('created_by')
      .notNull()
      .references(() => users.id),
    endedAt: text('ended_at'),
    outcome: text('outcome'),
    /** Who was in the team and in what role, completed at review. */
    team: text('team', { mode: 'json' }).$type<{ name: string; role: string }[]>(),
    debriefNotes: text('debrief_notes'),
    /** How the weight was obtained (measured, stated, length-based tape, estimated from age). */
    weightSource: text('weight_source'),
    /** The protocol version in force when the code started; null for codes started before versions (version 1). */
    protocolVersion: integer('protocol_version'),
    /** When adult/child was last switched during the code. */
    categoryChangedAt: text('category_changed_at'),
    /**
     * The facility name as it was at the record's first signature, so a later rename of the
     * facility leaves the signed record (and its signatures) as they were. Null until signed.
     */
    facilityName: text('facility_name'),
    /**
     * The registry details (Utstein) completed at review, as they stood at the first signature;
     * later changes are rows of `utstein_addenda`. Null while none were entered.
     */
    utstein: text('utstein', { mode: 'json' }).$type<Record<string, unknown>>(),
  },
  (t) => [index('codes_status_idx').on(t.status, t.arrestAt)],
);

/**
 * Changes to a signed record's registry details, each with its old and new values, who and when.
 * Append-only (triggers); part of the canonical record and counted by its seal.
 */
export const utsteinAddenda = sqliteTable(
  'utstein_addenda',
  {
    id: text('id').primaryKey(),
    codeId: text('code_id')
      .notNull()
      .references(() => codes.id),
    recordedAt: text('recorded_at').notNull(),
    userId: text('user_id')
      .notNull()
      .references(() => users.id),
    userName: text('user_name').notNull(),
    /** `{field: {from, to}}`, null for a value not entered. */
    changes: text('changes', { mode: 'json' }).notNull().$type<Record<string, { from: unknown; to: unknown }>>(),
  },
  (t) => [index('utstein_addenda_code_idx').on(t.codeId, t.recordedAt)],
);

/**
 * The entry log. Append-only (triggers refuse UPDATE and DELETE); `cursor` orders every write in
 * the database and is what a screen sends back to catch up; `id` is made on the device, so a
 * resent tap finds its stored row instead of making a second one.
 */
export const entries = sqliteTable(
  'entries',
  {
    cursor: integer('cursor').primaryKey({ autoIncrement: true }),
    id: text('id').notNull().unique(),
    codeId: text('code_id')
      .notNull()
      .references(() => codes.id),
    kind: text('kind').notNull(),
    at: text('at').notNull(),
    atMs: integer('at_ms').notNull(),
    deviceId: text('device_id'),
    seq: integer('seq'),
    offsetMs: real('offset_ms'),
    offsetUncertaintyMs: real('offset_uncertainty_ms'),
    userId: text('user_id')
      .notNull()
      .references(() => users.id),
    receivedAt: text('received_at').notNull(),
    recordedAt: text('recorded_at').notNull(),
    addendum: integer('addendum', { mode: 'boolean' }).notNull().default(false),
    /** The writer's display name when the entry was stored (null on entries stored before names were kept). */
    userName: text('user_name'),
    /** The entry as validated, kind-specific fields included. */
    body: text('body', { mode: 'json' }).notNull().$type<Record<string, unknown>>(),
  },
  (t) => [index('entries_code_cursor_idx').on(t.codeId, t.cursor)],
);

/**
 * The entry log chained by hash, one link per entry. Append-only (triggers). A link's hash is
 * SHA-256 of `prev_hash + "\n" + ` the RFC 8785 text of the stored entry as the canonical record
 * holds it; the first link of a code has 64 zeros as `prev_hash`. One position per code, so the
 * chain cannot fork.
 */
export const entryLinks = sqliteTable(
  'entry_links',
  {
    entryId: text('entry_id')
      .primaryKey()
      .references(() => entries.id),
    codeId: text('code_id')
      .notNull()
      .references(() => codes.id),
    /** 1..n per code, in cursor order. */
    position: integer('position').notNull(),
    prevHash: text('prev_hash').notNull(),
    hash: text('hash').notNull(),
  },
  (t) => [uniqueIndex('entry_links_code_position_idx').on(t.codeId, t.position)],
);

/**
 * One seal per code: the server's HMAC-SHA256 (key in DATA_DIR/keys, never in the database) over
 * what the record is made of: the entry chain's length and head, the number of signatures and a
 * digest of the attachment list. Rewritten (never with a stale state) each time one of them grows,
 * so a recomputed chain, a removed last entry, signature or attachment shows even on an
 * unsigned record. Not append-only: the MAC, not a trigger, is what protects it.
 */
export const recordSeals = sqliteTable('record_seals', {
  codeId: text('code_id')
    .primaryKey()
    .references(() => codes.id),
  entries: integer('entries').notNull(),
  head: text('head').notNull(),
  signatures: integer('signatures').notNull(),
  attachments: text('attachments').notNull(),
  /** SHA-256 of the registry-details addenda; null while there are none (the MAC leaves it out then). */
  detailAddenda: text('detail_addenda'),
  mac: text('mac').notNull(),
  sealedAt: text('sealed_at').notNull(),
});
