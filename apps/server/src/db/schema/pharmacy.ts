import { index, integer, primaryKey, real, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { codes } from './codes.js';
import { users } from './users.js';

/** A named code-cart drug tray: what it holds, in what strength and how many. */
export const trayTemplates = sqliteTable('tray_templates', {
  id: text('id').primaryKey(),
  name: text('name').notNull().unique(),
  active: integer('active', { mode: 'boolean' }).notNull().default(true),
  createdAt: text('created_at').notNull(),
  updatedAt: text('updated_at').notNull(),
});

export const trayItems = sqliteTable(
  'tray_items',
  {
    id: text('id').primaryKey(),
    trayId: text('tray_id')
      .notNull()
      .references(() => trayTemplates.id, { onDelete: 'cascade' }),
    /** Catalogue key of the drug (protocol drugs), or free text for others. */
    drugKey: text('drug_key').notNull(),
    label: text('label').notNull(),
    /** Amount of drug in one unit (vial, syringe, ampoule), in `strengthUnit`. */
    strengthAmount: real('strength_amount').notNull(),
    strengthUnit: text('strength_unit').notNull(),
    /** Volume of one unit in mL, when it matters (e.g. 1 mg in 10 mL). */
    volumeMl: real('volume_ml'),
    quantity: integer('quantity').notNull(),
    controlled: integer('controlled', { mode: 'boolean' }).notNull().default(false),
    sortOrder: integer('sort_order').notNull().default(0),
    /** Lot number and expiry date (YYYY-MM-DD) of the units now on the tray, when known. */
    lot: text('lot'),
    expiry: text('expiry'),
  },
  (t) => [index('tray_items_tray_idx').on(t.trayId)],
);

/** Which tray each unit's cart carries. */
export const unitTrays = sqliteTable(
  'unit_trays',
  {
    unitId: text('unit_id').notNull(),
    trayId: text('tray_id')
      .notNull()
      .references(() => trayTemplates.id),
  },
  (t) => [primaryKey({ columns: [t.unitId] })],
);

/** The pharmacist's reconciliation of one code's drugs against the tray. */
export const reconciliations = sqliteTable('reconciliations', {
  codeId: text('code_id')
    .primaryKey()
    .references(() => codes.id),
  trayId: text('tray_id'),
  status: text('status', { enum: ['draft', 'signed'] }).notNull(),
  notes: text('notes'),
  startedBy: text('started_by')
    .notNull()
    .references(() => users.id),
  startedAt: text('started_at').notNull(),
  updatedAt: text('updated_at').notNull(),
  signedBy: text('signed_by').references(() => users.id),
  signedAt: text('signed_at'),
});

/** Per tray item (or drug): units opened, wasted with a witness, lot numbers. */
export const reconciliationLines = sqliteTable(
  'reconciliation_lines',
  {
    id: text('id').primaryKey(),
    codeId: text('code_id')
      .notNull()
      .references(() => reconciliations.codeId),
    trayItemId: text('tray_item_id'),
    drugKey: text('drug_key').notNull(),
    unitsOpened: integer('units_opened').notNull().default(0),
    unitsWasted: integer('units_wasted').notNull().default(0),
    wasteWitness: text('waste_witness'),
    lotNumbers: text('lot_numbers'),
    note: text('note'),
  },
  (t) => [index('reconciliation_lines_code_idx').on(t.codeId)],
);

/** After sign-off a reconciliation changes only by addenda. Append-only. */
export const reconciliationAddenda = sqliteTable('reconciliation_addenda', {
  id: text('id').primaryKey(),
  codeId: text('code_id')
    .notNull()
    .references(() => reconciliations.codeId),
  at: text('at').notNull(),
  userId: text('user_id')
    .notNull()
    .references(() => users.id),
  text: text('text').notNull(),
  changes: text('changes', { mode: 'json' }).$type<Record<string, unknown>>(),
});
