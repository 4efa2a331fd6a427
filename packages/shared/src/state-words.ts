import { formatElapsedMs, RHYTHM_CHECK_LEAD_MS, type CodeState, type Reminder } from './code-state.js';
import { doseUnitLabel } from './drug-catalogue.js';
import type { Rhythm } from './entries.js';
import type { DrugAggregate } from './timeline.js';

/**
 * What the pad's strip and the wall say about a moment of a code, in words: one reading per
 * clock, each with a value, a state word, a note, a tone and a shape. Both screens render these
 * and nothing else, so the nurse and the leader read the same words from the same state. The
 * word and the shape carry the state; the tone (colour) only repeats it.
 */

export type ReadingTone = 'calm' | 'ok' | 'due' | 'overdue';
/** Shapes that say a state without colour (drawn by the web app). */
export type ReadingShape = 'ring' | 'triangle' | 'octagon' | 'check' | 'clock' | 'cross' | 'bolt';

export interface Reading {
  /** The big value: a clock, a count, a rhythm. */
  value: string;
  /** The state in words: DUE, OVERDUE, PAUSED, RUNNING... */
  word: string;
  note: string;
  tone: ReadingTone;
  shape: ReadingShape | null;
}

export const RHYTHM_WORDS: Record<Rhythm, string> = {
  vf: 'VF',
  pvt: 'pVT',
  pea: 'PEA',
  asystole: 'Asystole',
  organized: 'Organised',
  other: 'Other rhythm',
};

export const PAUSE_WORDS = {
  'rhythm-check': 'rhythm check',
  shock: 'shock',
  airway: 'airway',
  rosc: 'ROSC',
  other: 'other reason',
} as const;

const roundUp = (ms: number) => Math.ceil(ms / 1000) * 1000;

/** Time since the arrest began and what the code is now. */
export function arrestReading(s: CodeState): Reading {
  const word = s.status === 'ended' ? 'ENDED' : s.status === 'rosc' ? 'ROSC' : 'ARREST';
  const note = s.status === 'ended' ? 'Code ended: clocks stopped' : s.status === 'rosc' ? `ROSC for ${formatElapsedMs(s.roscElapsedMs ?? 0)}` : 'Arrest running';
  return { value: formatElapsedMs(s.arrestElapsedMs), word, note, tone: s.status === 'rosc' ? 'ok' : 'calm', shape: s.status === 'rosc' ? 'check' : null };
}

/** Compressions running or paused, and the cycle with its countdown to the rhythm check. */
export function compressionReading(s: CodeState): Reading {
  if (s.status === 'ended') return { value: '—', word: 'ENDED', note: 'Code ended: clocks stopped', tone: 'calm', shape: null };
  if (s.status === 'rosc')
    return { value: formatElapsedMs(s.roscElapsedMs ?? 0), word: 'ROSC', note: 'Compressions stopped', tone: 'ok', shape: 'check' };
  const c = s.compressions;
  const cycle = c.cycle;
  if (c.pause) {
    const why = c.pause.reason ? ` for ${PAUSE_WORDS[c.pause.reason]}` : '';
    // The cycle keeps running through a pause that is not a rhythm check.
    const check = cycle ? ` · check ${cycle.checkCountdownMs < 0 ? 'overdue' : `in ${formatElapsedMs(roundUp(cycle.checkCountdownMs))}`}` : '';
    return c.pause.tooLong
      ? { value: formatElapsedMs(c.pause.lengthMs), word: 'PAUSE TOO LONG', note: `Paused${why}: resume compressions${check}`, tone: 'overdue', shape: 'octagon' }
      : { value: formatElapsedMs(c.pause.lengthMs), word: 'PAUSED', note: `Paused${why}${check}`, tone: 'due', shape: 'triangle' };
  }
  if (c.running && cycle) {
    const left = cycle.checkCountdownMs;
    if (left < 0)
      return { value: `+${formatElapsedMs(left)}`, word: 'CHECK OVERDUE', note: `Cycle ${cycle.number}: rhythm check overdue`, tone: 'overdue', shape: 'octagon' };
    if (left <= RHYTHM_CHECK_LEAD_MS)
      return { value: formatElapsedMs(roundUp(left)), word: 'CHECK DUE', note: `Cycle ${cycle.number}: get ready`, tone: 'due', shape: 'triangle' };
    return { value: formatElapsedMs(roundUp(left)), word: 'RUNNING', note: `Cycle ${cycle.number}: to the rhythm check`, tone: 'calm', shape: 'ring' };
  }
  return { value: '—', word: 'NOT STARTED', note: 'No compressions recorded yet', tone: 'calm', shape: 'ring' };
}

