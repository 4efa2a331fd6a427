import { integer, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { users } from './users.js';

/**
 * Every saved version of the local protocol, never changed once written. A code keeps the
 * version in force when it started, so an admin's change never alters a past code's timers,
 * doses, summary or record.
 */
export const protocolVersions = sqliteTable('protocol_versions', {
  version: integer('version').primaryKey(),
  /** The settings as saved (JSON, the shared protocol schema of its day). */
  settings: text('settings', { mode: 'json' }).notNull().$type<unknown>(),
  savedAt: text('saved_at').notNull(),
  /** Null for the first version, made from the published defaults or the settings found at upgrade. */
  savedBy: text('saved_by').references(() => users.id),
});
