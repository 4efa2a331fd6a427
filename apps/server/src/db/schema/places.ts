import { integer, sqliteTable, text } from 'drizzle-orm/sqlite-core';

/** Key-value settings edited by admins (facility name, the protocol). Values are JSON. */
export const settings = sqliteTable('settings', {
  key: text('key').primaryKey(),
  value: text('value', { mode: 'json' }).notNull(),
  updatedAt: text('updated_at').notNull(),
  updatedBy: text('updated_by'),
});

export const units = sqliteTable('units', {
  id: text('id').primaryKey(),
  name: text('name').notNull().unique(),
  active: integer('active', { mode: 'boolean' }).notNull().default(true),
  createdAt: text('created_at').notNull(),
});
