import { EPINEPHRINE_KEY } from './drug-catalogue.js';
import type { DoseUnit, Outcome, Rhythm } from './entries.js';
import { sustainedRoscAt, TAPS_NOT_SENSOR } from './code-state.js';
import type { LogEntry } from './effective-log.js';
import type { ProtocolSettings } from './protocol.js';
import { aggregateDoses, documentedRhythm, foldLog, type CprStopReason, type DoseFact, type DrugAggregate, type Timeline, type TimelineCode } from './timeline.js';

export type { CprStopReason };
/**
 * Step three of the clinical core: the record's and quality's figures for the whole code,
 * read from its Timeline: Utstein-style time points and intervals, ROSC, compression fraction
 * and pauses, shocks, epinephrine timing and drug totals. Definitions and their sources:
 * docs/clinical-sources.md.
 */

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
  arrestAt: 'When the arrest was recognised: the moment the code was started, unless the recorder or leader set it earlier because recording began late.',
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
  firstRhythm: 'The rhythm seen at the first rhythm check; an organised rhythm without a pulse counts as PEA.',
  firstRhythmShockable: 'Whether the first documented rhythm was shockable (VF or pVT).',
  anyRosc: 'Whether ROSC was recorded at any time, however briefly.',
  sustainedRosc:
    'Yes when a ROSC period lasted at least the sustained-ROSC time (20 min by default) with no chest compressions; no when ROSC was never reached or each period ended sooner in re-arrest or compressions; not observed when the code ended (the patient handed over) before that time had passed.',
  roscPeriods:
    'Each period of ROSC, from the ROSC entry to a rearrest, a compression start or the end of the code.',
  roscAtEnd: 'Whether the patient was in ROSC when the code ended.',
  outcome: 'The outcome recorded with the end of the code (how the code ended, not whether ROSC was sustained).',
  compressionFraction:
    'Time with chest compressions divided by the time from the first compression start to the last compressions (or the end, if compressions ran to it), leaving out periods of ROSC, as recorded by taps and not by a compression sensor.',
  compressionSeconds: 'Total seconds with chest compressions running.',
  compressionWindowSeconds:
    'The compression-fraction denominator: seconds from the first compression start to the last compressions (or the end), less periods of ROSC.',
  pauses:
    'Every interruption of chest compressions during arrest (not during ROSC), with start, end, seconds and the reason recorded when compressions stopped, as recorded by taps; the last stop of a code that ended without compressions is not a pause.',
  longestPause: 'The longest interruption of chest compressions.',
  longPauses: 'Interruptions longer than the pause warning (10 s by default).',
  preShockPause: 'Seconds from the last compression before a shock to the shock.',
  postShockPause: 'Seconds from a shock to the restart of chest compressions.',
  periShockPause: 'Pre-shock pause plus post-shock pause for one shock.',
  shocks: 'Every shock with its time, energy in joules and whether it was synchronised; defibrillations and cardioversions are numbered apart.',
  epinephrineIntervals: 'Seconds between consecutive epinephrine doses.',
  epinephrineOutsideWindow:
    'Epinephrine intervals during arrest shorter than the window minimum (early) or longer than its maximum (late); 3 to 5 min by default.',
  drugTotals: 'Total dose of each drug in each unit as recorded, with the number of doses.',
  flaggedDoses: 'Doses past the protocol\'s limit (number of doses or total), above the dose the sheet gives, in another unit than the catalogue\'s, or epinephrine sooner than the window.',
  cycleCount: 'Number of compression cycles begun; a cycle runs from the compressions after one rhythm check (or shock) to the next.',
  sustainedRoscText: 'The sustained-ROSC answer in words: yes, no, or not observed with how long ROSC lasted before the code ended.',
  defibrillationCount: 'Number of unsynchronised shocks (defibrillations).',
  cardioversionCount: 'Number of synchronised shocks (cardioversions).',
  drugs: 'Per drug, the total in the catalogue unit with mass units converted (never mEq or mL), as the live screens show it.',
  airway: 'Each airway device recorded, with its time and how it was confirmed.',
  access: 'Each vascular access recorded (IV or IO), with its time and site.',
  etco2: 'Each ETCO2 reading in mmHg, with its time.',
  protocolVersion: 'The protocol version the code started with, whose timers, doses and limits these figures use.',
  protocolEdition: 'The guideline edition that protocol version follows.',
  tapsNote: 'A reminder that compression fraction and pauses come from the taps recorded, not from a compression sensor.',
  entryCounts:
    'Number of entries in the log, how many were voided and how many amended, and the number of corrections made.',
} as const satisfies Record<string, string>;

