import { z } from 'zod';
import { textSchema } from './text.js';
import {
  COMPRESSION_FRACTION_EDGES,
  histogram,
  quantileSummary,
  RATE_METHOD,
  rateWithInterval,
  shareOf,
  type HistogramBin,
  type QuantileSummary,
  type RateWithInterval,
  type Share,
} from './aggregate.js';
import type { CodeCategory } from './codes.js';
import { OUTCOMES, RHYTHMS, type Outcome, type Rhythm } from './entries.js';
import { evaluateTargetInputs, QUALITY_TARGET_IDS, type QualityTargetId, type TargetInputs, type TargetResult } from './quality-targets.js';
import type { CodeSummary } from './summary.js';
import type { FollowUp, SurvivalToDischarge, UtsteinDetails } from './utstein.js';

export * from './quality-targets.js';
export * from './aggregate.js';
export * from './utstein-csv.js';
export * from './fhir-bundle.js';

/** The quality reviewer's REST contract (docs/api.md, "Quality review"). */

export const QUALITY_SORT_FIELDS = [
  'arrestAt',
  'unit',
  'firstRhythm',
  'outcome',
  'durationSeconds',
  'toFirstShockSeconds',
  'toFirstEpinephrineSeconds',
  'compressionFraction',
  'targetsMissed',
] as const;
export type QualitySortField = (typeof QUALITY_SORT_FIELDS)[number];

const day = z.iso.date({ message: 'must be a date, YYYY-MM-DD' });

/** Filters shared by the list, the stats and the CSV export. `to` is inclusive (the whole day, UTC). */
export const qualityFilterSchema = z
  .object({
    from: day.optional(),
    to: day.optional(),
    unitId: textSchema().trim().min(1).max(64).optional(),
    firstRhythm: z.enum([...RHYTHMS, 'none']).optional(),
    outcome: z.enum(OUTCOMES).optional(),
    /** `any`: at least one target missed; a target id: that target missed. */
    missed: z.enum(['any', ...QUALITY_TARGET_IDS]).optional(),
  })
  .refine((f) => !f.from || !f.to || f.from <= f.to, { message: 'from must not be after to', path: ['from'] });
export type QualityFilter = z.infer<typeof qualityFilterSchema>;

export const qualityListQuerySchema = z
  .object({
    from: day.optional(),
    to: day.optional(),
    unitId: textSchema().trim().min(1).max(64).optional(),
    firstRhythm: z.enum([...RHYTHMS, 'none']).optional(),
    outcome: z.enum(OUTCOMES).optional(),
    missed: z.enum(['any', ...QUALITY_TARGET_IDS]).optional(),
    sort: z.enum(QUALITY_SORT_FIELDS).default('arrestAt'),
    dir: z.enum(['asc', 'desc']).default('desc'),
    page: z.coerce.number().int().min(1, 'page starts at 1').max(100000).default(1),
    pageSize: z.coerce.number().int().min(1).max(200, 'pageSize is at most 200').default(25),
  })
  .refine((f) => !f.from || !f.to || f.from <= f.to, { message: 'from must not be after to', path: ['from'] });
export type QualityListQuery = z.infer<typeof qualityListQuerySchema>;

export interface QualityListItem {
  codeId: string;
  arrestAt: string;
  unitId: string | null;
  unitName: string | null;
  location: string | null;
  category: CodeCategory;
  firstRhythm: Rhythm | null;
  outcome: Outcome | null;
  anyRosc: boolean;
  /** Null when the code ended before 20 min of ROSC could be observed. */
  sustainedRosc: boolean | null;
  durationSeconds: number | null;
  toFirstShockSeconds: number | null;
  toFirstEpinephrineSeconds: number | null;
  compressionFraction: number | null;
  maxPreShockPauseSeconds: number | null;
  targetsMissed: QualityTargetId[];
  /** The record carries at least one signature (then the FHIR export is open). */
  recordSigned: boolean;
  /** When a reviewer signed the quality review off; null while open. */
  reviewedAt: string | null;
}

