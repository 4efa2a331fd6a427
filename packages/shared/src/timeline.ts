import type { Code, CodeCategory } from './codes.js';
import { computeDosing, type DosingSheet, type DrugDosing } from './dosing.js';
import { convertDose, DrugCatalogue, EPINEPHRINE_KEY, roundTotal } from './drug-catalogue.js';
import { effectiveEntries, entryTimeMs, type EffectiveEntry, type LogEntry } from './effective-log.js';
import type { CPR_STOP_REASONS, DoseUnit, Outcome, Rhythm } from './entries.js';
import { SHOCKABLE_RHYTHMS } from './entries.js';
import type { ProtocolSettings } from './protocol.js';

/**
 * Step one of the clinical core: one pass over the effective log (voids and amendments
 * applied) into a Timeline of clinical facts, with no clock in it. Everything a screen, the
 * record, pharmacy or quality shows is read from this by `stateAt` (a moment) or `summarize`
 * (the whole code). Every rule here looks only backwards in time, so the state at any moment
 * is the same whether the later entries exist yet or not.
 */

export type CprStopReason = (typeof CPR_STOP_REASONS)[number];

/**
 * A rhythm check or shock tapped this soon after compressions restarted is a late tap for the
 * pause just before, so the cycle is anchored at that restart. Our own choice, not a published value.
 */
export const RHYTHM_TAP_GRACE_MS = 15_000;

/** What the team does about a rhythm: an organised rhythm without a pulse is PEA. */
export type RhythmClass = 'vf' | 'pvt' | 'pea' | 'asystole' | 'perfusing' | 'other';

export function rhythmClassOf(rhythm: Rhythm, pulse: boolean): RhythmClass {
  switch (rhythm) {
    case 'vf':
    case 'pvt':
    case 'pea':
    case 'asystole':
      return rhythm;
    case 'organized':
      return pulse ? 'perfusing' : 'pea';
    default:
      return 'other';
  }
}

/** The rhythm as a registry counts it: an organised rhythm without a pulse is reported as PEA. */
export function documentedRhythm(rhythm: Rhythm, pulse: boolean): Rhythm {
  return rhythm === 'organized' && !pulse ? 'pea' : rhythm;
}

export interface RhythmCheckFact {
  id: string;
  atMs: number;
  rhythm: Rhythm;
  pulse: boolean;
  rhythmClass: RhythmClass;
  shockable: boolean;
}

export interface CompressionRun {
  startMs: number;
  /** Null while compressions still run at the last entry. */
  endMs: number | null;
  endedBy: 'stop' | 'rosc' | 'end' | null;
}

export interface PauseFact {
  startMs: number;
  /** Null while the pause is still open at the last entry. */
  endMs: number | null;
  /** A compression stop, or a rearrest before compressions restarted. */
  startedBy: 'cpr-stop' | 'rearrest';
  reason: CprStopReason | null;
  /** 'end': compressions never restarted before the code ended; that last stop is not a pause of the code. */
  endedBy: 'compressions' | 'rosc' | 'end' | null;
}

export interface CycleFact {
  /** 1 for the first cycle of the code; keeps counting across ROSC and rearrest. */
  number: number;
  /** When compressions began this cycle. */
  startMs: number;
  /** startMs + the protocol's cycle length. */
  checkDueMs: number;
  /** When the log first showed this cycle (later than startMs for a late-tapped check). */
  knownAtMs: number;
  endMs: number | null;
  /** When the log first showed the end (later than endMs when a late tap re-anchored the cycle). */
  endKnownAtMs: number | null;
  endedBy: 'rhythm-check' | 'shock' | 'rosc' | 'end' | null;
}

export interface RoscFact {
  startMs: number;
  endMs: number | null;
  endedBy: 'rearrest' | 'compressions' | 'end' | null;
}

export interface ShockFact {
  id: string;
  atMs: number;
  joules: number;
  synchronized: boolean;
  /** Defibrillations and synchronised cardioversions are counted apart. */
  kind: 'defibrillation' | 'cardioversion';
  /** 1-based within its kind. */
  number: number;
}

export type DoseFlag =
  /** More doses than the protocol allows for this drug. */
  | 'past-max-doses'
  /** The running total passed the cumulative maximum. */
  | 'past-max-total'
  /** Above the dose the sheet gives for this dose number (e.g. an adult dose given to a child). */
  | 'above-dose'
  /** Recorded in another unit than the catalogue's (mg vs mcg...). */
  | 'other-unit'
  /** Epinephrine sooner than the window's minimum after the dose before. */
  | 'early';

