import type { CodeCategory } from './codes.js';
import type { CPR_STOP_REASONS, DoseUnit, Outcome, Rhythm } from './entries.js';
import { SHOCKABLE_RHYTHMS } from './entries.js';
import {
  effectiveEntries,
  entryTimeMs,
  type EffectiveEntry,
  type LogEntry,
} from './effective-log.js';
import { EPINEPHRINE_KEY, resolveDrug } from './live-state.js';
import type { ProtocolSettings } from './protocol.js';

/**
 * The after-the-code summary: Utstein-style time points and intervals, ROSC, compression
 * fraction and pauses, shocks, epinephrine timing and drug totals, all computed from the
 * corrected entry log. Definitions and their sources: shared/reference/clinical-reference.md
 * sections 3, 4 and 6.
 */

export type CprStopReason = (typeof CPR_STOP_REASONS)[number];

/**
 * Common quality-improvement target for the pre-shock pause (shorter than this).
 * FROM MEMORY per the clinical sheet (section 3: "< 10 s pre-shock", Cheskes et al.,
 * Circulation 2011); not yet checked against the primary text. Not an admin setting yet.
 */
export const PRE_SHOCK_PAUSE_TARGET_SECONDS = 10;

/**
 * One sentence per metric, shared by the summary screen, the PDF and the docs so all say
 * the same thing. The JSDoc on `CodeSummary` repeats these words.
 */
export const SUMMARY_DEFINITIONS = {
  arrestAt: 'When the arrest was recognised, as recorded when the code was started.',
  firstCompressionsAt: 'When chest compressions were first started.',
  firstRhythmAnalysisAt: 'When the first rhythm check was recorded.',
  firstShockAt: 'When the first defibrillation (an unsynchronised shock) was given.',
  firstEpinephrineAt: 'When the first dose of epinephrine was given.',
  firstRoscAt: 'When return of spontaneous circulation (ROSC) was first recorded.',
  endedAt: 'When the code ended (the end entry, or the code record if the log has none).',
  arrestToFirstCompressions: 'Seconds from arrest recognition to the first chest compressions.',
  arrestToFirstRhythmAnalysis: 'Seconds from arrest recognition to the first rhythm check.',
  arrestToFirstShock: 'Seconds from arrest recognition to the first defibrillation.',
  arrestToFirstEpinephrine: 'Seconds from arrest recognition to the first epinephrine dose.',
  arrestToFirstRosc: 'Seconds from arrest recognition to the first ROSC.',
  arrestToEnd: 'Seconds from arrest recognition to the end of the code.',
  durationSeconds: 'Duration of the event: seconds from arrest recognition to the end of the code.',
  firstRhythm: 'The rhythm seen at the first rhythm check.',
  firstRhythmShockable: 'Whether the first documented rhythm was shockable (VF or pVT).',
  anyRosc: 'Whether ROSC was recorded at any time, however briefly.',
  sustainedRosc:
    'Whether any ROSC period lasted at least the sustained-ROSC time (20 min by default) with no chest compressions; a period still running when the code ended runs to the end.',
  roscPeriods:
    'Each period of ROSC, from the ROSC entry to a rearrest, a compression start or the end of the code.',
  roscAtEnd: 'Whether the patient was in ROSC when the code ended.',
  outcome: 'The outcome recorded with the end of the code.',
  compressionFraction:
    'Time with chest compressions divided by the time from the first compression start to the end of the code, leaving out periods of ROSC.',
  compressionSeconds: 'Total seconds with chest compressions running.',
  compressionWindowSeconds:
    'The compression-fraction denominator: seconds from the first compression start to the end of the code, less periods of ROSC.',
  pauses:
    'Every interruption of chest compressions during arrest (not during ROSC), with start, end, seconds and the reason recorded when compressions stopped.',
  longestPause: 'The longest interruption of chest compressions.',
  longPauses: 'Interruptions longer than the pause warning (10 s by default).',
  preShockPause: 'Seconds from the last compression before a shock to the shock.',
  postShockPause: 'Seconds from a shock to the restart of chest compressions.',
  periShockPause: 'Pre-shock pause plus post-shock pause for one shock.',
  shocks: 'Every shock with its time, energy in joules and whether it was synchronised.',
  epinephrineIntervals: 'Seconds between consecutive epinephrine doses.',
  epinephrineOutsideWindow:
    'Epinephrine intervals during arrest shorter than the window minimum (early) or longer than its maximum (late); 3 to 5 min by default.',
  drugTotals: 'Total dose of each drug in each unit, with the number of doses.',
  entryCounts:
    'Number of entries in the log, how many were voided and how many amended, and the number of corrections made.',
} as const satisfies Record<string, string>;

