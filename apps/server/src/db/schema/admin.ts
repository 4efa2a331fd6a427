import { index, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { units } from './places.js';
import { users } from './users.js';

export const rooms = sqliteTable(
  'rooms',
  {
    id: text('id').primaryKey(),
    unitId: text('unit_id')
      .notNull()
      .references(() => units.id),
    name: text('name').notNull(),
    createdAt: text('created_at').notNull(),
  },
  (t) => [index('rooms_unit_idx').on(t.unitId)],
);

export const beds = sqliteTable(
  'beds',
  {
    id: text('id').primaryKey(),
    roomId: text('room_id')
      .notNull()
      .references(() => rooms.id),
    name: text('name').notNull(),
    createdAt: text('created_at').notNull(),
  },
  (t) => [index('beds_room_idx').on(t.roomId)],
);

/** A second factor (TOTP) for a person; the secret is encrypted with a key in DATA_DIR. */
export const userTotp = sqliteTable('user_totp', {
  userId: text('user_id')
    .primaryKey()
    .references(() => users.id),
  secretEncrypted: text('secret_encrypted').notNull(),
  enabledAt: text('enabled_at'),
  /** scrypt or SHA-256 hashes of unused recovery codes. */
  recoveryCodes: text('recovery_codes', { mode: 'json' }).$type<string[]>().notNull(),
  createdAt: text('created_at').notNull(),
});