export interface QualityUnit {
  id: string;
  name: string;
}

export interface QualityListResponse {
  items: QualityListItem[];
  total: number;
  page: number;
  pageSize: number;
  /** Every unit, for the filter. */
  units: QualityUnit[];
}

export const qualityReviewSchema = z
  .object({
    notes: textSchema().max(10000).nullable().optional(),
    debriefPoints: z.array(textSchema().trim().min(1, 'a debrief point cannot be empty').max(500)).max(50).optional(),
  })
  .strict()
  .refine((v) => v.notes !== undefined || v.debriefPoints !== undefined, 'Send notes or debriefPoints');
export type QualityReviewRequest = z.infer<typeof qualityReviewSchema>;

export const qualitySignOffSchema = z
  .object({ password: textSchema().min(1, 'password is required').max(1024) })
  .strict();
export type QualitySignOffRequest = z.infer<typeof qualitySignOffSchema>;

export interface QualityReview {
  notes: string | null;
  debriefPoints: string[];
  /** The record's own debrief notes, from the team at review. */
  teamDebriefNotes: string | null;
  reviewedBy: { id: string; displayName: string } | null;
  reviewedAt: string | null;
  updatedAt: string | null;
}

export interface QualityCodeDetail {
  code: {
    id: string;
    status: 'active' | 'ended';
    category: CodeCategory;
    location: string | null;
    unitId: string | null;
    unitName: string | null;
    arrestAt: string;
    endedAt: string | null;
    outcome: Outcome | null;
  };
  summary: CodeSummary;
  targets: TargetResult[];
  review: QualityReview;
  signatures: { printedName: string; meaning: string; signedAt: string }[];
  /** The registry details as they read now (signed ones with their addenda applied). */
  utstein: UtsteinDetails;
  followUp: FollowUp;
}

/** `GET /api/quality/follow-up`: ended codes still waiting for their follow-up, oldest arrest first. */
export const followUpListQuerySchema = z
  .object({
    unitId: textSchema().trim().min(1).max(64).optional(),
    page: z.coerce.number().int().min(1, 'page starts at 1').max(100000).default(1),
    pageSize: z.coerce.number().int().min(1).max(200, 'pageSize is at most 200').default(50),
  })
  .strict();
export type FollowUpListQuery = z.infer<typeof followUpListQuerySchema>;

export interface FollowUpListItem {
  codeId: string;
  arrestAt: string;
  /** Whole days from the arrest to the moment of the answer (UTC). */
  daysSinceArrest: number;
  unitId: string | null;
  unitName: string | null;
  location: string | null;
  outcome: Outcome | null;
  anyRosc: boolean;
  followUp: FollowUp;
}

export interface FollowUpListResponse {
  items: FollowUpListItem[];
  total: number;
  page: number;
  pageSize: number;
  units: QualityUnit[];
}

// --- across codes ---

/** One code's stored numbers, as the stats need them. */
export interface QualityMetricsRow extends TargetInputs {
  arrestAt: string;
  unitId: string | null;
  unitName: string | null;
  durationSeconds: number | null;
  toCompressionsSeconds: number | null;
  /** From the follow-up; null when not entered. */
  survivalToDischarge: SurvivalToDischarge | null;
  followUpComplete: boolean;
}

export const QUALITY_INTERVALS = ['toCompressionsSeconds', 'toFirstShockSeconds', 'toFirstEpinephrineSeconds', 'durationSeconds'] as const;
export type QualityInterval = (typeof QUALITY_INTERVALS)[number];

export const QUALITY_INTERVAL_LABELS: Record<QualityInterval, string> = {
  toCompressionsSeconds: 'Arrest to first compressions',
  toFirstShockSeconds: 'Arrest to first shock',
  toFirstEpinephrineSeconds: 'Arrest to first epinephrine',
  durationSeconds: 'Duration of the event',
};