export type SummaryMetric = keyof typeof SUMMARY_DEFINITIONS;

export interface SummaryTimes {
  /** When the arrest was recognised, as recorded when the code was started. */
  arrestAt: string;
  /** When chest compressions were first started. */
  firstCompressionsAt: string | null;
  /** When the first rhythm check was recorded. */
  firstRhythmAnalysisAt: string | null;
  /** When the first defibrillation (an unsynchronised shock) was given. */
  firstShockAt: string | null;
  /** When the first dose of epinephrine was given. */
  firstEpinephrineAt: string | null;
  /** When return of spontaneous circulation (ROSC) was first recorded. */
  firstRoscAt: string | null;
  /** When the code ended (the end entry, or the code record if the log has none). */
  endedAt: string | null;
}

export interface SummaryIntervals {
  /** Seconds from arrest recognition to the first chest compressions. */
  arrestToFirstCompressions: number | null;
  /** Seconds from arrest recognition to the first rhythm check. */
  arrestToFirstRhythmAnalysis: number | null;
  /** Seconds from arrest recognition to the first defibrillation. */
  arrestToFirstShock: number | null;
  /** Seconds from arrest recognition to the first epinephrine dose. */
  arrestToFirstEpinephrine: number | null;
  /** Seconds from arrest recognition to the first ROSC. */
  arrestToFirstRosc: number | null;
  /** Seconds from arrest recognition to the end of the code. */
  arrestToEnd: number | null;
}

export interface RoscPeriod {
  startAt: string;
  endAt: string;
  seconds: number;
  /** What ended it; `end` means the code ended (or the summary was taken) in ROSC. */
  endedBy: 'rearrest' | 'compressions' | 'end';
  /** Lasted at least `settings.sustainedRoscSeconds`. */
  sustained: boolean;
}

export interface CompressionPause {
  startAt: string;
  endAt: string;
  seconds: number;
  /** A compression stop entry, or a rearrest (compressions not yet restarted). */
  startedBy: 'cpr-stop' | 'rearrest';
  /** The reason on the compression stop entry, when one was recorded. */
  reason: CprStopReason | null;
  /** `end`: compressions had not restarted when the code ended. */
  endedBy: 'compressions' | 'rosc' | 'end';
  /** A shock fell inside the pause. */
  preShock: boolean;
  shockIds: string[];
  /** Longer than `settings.pauseWarningSeconds`. */
  overWarning: boolean;
}

export interface ShockSummary {
  id: string;
  at: string;
  sinceArrestSeconds: number;
  joules: number;
  synchronized: boolean;
  /** Seconds from the last compression before the shock to the shock; null when the shock did not fall in a recorded pause. */
  preShockPauseSeconds: number | null;
  /** Seconds from the shock to the restart of compressions; null unless compressions restarted. */
  postShockPauseSeconds: number | null;
  /** Pre-shock plus post-shock pause, when both are known. */
  periShockPauseSeconds: number | null;
  /** Pre-shock pause below PRE_SHOCK_PAUSE_TARGET_SECONDS; null when unknown. */
  preShockPauseMeetsTarget: boolean | null;
}

export interface EpinephrineDose {
  id: string;
  at: string;
  dose: number;
  unit: DoseUnit;
}

export interface EpinephrineInterval {
  fromId: string;
  toId: string;
  fromAt: string;
  toAt: string;
  seconds: number;
  /** Against `settings.epinephrineWindowSeconds`: below min is early, above max is late. */
  status: 'early' | 'within' | 'late';
  /** A ROSC period overlaps the interval, so the arrest window does not apply to it. */
  spansRosc: boolean;
}

