import { nextDose, nextShockJoules, type DosingSheet, type EnergyStep, type NextDose } from './dosing.js';
import { EPINEPHRINE_KEY } from './drug-catalogue.js';
import type { EffectiveEntry } from './effective-log.js';
import type { Outcome, Rhythm } from './entries.js';
import type { CodeCategory } from './codes.js';
import { aggregateDoses, type CprStopReason, type DoseFact, type DrugAggregate, type RhythmClass, type Timeline } from './timeline.js';

/**
 * Step two of the clinical core: what the screens show at one moment of a code, read from its
 * Timeline. The pad and the wall call this every second with the corrected clock; the server
 * answers it for any moment (GET /api/codes/:id/state?at=); the review's slider replays it.
 * Only what had happened by that moment counts, so a replay shows the code as it was.
 */

export type StateStatus = 'arrest' | 'rosc' | 'ended';
export type EpinephrineState = 'none-yet' | 'early' | 'due' | 'overdue';

/**
 * How long before a rhythm check falls due the reminder appears, so the team can get the next
 * compressor and the defibrillator ready. Our own choice, not a published value.
 */
export const RHYTHM_CHECK_LEAD_MS = 15_000;

/** How many entries `recent` holds unless the caller asks otherwise. */
export const RECENT_COUNT = 8;

/** Shown on every surface that shows reminders. */
export const REMINDER_CAUTION =
  "Reminders support, and do not replace, the team leader's judgment, local protocol and licensed practice.";

/** Shown beside every compression fraction and pause figure. */
export const TAPS_NOT_SENSOR =
  'Compression fraction and pauses come from the taps recorded here, not from a compression sensor.';

/** Shown with the capnography cues. */
export const ETCO2_CAUTION = 'ETCO2 cues are information only, never a reason on their own to stop or change treatment.';

export interface StatePause {
  startedAtMs: number;
  lengthMs: number;
  reason: CprStopReason | null;
  tooLong: boolean;
}

export interface StateCycle {
  number: number;
  startedAtMs: number;
  checkDueAtMs: number;
  /** checkDueAtMs - clock; negative means the rhythm check is overdue. */
  checkCountdownMs: number;
}

export interface StateRhythmCheck {
  id: string;
  atMs: number;
  rhythm: Rhythm;
  pulse: boolean;
  rhythmClass: RhythmClass;
}

export type ReminderKind =
  | 'rhythm-check'
  | 'pause'
  | 'epinephrine'
  | 'epinephrine-early'
  | 'epinephrine-first'
  | 'antiarrhythmic'
  | 'etco2-low'
  | 'etco2-rise';
export type ReminderState = 'due' | 'overdue' | 'early' | 'too-long' | 'consider';
export type ReminderSeverity = 'info' | 'attention' | 'urgent';

export interface Reminder {
  kind: ReminderKind;
  /** The word a screen shows beside the shape. */
  state: ReminderState;
  severity: ReminderSeverity;
  message: string;
  /** The instant the reminder is about (due time, pause start, the reading...). */
  atMs: number;
}

