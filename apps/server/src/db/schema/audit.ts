import { index, integer, sqliteTable, text } from 'drizzle-orm/sqlite-core';

/** Who did what, when. Append-only: triggers in the migrations refuse UPDATE and DELETE. */
export const auditEvents = sqliteTable(
  'audit_events',
  {
    id: integer('id').primaryKey({ autoIncrement: true }),
    at: text('at').notNull(),
    userId: text('user_id'),
    username: text('username'),
    action: text('action').notNull(),
    codeId: text('code_id'),
    ip: text('ip'),
    detail: text('detail', { mode: 'json' }).$type<Record<string, unknown>>(),
  },
  (t) => [index('audit_at_idx').on(t.at), index('audit_user_idx').on(t.userId), index('audit_code_idx').on(t.codeId)],
);
