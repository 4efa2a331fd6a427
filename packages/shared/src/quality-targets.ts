import type { Rhythm } from './entries.js';
import type { CodeSummary } from './summary.js';
import { PRE_SHOCK_PAUSE_TARGET_SECONDS } from './summary.js';
import { witnessedOrMonitored, type UtsteinDetails } from './utstein.js';

/**
 * The resuscitation committee's targets, each with its rule and its source as the clinical
 * sheet gives them (shared/reference/clinical-reference.md sections 3 and 6). Evaluated from a
 * few numbers that the server also stores per code (`code_metrics`), so the list, the detail
 * page and the monthly shares all apply the same rule.
 */

export const QUALITY_TARGET_IDS = [
  'time-to-shock',
  'time-to-epinephrine',
  'compression-fraction',
  'pre-shock-pause',
] as const;
export type QualityTargetId = (typeof QUALITY_TARGET_IDS)[number];

export interface QualityTargetSettings {
  /** Defibrillation within this many seconds of the arrest, for VF/pVT. */
  shockSeconds: number;
  /** First epinephrine within this many seconds of the arrest, for PEA/asystole. */
  epinephrineSeconds: number;
  /** Compression fraction at least this (0 to 1). */
  compressionFraction: number;
  /** Every pre-shock pause shorter than this many seconds. */
  preShockPauseSeconds: number;
}

export const DEFAULT_QUALITY_TARGETS: QualityTargetSettings = {
  // Chan 2008 NEJM: "within 2 min" is the guideline basis (clinical sheet §6, confirmed primary, abstract).
  shockSeconds: 120,
  // Not a published adult target: the committee's local cut-off, set where Donnino 2014 BMJ's
  // survival odds start to fall (the 4-6 min band, sheet §6); AHA 2020 PALS gives "within 5 min"
  // for children (sheet §2, from memory).
  epinephrineSeconds: 300,
  // Meaney 2013 AHA consensus: CCF goal > 80% (sheet §3, confirmed secondary).
  compressionFraction: 0.8,
  // Common QI target < 10 s (Cheskes 2011; sheet §3, from memory).
  preShockPauseSeconds: PRE_SHOCK_PAUSE_TARGET_SECONDS,
};

/** What the targets are computed from: the summary's numbers, or a stored metrics row. */
export interface TargetInputs {
  firstRhythm: Rhythm | null;
  /**
   * From the registry details: true when the arrest was witnessed or monitored, false when it
   * was neither, null while not known (the time-to-shock target needs it).
   */
  witnessedOrMonitored: boolean | null;
  anyRosc: boolean;
  toFirstShockSeconds: number | null;
  toFirstEpinephrineSeconds: number | null;
  compressionFraction: number | null;
  /** The longest pre-shock pause; null when no shock fell in a recorded pause. */
  maxPreShockPauseSeconds: number | null;
}

export interface TargetResult {
  id: QualityTargetId;
  label: string;
  /** The rule in words, with this hospital's threshold. */
  rule: string;
  /** Where the rule comes from, and how sure the clinical sheet is of it. */
  source: string;
  /** Whether the rule applies to this code (e.g. time to shock only for a shockable first rhythm). */
  applies: boolean;
  /** Met or missed; null when it does not apply. */
  met: boolean | null;
  /** The code's value: seconds, or a ratio for the compression fraction; null when not recorded. */
  value: number | null;
  unit: 's' | 'ratio';
  /** Why it does not apply, or why it counts as missed without a value. */
  note: string | null;
}

const SHOCKABLE: readonly Rhythm[] = ['vf', 'pvt'];
const NONSHOCKABLE: readonly Rhythm[] = ['pea', 'asystole'];

const mmss = (s: number) => `${Math.floor(s / 60)}:${String(Math.round(s % 60)).padStart(2, '0')}`;

