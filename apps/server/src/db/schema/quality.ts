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
    /** From the registry details: witnessed or monitored (1), neither (0), not known (null). */
    witnessedOrMonitored: integer('witnessed_or_monitored', { mode: 'boolean' }),
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


/**
 * The reviewer's follow-up of one code after the event: each answer with its date, and who
 * entered it and when. `complete`: nothing the code waits for is missing (shared followUpMissing).
 */
export const codeFollowUps = sqliteTable(
  'code_follow_ups',
  {
    codeId: text('code_id')
      .primaryKey()
      .references(() => codes.id),
    survivalToDischarge: text('survival_to_discharge'),
    survivalToDischargeDate: text('survival_to_discharge_date'),
    survivalToDischargeBy: text('survival_to_discharge_by').references(() => users.id),
    survivalToDischargeByName: text('survival_to_discharge_by_name'),
    survivalToDischargeAt: text('survival_to_discharge_at'),
    status30Days: text('status_30_days'),
    status30DaysDate: text('status_30_days_date'),
    status30DaysBy: text('status_30_days_by').references(() => users.id),
    status30DaysByName: text('status_30_days_by_name'),
    status30DaysAt: text('status_30_days_at'),
    neurologicalOutcome: text('neurological_outcome'),
    neurologicalOutcomeDate: text('neurological_outcome_date'),
    neurologicalOutcomeBy: text('neurological_outcome_by').references(() => users.id),
    neurologicalOutcomeByName: text('neurological_outcome_by_name'),
    neurologicalOutcomeAt: text('neurological_outcome_at'),
    complete: integer('complete', { mode: 'boolean' }).notNull().default(false),
    updatedAt: text('updated_at').notNull(),
  },
  (t) => [index('code_follow_ups_complete_idx').on(t.complete)],
);