/** Time since the last epinephrine and whether the next (or the first) dose is due. */
export function epinephrineReading(s: CodeState): Reading {
  const e = s.epinephrine;
  if (e.sinceLastMs === null) {
    const first = s.status === 'arrest' ? s.reminders.find((r) => r.kind === 'epinephrine-first') : undefined;
    return first
      ? { value: '—', word: 'FIRST DOSE DUE', note: first.message, tone: 'due', shape: 'triangle' }
      : { value: '—', word: 'NONE GIVEN', note: 'No epinephrine recorded', tone: 'calm', shape: 'ring' };
  }
  const value = formatElapsedMs(e.sinceLastMs);
  const given = `${e.doseCount} ${e.doseCount === 1 ? 'dose' : 'doses'} given`;
  if (s.status !== 'arrest') return { value, word: 'SINCE LAST', note: given, tone: 'calm', shape: null };
  if (e.state === 'overdue') return { value, word: 'OVERDUE', note: `Next dose overdue · ${given}`, tone: 'overdue', shape: 'octagon' };
  if (e.state === 'due') return { value, word: 'DUE', note: `Next dose due · ${given}`, tone: 'due', shape: 'triangle' };
  const dueIn = Math.max(0, (e.dueFromMs ?? s.clockMs) - s.clockMs);
  return { value, word: 'NOT YET DUE', note: `Due in ${formatElapsedMs(roundUp(dueIn))} · ${given}`, tone: 'calm', shape: 'ring' };
}

/** The latest rhythm check; an organised rhythm without a pulse reads as PEA. */
export function rhythmReading(s: CodeState): Reading {
  const r = s.rhythm.current;
  if (!r) return { value: '—', word: 'NOT CHECKED', note: 'No rhythm check yet', tone: 'calm', shape: null };
  const organisedNoPulse = r.rhythm === 'organized' && r.rhythmClass === 'pea';
  const value = organisedNoPulse ? 'PEA' : RHYTHM_WORDS[r.rhythm];
  const pulse = organisedNoPulse ? 'Organised rhythm, no pulse' : r.pulse ? 'Pulse present' : 'No pulse';
  const shockable = r.rhythmClass === 'vf' || r.rhythmClass === 'pvt';
  return {
    value,
    word: shockable ? 'SHOCKABLE' : r.rhythmClass === 'perfusing' ? 'PULSE' : 'NOT SHOCKABLE',
    note: `${pulse} · ${formatElapsedMs(s.clockMs - r.atMs)} ago`,
    tone: 'calm',
    shape: shockable ? 'bolt' : null,
  };
}

/** Shocks so far, the two kinds apart, and the last energy. */
export function shockReading(s: CodeState): Reading {
  const sh = s.shocks;
  const parts = [`${sh.defibrillations} defib.`];
  if (sh.cardioversions > 0) parts.push(`${sh.cardioversions} synchronised`);
  const last = sh.lastJoules === null ? 'None yet' : `Last ${Number(sh.lastJoules.toPrecision(6))} J ${sh.lastSynchronized ? 'SYNCHRONISED' : 'not synchronised'}`;
  return { value: String(sh.count), word: parts.join(' · '), note: last, tone: 'calm', shape: sh.count > 0 ? 'bolt' : null };
}

/** "82 %" for the compression fraction, "—" before the first compressions. */
export function fractionText(fraction: number | null): string {
  return fraction === null ? '—' : `${Math.round(fraction * 100)} %`;
}

/** The compression fraction so far, from taps (never a sensor). */
export function fractionReading(s: CodeState): Reading {
  const c = s.compressions;
  return {
    value: fractionText(c.fraction),
    word: 'FROM TAPS',
    note: c.fraction === null ? 'From the first compressions' : `${formatElapsedMs(c.compressionMs)} of ${formatElapsedMs(c.arrestWindowMs)}`,
    tone: 'calm',
    shape: null,
  };
}

/** A drug's total in words: in the catalogue unit when every dose converts, else per unit. */
export function drugTotalText(t: DrugAggregate): string {
  const fmt = (x: number) => String(Number(x.toPrecision(6)));
  if (t.totalInCatalogueUnit !== null && t.catalogueUnit && t.allConverted) return `${fmt(t.totalInCatalogueUnit)} ${doseUnitLabel(t.catalogueUnit)}`;
  return t.byUnit.map((u) => `${fmt(u.total)} ${doseUnitLabel(u.unit)}`).join(' + ');
}

/** The state word of a reminder, for a badge beside its message. */
export const REMINDER_WORDS: Record<Reminder['state'], string> = {
  due: 'DUE',
  overdue: 'OVERDUE',
  early: 'EARLY',
  'too-long': 'TOO LONG',
  consider: 'CONSIDER',
};

/** Every reading of the strip and the wall, in the order both show them. */
export function stateReadings(s: CodeState): Record<'arrest' | 'compressions' | 'epinephrine' | 'rhythm' | 'shocks' | 'fraction', Reading> {
  return {
    arrest: arrestReading(s),
    compressions: compressionReading(s),
    epinephrine: epinephrineReading(s),
    rhythm: rhythmReading(s),
    shocks: shockReading(s),
    fraction: fractionReading(s),
  };
}

/**
 * The moments the wall's sound cue marks: a rhythm check reaching its due time (once per cycle)
 * and an epinephrine dose falling due (once per last dose). A new key is a new cue.
 */
export function dueCueKeys(s: CodeState): string[] {
  if (s.status !== 'arrest') return [];
  const keys: string[] = [];
  const cycle = s.compressions.cycle;
  if (cycle && cycle.checkCountdownMs <= 0) keys.push(`check:${cycle.number}:${cycle.startedAtMs}`);
  const e = s.epinephrine;
  if ((e.state === 'due' || e.state === 'overdue') && e.lastDoseAtMs !== null) keys.push(`epi:${e.lastDoseAtMs}`);
  return keys;
}