export interface DoseFact {
  id: string;
  atMs: number;
  /** Catalogue key, or the free text in lower case. */
  key: string;
  label: string;
  inCatalogue: boolean;
  dose: number;
  unit: DoseUnit;
  route: string;
  /** The catalogue's unit for this drug; null for free text. */
  catalogueUnit: DoseUnit | null;
  /** 1-based: the nth dose of this drug. */
  number: number;
  /** The dose in the catalogue's unit; null for free text or a unit that does not convert. */
  doseInCatalogueUnit: number | null;
  /** Sum so far in the catalogue's unit (doses that convert). */
  runningTotal: number | null;
  runningTotalPerKg: number | null;
  /** The sheet's dose for this dose number, in the catalogue unit (the upper end of a range). */
  expectedDose: number | null;
  flags: DoseFlag[];
}

export interface DrugAggregate {
  key: string;
  label: string;
  inCatalogue: boolean;
  catalogueUnit: DoseUnit | null;
  doseCount: number;
  firstAtMs: number;
  lastAtMs: number;
  /** One total per unit as recorded, in the order first given. */
  byUnit: { unit: DoseUnit; total: number; doseCount: number }[];
  /** Every dose that converts, in the catalogue unit; null for free-text drugs. */
  totalInCatalogueUnit: number | null;
  /** False when a dose could not be converted (mEq or mL against a mass unit), so the total leaves it out. */
  allConverted: boolean;
  totalPerKg: number | null;
}

export interface TimelineCode {
  id?: string;
  arrestAt: string;
  category: CodeCategory;
  weightKg: number | null;
  /** The code row's end, used when the log has no end entry. */
  endedAt?: string | null;
  patient?: Code['patient'];
  protocolVersion?: number | null;
  /** When the category was last switched during the code. */
  categoryChangedAt?: string | null;
}

export interface Timeline {
  code: TimelineCode;
  protocol: ProtocolSettings;
  protocolVersion: number | null;
  arrestAtMs: number;
  /** The dosing sheet for the code's category and weight; null when the weight is not usable. */
  sheet: DosingSheet | null;
  /** Every clinical entry with corrections applied; voided ones stay, marked. */
  all: EffectiveEntry[];
  /** The entries that count, in log order. */
  live: EffectiveEntry[];
  /** Time of the latest entry that counts (or the arrest). */
  lastEntryMs: number;
  end: { id: string | null; atMs: number; outcome: Outcome | null } | null;
  /** When the category was switched during the code. */
  categoryChange: { atMs: number; to: CodeCategory } | null;
  firstCompressionsMs: number | null;
  runs: CompressionRun[];
  /**
   * Interruptions during the arrest. A stop still open when the code ended is kept with endedBy
   * 'end' (it was a pause while it lasted) but is not a pause of the finished code.
   */
  pauses: PauseFact[];
  /** When the code ended with compressions stopped: the last stop (compression fraction runs to here). */
  endedStoppedSinceMs: number | null;
  cycles: CycleFact[];
  rosc: RoscFact[];
  rhythmChecks: RhythmCheckFact[];
  shocks: ShockFact[];
  doses: DoseFact[];
  drugs: DrugAggregate[];
  airway: Extract<EffectiveEntry, { kind: 'airway' }>[];
  access: Extract<EffectiveEntry, { kind: 'access' }>[];
  etco2: { id: string; atMs: number; mmHg: number }[];
  /** Void and amend entries in the log. */
  corrections: number;
}

type Entry<K extends EffectiveEntry['kind']> = Extract<EffectiveEntry, { kind: K }>;

/** Months between a birth date and the arrest; null when unknown or not a date. */
function ageMonthsAt(birthDate: string | undefined, arrestMs: number): number | null {
  if (!birthDate) return null;
  const born = Date.parse(birthDate);
  if (!Number.isFinite(born) || born > arrestMs) return null;
  return (arrestMs - born) / (30.4375 * 24 * 3600 * 1000);
}

function sheetFor(code: TimelineCode, protocol: ProtocolSettings, arrestMs: number): DosingSheet | null {
  try {
    return computeDosing({ category: code.category, weightKg: code.weightKg, ageMonths: ageMonthsAt(code.patient?.birthDate, arrestMs) }, protocol);
  } catch {
    return null;
  }
}

