import { formatElapsedMs, RHYTHM_CHECK_LEAD_MS, type LiveState } from '@steadyhand/shared';
import type { ShapeKind } from '../../../components/ui/shapes';
import { PAUSE_WORDS } from '../../../lib/live/entry-words';

/**
 * What the wall says about each clock: a big value, a word for the state, a tone and a shape.
 * The word and the shape carry the state; the tone (colour) only repeats it.
 */
export type WallTone = 'calm' | 'ok' | 'due' | 'overdue';

export interface WallReading {
  value: string;
  /** The state in words: DUE, OVERDUE, PAUSED, RUNNING... */
  word: string;
  note: string;
  tone: WallTone;
  shape: ShapeKind | null;
}

const roundUp = (ms: number) => Math.ceil(ms / 1000) * 1000;

/** Compressions running or paused, and the cycle with its countdown to the rhythm check. */
export function compressionReading(s: LiveState): WallReading {
  if (s.status === 'ended')
    return { value: '—', word: 'ENDED', note: 'Code ended: clocks stopped', tone: 'calm', shape: null };
  if (s.status === 'rosc')
    return {
      value: formatElapsedMs(s.roscElapsedMs ?? 0),
      word: 'ROSC',
      note: 'Compressions stopped',
      tone: 'ok',
      shape: 'check',
    };
  const c = s.compressions;
  if (c.running && c.cycle) {
    const left = c.cycle.checkCountdownMs;
    if (left < 0)
      return {
        value: `+${formatElapsedMs(left)}`,
        word: 'CHECK OVERDUE',
        note: `Cycle ${c.cycle.number}: rhythm check overdue`,
        tone: 'overdue',
        shape: 'octagon',
      };
    if (left <= RHYTHM_CHECK_LEAD_MS)
      return {
        value: formatElapsedMs(roundUp(left)),
        word: 'CHECK DUE',
        note: `Cycle ${c.cycle.number}: get ready`,
        tone: 'due',
        shape: 'triangle',
      };
    return {
      value: formatElapsedMs(roundUp(left)),
      word: 'RUNNING',
      note: `Cycle ${c.cycle.number}: to the rhythm check`,
      tone: 'calm',
      shape: 'ring',
    };
  }
  if (c.pause) {
    const why = c.pause.reason ? ` for ${PAUSE_WORDS[c.pause.reason]}` : '';
    return c.pause.tooLong
      ? {
          value: formatElapsedMs(c.pause.lengthMs),
          word: 'PAUSE TOO LONG',
          note: `Paused${why}: resume compressions`,
          tone: 'overdue',
          shape: 'octagon',
        }
      : {
          value: formatElapsedMs(c.pause.lengthMs),
          word: 'PAUSED',
          note: `Paused${why}`,
          tone: 'due',
          shape: 'triangle',
        };
  }
  return { value: '—', word: 'NOT STARTED', note: 'No compressions recorded yet', tone: 'calm', shape: 'ring' };
}

/** Time since the last epinephrine and whether the next dose is due. */
export function epinephrineReading(s: LiveState): WallReading {
  const e = s.epinephrine;
  if (e.sinceLastMs === null)
    return { value: '—', word: 'NONE GIVEN', note: 'No epinephrine recorded', tone: 'calm', shape: 'ring' };
  const value = formatElapsedMs(e.sinceLastMs);
  const given = `${e.doseCount} ${e.doseCount === 1 ? 'dose' : 'doses'} given`;
  if (s.status !== 'arrest')
    return { value, word: 'SINCE LAST', note: given, tone: 'calm', shape: null };
  if (e.state === 'overdue')
    return { value, word: 'OVERDUE', note: `Next dose overdue · ${given}`, tone: 'overdue', shape: 'octagon' };
  if (e.state === 'due')
    return { value, word: 'DUE', note: `Next dose due · ${given}`, tone: 'due', shape: 'triangle' };
  const dueIn = Math.max(0, (e.dueFromMs ?? s.clockMs) - s.clockMs);
  return {
    value,
    word: 'NOT YET DUE',
    note: `Due in ${formatElapsedMs(roundUp(dueIn))} · ${given}`,
    tone: 'calm',
    shape: 'ring',
  };
}

/**
 * The moments the sound cue marks: a rhythm check reaching its due time (once per cycle) and an
 * epinephrine dose falling due (once per last dose). A new key is a new cue.
 */
export function dueCueKeys(s: LiveState): string[] {
  if (s.status !== 'arrest') return [];
  const keys: string[] = [];
  const cycle = s.compressions.cycle;
  if (cycle && cycle.checkCountdownMs <= 0) keys.push(`check:${cycle.number}:${cycle.startedAtMs}`);
  const e = s.epinephrine;
  if ((e.state === 'due' || e.state === 'overdue') && e.lastDoseAtMs !== null) keys.push(`epi:${e.lastDoseAtMs}`);
  return keys;
}

/** "82 %" for the compression fraction, "—" before the first compressions. */
export function fractionText(fraction: number | null): string {
  return fraction === null ? '—' : `${Math.round(fraction * 100)} %`;
}
