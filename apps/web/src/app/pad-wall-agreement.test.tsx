import { screen } from '@testing-library/react';
import { DEFAULT_PROTOCOL, foldLog, stateAt, stateReadings, type Code, type LogEntry } from '@steadyhand/shared';
import { describe, expect, it } from 'vitest';
import { StatusStrip } from '../features/recorder/components/status-strip';
import { WallFace } from '../features/wall/components/wall-screen';
import type { LiveSyncState } from '../lib/live/use-live-code';
import { renderWithProviders } from '../testing/render';

// The pad's status strip and the wall are two features: they meet here, as they do on the review
// screen's replay. For the same moment of the same log they must say the same things, since both
// read one state (stateAt over the one fold of the log) through the same words (stateReadings).

const ARREST = Date.parse('2026-03-04T07:42:10.000Z');
const at = (min: number, sec = 0) => new Date(ARREST + (min * 60 + sec) * 1000).toISOString();
let n = 0;
const e = (when: string, body: Record<string, unknown>) => ({ id: `e${++n}`, at: when, ...body }) as LogEntry;

const CODE: Code = {
  id: 'code-1',
  status: 'active',
  category: 'adult',
  weightKg: null,
  location: '4 West, bed 12',
  unitId: null,
  patient: null,
  arrestAt: at(0),
  createdAt: at(0),
  createdBy: 'u1',
  endedAt: null,
  outcome: null,
  weightSource: null,
  protocolVersion: 1,
  categoryChangedAt: null,
};

// A shockable arrest with the odd orders a real code has: an airway pause inside a cycle (not a
// rhythm check), epinephrine after the second shock, a third shock, ROSC and a re-arrest.
const LOG: LogEntry[] = [
  e(at(0, 10), { kind: 'cpr', action: 'start' }),
  e(at(1, 50), { kind: 'cpr', action: 'stop', reason: 'airway' }),
  e(at(1, 56), { kind: 'cpr', action: 'start' }),
  e(at(2, 10), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }),
  e(at(2, 12), { kind: 'rhythm', rhythm: 'vf', pulse: false }),
  e(at(2, 15), { kind: 'shock', joules: 200, synchronized: false }),
  e(at(2, 17), { kind: 'cpr', action: 'start' }),
  e(at(4, 20), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }),
  e(at(4, 22), { kind: 'rhythm', rhythm: 'vf', pulse: false }),
  e(at(4, 25), { kind: 'shock', joules: 200, synchronized: false }),
  e(at(4, 27), { kind: 'cpr', action: 'start' }),
  e(at(5, 0), { kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' }),
  e(at(6, 30), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }),
  e(at(6, 32), { kind: 'rhythm', rhythm: 'vf', pulse: false }),
  e(at(6, 35), { kind: 'shock', joules: 200, synchronized: false }),
  e(at(6, 37), { kind: 'cpr', action: 'start' }),
  e(at(8, 40), { kind: 'cpr', action: 'stop', reason: 'rhythm-check' }),
  e(at(8, 42), { kind: 'rhythm', rhythm: 'organized', pulse: true }),
  e(at(8, 45), { kind: 'rosc' }),
  e(at(11, 0), { kind: 'rearrest' }),
  e(at(11, 2), { kind: 'cpr', action: 'start' }),
];

const SYNC: LiveSyncState = {
  connected: true,
  waiting: 0,
  failedCount: 0,
  oldestWaitingAt: null,
  oldestWaitingMs: 0,
  alarm: false,
  lastContactAt: null,
  browserOffline: false,
  joined: true,
  refusal: null,
};

/** Moments across the code: before any shock, mid-cycle after the airway pause, epinephrine due, ROSC, after re-arrest. */
const MOMENTS: [string, number][] = [
  ['1:00, first cycle', ARREST + 60_000],
  ['2:05, after the airway pause', ARREST + 125_000],
  ['4:00, after the first shock', ARREST + 240_000],
  ['6:00, after epinephrine', ARREST + 360_000],
  ['7:30, after the third shock', ARREST + 450_000],
  ['10:00, in ROSC', ARREST + 600_000],
  ['12:00, after re-arrest', ARREST + 720_000],
];

const text = (el: HTMLElement) => el.textContent?.replace(/\s+/g, ' ').trim() ?? '';

describe('the pad and the wall say the same for the same moment', () => {
  const timeline = foldLog(CODE, LOG, DEFAULT_PROTOCOL);

  it('the moments include reminders the tiles carry and reminders listed apart', () => {
    const kinds = MOMENTS.flatMap(([, atMs]) => stateAt(timeline, atMs).reminders.map((r) => r.kind));
    expect(kinds).toEqual(expect.arrayContaining(['rhythm-check', 'epinephrine']));
    expect(kinds.some((k) => k !== 'rhythm-check' && k !== 'pause' && k !== 'epinephrine')).toBe(true);
  });

  it.each(MOMENTS)('at %s', (_label, atMs) => {
    const state = stateAt(timeline, atMs);
    const words = stateReadings(state);
    const { unmount } = renderWithProviders(
      <>
        <StatusStrip timeline={timeline} sync={SYNC} correctedNow={() => atMs} />
        <WallFace code={CODE} protocol={DEFAULT_PROTOCOL} state={state} entries={LOG} />
      </>,
    );
    const pad = (id: string) => text(screen.getByTestId(id));
    const wall = (id: string) => text(screen.getByTestId(id));

    // The arrest clock: the same reading on both.
    expect(pad('clock-arrest')).toContain(words.arrest.value);
    expect(wall('wall-arrest-clock')).toBe(words.arrest.value);
    // Compressions, epinephrine and shocks: the same value and the same state word.
    for (const [padId, wallId, reading] of [
      ['clock-cycle', 'wall-compressions', words.compressions],
      ['clock-epi', 'wall-epinephrine', words.epinephrine],
      ['state-shocks', 'wall-shocks', words.shocks],
    ] as const) {
      expect(pad(padId)).toContain(reading.value);
      expect(wall(wallId)).toContain(reading.value);
      expect(pad(padId)).toContain(reading.word);
      expect(wall(wallId)).toContain(reading.word);
    }
    for (const [padId, wallId] of [['clock-cycle', 'wall-compressions'], ['clock-epi', 'wall-epinephrine']] as const) {
      expect(screen.getByTestId(padId).getAttribute('data-tone')).toBe(screen.getByTestId(wallId).getAttribute('data-tone'));
    }
    expect(pad('state-rhythm')).toContain(words.rhythm.value);
    expect(wall('wall-rhythm')).toContain(words.rhythm.value);
    // What is due, most urgent first: the wall lists the first three; the pad lists them too,
    // except the cycle and epinephrine reminders, which its own tiles carry as a due tone.
    const TILE_OF: Partial<Record<string, string>> = { 'rhythm-check': 'clock-cycle', pause: 'clock-cycle', epinephrine: 'clock-epi' };
    for (const r of state.reminders.slice(0, 3)) {
      expect(wall(`wall-reminder-${r.kind}`)).toContain(r.message);
      const tile = TILE_OF[r.kind];
      if (tile) expect(screen.getByTestId(tile).getAttribute('data-tone')).not.toBe('calm');
      else expect(pad(`pad-reminder-${r.kind}`)).toContain(r.message);
    }
    unmount();
  });
});