/** The sheet's dose for the nth dose of a drug (the upper end of a range), before any cumulative limit. */
function expectedDoseFor(drug: DrugDosing | undefined, number: number): number | null {
  if (!drug) return null;
  const line = number <= drug.doses.length ? drug.doses[number - 1] : drug.repeatLine;
  if (!line) return null;
  const low = line.uncappedAmount === null ? line.amount : Math.min(line.uncappedAmount, line.maxDose ?? Infinity);
  const high = line.uncappedAmountHigh === null ? null : Math.min(line.uncappedAmountHigh, line.maxDose ?? Infinity);
  return high ?? low;
}

/** Drug totals from doses (all of a code's, or those given by a moment): one total per unit as recorded, and in the catalogue unit. */
export function aggregateDoses(doses: readonly DoseFact[], weightKg: number | null): DrugAggregate[] {
  const out = new Map<string, DrugAggregate>();
  for (const d of doses) {
    let agg = out.get(d.key);
    if (!agg) {
      agg = {
        key: d.key,
        label: d.label,
        inCatalogue: d.inCatalogue,
        catalogueUnit: d.catalogueUnit,
        doseCount: 0,
        firstAtMs: d.atMs,
        lastAtMs: d.atMs,
        byUnit: [],
        totalInCatalogueUnit: d.inCatalogue ? 0 : null,
        allConverted: true,
        totalPerKg: null,
      };
      out.set(d.key, agg);
    }
    agg.doseCount += 1;
    agg.lastAtMs = d.atMs;
    let u = agg.byUnit.find((x) => x.unit === d.unit);
    if (!u) {
      u = { unit: d.unit, total: 0, doseCount: 0 };
      agg.byUnit.push(u);
    }
    u.total = roundTotal(u.total + d.dose);
    u.doseCount += 1;
    if (d.inCatalogue) {
      if (d.doseInCatalogueUnit === null) agg.allConverted = false;
      else agg.totalInCatalogueUnit = roundTotal((agg.totalInCatalogueUnit ?? 0) + d.doseInCatalogueUnit);
      agg.totalPerKg = weightKg === null || agg.totalInCatalogueUnit === null ? null : roundTotal(agg.totalInCatalogueUnit / weightKg);
    }
  }
  return [...out.values()];
}

/** A dose this much above the sheet's is flagged: rounding to what a syringe measures is not an error. Our own choice. */
const ABOVE_DOSE_TOLERANCE = 0.005;

/**
 * Folds a code's log into its Timeline. `protocol` is the code's own protocol version, so an
 * admin's later change never alters a past code.
 */