export const TARGET_SOURCES: Record<QualityTargetId, string> = {
  'time-to-shock':
    'Chan PS et al., NEJM 2008;358:9-17 (DOI 10.1056/NEJMoa0706467): defibrillation within 2 min of an in-hospital arrest from VF/pVT is the AHA guideline basis; delay beyond 2 min was linked to lower survival to discharge (22.2% vs 39.3%). Clinical sheet §6, confirmed (primary, abstract). Counting only witnessed or monitored arrests, whose start is known, is the committee\'s rule (common practice, no published source in our sheet).',
  'time-to-epinephrine':
    'No published source defines a 5-minute adult target: it is the committee\'s local cut-off. It is informed by Donnino MW et al., BMJ 2014;348:g3028, which compared time-to-epinephrine bands for a nonshockable first rhythm and found survival fell as the time grew (adjusted OR 0.91 at 4-6 min, 0.74 at 7-9 min, vs 1-3 min; clinical sheet §6, confirmed primary, abstract); the AHA 2020 adult algorithm says "as soon as possible" for nonshockable rhythms (clinical sheet §1a). For children, AHA 2020 PALS calls first epinephrine within 5 min of starting compressions reasonable (clinical sheet §2, from memory).',
  'compression-fraction':
    'Meaney PA et al., AHA consensus statement on CPR quality, Circulation 2013;128:417-435: compression fraction goal above 80% (clinical sheet §3, confirmed secondary). AHA 2015/2020 minimum: at least 60%.',
  'pre-shock-pause':
    'Common quality-improvement target of under 10 s before each shock (Cheskes et al., Circulation 2011); AHA 2015/2020: keep it as short as possible. Clinical sheet §3, from memory: check against the primary text.',
};

/**
 * "The first X within N seconds of the arrest, when the first rhythm is one of these": applies
 * only to those rhythms; none recorded is a miss, unless ROSC came without it.
 */
function firstTimeTarget(t: {
  id: 'time-to-shock' | 'time-to-epinephrine';
  label: string;
  rule: string;
  rhythms: readonly Rhythm[];
  rhythmWords: string;
  what: string;
  limitSeconds: number;
  value: number | null;
  rhythm: Rhythm | null;
  anyRosc: boolean;
  /** A further condition the target needs, and why it does not apply when unmet. */
  gate?: { ok: boolean; why: string };
}): TargetResult {
  const inGroup = t.rhythm !== null && t.rhythms.includes(t.rhythm);
  const gated = inGroup && t.gate !== undefined && !t.gate.ok;
  const exempt = inGroup && !gated && t.value === null && t.anyRosc;
  const applies = inGroup && !gated && !exempt;
  const none = t.what === 'a shock' ? 'No shock was recorded.' : `No ${t.what} was recorded.`;
  return {
    id: t.id,
    label: t.label,
    rule: t.rule,
    source: TARGET_SOURCES[t.id],
    applies,
    met: applies ? t.value !== null && t.value <= t.limitSeconds : null,
    value: t.value,
    unit: 's',
    note: !inGroup
      ? `The first rhythm was not ${t.rhythmWords}.`
      : gated
        ? (t.gate?.why ?? null)
        : exempt
        ? `ROSC was reached without ${t.what}.`
        : t.value === null
          ? none
          : null,
  };
}

