import { index, integer, primaryKey, sqliteTable, text } from 'drizzle-orm/sqlite-core';

export const users = sqliteTable('users', {
  id: text('id').primaryKey(),
  username: text('username').notNull().unique(),
  displayName: text('display_name').notNull(),
  passwordHash: text('password_hash').notNull(),
  mustChangePassword: integer('must_change_password', { mode: 'boolean' }).notNull().default(false),
  disabledAt: text('disabled_at'),
  createdAt: text('created_at').notNull(),
  updatedAt: text('updated_at').notNull(),
});

export const userRoles = sqliteTable(
  'user_roles',
  {
    userId: text('user_id')
      .notNull()
      .references(() => users.id, { onDelete: 'cascade' }),
    role: text('role', { enum: ['recorder', 'leader', 'pharmacist', 'reviewer', 'admin'] }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.role] })],
);

/** express-session rows; user_id is copied out of the data so sessions can be listed and ended per user. */
export const sessions = sqliteTable(
  'sessions',
  {
    sid: text('sid').primaryKey(),
    userId: text('user_id').references(() => users.id, { onDelete: 'cascade' }),
    data: text('data').notNull(),
    expiresAt: integer('expires_at').notNull(),
    createdAt: integer('created_at').notNull(),
    lastSeenAt: integer('last_seen_at').notNull(),
    userAgent: text('user_agent'),
  },
  (t) => [index('sessions_user_idx').on(t.userId), index('sessions_expires_idx').on(t.expiresAt)],
);

/**
 * Real password failures (a wrong sign-in, or a wrong password typed again to sign), by the
 * username typed (whether or not it exists) and the client address: the per-address lock, the
 * per-account limit and the back-off per account and address all count these rows.
 */
export const loginFailures = sqliteTable(
  'login_failures',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    username: text('username').notNull(),
    at: integer('at').notNull(),
    ip: text('ip'),
  },
  (t) => [
    index('login_failures_username_at_idx').on(t.username, t.at),
    index('login_failures_ip_at_idx').on(t.ip, t.at),
    index('login_failures_at_idx').on(t.at),
  ],
);

/**
 * Devices a person has signed in from (a random id in an HttpOnly cookie, kept here as its
 * SHA-256): the per-account limit does not hold them back, so failures from elsewhere cannot
 * lock the owner out of the device they use.
 */
export const knownDevices = sqliteTable(
  'known_devices',
  {
    deviceHash: text('device_hash').notNull(),
    /** The username as typed at sign-in, lower-cased (the key the failures use). */
    username: text('username').notNull(),
    lastSeenAt: integer('last_seen_at').notNull(),
  },
  (t) => [primaryKey({ columns: [t.deviceHash, t.username] })],
);

