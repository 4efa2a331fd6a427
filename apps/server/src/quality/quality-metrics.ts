import { evaluateTargets, missedTargets, summarize, targetInputsOf, type Timeline, type UtsteinDetails } from '@steadyhand/shared';
import type { codeMetrics } from '../db/schema/index.js';

export type CodeMetricsRow = typeof codeMetrics.$inferInsert;

/**
 * One ended code's row in `code_metrics`, from its folded log through the shared summary and targets
 * (with the registry details the targets read), so the list, the stats and the detail page agree.
 * Also used by bench/quality-list.mjs.
 */
export function computeCodeMetrics(
  code: { id: string; unitId: string | null; category: 'adult' | 'pediatric' },
  timeline: Timeline,
  details: UtsteinDetails = {},
  computedAt = new Date().toISOString(),
): CodeMetricsRow {
  const summary = summarize(timeline);
  const inputs = targetInputsOf(summary, details);
  const missed = missedTargets(evaluateTargets(summary, details));
  return {
    codeId: code.id,
    arrestAt: summary.times.arrestAt,
    unitId: code.unitId,
    category: code.category,
    firstRhythm: summary.firstRhythm,
    witnessedOrMonitored: inputs.witnessedOrMonitored,
    outcome: summary.outcome,
    anyRosc: summary.anyRosc,
    sustainedRosc: summary.sustainedRosc,
    durationSeconds: summary.durationSeconds,
    toCompressionsSeconds: summary.intervals.arrestToFirstCompressions,
    toFirstShockSeconds: inputs.toFirstShockSeconds,
    toFirstEpinephrineSeconds: inputs.toFirstEpinephrineSeconds,
    compressionFraction: inputs.compressionFraction,
    longestPauseSeconds: summary.longestPause?.seconds ?? null,
    maxPreShockPauseSeconds: inputs.maxPreShockPauseSeconds,
    // Wrapped in commas so one target matches with LIKE '%,id,%' and never a longer id.
    targetsMissed: missed.length ? `,${missed.join(',')},` : '',
    targetsMissedCount: missed.length,
    computedAt,
  };
}

export function parseTargetsMissed(value: string): string[] {
  return value.split(',').filter(Boolean);
}