export interface CodeState {
  /** The moment asked for. */
  atMs: number;
  /** The instant every clock is read at: the moment, or the end of the code once it has ended. */
  clockMs: number;
  arrestAtMs: number;
  arrestElapsedMs: number;
  status: StateStatus;
  roscSinceMs: number | null;
  roscElapsedMs: number | null;
  endedAtMs: number | null;
  outcome: Outcome | null;
  category: CodeCategory;
  weightKg: number | null;
  protocolEdition: string;
  protocolVersion: number | null;
  compressions: {
    running: boolean;
    firstStartedAtMs: number | null;
    /** The current pause during the arrest; null while compressions run, in ROSC, or once ended. */
    pause: StatePause | null;
    cyclesStarted: number;
    /** The running cycle (also through an airway pause or a swap); null when none runs. */
    cycle: StateCycle | null;
    compressionMs: number;
    /** Compression fraction denominator: first compressions to the clock (or the last stop of an ended code), ROSC left out. */
    arrestWindowMs: number;
    fraction: number | null;
    pauseCount: number;
    longPauseCount: number;
  };
  epinephrine: {
    doseCount: number;
    lastDoseAtMs: number | null;
    sinceLastMs: number | null;
    state: EpinephrineState;
    dueFromMs: number | null;
    overdueFromMs: number | null;
    earlyDoses: string[];
  };
  shocks: {
    /** Every shock, both kinds. */
    count: number;
    defibrillations: number;
    cardioversions: number;
    lastJoules: number | null;
    lastSynchronized: boolean | null;
    lastAtMs: number | null;
    sinceLastMs: number | null;
  };
  rhythm: { current: StateRhythmCheck | null; first: StateRhythmCheck | null };
  etco2: { lastMmHg: number | null; lastAtMs: number | null };
  anyRosc: boolean;
  /** True: ROSC held for the sustained time; false: it did not (or no ROSC); null: not observed long enough yet. */
  sustainedRosc: boolean | null;
  drugTotals: DrugAggregate[];
  /** Doses with a flag (past a limit, above the sheet's dose, another unit, early), newest first. */
  flaggedDoses: DoseFact[];
  /** Per catalogue drug: the dose to suggest next, or the limit reached. */
  nextDoses: Record<string, NextDose>;
  nextEnergy: { defibrillation: EnergyStep | null; cardioversion: EnergyStep | null };
  sheet: DosingSheet | null;
  /** An adult code whose weight says child. */
  categoryWarning: string | null;
  /** The category was switched during the code, at this time. */
  categoryChange: { atMs: number; to: CodeCategory } | null;
  recent: EffectiveEntry[];
  /** Most urgent first. Only while the arrest runs (not in ROSC, not once ended). */
  reminders: Reminder[];
}

/** "m:ss", or "h:mm:ss" from an hour; negative values are shown by their size. */
export function formatElapsedMs(ms: number): string {
  const total = Math.floor(Math.abs(ms) / 1000);
  const h = Math.floor(total / 3600);
  const m = Math.floor((total % 3600) / 60);
  const s = String(total % 60).padStart(2, '0');
  return h > 0 ? `${h}:${String(m).padStart(2, '0')}:${s}` : `${m}:${s}`;
}

const PAUSE_REASON_WORDS: Record<CprStopReason, string> = {
  'rhythm-check': 'rhythm check',
  shock: 'shock',
  airway: 'airway',
  rosc: 'ROSC',
  other: 'other reason',
};

const CLASS_WORDS: Record<RhythmClass, string> = {
  vf: 'VF',
  pvt: 'pVT',
  pea: 'PEA',
  asystole: 'asystole',
  perfusing: 'a perfusing rhythm',
  other: 'another rhythm',
};

const SEVERITY_RANK: Record<ReminderSeverity, number> = { urgent: 0, attention: 1, info: 2 };

/** Sustained ROSC as far as a moment shows it: held for the time, broken before it, or not yet known. */
export function sustainedRoscAt(timeline: Timeline, clockMs: number): boolean | null {
  const need = timeline.protocol.sustainedRoscSeconds * 1000;
  let open = false;
  for (const r of timeline.rosc) {
    if (r.startMs > clockMs) break;
    const endMs = r.endMs === null || r.endMs > clockMs ? clockMs : r.endMs;
    if (endMs - r.startMs >= need) return true;
    // Still in ROSC at the clock, or the code ended in it: the 20 min were never there to see.
    open = r.endMs === null || r.endMs > clockMs || r.endedBy === 'end';
  }
  return open ? null : false;
}

export interface StateAtOptions {
  /** Length of `recent`; default RECENT_COUNT. */
  recentCount?: number;
}