export interface QualityGroupStats {
  /** "2026-03" for a month (UTC), or the unit id ("" for no unit). */
  key: string;
  label: string;
  codes: number;
  intervals: Record<QualityInterval, QuantileSummary>;
  compressionFraction: QuantileSummary;
  targets: Record<QualityTargetId, Share>;
  /** Any ROSC, of every code in the group (always known), with its 95% Wilson interval. */
  rosc: RateWithInterval;
  /** Survival to hospital discharge, of the codes whose answer is known (yes or no). */
  survivalToDischarge: RateWithInterval;
  /** Codes whose follow-up is complete, of every code in the group. */
  followUpComplete: { complete: number; codes: number; share: number | null };
}

export interface QualityStats {
  overall: QualityGroupStats;
  byMonth: QualityGroupStats[];
  byUnit: QualityGroupStats[];
  compressionFractionBins: HistogramBin[];
  quantileMethod: string;
  /** How the rates' confidence intervals are computed (the page says so). */
  rateMethod: string;
}

export const QUANTILE_METHOD =
  'Median and quartiles by linear interpolation between closest ranks (Hyndman-Fan type 7, as R, NumPy and Excel PERCENTILE.INC).';

function groupStats(key: string, label: string, rows: readonly QualityMetricsRow[]): QualityGroupStats {
  const evaluated = rows.map((r) => evaluateTargetInputs(r));
  const targets = Object.fromEntries(
    QUALITY_TARGET_IDS.map((id) => [id, shareOf(evaluated.map((list) => list.find((t) => t.id === id)?.met ?? null))]),
  ) as Record<QualityTargetId, Share>;
  const intervals = Object.fromEntries(QUALITY_INTERVALS.map((k) => [k, quantileSummary(rows.map((r) => r[k]))])) as Record<QualityInterval, QuantileSummary>;
  const complete = rows.filter((r) => r.followUpComplete).length;
  return {
    key,
    label,
    codes: rows.length,
    intervals,
    compressionFraction: quantileSummary(rows.map((r) => r.compressionFraction)),
    targets,
    rosc: rateWithInterval(rows.map((r) => r.anyRosc)),
    survivalToDischarge: rateWithInterval(rows.map((r) => (r.survivalToDischarge === 'yes' ? true : r.survivalToDischarge === 'no' ? false : null))),
    followUpComplete: { complete, codes: rows.length, share: rows.length === 0 ? null : complete / rows.length },
  };
}

const pct = (from: number, to: number) => `${Math.round(from * 100)}-${Math.round(to * 100)}%`;

/** Medians, quartiles and target shares overall, by month (UTC) and by unit. */
export function aggregateQuality(rows: readonly QualityMetricsRow[]): QualityStats {
  const byMonth = new Map<string, QualityMetricsRow[]>();
  const byUnit = new Map<string, { label: string; rows: QualityMetricsRow[] }>();
  for (const r of rows) {
    const month = r.arrestAt.slice(0, 7);
    const list = byMonth.get(month) ?? [];
    list.push(r);
    byMonth.set(month, list);
    const unitKey = r.unitId ?? '';
    const unit = byUnit.get(unitKey) ?? { label: r.unitName ?? 'No unit recorded', rows: [] };
    unit.rows.push(r);
    byUnit.set(unitKey, unit);
  }
  return {
    overall: groupStats('all', 'All codes', rows),
    byMonth: [...byMonth.entries()].sort(([a], [b]) => a.localeCompare(b)).map(([k, list]) => groupStats(k, k, list)),
    byUnit: [...byUnit.entries()].sort(([, a], [, b]) => a.label.localeCompare(b.label)).map(([k, u]) => groupStats(k, u.label, u.rows)),
    compressionFractionBins: histogram(rows.map((r) => r.compressionFraction), COMPRESSION_FRACTION_EDGES, pct),
    quantileMethod: QUANTILE_METHOD,
    rateMethod: RATE_METHOD,
  };
}
