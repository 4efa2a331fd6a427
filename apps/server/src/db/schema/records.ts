import { index, integer, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { codes } from './codes.js';
import { users } from './users.js';

/**
 * Electronic signatures on a code record. Each one names the signer, the meaning and the time,
 * and carries the digest of the canonical record it signed plus the server's Ed25519 signature
 * over (record id, digest, signer, meaning, time), so it cannot be moved to another record.
 */
export const signatures = sqliteTable(
  'signatures',
  {
    id: text('id').primaryKey(),
    codeId: text('code_id')
      .notNull()
      .references(() => codes.id),
    userId: text('user_id')
      .notNull()
      .references(() => users.id),
    printedName: text('printed_name').notNull(),
    meaning: text('meaning', { enum: ['recorded-by', 'reviewed-confirmed'] }).notNull(),
    signedAt: text('signed_at').notNull(),
    recordDigest: text('record_digest').notNull(),
    serverSignature: text('server_signature').notNull(),
    /**
     * The server key that made `serverSignature` (its id in DATA_DIR/keys, GET /api/records/public-keys).
     * Null for signatures stored before keys were rotated: those were made by the first key.
     */
    keyId: text('key_id'),
  },
  (t) => [index('signatures_code_idx').on(t.codeId)],
);

/** Monitor strips and photos of paper notes, stored on disk under their SHA-256. */
export const attachments = sqliteTable(
  'attachments',
  {
    id: text('id').primaryKey(),
    codeId: text('code_id')
      .notNull()
      .references(() => codes.id),
    sha256: text('sha256').notNull(),
    filename: text('filename').notNull(),
    mediaType: text('media_type').notNull(),
    sizeBytes: integer('size_bytes').notNull(),
    uploadedBy: text('uploaded_by')
      .notNull()
      .references(() => users.id),
    uploadedAt: text('uploaded_at').notNull(),
  },
  (t) => [index('attachments_code_idx').on(t.codeId)],
);

/** Every message handed to the mail relay, for the development outbox page and the audit. */
export const mailLog = sqliteTable('mail_log', {
  id: integer('id').primaryKey({ autoIncrement: true }),
  sentAt: text('sent_at').notNull(),
  to: text('to').notNull(),
  subject: text('subject').notNull(),
  codeId: text('code_id'),
  messageId: text('message_id'),
  status: text('status').notNull(),
  error: text('error'),
});