export function foldLog(code: TimelineCode, entries: readonly LogEntry[], protocol: ProtocolSettings): Timeline {
  const arrestAtMs = Date.parse(code.arrestAt);
  const cycleMs = protocol.cprCycleSeconds * 1000;
  const epiMinMs = protocol.epinephrineWindowSeconds.min * 1000;
  const catalogue = new DrugCatalogue(protocol);
  const sheet = sheetFor(code, protocol, arrestAtMs);
  const sheetDrugs = new Map((sheet?.drugs ?? []).map((d) => [d.key, d]));
  const weight = code.weightKg !== null && code.weightKg > 0 ? code.weightKg : null;

  const all = effectiveEntries(entries);
  const live = all.filter((e) => e.voided === null);
  const corrections = new Set(entries.filter((e) => e.kind === 'void' || e.kind === 'amend').map((e) => e.id)).size;

  // The log's end entry wins over the code row (it may have been amended).
  const endEntry = live.find((e): e is Entry<'end'> => e.kind === 'end');
  const rowEndMs = code.endedAt ? Date.parse(code.endedAt) : null;
  const end = endEntry
    ? { id: endEntry.id, atMs: entryTimeMs(endEntry), outcome: endEntry.outcome }
    : rowEndMs !== null && Number.isFinite(rowEndMs)
      ? { id: null, atMs: rowEndMs, outcome: null }
      : null;

  const runs: CompressionRun[] = [];
  const pauses: PauseFact[] = [];
  const cycles: CycleFact[] = [];
  const rosc: RoscFact[] = [];
  const rhythmChecks: RhythmCheckFact[] = [];
  const shocks: ShockFact[] = [];
  const doses: DoseFact[] = [];
  const given = new Map<string, { count: number; converted: number }>();
  const airway: Entry<'airway'>[] = [];
  const access: Entry<'access'>[] = [];
  const etco2: Timeline['etco2'] = [];

  let run: CompressionRun | null = null;
  let pause: PauseFact | null = null;
  let cycle: CycleFact | null = null;
  let roscNow: RoscFact | null = null;
  let firstCompressionsMs: number | null = null;
  let lastRestartMs: number | null = null;
  let ended = false;
  let endedStoppedSinceMs: number | null = null;
  let defibrillations = 0;
  let cardioversions = 0;
  let lastEpinephrineMs: number | null = null;
  let lastEntryMs = arrestAtMs;

  const beginCycle = (startMs: number, knownAtMs: number) => {
    cycle = { number: cycles.length + 1, startMs, checkDueMs: startMs + cycleMs, knownAtMs, endMs: null, endKnownAtMs: null, endedBy: null };
    cycles.push(cycle);
  };
  const endCycle = (t: number, by: NonNullable<CycleFact['endedBy']>, knownAtMs = t) => {
    if (cycle) {
      cycle.endMs = t;
      cycle.endKnownAtMs = knownAtMs;
      cycle.endedBy = by;
    }
    cycle = null;
  };
  const closeRun = (t: number, by: NonNullable<CompressionRun['endedBy']>) => {
    if (run) {
      run.endMs = t;
      run.endedBy = by;
    }
    run = null;
  };
  const closePause = (t: number, by: NonNullable<PauseFact['endedBy']>) => {
    if (pause) {
      pause.endMs = t;
      pause.endedBy = by;
      if (t > pause.startMs) pauses.push(pause);
    }
    pause = null;
  };
  /** The end closes whatever runs; a stop still open then was the last, not a pause of the code. */
  const closeAtEnd = (t: number) => {
    if (run) closeRun(t, 'end');
    if (pause) endedStoppedSinceMs = pause.startMs;
    closePause(t, 'end');
    if (roscNow) {
      roscNow.endMs = t;
      roscNow.endedBy = 'end';
      roscNow = null;
    }
    endCycle(t, 'end');
    ended = true;
  };
  /**
   * A rhythm check or a shock ends the cycle. Tapped during a pause: the next compressions
   * begin the next cycle. Tapped while compressions run: soon after a restart it belongs to
   * the pause before (the cycle starts at that restart); later, compressions went on through
   * it and the next cycle starts at once.
   */
  const checkpoint = (t: number, by: 'rhythm-check' | 'shock') => {
    if (ended || roscNow) return;
    if (!run) {
      endCycle(t, by);
      return;
    }
    const current: CycleFact | null = cycle;
    if (lastRestartMs !== null && t - lastRestartMs < RHYTHM_TAP_GRACE_MS) {
      if (current && current.startMs === lastRestartMs) return; // already anchored there
      endCycle(lastRestartMs, by, t);
      beginCycle(lastRestartMs, t);
      return;
    }
    endCycle(t, by);
    beginCycle(t, t);
  };

  for (const e of live) {
    const t = entryTimeMs(e);
    lastEntryMs = Math.max(lastEntryMs, t);
    const clockEntry = e.kind === 'cpr' || e.kind === 'rosc' || e.kind === 'rearrest' || e.kind === 'end';
    // The end freezes the clocks; drugs, shocks and rhythms timed after it still count.
    if (clockEntry && (ended || (end !== null && t > end.atMs))) continue;
    switch (e.kind) {
      case 'cpr': {
        if (e.action === 'start') {
          if (run) break; // a repeated start changes nothing
          if (roscNow) {
            roscNow.endMs = t;
            roscNow.endedBy = 'compressions';
            roscNow = null;
          }
          closePause(t, 'compressions');
          run = { startMs: t, endMs: null, endedBy: null };
          runs.push(run);
          firstCompressionsMs ??= t;
          lastRestartMs = t;
          if (!cycle) beginCycle(t, t);
        } else if (e.action === 'stop') {
          if (!run) break;
          closeRun(t, 'stop');
          pause = { startMs: t, endMs: null, startedBy: 'cpr-stop', reason: e.reason ?? null, endedBy: null };
          // Only a rhythm check or a shock ends the cycle; an airway pause or a swap does not.
          if (e.reason === 'rhythm-check' || e.reason === 'shock') endCycle(t, e.reason);
        }
        // 'swap' changes the compressor, not the clocks.
        break;
      }
      case 'rosc': {
        if (roscNow) break;
        closeRun(t, 'rosc');
        closePause(t, 'rosc');
        endCycle(t, 'rosc');
        roscNow = { startMs: t, endMs: null, endedBy: null };
        rosc.push(roscNow);
        break;
      }
      case 'rearrest': {
        if (!roscNow) break;
        roscNow.endMs = t;
        roscNow.endedBy = 'rearrest';
        roscNow = null;
        // Back in arrest without compressions: a pause, once compressions have begun at all.
        if (firstCompressionsMs !== null) pause = { startMs: t, endMs: null, startedBy: 'rearrest', reason: null, endedBy: null };
        break;
      }
      case 'end': {
        // Only the log's first end entry reaches here (later ones are skipped above).
        closeAtEnd(t);
        break;
      }
      case 'rhythm': {
        const rhythmClass = rhythmClassOf(e.rhythm, e.pulse);
        rhythmChecks.push({ id: e.id, atMs: t, rhythm: e.rhythm, pulse: e.pulse, rhythmClass, shockable: SHOCKABLE_RHYTHMS.includes(e.rhythm) });
        checkpoint(t, 'rhythm-check');
        break;
      }
      case 'shock': {
        const kind = e.synchronized ? 'cardioversion' : 'defibrillation';
        const number = kind === 'defibrillation' ? ++defibrillations : ++cardioversions;
        shocks.push({ id: e.id, atMs: t, joules: e.joules, synchronized: e.synchronized, kind, number });
        checkpoint(t, 'shock');
        break;
      }
      case 'drug': {
        const { key, label, def } = catalogue.identity(e.drug);
        // Counted here for the limits; the totals shown are aggregateDoses over the facts.
        const so = (given.get(key) ?? { count: 0, converted: 0 });
        given.set(key, so);
        so.count += 1;
        const inUnit = def ? convertDose(e.dose, e.unit, def.unit) : null;
        if (inUnit !== null) so.converted = roundTotal(so.converted + inUnit);
        const flags: DoseFlag[] = [];
        const dosing = sheetDrugs.get(key);
        if (def && e.unit !== def.unit) flags.push('other-unit');
        if (dosing?.countLimit != null && so.count > dosing.countLimit) flags.push('past-max-doses');
        if (dosing?.maxTotal != null && def && so.converted > dosing.maxTotal * (1 + ABOVE_DOSE_TOLERANCE)) flags.push('past-max-total');
        const expected = expectedDoseFor(dosing, so.count);
        if (expected !== null && inUnit !== null && inUnit > expected * (1 + ABOVE_DOSE_TOLERANCE)) flags.push('above-dose');
        if (key === EPINEPHRINE_KEY) {
          if (lastEpinephrineMs !== null && t - lastEpinephrineMs < epiMinMs) flags.push('early');
          lastEpinephrineMs = t;
        }
        doses.push({
          id: e.id,
          atMs: t,
          key,
          label,
          inCatalogue: def !== undefined,
          dose: e.dose,
          unit: e.unit,
          route: e.route,
          catalogueUnit: def?.unit ?? null,
          number: so.count,
          doseInCatalogueUnit: inUnit,
          runningTotal: def ? so.converted : null,
          runningTotalPerKg: def && weight !== null ? roundTotal(so.converted / weight) : null,
          expectedDose: expected,
          flags,
        });
        break;
      }
      case 'airway':
        airway.push(e);
        break;
      case 'access':
        access.push(e);
        break;
      case 'etco2':
        etco2.push({ id: e.id, atMs: t, mmHg: e.mmHg });
        break;
      default:
        break;
    }
  }

  // A code ended on the code row only (no end entry): close there, as an end entry would.
  if (!ended && end !== null) closeAtEnd(end.atMs);
  // A pause still open at the last entry stays open: stateAt closes it at its clock.
  if (pause) pauses.push(pause);

  const changedMs = code.categoryChangedAt ? Date.parse(code.categoryChangedAt) : NaN;
  return {
    code,
    protocol,
    protocolVersion: code.protocolVersion ?? null,
    arrestAtMs,
    sheet,
    all,
    live,
    lastEntryMs,
    end,
    categoryChange: Number.isFinite(changedMs) ? { atMs: changedMs, to: code.category } : null,
    firstCompressionsMs,
    runs,
    pauses,
    endedStoppedSinceMs,
    cycles,
    rosc,
    rhythmChecks,
    shocks,
    doses,
    drugs: aggregateDoses(doses, weight),
    airway,
    access,
    etco2,
    corrections,
  };
}