/** Evaluates every target from the stored numbers (the list and the monthly shares use this). */
export function evaluateTargetInputs(
  inputs: TargetInputs,
  settings: QualityTargetSettings = DEFAULT_QUALITY_TARGETS,
): TargetResult[] {
  const rhythm = inputs.firstRhythm;
  const results: TargetResult[] = [];

  // Time to shock: a shockable rhythm with no shock is a miss, unless ROSC came without one;
  // only for an arrest witnessed or monitored, whose start is known.
  const wm = inputs.witnessedOrMonitored;
  results.push(
    firstTimeTarget({
      id: 'time-to-shock',
      label: 'Time to first shock',
      rule: `First defibrillation within ${mmss(settings.shockSeconds)} of the arrest, when the first rhythm is VF or pVT and the arrest was witnessed or monitored.`,
      gate: {
        ok: wm === true,
        why:
          wm === false
            ? 'The arrest was neither witnessed nor monitored: its true start is not known, so the time to the first shock is not judged.'
            : 'Whether the arrest was witnessed or monitored is not recorded yet: complete the registry details for this target to apply.',
      },
      rhythms: SHOCKABLE,
      rhythmWords: 'VF or pVT',
      what: 'a shock',
      limitSeconds: settings.shockSeconds,
      value: inputs.toFirstShockSeconds,
      rhythm,
      anyRosc: inputs.anyRosc,
    }),
  );
  // Time to first epinephrine, for PEA and asystole (Donnino's nonshockable group).
  results.push(
    firstTimeTarget({
      id: 'time-to-epinephrine',
      label: 'Time to first epinephrine',
      rule: `First epinephrine within ${mmss(settings.epinephrineSeconds)} of the arrest, when the first rhythm is PEA or asystole.`,
      rhythms: NONSHOCKABLE,
      rhythmWords: 'PEA or asystole',
      what: 'epinephrine',
      limitSeconds: settings.epinephrineSeconds,
      value: inputs.toFirstEpinephrineSeconds,
      rhythm,
      anyRosc: inputs.anyRosc,
    }),
  );

  {
    const value = inputs.compressionFraction;
    results.push({
      id: 'compression-fraction',
      label: 'Compression fraction',
      rule: `Chest compressions for at least ${Math.round(settings.compressionFraction * 100)}% of the arrest time (from the first compressions to the end, ROSC periods left out).`,
      source: TARGET_SOURCES['compression-fraction'],
      applies: value !== null,
      met: value === null ? null : value >= settings.compressionFraction,
      value,
      unit: 'ratio',
      note: value === null ? 'No chest compressions were recorded.' : null,
    });
  }

  {
    const value = inputs.maxPreShockPauseSeconds;
    results.push({
      id: 'pre-shock-pause',
      label: 'Pre-shock pauses',
      rule: `Every pause before a shock shorter than ${settings.preShockPauseSeconds} s (from the last compression to the shock).`,
      source: TARGET_SOURCES['pre-shock-pause'],
      applies: value !== null,
      met: value === null ? null : value < settings.preShockPauseSeconds,
      value,
      unit: 's',
      note: value === null ? 'No shock fell in a recorded compression pause.' : null,
    });
  }
  return results;
}

/** The numbers the targets need, read from a code's summary and its registry details. */
export function targetInputsOf(summary: CodeSummary, details: Pick<UtsteinDetails, 'witnessed' | 'monitored'> = {}): TargetInputs {
  const pre = summary.shocks
    .map((s) => s.preShockPauseSeconds)
    .filter((s): s is number => s !== null);
  return {
    firstRhythm: summary.firstRhythm,
    witnessedOrMonitored: witnessedOrMonitored(details),
    anyRosc: summary.anyRosc,
    toFirstShockSeconds: summary.intervals.arrestToFirstShock,
    toFirstEpinephrineSeconds: summary.intervals.arrestToFirstEpinephrine,
    compressionFraction: summary.compressionFraction,
    maxPreShockPauseSeconds: pre.length > 0 ? Math.max(...pre) : null,
  };
}

/** Each target met or missed for one code, from its summary and its registry details. */
export function evaluateTargets(
  summary: CodeSummary,
  details: Pick<UtsteinDetails, 'witnessed' | 'monitored'> = {},
  settings: QualityTargetSettings = DEFAULT_QUALITY_TARGETS,
): TargetResult[] {
  return evaluateTargetInputs(targetInputsOf(summary, details), settings);
}

/** Ids of the targets missed. */
export function missedTargets(results: readonly TargetResult[]): QualityTargetId[] {
  return results.filter((r) => r.met === false).map((r) => r.id);
}
