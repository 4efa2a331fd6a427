import type { CPR_STOP_REASONS, DoseUnit, Outcome, Rhythm } from './entries.js';
import type { CodeCategory } from './codes.js';
import type { DrugDefinition, ProtocolSettings } from './protocol.js';
import { entryTimeMs, liveEntries, type EffectiveEntry, type LogEntry } from './effective-log.js';

/**
 * The live state of a code: every clock, count and reminder the recorder pad and the timer wall
 * show. Pure and recomputed from the whole log on every tick (the log is small; counting ticks
 * would drift), so every screen that has the same entries and the same corrected clock agrees.
 */

export type LiveStatus = 'arrest' | 'rosc' | 'ended';
export type LivePauseReason = (typeof CPR_STOP_REASONS)[number];
export type EpinephrineState = 'none-yet' | 'early' | 'due' | 'overdue';

/** The catalogue key the epinephrine clock follows. */
export const EPINEPHRINE_KEY = 'epinephrine';

/** Other names a recorder may type for a catalogue drug (free-text entries). */
const DRUG_SYNONYMS: Readonly<Record<string, string>> = {
  adrenaline: 'epinephrine',
  adrenalin: 'epinephrine',
  epi: 'epinephrine',
};

/**
 * How long before a rhythm check falls due the reminder appears, so the team can get the next
 * compressor and the defibrillator ready. Our own choice, not a published value.
 */
export const RHYTHM_CHECK_LEAD_MS = 15_000;

/**
 * A rhythm check tapped this soon after compressions (re)started is taken as a late tap for the
 * pause just before, so it does not begin another cycle. Our own choice, not a published value.
 */
export const RHYTHM_TAP_GRACE_MS = 15_000;

/** How many entries `recent` holds unless the caller asks otherwise. */
export const LIVE_RECENT_COUNT = 8;

/** Shown on every surface that shows reminders. */
export const LIVE_REMINDER_CAUTION =
  "Reminders support, and do not replace, the team leader's judgment, local protocol and licensed practice.";

export interface LiveStateInput {
  code: { arrestAt: string; category: CodeCategory; weightKg: number | null };
  entries: readonly LogEntry[];
  settings: ProtocolSettings;
  /** Corrected clock (device time plus measured offset), epoch ms. */
  nowMs: number;
  /** Length of `recent`; default LIVE_RECENT_COUNT. */
  recentCount?: number;
}

export interface LivePause {
  /** When compressions stopped (or the arrest resumed without compressions). */
  startedAtMs: number;
  lengthMs: number;
  /** The stop entry's reason; null when not recorded or when the pause began at a rearrest. */
  reason: LivePauseReason | null;
  /** True when lengthMs is above settings.pauseWarningSeconds. */
  tooLong: boolean;
}

export interface LiveCycle {
  /** 1 for the first cycle of the code; keeps counting across ROSC and rearrest. */
  number: number;
  startedAtMs: number;
  /** startedAtMs + settings.cprCycleSeconds. */
  checkDueAtMs: number;
  /** checkDueAtMs - clock; negative means the rhythm check is overdue. */
  checkCountdownMs: number;
}

export interface LiveCompressions {
  running: boolean;
  firstStartedAtMs: number | null;
  /** The current pause, during the arrest and after compressions first started; else null. */
  pause: LivePause | null;
  /** Number of cycles begun so far (0 before the first compressions). */
  cyclesStarted: number;
  /** The running cycle; null unless compressions are running in the arrest. */
  cycle: LiveCycle | null;
  /** Time with compressions running, up to the clock. */
  compressionMs: number;
  /** CCF denominator: first compression start to the clock, minus ROSC periods. */
  arrestWindowMs: number;
  /** Chest compression fraction, 0..1; null before the first compressions. */
  fraction: number | null;
}

export interface LiveEpinephrine {
  doseCount: number;
  lastDoseAtMs: number | null;
  sinceLastMs: number | null;
  state: EpinephrineState;
  /** Last dose + window min: the next dose is due from here. */
  dueFromMs: number | null;
  /** Last dose + window max: overdue after this instant. */
  overdueFromMs: number | null;
  /** Ids of doses given less than the window min after the dose before. */
  earlyDoses: string[];
}