export function stateAt(timeline: Timeline, atMs: number, options: StateAtOptions = {}): CodeState {
  const { protocol, arrestAtMs, end } = timeline;
  const ended = end !== null && end.atMs <= atMs;
  const clockMs = ended ? end.atMs : atMs;
  const pauseLimitMs = protocol.pauseWarningSeconds * 1000;
  const epiMinMs = protocol.epinephrineWindowSeconds.min * 1000;
  const epiMaxMs = protocol.epinephrineWindowSeconds.max * 1000;
  const weight = timeline.code.weightKg !== null && timeline.code.weightKg > 0 ? timeline.code.weightKg : null;

  // --- compressions, pauses, ROSC, cycles, read at the clock
  let compressionMs = 0;
  let running = false;
  for (const r of timeline.runs) {
    if (r.startMs > clockMs) break;
    const stop = r.endMs === null || r.endMs > clockMs ? clockMs : r.endMs;
    compressionMs += Math.max(0, stop - r.startMs);
    if (!ended && (r.endMs === null || r.endMs > clockMs)) running = true;
  }
  const roscNow = timeline.rosc.find((r) => r.startMs <= clockMs && (r.endMs === null || r.endMs > clockMs));
  const inRosc = !ended && roscNow !== undefined;
  const status: StateStatus = ended ? 'ended' : inRosc ? 'rosc' : 'arrest';

  let pauseCount = 0;
  let longPauseCount = 0;
  let pause: StatePause | null = null;
  for (const p of timeline.pauses) {
    if (p.startMs > clockMs) break;
    // The last stop of an ended code was a pause while it lasted, but not once the code has ended.
    if (ended && p.endedBy === 'end') continue;
    const open = p.endMs === null || p.endMs > clockMs;
    const lengthMs = (open ? clockMs : (p.endMs ?? clockMs)) - p.startMs;
    if (lengthMs <= 0) continue;
    pauseCount += 1;
    if (lengthMs > pauseLimitMs) longPauseCount += 1;
    if (open && status === 'arrest') pause = { startedAtMs: p.startMs, lengthMs, reason: p.reason, tooLong: lengthMs > pauseLimitMs };
  }

  const first = timeline.firstCompressionsMs;
  let arrestWindowMs = 0;
  let fraction: number | null = null;
  if (first !== null && first <= clockMs) {
    // An ended code stopped in a pause: the window runs to its last compressions.
    const windowEnd = ended && timeline.endedStoppedSinceMs !== null ? Math.min(clockMs, timeline.endedStoppedSinceMs) : clockMs;
    let roscMs = 0;
    for (const r of timeline.rosc) {
      const from = Math.max(r.startMs, first);
      const to = Math.min(r.endMs ?? windowEnd, windowEnd);
      if (to > from) roscMs += to - from;
    }
    arrestWindowMs = Math.max(0, windowEnd - first - roscMs);
    fraction = arrestWindowMs > 0 ? Math.min(1, compressionMs / arrestWindowMs) : null;
  }

  let cycle: StateCycle | null = null;
  let cyclesStarted = 0;
  for (const c of timeline.cycles) {
    // Seen by the moment: begun, and known to the log (a late-tapped check re-anchors later).
    if (c.knownAtMs > atMs || c.startMs > clockMs) continue;
    cyclesStarted = c.number;
    const closed = c.endMs !== null && c.endMs <= clockMs && (c.endKnownAtMs ?? c.endMs) <= atMs;
    cycle =
      closed || status !== 'arrest'
        ? null
        : { number: c.number, startedAtMs: c.startMs, checkDueAtMs: c.checkDueMs, checkCountdownMs: c.checkDueMs - clockMs };
  }

  // --- what had been given and seen by the moment (drugs and shocks after the end still count)
  const upTo = <T extends { atMs: number }>(xs: readonly T[]) => xs.filter((x) => x.atMs <= atMs);
  const doses = upTo(timeline.doses);
  const shocks = upTo(timeline.shocks);
  const checks = upTo(timeline.rhythmChecks);
  const etco2 = upTo(timeline.etco2);
  const drugTotals = aggregateDoses(doses, weight);

  const epiDoses = doses.filter((d) => d.key === EPINEPHRINE_KEY);
  const lastEpi = epiDoses[epiDoses.length - 1] ?? null;
  const epinephrine: CodeState['epinephrine'] = {
    doseCount: epiDoses.length,
    lastDoseAtMs: lastEpi?.atMs ?? null,
    sinceLastMs: null,
    state: 'none-yet',
    dueFromMs: null,
    overdueFromMs: null,
    earlyDoses: epiDoses.filter((d) => d.flags.includes('early')).map((d) => d.id),
  };
  if (lastEpi) {
    const since = Math.max(0, clockMs - lastEpi.atMs);
    epinephrine.sinceLastMs = since;
    epinephrine.dueFromMs = lastEpi.atMs + epiMinMs;
    epinephrine.overdueFromMs = lastEpi.atMs + epiMaxMs;
    // Due from min (inclusive) to max (inclusive); overdue only after max.
    epinephrine.state = since < epiMinMs ? 'early' : since <= epiMaxMs ? 'due' : 'overdue';
  }

  const defibrillations = shocks.filter((s) => s.kind === 'defibrillation').length;
  const cardioversions = shocks.length - defibrillations;
  const lastShock = shocks[shocks.length - 1] ?? null;
  const toCheck = (c: (typeof checks)[number] | undefined): StateRhythmCheck | null =>
    c ? { id: c.id, atMs: c.atMs, rhythm: c.rhythm, pulse: c.pulse, rhythmClass: c.rhythmClass } : null;
  const currentRhythm = toCheck(checks[checks.length - 1]);

  const sheet = timeline.sheet;
  const nextDoses: Record<string, NextDose> = {};
  if (sheet) {
    for (const drug of sheet.drugs) {
      const given = drugTotals.find((t) => t.key === drug.key);
      nextDoses[drug.key] = nextDose(drug, { count: given?.doseCount ?? 0, total: given?.totalInCatalogueUnit ?? 0 });
    }
  }
  const nextEnergy = {
    defibrillation: sheet ? nextShockJoules(sheet, defibrillations, 'defibrillation') : null,
    cardioversion: sheet ? nextShockJoules(sheet, cardioversions, 'cardioversion') : null,
  };

  const recentCount = Math.max(0, options.recentCount ?? RECENT_COUNT);
  const recent: EffectiveEntry[] = [];
  for (let i = timeline.live.length - 1; i >= 0 && recent.length < recentCount; i--) {
    const e = timeline.live[i];
    if (e && Date.parse(e.at) <= atMs) recent.push(e);
  }

  const roscSinceMs = inRosc && roscNow ? roscNow.startMs : null;
  const state: CodeState = {
    atMs,
    clockMs,
    arrestAtMs,
    arrestElapsedMs: clockMs - arrestAtMs,
    status,
    roscSinceMs,
    roscElapsedMs: roscSinceMs === null ? null : Math.max(0, clockMs - roscSinceMs),
    endedAtMs: ended ? end.atMs : null,
    outcome: ended ? end.outcome : null,
    category: timeline.code.category,
    weightKg: timeline.code.weightKg,
    protocolEdition: protocol.edition,
    protocolVersion: timeline.protocolVersion,
    compressions: {
      running,
      firstStartedAtMs: first !== null && first <= clockMs ? first : null,
      pause,
      cyclesStarted,
      cycle,
      compressionMs,
      arrestWindowMs,
      fraction,
      pauseCount,
      longPauseCount,
    },
    epinephrine,
    shocks: {
      count: shocks.length,
      defibrillations,
      cardioversions,
      lastJoules: lastShock?.joules ?? null,
      lastSynchronized: lastShock?.synchronized ?? null,
      lastAtMs: lastShock?.atMs ?? null,
      sinceLastMs: lastShock ? Math.max(0, clockMs - lastShock.atMs) : null,
    },
    rhythm: { current: currentRhythm, first: toCheck(checks[0]) },
    etco2: { lastMmHg: etco2[etco2.length - 1]?.mmHg ?? null, lastAtMs: etco2[etco2.length - 1]?.atMs ?? null },
    anyRosc: timeline.rosc.some((r) => r.startMs <= clockMs),
    sustainedRosc: sustainedRoscAt(timeline, clockMs),
    drugTotals,
    flaggedDoses: doses.filter((d) => d.flags.length > 0).reverse(),
    nextDoses,
    nextEnergy,
    sheet,
    categoryWarning: sheet?.categoryWarning ?? null,
    categoryChange: timeline.categoryChange && timeline.categoryChange.atMs <= atMs ? timeline.categoryChange : null,
    recent,
    reminders: [],
  };
  state.reminders = status === 'arrest' ? remindersOf(timeline, state, etco2) : [];
  return state;
}