export interface DrugTotal {
  /** Catalogue key when the drug is in the protocol's catalogue, else the recorded name in lower case. */
  drug: string;
  label: string;
  unit: DoseUnit;
  total: number;
  doses: number;
  firstAt: string;
  lastAt: string;
}

export interface EntryCounts {
  /** Clinical entries in the log (corrections not included); a resent tap counts once. */
  entries: number;
  /** Entries that are not voided. */
  live: number;
  voided: number;
  /** Entries with at least one amendment applied. */
  amended: number;
  /** Void and amend entries in the log. */
  corrections: number;
}

export interface CodeSummary {
  /** Utstein-style time points, ISO 8601 in UTC; null when not recorded. */
  times: SummaryTimes;
  /** Seconds from arrest recognition to each time point; null when the time point is null. */
  intervals: SummaryIntervals;
  /** Duration of the event: seconds from arrest recognition to the end of the code. */
  durationSeconds: number | null;
  /** The rhythm seen at the first rhythm check. */
  firstRhythm: Rhythm | null;
  /** Whether the first documented rhythm was shockable (VF or pVT); null when no rhythm was recorded. */
  firstRhythmShockable: boolean | null;
  /** Whether ROSC was recorded at any time, however briefly. */
  anyRosc: boolean;
  /**
   * Whether any ROSC period lasted at least the sustained-ROSC time (20 min by default) with no
   * chest compressions; a period still running when the code ended runs to the end.
   */
  sustainedRosc: boolean;
  /** Each period of ROSC, from the ROSC entry to a rearrest, a compression start or the end of the code. */
  roscPeriods: RoscPeriod[];
  /** Whether the patient was in ROSC when the code ended. */
  roscAtEnd: boolean;
  /** The outcome recorded with the end of the code. */
  outcome: Outcome | null;
  /**
   * Time with chest compressions divided by the time from the first compression start to the
   * end of the code, leaving out periods of ROSC. A ratio from 0 to 1; null without compressions.
   */
  compressionFraction: number | null;
  /** Total seconds with chest compressions running. */
  compressionSeconds: number;
  /**
   * The compression-fraction denominator: seconds from the first compression start to the end
   * of the code, less periods of ROSC. Null without compressions.
   */
  compressionWindowSeconds: number | null;
  /**
   * Every interruption of chest compressions during arrest (not during ROSC), with start, end,
   * seconds and the reason recorded when compressions stopped. In time order.
   */
  pauses: CompressionPause[];
  /** The longest interruption of chest compressions. */
  longestPause: CompressionPause | null;
  /** Interruptions longer than the pause warning (10 s by default). */
  longPauses: CompressionPause[];
  /** Every shock with its time, energy in joules and whether it was synchronised, with its pre-, post- and peri-shock pauses. */
  shocks: ShockSummary[];
  /** Epinephrine doses in time order. */
  epinephrineDoses: EpinephrineDose[];
  /** Seconds between consecutive epinephrine doses. */
  epinephrineIntervals: EpinephrineInterval[];
  /**
   * Epinephrine intervals during arrest shorter than the window minimum (early) or longer than
   * its maximum (late); 3 to 5 min by default. Intervals spanning ROSC are left out.
   */
  epinephrineOutsideWindow: EpinephrineInterval[];
  /** Total dose of each drug in each unit, with the number of doses. In order of first dose. */
  drugTotals: DrugTotal[];
  /** Number of entries in the log, how many were voided and how many amended, and the number of corrections made. */
  entryCounts: EntryCounts;
  /**
   * Where open periods (compressions, pauses, ROSC) were closed: the end of the code, or for a
   * code still running `asOf` (default: the latest entry). Compression, ROSC and rearrest entries
   * after it change nothing; drugs, shocks and rhythms after it still count.
   */
  horizonAt: string;
}

export interface SummaryCodeInput {
  arrestAt: string;
  endedAt: string | null;
  category: CodeCategory;
  weightKg: number | null;
}

export interface SummarizeCodeInput {
  code: SummaryCodeInput;
  entries: readonly LogEntry[];
  settings: ProtocolSettings;
  /** For a code still running: the time the summary is taken at. Ignored once the code has ended. */
  asOf?: string;
}