export interface LiveShocks {
  count: number;
  lastJoules: number | null;
  lastSynchronized: boolean | null;
  lastAtMs: number | null;
  sinceLastMs: number | null;
}

export interface LiveRhythmCheck {
  id: string;
  atMs: number;
  rhythm: Rhythm;
  pulse: boolean;
}

export interface LiveUnitTotal {
  unit: DoseUnit;
  total: number;
  doseCount: number;
}

export interface LiveDrugTotal {
  /** Catalogue key, or the free text lower-cased when the drug is not in the catalogue. */
  key: string;
  /** Catalogue label, or the free text as first entered. */
  label: string;
  inCatalogue: boolean;
  doseCount: number;
  lastAtMs: number;
  /** One total per unit as given, in the order first given: mg is never added to g here. */
  byUnit: LiveUnitTotal[];
  /** The catalogue's unit for this drug; null for free-text drugs. */
  catalogueUnit: DoseUnit | null;
  /** Doses in the catalogue unit, plus mass doses (g, mg, ug) converted to it; null for free-text drugs. */
  totalInCatalogueUnit: number | null;
  /** False when some dose could not be converted (mEq or mL against a mass unit...), so the total leaves it out. */
  allConverted: boolean;
  /** totalInCatalogueUnit per kg when the weight is known. */
  totalPerKg: number | null;
}

export type LiveReminderKind = 'rhythm-check' | 'epinephrine' | 'epinephrine-early' | 'pause';
export type LiveReminderState = 'due' | 'overdue' | 'early' | 'too-long';
export type LiveReminderSeverity = 'attention' | 'urgent';

export interface LiveReminder {
  kind: LiveReminderKind;
  /** The word a screen shows beside the shape: due, overdue, early, too long. */
  state: LiveReminderState;
  severity: LiveReminderSeverity;
  message: string;
  /** The instant the reminder is about (due time, overdue-from time, pause start, early dose). */
  atMs: number;
}

export interface LiveState {
  /** The instant every clock here is read at: nowMs, or the end entry's time once ended. */
  clockMs: number;
  arrestAtMs: number;
  /** From arrestAt to clockMs (ROSC periods included: it is time since the arrest began). */
  arrestElapsedMs: number;
  status: LiveStatus;
  /** Start of the current ROSC period when status is 'rosc'. */
  roscSinceMs: number | null;
  roscElapsedMs: number | null;
  endedAtMs: number | null;
  outcome: Outcome | null;
  compressions: LiveCompressions;
  epinephrine: LiveEpinephrine;
  shocks: LiveShocks;
  rhythm: { current: LiveRhythmCheck | null; first: LiveRhythmCheck | null };
  /** In the order each drug was first given. */
  drugTotals: LiveDrugTotal[];
  /** The last entries that count (voids and amendments applied), newest first. */
  recent: EffectiveEntry[];
  /** Urgent first. Only while the arrest runs (not in ROSC, not once ended). */
  reminders: LiveReminder[];
}

/** Milligrams per unit, for the mass units only; mEq and mL do not convert. */
const MG_PER_UNIT: Partial<Record<DoseUnit, number>> = { g: 1000, mg: 1, ug: 0.001 };

/** Hides binary floating-point noise (0.1 + 0.2) in sums of doses. */
function roundTotal(x: number): number {
  return Math.round(x * 1e6) / 1e6;
}

function convertDose(dose: number, from: DoseUnit, to: DoseUnit): number | null {
  if (from === to) return dose;
  const f = MG_PER_UNIT[from];
  const t = MG_PER_UNIT[to];
  return f === undefined || t === undefined ? null : (dose * f) / t;
}

function normalizeName(name: string): string {
  return name.trim().toLowerCase();
}

