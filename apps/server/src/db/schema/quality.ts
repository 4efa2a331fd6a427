import { index, integer, real, sqliteTable, text } from 'drizzle-orm/sqlite-core';
import { codes } from './codes.js';
import { users } from './users.js';

/** The quality reviewer's notes and sign-off on one code. */
export const qualityReviews = sqliteTable('quality_reviews', {
  codeId: text('code_id')
    .primaryKey()
    .references(() => codes.id),
  notes: text('notes'),
  debriefPoints: text('debrief_points', { mode: 'json' }).$type<string[]>(),
  reviewedBy: text('reviewed_by').references(() => users.id),
  reviewedAt: text('reviewed_at'),
  updatedAt: text('updated_at').notNull(),
});

/**
 * Metrics of each ended code, computed from its log when it changes, so the reviewer's list
 * filters and sorts a year of codes in SQL instead of recomputing thousands of summaries.
 */
export const codeMetrics = sqliteTable(
  'code_metrics',
  {
    codeId: text('code_id')
      .primaryKey()
      .references(() => codes.id),
    arrestAt: text('arrest_at').notNull(),
    unitId: text('unit_id'),
    category: text('category').notNull(),
    firstRhythm: text('first_rhythm'),
    outcome: text('outcome'),
    anyRosc: integer('any_rosc', { mode: 'boolean' }).notNull(),
    // Null: the code ended before 20 min of ROSC could be observed.
    sustainedRosc: integer('sustained_rosc', { mode: 'boolean' }),
    durationSeconds: real('duration_seconds'),
    toCompressionsSeconds: real('to_compressions_seconds'),
    toFirstShockSeconds: real('to_first_shock_seconds'),
    toFirstEpinephrineSeconds: real('to_first_epinephrine_seconds'),
    compressionFraction: real('compression_fraction'),
    longestPauseSeconds: real('longest_pause_seconds'),
    maxPreShockPauseSeconds: real('max_pre_shock_pause_seconds'),
    /** Names of the targets missed, comma separated, for filtering. */
    targetsMissed: text('targets_missed').notNull().default(''),
    targetsMissedCount: integer('targets_missed_count').notNull().default(0),
    computedAt: text('computed_at').notNull(),
  },
  (t) => [
    index('code_metrics_arrest_idx').on(t.arrestAt),
    index('code_metrics_unit_idx').on(t.unitId, t.arrestAt),
    index('code_metrics_rhythm_idx').on(t.firstRhythm, t.arrestAt),
  ],
);