const iso = (ms: number): string => new Date(ms).toISOString();
const secondsBetween = (fromMs: number, toMs: number): number => (toMs - fromMs) / 1000;
// Dose sums: avoid 0.1 + 0.2 style float noise in totals shown to a pharmacist.
const roundDose = (n: number): number => Math.round(n * 1e6) / 1e6;

// Same name matching as the live screens (key, label or a known synonym), so totals agree.
function drugIdentity(settings: ProtocolSettings, name: string): { key: string; label: string } {
  const def = resolveDrug(settings, name);
  return def
    ? { key: def.key, label: def.label }
    : { key: name.trim().toLowerCase(), label: name.trim() };
}

type Entry<K extends EffectiveEntry['kind']> = Extract<EffectiveEntry, { kind: K }>;

export function summarizeCode(input: SummarizeCodeInput): CodeSummary {
  const { code, entries, settings } = input;
  const arrestMs = Date.parse(code.arrestAt);
  const all = effectiveEntries(entries);
  const live = all.filter((e) => e.voided === null);

  // The log is the record: a (possibly amended) end entry wins over the code row.
  const endEntry = live.find((e): e is Entry<'end'> => e.kind === 'end');
  const endMs = endEntry
    ? entryTimeMs(endEntry)
    : code.endedAt !== null
      ? Date.parse(code.endedAt)
      : null;
  const asOfMs = input.asOf !== undefined ? Date.parse(input.asOf) : null;
  const horizonMs = endMs ?? asOfMs ?? Math.max(arrestMs, ...live.map((e) => entryTimeMs(e)));

  // As on the live screens: the end freezes the clocks (compressions, pauses, ROSC), but drugs,
  // shocks and rhythms timed after it still count, so nothing recorded is hidden.
  const clockEntries = live.filter((e) => entryTimeMs(e) <= horizonMs);
  const since = (ms: number | null): number | null =>
    ms === null ? null : secondsBetween(arrestMs, ms);

  // --- compressions, pauses and ROSC: one pass over the log in time order ---
  let windowStartMs: number | null = null;
  let compressing = false;
  let compressionStartMs = 0;
  let compressionMs = 0;
  let rosc: { startMs: number } | null = null;
  let pause: {
    startMs: number;
    startedBy: CompressionPause['startedBy'];
    reason: CprStopReason | null;
  } | null = null;
  const roscSpans: { startMs: number; endMs: number; endedBy: RoscPeriod['endedBy'] }[] = [];
  const pauseSpans: {
    startMs: number;
    endMs: number;
    startedBy: CompressionPause['startedBy'];
    reason: CprStopReason | null;
    endedBy: CompressionPause['endedBy'];
  }[] = [];

  const startCompressions = (t: number) => {
    if (windowStartMs === null) windowStartMs = t;
    compressing = true;
    compressionStartMs = t;
  };
  const stopCompressions = (t: number) => {
    compressionMs += t - compressionStartMs;
    compressing = false;
  };
  const closePause = (t: number, endedBy: CompressionPause['endedBy']) => {
    if (pause && t > pause.startMs) pauseSpans.push({ ...pause, endMs: t, endedBy });
    pause = null;
  };
  const closeRosc = (t: number, endedBy: RoscPeriod['endedBy']) => {
    if (rosc) roscSpans.push({ startMs: rosc.startMs, endMs: t, endedBy });
    rosc = null;
  };

  for (const e of clockEntries) {
    const t = entryTimeMs(e);
    if (e.kind === 'cpr') {
      // A swap changes the compressor, not the clocks (the live screens read it the same way).
      if (e.action === 'start' && !compressing) {
        closeRosc(t, 'compressions'); // compressions again: the ROSC period is over
        closePause(t, 'compressions');
        startCompressions(t);
      } else if (e.action === 'stop' && compressing) {
        stopCompressions(t);
        pause = { startMs: t, startedBy: 'cpr-stop', reason: e.reason ?? null };
      }
    } else if (e.kind === 'rosc') {
      if (rosc) continue;
      if (compressing) stopCompressions(t);
      closePause(t, 'rosc');
      rosc = { startMs: t };
    } else if (e.kind === 'rearrest') {
      if (!rosc) continue;
      closeRosc(t, 'rearrest');
      // Time back in arrest before compressions restart is a pause, once compressions have begun at all.
      if (windowStartMs !== null) pause = { startMs: t, startedBy: 'rearrest', reason: null };
    }
  }
  if (compressing) stopCompressions(horizonMs);
  closePause(horizonMs, 'end');
  closeRosc(horizonMs, 'end');

  const roscPeriods: RoscPeriod[] = roscSpans.map((r) => {
    const seconds = secondsBetween(r.startMs, r.endMs);
    return {
      startAt: iso(r.startMs),
      endAt: iso(r.endMs),
      seconds,
      endedBy: r.endedBy,
      sustained: seconds >= settings.sustainedRoscSeconds,
    };
  });

  let compressionWindowSeconds: number | null = null;
  let compressionFraction: number | null = null;
  if (windowStartMs !== null) {
    const ws: number = windowStartMs;
    const roscInWindowMs = roscSpans.reduce(
      (sum, r) => sum + Math.max(0, Math.min(r.endMs, horizonMs) - Math.max(r.startMs, ws)),
      0,
    );
    const windowMs = horizonMs - ws - roscInWindowMs;
    compressionWindowSeconds = windowMs / 1000;
    compressionFraction = windowMs > 0 ? compressionMs / windowMs : null;
  }

  // --- shocks and the pauses around them ---
  const shockEntries = live.filter((e): e is Entry<'shock'> => e.kind === 'shock');
  const pauses: CompressionPause[] = pauseSpans.map((p) => {
    const seconds = secondsBetween(p.startMs, p.endMs);
    const shockIds = shockEntries
      .filter((s) => entryTimeMs(s) >= p.startMs && entryTimeMs(s) <= p.endMs)
      .map((s) => s.id);
    return {
      startAt: iso(p.startMs),
      endAt: iso(p.endMs),
      seconds,
      startedBy: p.startedBy,
      reason: p.reason,
      endedBy: p.endedBy,
      preShock: shockIds.length > 0,
      shockIds,
      overWarning: seconds > settings.pauseWarningSeconds,
    };
  });

  const shocks: ShockSummary[] = shockEntries.map((s) => {
    const t = entryTimeMs(s);
    const p = pauseSpans.find((span) => t >= span.startMs && t <= span.endMs);
    const pre = p ? secondsBetween(p.startMs, t) : null;
    const post = p && p.endedBy === 'compressions' ? secondsBetween(t, p.endMs) : null;
    return {
      id: s.id,
      at: iso(t),
      sinceArrestSeconds: secondsBetween(arrestMs, t),
      joules: s.joules,
      synchronized: s.synchronized,
      preShockPauseSeconds: pre,
      postShockPauseSeconds: post,
      periShockPauseSeconds: pre !== null && post !== null ? pre + post : null,
      preShockPauseMeetsTarget: pre === null ? null : pre < PRE_SHOCK_PAUSE_TARGET_SECONDS,
    };
  });

  let longestPause: CompressionPause | null = null;
  for (const p of pauses) if (!longestPause || p.seconds > longestPause.seconds) longestPause = p;

  // --- drugs ---
  const drugEntries = live.filter((e): e is Entry<'drug'> => e.kind === 'drug');
  const totals = new Map<string, DrugTotal>();
  const epinephrineEntries: Entry<'drug'>[] = [];
  for (const d of drugEntries) {
    const { key, label } = drugIdentity(settings, d.drug);
    if (key === EPINEPHRINE_KEY) epinephrineEntries.push(d);
    // Units are never converted: a mg/ug mix-up shows as two rows instead of hiding in a sum.
    const mapKey = `${key}\u0000${d.unit}`;
    const at = iso(entryTimeMs(d));
    const row = totals.get(mapKey);
    if (row) {
      row.total = roundDose(row.total + d.dose);
      row.doses += 1;
      row.lastAt = at;
    } else {
      totals.set(mapKey, {
        drug: key,
        label,
        unit: d.unit,
        total: roundDose(d.dose),
        doses: 1,
        firstAt: at,
        lastAt: at,
      });
    }
  }

  const epinephrineDoses: EpinephrineDose[] = epinephrineEntries.map((d) => ({
    id: d.id,
    at: iso(entryTimeMs(d)),
    dose: d.dose,
    unit: d.unit,
  }));
  const { min, max } = settings.epinephrineWindowSeconds;
  const epinephrineIntervals: EpinephrineInterval[] = [];
  for (let i = 1; i < epinephrineEntries.length; i++) {
    const a = epinephrineEntries[i - 1];
    const b = epinephrineEntries[i];
    if (!a || !b) continue;
    const aMs = entryTimeMs(a);
    const bMs = entryTimeMs(b);
    const seconds = secondsBetween(aMs, bMs);
    epinephrineIntervals.push({
      fromId: a.id,
      toId: b.id,
      fromAt: iso(aMs),
      toAt: iso(bMs),
      seconds,
      status: seconds < min ? 'early' : seconds > max ? 'late' : 'within',
      spansRosc: roscSpans.some((r) => r.startMs < bMs && r.endMs > aMs),
    });
  }

  // --- time points ---
  const first = <K extends EffectiveEntry['kind']>(
    kind: K,
    pick: (e: Entry<K>) => boolean = () => true,
  ): Entry<K> | undefined =>
    live.find((e): e is Entry<K> => e.kind === kind && pick(e as Entry<K>));
  const firstRhythmEntry = first('rhythm');
  const firstShockEntry = first('shock', (s) => !s.synchronized);
  const firstEpi = epinephrineEntries[0];
  const firstRoscEntry = clockEntries.find((e): e is Entry<'rosc'> => e.kind === 'rosc');
  const ms = (e: { at: string } | undefined): number | null => (e ? entryTimeMs(e) : null);

  const firstRhythmAnalysisMs = ms(firstRhythmEntry);
  const firstShockMs = ms(firstShockEntry);
  const firstEpinephrineMs = ms(firstEpi);
  const firstRoscMs = ms(firstRoscEntry);
  const isoOrNull = (t: number | null) => (t === null ? null : iso(t));

  const corrections = new Set(
    entries.filter((e) => e.kind === 'void' || e.kind === 'amend').map((e) => e.id),
  );

  return {
    times: {
      arrestAt: iso(arrestMs),
      firstCompressionsAt: isoOrNull(windowStartMs),
      firstRhythmAnalysisAt: isoOrNull(firstRhythmAnalysisMs),
      firstShockAt: isoOrNull(firstShockMs),
      firstEpinephrineAt: isoOrNull(firstEpinephrineMs),
      firstRoscAt: isoOrNull(firstRoscMs),
      endedAt: isoOrNull(endMs),
    },
    intervals: {
      arrestToFirstCompressions: since(windowStartMs),
      arrestToFirstRhythmAnalysis: since(firstRhythmAnalysisMs),
      arrestToFirstShock: since(firstShockMs),
      arrestToFirstEpinephrine: since(firstEpinephrineMs),
      arrestToFirstRosc: since(firstRoscMs),
      arrestToEnd: since(endMs),
    },
    durationSeconds: since(endMs),
    firstRhythm: firstRhythmEntry?.rhythm ?? null,
    firstRhythmShockable: firstRhythmEntry
      ? SHOCKABLE_RHYTHMS.includes(firstRhythmEntry.rhythm)
      : null,
    anyRosc: clockEntries.some((e) => e.kind === 'rosc'),
    sustainedRosc: roscPeriods.some((r) => r.sustained),
    roscPeriods,
    roscAtEnd: endMs !== null && roscPeriods.some((r) => r.endedBy === 'end'),
    outcome: endEntry?.outcome ?? null,
    compressionFraction,
    compressionSeconds: compressionMs / 1000,
    compressionWindowSeconds,
    pauses,
    longestPause,
    longPauses: pauses.filter((p) => p.overWarning),
    shocks,
    epinephrineDoses,
    epinephrineIntervals,
    epinephrineOutsideWindow: epinephrineIntervals.filter(
      (i) => i.status !== 'within' && !i.spansRosc,
    ),
    drugTotals: [...totals.values()],
    entryCounts: {
      entries: all.length,
      live: live.length,
      voided: all.length - live.length,
      amended: all.filter((e) => e.amendments.length > 0).length,
      corrections: corrections.size,
    },
    horizonAt: iso(horizonMs),
  };
}