/** Index of the catalogue by key and label, lower-cased. Built once per call (a dozen drugs). */
function catalogueIndex(settings: ProtocolSettings): Map<string, DrugDefinition> {
  const index = new Map<string, DrugDefinition>();
  for (const d of settings.drugs) {
    index.set(normalizeName(d.label), d);
    index.set(normalizeName(d.key), d); // the key wins over another drug's label
  }
  return index;
}

/**
 * The catalogue drug a drug entry names (by key, label or a known synonym), or undefined for
 * free text. Case and surrounding spaces do not matter.
 */
export function resolveDrug(settings: ProtocolSettings, name: string): DrugDefinition | undefined {
  return lookupDrug(catalogueIndex(settings), name);
}

function lookupDrug(index: Map<string, DrugDefinition>, name: string): DrugDefinition | undefined {
  const n = normalizeName(name);
  return index.get(n) ?? index.get(DRUG_SYNONYMS[n] ?? '');
}

/** "m:ss", or "h:mm:ss" from an hour; negative values are shown by their size. */
export function formatElapsedMs(ms: number): string {
  const total = Math.floor(Math.abs(ms) / 1000);
  const h = Math.floor(total / 3600);
  const m = Math.floor((total % 3600) / 60);
  const s = String(total % 60).padStart(2, '0');
  return h > 0 ? `${h}:${String(m).padStart(2, '0')}:${s}` : `${m}:${s}`;
}

const PAUSE_REASON_WORDS: Record<LivePauseReason, string> = {
  'rhythm-check': 'rhythm check',
  shock: 'shock',
  airway: 'airway',
  rosc: 'ROSC',
  other: 'other reason',
};

interface DrugAccumulator {
  total: LiveDrugTotal;
  def: DrugDefinition | undefined;
  converted: number;
}

type CycleAnchor = { number: number; startedAtMs: number };

/**
 * Derives the live state from the log. Rules:
 * - Entries count in log order with voids and amendments applied (liveEntries).
 * - A rosc entry stops compressions and pauses the arrest (no cycle, pause or reminders; its time
 *   is left out of the CCF); a rearrest resumes it. Compressions started during ROSC mean the arrest resumed, even if nobody tapped
 *   rearrest (compressions only happen in an arrest).
 * - The first end entry freezes every clock at its time; later cpr, rosc, rearrest and end
 *   entries change nothing, but later drugs, shocks and rhythms still count (nothing is hidden).
 * - A cycle begins when compressions start after a stop, and at a rhythm check recorded while
 *   compressions run (the check that was due happened without a stop being tapped), unless it
 *   comes within RHYTHM_TAP_GRACE_MS of the cycle's start. The next rhythm check is due
 *   settings.cprCycleSeconds after the cycle began.
 * - CCF = compression time / (first compression start to the clock, minus ROSC periods).
 */
export function deriveLiveState(input: LiveStateInput): LiveState {
  const { entries, ...rest } = input;
  return deriveLiveStateFromLive({ ...rest, liveEntries: liveEntries(entries) });
}

export interface LiveStateFromLiveInput extends Omit<LiveStateInput, 'entries'> {
  /** What liveEntries() returns: log order, corrections applied, voided entries left out. */
  liveEntries: readonly EffectiveEntry[];
}

/**
 * deriveLiveState's single pass, for a screen that keeps liveEntries() of its log and redoes it
 * only when the log changes: the sort and the corrections cost more than this pass, and the
 * per-second tick then needs only this.
 */