export type SummaryMetric = keyof typeof SUMMARY_DEFINITIONS;

export interface SummaryTimes {
  /** When the arrest was recognised (set at the start, correctable if recording began late). */
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
  kind: 'defibrillation' | 'cardioversion';
  /** 1-based within its kind. */
  number: number;
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
   * True when a ROSC period lasted the sustained-ROSC time (20 min by default) with no chest
   * compressions; false when ROSC was never reached or broke off sooner; null when the code
   * ended (or the summary was taken) before that time could pass.
   */
  sustainedRosc: boolean | null;
  /** The sustained-ROSC answer in words, e.g. "not observed: handed over after 14 min of ROSC". */
  sustainedRoscText: string;
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
  defibrillationCount: number;
  cardioversionCount: number;
  /** Compression cycles begun. */
  cycleCount: number;
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
  /** Per drug, every dose that converts in the catalogue's unit (the same totals the screens show). */
  drugs: DrugAggregate[];
  /** Doses with a flag, in time order. */
  flaggedDoses: DoseFact[];
  /** Airway devices and access routes recorded, in time order. */
  airway: { at: string; device: string; confirmation: string | null }[];
  access: { at: string; route: 'iv' | 'io'; site: string | null }[];
  etco2: { at: string; mmHg: number }[];
  /** Which protocol version the figures used, and its edition. */
  protocolVersion: number | null;
  protocolEdition: string;
  /** Compression fraction and pauses come from taps, not a compression sensor. */
  tapsNote: string;
  /** Number of entries in the log, how many were voided and how many amended, and the number of corrections made. */
  entryCounts: EntryCounts;
  /**
   * Where open periods (compressions, pauses, ROSC) were closed: the end of the code, or for a
   * code still running `asOf` (default: the latest entry). Compression, ROSC and rearrest entries
   * after it change nothing; drugs, shocks and rhythms after it still count.
   */
  horizonAt: string;
}


const iso = (ms: number): string => new Date(ms).toISOString();
const secondsBetween = (fromMs: number, toMs: number): number => (toMs - fromMs) / 1000;

export interface SummarizeOptions {
  /** For a code still running: the moment the summary is taken at (epoch ms). Ignored once ended. */
  asOfMs?: number;
}

/** The sustained-ROSC answer in words for the record and the screens. */
function sustainedWords(value: boolean | null, periods: readonly RoscPeriod[], anyRosc: boolean, ended: boolean): string {
  if (value === true) return 'yes';
  if (!anyRosc) return 'no: no ROSC';
  if (value === false) return 'no: re-arrest or compressions before 20 min';
  const last = periods[periods.length - 1];
  const min = last ? Math.floor(last.seconds / 60) : 0;
  return ended ? `not observed: handed over after ${min} min of ROSC` : `not yet known: ${min} min of ROSC so far`;
}