function remindersOf(timeline: Timeline, s: CodeState, etco2: readonly { atMs: number; mmHg: number }[]): Reminder[] {
  const { protocol } = timeline;
  const out: Reminder[] = [];
  const clock = s.clockMs;
  const pause = s.compressions.pause;
  if (pause?.tooLong) {
    const why = pause.reason ? ` for ${PAUSE_REASON_WORDS[pause.reason]}` : '';
    out.push({
      kind: 'pause',
      state: 'too-long',
      severity: 'urgent',
      message: `Compressions paused ${formatElapsedMs(pause.lengthMs)}${why}: longer than ${protocol.pauseWarningSeconds} s. Resume compressions.`,
      atMs: pause.startedAtMs,
    });
  }
  const cycle = s.compressions.cycle;
  if (cycle && cycle.checkCountdownMs <= RHYTHM_CHECK_LEAD_MS) {
    const c = cycle.checkCountdownMs;
    const overdue = c < 0;
    out.push({
      kind: 'rhythm-check',
      state: overdue ? 'overdue' : 'due',
      severity: overdue ? 'urgent' : 'attention',
      message: overdue
        ? `Rhythm check overdue by ${formatElapsedMs(c)} (cycle ${cycle.number}).`
        : c === 0
          ? `Rhythm check due now (cycle ${cycle.number}).`
          : // Round up so the countdown reads 0:00 only at the due time.
            `Rhythm check due in ${formatElapsedMs(Math.ceil(c / 1000) * 1000)} (cycle ${cycle.number}).`,
      atMs: cycle.checkDueAtMs,
    });
  }

  const epi = s.epinephrine;
  const minMs = protocol.epinephrineWindowSeconds.min * 1000;
  const maxMs = protocol.epinephrineWindowSeconds.max * 1000;
  const windowWords = `window ${formatElapsedMs(minMs)} to ${formatElapsedMs(maxMs)}`;
  if (epi.sinceLastMs !== null && (epi.state === 'due' || epi.state === 'overdue')) {
    const overdue = epi.state === 'overdue';
    out.push({
      kind: 'epinephrine',
      state: overdue ? 'overdue' : 'due',
      severity: overdue ? 'urgent' : 'attention',
      message: `Epinephrine ${overdue ? 'overdue' : 'due'}: last dose ${formatElapsedMs(epi.sinceLastMs)} ago (${windowWords}).`,
      atMs: (overdue ? epi.overdueFromMs : epi.dueFromMs) ?? clock,
    });
  }
  const lastEarly = epi.earlyDoses[epi.earlyDoses.length - 1];
  if (epi.state === 'early' && lastEarly !== undefined && epi.lastDoseAtMs !== null) {
    out.push({
      kind: 'epinephrine-early',
      state: 'early',
      severity: 'attention',
      message: `Last epinephrine dose was early: given sooner than ${formatElapsedMs(minMs)} after the one before (${windowWords}). Check the dose was intended.`,
      atMs: epi.lastDoseAtMs,
    });
  }

  // The drug sequence of the arrest algorithms, read from the latest rhythm check.
  const rhythm = s.rhythm.current;
  const seq = protocol.sequence;
  const defibs = s.shocks.defibrillations;
  if (epi.doseCount === 0 && rhythm) {
    if (rhythm.rhythmClass === 'pea' || rhythm.rhythmClass === 'asystole') {
      out.push({
        kind: 'epinephrine-first',
        state: 'due',
        severity: 'attention',
        message: `Epinephrine: give as soon as possible for ${CLASS_WORDS[rhythm.rhythmClass]} (non-shockable rhythm).`,
        atMs: rhythm.atMs,
      });
    } else if ((rhythm.rhythmClass === 'vf' || rhythm.rhythmClass === 'pvt') && defibs >= seq.epinephrineAfterShocks) {
      out.push({
        kind: 'epinephrine-first',
        state: 'due',
        severity: 'attention',
        message: `Epinephrine due: ${defibs} shocks given for ${CLASS_WORDS[rhythm.rhythmClass]} (first dose after shock ${seq.epinephrineAfterShocks}).`,
        atMs: timeline.shocks.filter((x) => x.kind === 'defibrillation')[seq.epinephrineAfterShocks - 1]?.atMs ?? rhythm.atMs,
      });
    }
  }
  if (rhythm && (rhythm.rhythmClass === 'vf' || rhythm.rhythmClass === 'pvt') && defibs >= seq.antiarrhythmicAfterShocks) {
    const keys = seq.antiarrhythmicKeys;
    const given = s.drugTotals.some((d) => keys.includes(d.key));
    if (!given && keys.length > 0) {
      const names = keys.map((k) => protocol.drugs.find((d) => d.key === k)?.label.toLowerCase() ?? k);
      out.push({
        kind: 'antiarrhythmic',
        state: 'consider',
        severity: 'attention',
        message: `Consider ${names.join(' or ')}: ${defibs} shocks given for ${CLASS_WORDS[rhythm.rhythmClass]} (after shock ${seq.antiarrhythmicAfterShocks}).`,
        atMs: timeline.shocks.filter((x) => x.kind === 'defibrillation')[seq.antiarrhythmicAfterShocks - 1]?.atMs ?? rhythm.atMs,
      });
    }
  }

  // Capnography cues, information only, from the latest reading since the latest rhythm check.
  const last = etco2[etco2.length - 1];
  const before = etco2[etco2.length - 2];
  if (last && (!rhythm || last.atMs >= rhythm.atMs)) {
    const cue = protocol.etco2;
    if (last.mmHg < cue.lowMmHg && s.compressions.running) {
      out.push({
        kind: 'etco2-low',
        state: 'consider',
        severity: 'info',
        message: `ETCO2 ${last.mmHg} mmHg, under ${cue.lowMmHg}: check compression quality. Information only.`,
        atMs: last.atMs,
      });
    } else if (before && last.mmHg >= cue.roscMmHg && last.mmHg - before.mmHg >= cue.riseMmHg) {
      out.push({
        kind: 'etco2-rise',
        state: 'consider',
        severity: 'attention',
        message: `ETCO2 rose from ${before.mmHg} to ${last.mmHg} mmHg: check for a pulse. Information only.`,
        atMs: last.atMs,
      });
    }
  }
  return out.sort((a, b) => SEVERITY_RANK[a.severity] - SEVERITY_RANK[b.severity]);
}

/** GET /api/codes/:id/state?at=: the state at a moment, with its instants also in ISO 8601. */
export interface CodeStateAnswer {
  /** The moment asked for. */
  at: string;
  /** When the running cycle's rhythm check falls due; null when no cycle runs. */
  rhythmCheckDueAt: string | null;
  /** Due and overdue reminders at that moment, most urgent first. */
  reminders: (Reminder & { at: string })[];
  state: CodeState;
}

export function stateAnswer(state: CodeState): CodeStateAnswer {
  const iso = (ms: number) => new Date(ms).toISOString();
  const due = state.compressions.cycle?.checkDueAtMs;
  return {
    at: iso(state.atMs),
    rhythmCheckDueAt: due === undefined ? null : iso(due),
    reminders: state.reminders.map((r) => ({ ...r, at: iso(r.atMs) })),
    state,
  };
}