export function deriveLiveStateFromLive(input: LiveStateFromLiveInput): LiveState {
  const { code, settings, nowMs } = input;
  const cycleMs = settings.cprCycleSeconds * 1000;
  const epiMinMs = settings.epinephrineWindowSeconds.min * 1000;
  const epiMaxMs = settings.epinephrineWindowSeconds.max * 1000;
  const pauseLimitMs = settings.pauseWarningSeconds * 1000;
  const arrestAtMs = Date.parse(code.arrestAt);
  const catalogue = catalogueIndex(settings);

  const entries = input.liveEntries;

  let status: LiveStatus = 'arrest';
  let endedAtMs: number | null = null;
  let outcome: Outcome | null = null;

  // Compressions and the arrest window.
  let running = false;
  let runStartMs = 0;
  let firstStartMs: number | null = null;
  let compressionMs = 0;
  let roscStartMs: number | null = null;
  let roscExcludedMs = 0;
  let pauseStartMs: number | null = null;
  let pauseReason: LivePauseReason | null = null;
  let cyclesStarted = 0;
  let cycle: CycleAnchor | null = null;

  // Epinephrine.
  let epiCount = 0;
  let epiLastMs: number | null = null;
  const earlyDoses: string[] = [];

  // Shocks and rhythm.
  let shockCount = 0;
  let lastShock: { joules: number; synchronized: boolean; atMs: number } | null = null;
  let currentRhythm: LiveRhythmCheck | null = null;
  let firstRhythm: LiveRhythmCheck | null = null;

  const drugs = new Map<string, DrugAccumulator>();

  const closeRosc = (t: number): void => {
    // ROSC before the first compressions lies outside the CCF window anyway.
    if (roscStartMs !== null && firstStartMs !== null) roscExcludedMs += Math.max(0, t - roscStartMs);
    roscStartMs = null;
  };
  const stopCompressions = (t: number): void => {
    if (!running) return;
    compressionMs += Math.max(0, t - runStartMs);
    running = false;
  };

  for (const e of entries) {
    const t = entryTimeMs(e);
    const ended = status === 'ended';
    switch (e.kind) {
      case 'cpr': {
        if (ended) break;
        if (e.action === 'start') {
          if (status === 'rosc') {
            closeRosc(t);
            status = 'arrest';
          }
          if (running) break; // a repeated start changes nothing
          running = true;
          runStartMs = t;
          firstStartMs ??= t;
          pauseStartMs = null;
          pauseReason = null;
          cyclesStarted += 1;
          cycle = { number: cyclesStarted, startedAtMs: t };
        } else if (e.action === 'stop') {
          if (!running) break;
          stopCompressions(t);
          pauseStartMs = t;
          pauseReason = e.reason ?? null;
          cycle = null;
        }
        // 'swap' changes the compressor, not the clocks.
        break;
      }
      case 'rhythm': {
        const check: LiveRhythmCheck = { id: e.id, atMs: t, rhythm: e.rhythm, pulse: e.pulse };
        currentRhythm = check;
        firstRhythm ??= check;
        if (!ended && status === 'arrest' && running && (cycle === null || t - cycle.startedAtMs >= RHYTHM_TAP_GRACE_MS)) {
          cyclesStarted += 1;
          cycle = { number: cyclesStarted, startedAtMs: t };
        }
        break;
      }
      case 'rosc': {
        if (ended || status !== 'arrest') break;
        stopCompressions(t);
        status = 'rosc';
        roscStartMs = t;
        pauseStartMs = null;
        pauseReason = null;
        cycle = null;
        break;
      }
      case 'rearrest': {
        if (ended || status !== 'rosc') break;
        closeRosc(t);
        status = 'arrest';
        // Without compressions yet, the resumed arrest is a pause (if compressions ever ran).
        pauseStartMs = firstStartMs !== null ? t : null;
        pauseReason = null;
        break;
      }
      case 'end': {
        if (ended) break;
        stopCompressions(t);
        if (status === 'rosc') closeRosc(t);
        status = 'ended';
        endedAtMs = t;
        outcome = e.outcome;
        pauseStartMs = null;
        cycle = null;
        break;
      }
      case 'shock': {
        shockCount += 1;
        lastShock = { joules: e.joules, synchronized: e.synchronized, atMs: t };
        break;
      }
      case 'drug': {
        const def = lookupDrug(catalogue, e.drug);
        const key = def?.key ?? normalizeName(e.drug);
        if (key === EPINEPHRINE_KEY) {
          if (epiLastMs !== null && t - epiLastMs < epiMinMs) earlyDoses.push(e.id);
          epiCount += 1;
          epiLastMs = t;
        }
        let acc = drugs.get(key);
        if (!acc) {
          acc = {
            def,
            converted: 0,
            total: {
              key,
              label: def?.label ?? e.drug.trim(),
              inCatalogue: def !== undefined,
              doseCount: 0,
              lastAtMs: t,
              byUnit: [],
              catalogueUnit: def?.unit ?? null,
              totalInCatalogueUnit: null,
              allConverted: true,
              totalPerKg: null,
            },
          };
          drugs.set(key, acc);
        }
        const total = acc.total;
        total.doseCount += 1;
        total.lastAtMs = t;
        let perUnit = total.byUnit.find((u) => u.unit === e.unit); // at most five units
        if (!perUnit) {
          perUnit = { unit: e.unit, total: 0, doseCount: 0 };
          total.byUnit.push(perUnit);
        }
        perUnit.total += e.dose;
        perUnit.doseCount += 1;
        if (acc.def) {
          const c = convertDose(e.dose, e.unit, acc.def.unit);
          if (c === null) total.allConverted = false;
          else acc.converted += c;
        }
        break;
      }
      default:
        break;
    }
  }

  const clockMs = endedAtMs ?? nowMs;

  // Close what is still open at the clock, on copies: the loop's state is done.
  let compressionTotalMs = compressionMs;
  if (running) compressionTotalMs += Math.max(0, clockMs - runStartMs);
  let roscTotalMs = roscExcludedMs;
  if (status === 'rosc' && roscStartMs !== null && firstStartMs !== null) {
    roscTotalMs += Math.max(0, clockMs - roscStartMs);
  }
  const arrestWindowMs = firstStartMs === null ? 0 : Math.max(0, clockMs - firstStartMs - roscTotalMs);
  const fraction =
    firstStartMs === null || arrestWindowMs <= 0 ? null : Math.min(1, compressionTotalMs / arrestWindowMs);

  const inArrest = status === 'arrest';
  let pause: LivePause | null = null;
  if (inArrest && !running && pauseStartMs !== null) {
    const lengthMs = Math.max(0, clockMs - pauseStartMs);
    pause = { startedAtMs: pauseStartMs, lengthMs, reason: pauseReason, tooLong: lengthMs > pauseLimitMs };
  }
  let liveCycle: LiveCycle | null = null;
  if (inArrest && running && cycle !== null) {
    const anchor: CycleAnchor = cycle;
    const checkDueAtMs = anchor.startedAtMs + cycleMs;
    liveCycle = {
      number: anchor.number,
      startedAtMs: anchor.startedAtMs,
      checkDueAtMs,
      checkCountdownMs: checkDueAtMs - clockMs,
    };
  }

  const epinephrine: LiveEpinephrine = {
    doseCount: epiCount,
    lastDoseAtMs: epiLastMs,
    sinceLastMs: null,
    state: 'none-yet',
    dueFromMs: null,
    overdueFromMs: null,
    earlyDoses,
  };
  if (epiLastMs !== null) {
    const since = Math.max(0, clockMs - epiLastMs);
    epinephrine.sinceLastMs = since;
    epinephrine.dueFromMs = epiLastMs + epiMinMs;
    epinephrine.overdueFromMs = epiLastMs + epiMaxMs;
    // Due from min (inclusive) to max (inclusive); overdue only after max.
    epinephrine.state = since < epiMinMs ? 'early' : since <= epiMaxMs ? 'due' : 'overdue';
  }

  const weight = code.weightKg !== null && code.weightKg > 0 ? code.weightKg : null;
  const drugTotals: LiveDrugTotal[] = [];
  for (const acc of drugs.values()) {
    const total = acc.total;
    for (const u of total.byUnit) u.total = roundTotal(u.total);
    if (acc.def) {
      total.totalInCatalogueUnit = roundTotal(acc.converted);
      total.totalPerKg = weight === null ? null : roundTotal(acc.converted / weight);
    }
    drugTotals.push(total);
  }

  const recentCount = Math.max(0, input.recentCount ?? LIVE_RECENT_COUNT);
  const recent: EffectiveEntry[] = [];
  for (let i = entries.length - 1; i >= 0 && recent.length < recentCount; i--) {
    const e = entries[i];
    if (e) recent.push(e);
  }

  const reminders: LiveReminder[] = [];
  if (inArrest) {
    if (pause?.tooLong) {
      const why = pause.reason ? ` for ${PAUSE_REASON_WORDS[pause.reason]}` : '';
      reminders.push({
        kind: 'pause',
        state: 'too-long',
        severity: 'urgent',
        message: `Compressions paused ${formatElapsedMs(pause.lengthMs)}${why}: longer than ${settings.pauseWarningSeconds} s. Resume compressions.`,
        atMs: pause.startedAtMs,
      });
    }
    if (liveCycle && liveCycle.checkCountdownMs <= RHYTHM_CHECK_LEAD_MS) {
      const c = liveCycle.checkCountdownMs;
      const overdue = c < 0;
      reminders.push({
        kind: 'rhythm-check',
        state: overdue ? 'overdue' : 'due',
        severity: overdue ? 'urgent' : 'attention',
        message: overdue
          ? `Rhythm check overdue by ${formatElapsedMs(c)} (cycle ${liveCycle.number}).`
          : c === 0
            ? `Rhythm check due now (cycle ${liveCycle.number}).`
            : // Round up so the countdown reads 0:00 only at the due time.
              `Rhythm check due in ${formatElapsedMs(Math.ceil(c / 1000) * 1000)} (cycle ${liveCycle.number}).`,
        atMs: liveCycle.checkDueAtMs,
      });
    }
    const windowWords = `window ${formatElapsedMs(epiMinMs)} to ${formatElapsedMs(epiMaxMs)}`;
    const since = epinephrine.sinceLastMs;
    if (since !== null && (epinephrine.state === 'due' || epinephrine.state === 'overdue')) {
      const overdue = epinephrine.state === 'overdue';
      reminders.push({
        kind: 'epinephrine',
        state: overdue ? 'overdue' : 'due',
        severity: overdue ? 'urgent' : 'attention',
        message: `Epinephrine ${overdue ? 'overdue' : 'due'}: last dose ${formatElapsedMs(since)} ago (${windowWords}).`,
        atMs: (overdue ? epinephrine.overdueFromMs : epinephrine.dueFromMs) ?? clockMs,
      });
    }
    const lastEarly = earlyDoses[earlyDoses.length - 1];
    if (epinephrine.state === 'early' && lastEarly !== undefined && epiLastMs !== null && since !== null) {
      // Shown until the next dose falls due: the last dose came sooner than the window allows.
      reminders.push({
        kind: 'epinephrine-early',
        state: 'early',
        severity: 'attention',
        message: `Last epinephrine dose was early: given sooner than ${formatElapsedMs(epiMinMs)} after the one before (${windowWords}). Check the dose was intended.`,
        atMs: epiLastMs,
      });
    }
    reminders.sort((a, b) => (a.severity === b.severity ? 0 : a.severity === 'urgent' ? -1 : 1));
  }

  return {
    clockMs,
    arrestAtMs,
    arrestElapsedMs: clockMs - arrestAtMs,
    status,
    roscSinceMs: status === 'rosc' ? roscStartMs : null,
    roscElapsedMs: status === 'rosc' && roscStartMs !== null ? Math.max(0, clockMs - roscStartMs) : null,
    endedAtMs,
    outcome,
    compressions: {
      running,
      firstStartedAtMs: firstStartMs,
      pause,
      cyclesStarted,
      cycle: liveCycle,
      compressionMs: compressionTotalMs,
      arrestWindowMs,
      fraction,
    },
    epinephrine,
    shocks: {
      count: shockCount,
      lastJoules: lastShock?.joules ?? null,
      lastSynchronized: lastShock?.synchronized ?? null,
      lastAtMs: lastShock?.atMs ?? null,
      sinceLastMs: lastShock ? Math.max(0, clockMs - lastShock.atMs) : null,
    },
    rhythm: { current: currentRhythm, first: firstRhythm },
    drugTotals,
    recent,
    reminders,
  };
}