export function summarize(timeline: Timeline, options: SummarizeOptions = {}): CodeSummary {
  const { protocol, arrestAtMs, end } = timeline;
  const horizonMs = end?.atMs ?? options.asOfMs ?? timeline.lastEntryMs;
  const since = (ms: number | null): number | null => (ms === null ? null : secondsBetween(arrestAtMs, ms));
  const isoOrNull = (t: number | null) => (t === null ? null : iso(t));
  const upTo = <T extends { atMs: number }>(xs: readonly T[]) => (end ? xs : xs.filter((x) => x.atMs <= horizonMs));

  // --- compressions, pauses and ROSC periods, closed at the horizon
  let compressionMs = 0;
  for (const r of timeline.runs) {
    if (r.startMs > horizonMs) continue;
    compressionMs += Math.min(r.endMs ?? horizonMs, horizonMs) - r.startMs;
  }
  const roscPeriods: RoscPeriod[] = timeline.rosc
    .filter((r) => r.startMs <= horizonMs)
    .map((r) => {
      const endMs = r.endMs === null || r.endMs > horizonMs ? horizonMs : r.endMs;
      const seconds = secondsBetween(r.startMs, endMs);
      return {
        startAt: iso(r.startMs),
        endAt: iso(endMs),
        seconds,
        endedBy: r.endMs === null || r.endMs > horizonMs ? 'end' : (r.endedBy ?? 'end'),
        sustained: seconds >= protocol.sustainedRoscSeconds,
      };
    });

  const shockFacts = upTo(timeline.shocks);
  const pauses: CompressionPause[] = timeline.pauses
    // The last stop of an ended code is not a pause of the code.
    .filter((p) => p.startMs < horizonMs && p.endedBy !== 'end')
    .map((p) => {
      const open = p.endMs === null || p.endMs > horizonMs;
      const endMs = open ? horizonMs : (p.endMs ?? horizonMs);
      const seconds = secondsBetween(p.startMs, endMs);
      const shockIds = shockFacts.filter((s) => s.atMs >= p.startMs && s.atMs <= endMs).map((s) => s.id);
      return {
        startAt: iso(p.startMs),
        endAt: iso(endMs),
        seconds,
        startedBy: p.startedBy,
        reason: p.reason,
        endedBy: open ? 'end' : (p.endedBy ?? 'end'),
        preShock: shockIds.length > 0,
        shockIds,
        overWarning: seconds > protocol.pauseWarningSeconds,
      };
    });

  let compressionWindowSeconds: number | null = null;
  let compressionFraction: number | null = null;
  const first = timeline.firstCompressionsMs;
  if (first !== null && first <= horizonMs) {
    const windowEnd = end && timeline.endedStoppedSinceMs !== null ? timeline.endedStoppedSinceMs : horizonMs;
    const roscInWindowMs = timeline.rosc.reduce(
      (sum, r) => sum + Math.max(0, Math.min(r.endMs ?? windowEnd, windowEnd) - Math.max(r.startMs, first)),
      0,
    );
    const windowMs = windowEnd - first - roscInWindowMs;
    compressionWindowSeconds = windowMs / 1000;
    compressionFraction = windowMs > 0 ? Math.min(1, compressionMs / windowMs) : null;
  }

  // --- shocks and the pauses around them
  const shocks: ShockSummary[] = shockFacts.map((s) => {
    const p = pauses.find((span) => s.atMs >= Date.parse(span.startAt) && s.atMs <= Date.parse(span.endAt));
    const pre = p ? secondsBetween(Date.parse(p.startAt), s.atMs) : null;
    const post = p && p.endedBy === 'compressions' ? secondsBetween(s.atMs, Date.parse(p.endAt)) : null;
    return {
      id: s.id,
      at: iso(s.atMs),
      sinceArrestSeconds: secondsBetween(arrestAtMs, s.atMs),
      joules: s.joules,
      synchronized: s.synchronized,
      kind: s.kind,
      number: s.number,
      preShockPauseSeconds: pre,
      postShockPauseSeconds: post,
      periShockPauseSeconds: pre !== null && post !== null ? pre + post : null,
      preShockPauseMeetsTarget: pre === null ? null : pre < PRE_SHOCK_PAUSE_TARGET_SECONDS,
    };
  });
  let longestPause: CompressionPause | null = null;
  for (const p of pauses) if (!longestPause || p.seconds > longestPause.seconds) longestPause = p;

  // --- drugs: per unit as recorded (the pharmacist's rows), and per drug in the catalogue unit
  const doseFacts = upTo(timeline.doses);
  const totals = new Map<string, DrugTotal>();
  for (const d of doseFacts) {
    // Units are never added across: a mg/mcg mix-up shows as two rows instead of hiding in a sum.
    const mapKey = `${d.key}\u0000${d.unit}`;
    const at = iso(d.atMs);
    const row = totals.get(mapKey);
    if (row) {
      row.total = Math.round((row.total + d.dose) * 1e6) / 1e6;
      row.doses += 1;
      row.lastAt = at;
    } else {
      totals.set(mapKey, { drug: d.key, label: d.label, unit: d.unit, total: d.dose, doses: 1, firstAt: at, lastAt: at });
    }
  }
  const weight = timeline.code.weightKg !== null && timeline.code.weightKg > 0 ? timeline.code.weightKg : null;
  const drugs = aggregateDoses(doseFacts, weight);

  const epiFacts = doseFacts.filter((d) => d.key === EPINEPHRINE_KEY);
  const epinephrineDoses: EpinephrineDose[] = epiFacts.map((d) => ({ id: d.id, at: iso(d.atMs), dose: d.dose, unit: d.unit }));
  const { min, max } = protocol.epinephrineWindowSeconds;
  const epinephrineIntervals: EpinephrineInterval[] = [];
  for (let i = 1; i < epiFacts.length; i++) {
    const a = epiFacts[i - 1];
    const b = epiFacts[i];
    if (!a || !b) continue;
    const seconds = secondsBetween(a.atMs, b.atMs);
    epinephrineIntervals.push({
      fromId: a.id,
      toId: b.id,
      fromAt: iso(a.atMs),
      toAt: iso(b.atMs),
      seconds,
      status: seconds < min ? 'early' : seconds > max ? 'late' : 'within',
      spansRosc: timeline.rosc.some((r) => r.startMs < b.atMs && (r.endMs ?? Infinity) > a.atMs),
    });
  }

  // --- time points
  const checks = upTo(timeline.rhythmChecks);
  const firstCheck = checks[0];
  const firstDefib = shockFacts.find((s) => s.kind === 'defibrillation');
  const firstEpi = epiFacts[0];
  const firstRosc = timeline.rosc.find((r) => r.startMs <= horizonMs);
  const anyRosc = firstRosc !== undefined;
  const sustainedRosc = sustainedRoscAt(timeline, horizonMs);
  const firstRhythm = firstCheck ? documentedRhythm(firstCheck.rhythm, firstCheck.pulse) : null;
  const liveCount = timeline.live.length;

  return {
    times: {
      arrestAt: iso(arrestAtMs),
      firstCompressionsAt: isoOrNull(first !== null && first <= horizonMs ? first : null),
      firstRhythmAnalysisAt: isoOrNull(firstCheck?.atMs ?? null),
      firstShockAt: isoOrNull(firstDefib?.atMs ?? null),
      firstEpinephrineAt: isoOrNull(firstEpi?.atMs ?? null),
      firstRoscAt: isoOrNull(firstRosc?.startMs ?? null),
      endedAt: isoOrNull(end?.atMs ?? null),
    },
    intervals: {
      arrestToFirstCompressions: since(first !== null && first <= horizonMs ? first : null),
      arrestToFirstRhythmAnalysis: since(firstCheck?.atMs ?? null),
      arrestToFirstShock: since(firstDefib?.atMs ?? null),
      arrestToFirstEpinephrine: since(firstEpi?.atMs ?? null),
      arrestToFirstRosc: since(firstRosc?.startMs ?? null),
      arrestToEnd: since(end?.atMs ?? null),
    },
    durationSeconds: since(end?.atMs ?? null),
    firstRhythm,
    firstRhythmShockable: firstCheck ? firstCheck.shockable : null,
    anyRosc,
    sustainedRosc,
    sustainedRoscText: sustainedWords(sustainedRosc, roscPeriods, anyRosc, end !== null),
    roscPeriods,
    roscAtEnd: end !== null && roscPeriods.some((r) => r.endedBy === 'end'),
    outcome: end?.outcome ?? null,
    compressionFraction,
    compressionSeconds: compressionMs / 1000,
    compressionWindowSeconds,
    pauses,
    longestPause,
    longPauses: pauses.filter((p) => p.overWarning),
    shocks,
    defibrillationCount: shocks.filter((s) => s.kind === 'defibrillation').length,
    cardioversionCount: shocks.filter((s) => s.kind === 'cardioversion').length,
    cycleCount: timeline.cycles.filter((c) => c.startMs <= horizonMs).length,
    epinephrineDoses,
    epinephrineIntervals,
    epinephrineOutsideWindow: epinephrineIntervals.filter((i) => i.status !== 'within' && !i.spansRosc),
    drugTotals: [...totals.values()],
    drugs,
    flaggedDoses: doseFacts.filter((d) => d.flags.length > 0),
    airway: upTo(timeline.airway.map((a) => ({ ...a, atMs: Date.parse(a.at) }))).map((a) => ({
      at: iso(a.atMs),
      device: a.device,
      confirmation: a.confirmation ?? null,
    })),
    access: upTo(timeline.access.map((a) => ({ ...a, atMs: Date.parse(a.at) }))).map((a) => ({ at: iso(a.atMs), route: a.route, site: a.site ?? null })),
    etco2: upTo(timeline.etco2).map((x) => ({ at: iso(x.atMs), mmHg: x.mmHg })),
    protocolVersion: timeline.protocolVersion,
    protocolEdition: protocol.edition,
    tapsNote: TAPS_NOT_SENSOR,
    entryCounts: {
      entries: timeline.all.length,
      live: liveCount,
      voided: timeline.all.length - liveCount,
      amended: timeline.all.filter((e) => e.amendments.length > 0).length,
      corrections: timeline.corrections,
    },
    horizonAt: iso(horizonMs),
  };
}


/** Fold and summarize in one call, for a caller that needs only the summary. */
export function summarizeLog(code: TimelineCode, entries: readonly LogEntry[], protocol: ProtocolSettings, options: SummarizeOptions = {}): CodeSummary {
  return summarize(foldLog(code, entries, protocol), options);
}
