import { describe, expect, it } from 'vitest';
import { stateAt } from './code-state.js';
import type { LogEntry } from './effective-log.js';
import { DEFAULT_PROTOCOL } from './protocol.js';
import { compressionReading, dueCueKeys, epinephrineReading, fractionText, shockReading, stateReadings } from './state-words.js';
import { foldLog } from './timeline.js';

const ARREST = Date.parse('2026-03-04T07:42:10.000Z');
const at = (s: number) => new Date(ARREST + s * 1000).toISOString();
let n = 0;
const id = () => `e-${++n}`;
const code = { arrestAt: at(0), category: 'adult' as const, weightKg: null };

function state(entries: LogEntry[], nowS: number) {
  return stateAt(foldLog(code, entries, DEFAULT_PROTOCOL), ARREST + nowS * 1000);
}

const start = (s: number): LogEntry => ({ id: id(), at: at(s), kind: 'cpr', action: 'start' });
const stop = (s: number): LogEntry => ({ id: id(), at: at(s), kind: 'cpr', action: 'stop', reason: 'rhythm-check' });
const epi = (s: number): LogEntry => ({ id: id(), at: at(s), kind: 'drug', drug: 'epinephrine', dose: 1, unit: 'mg', route: 'iv' });

describe('the words the strip and the wall share', () => {
  it('says every state in words and a shape, not colour alone', () => {
    const cycle = DEFAULT_PROTOCOL.cprCycleSeconds;
    expect(compressionReading(state([], 5))).toMatchObject({ word: 'NOT STARTED', shape: 'ring' });
    expect(compressionReading(state([start(10)], 20))).toMatchObject({ word: 'RUNNING', tone: 'calm' });
    expect(compressionReading(state([start(10)], 10 + cycle - 5))).toMatchObject({ word: 'CHECK DUE', shape: 'triangle' });
    expect(compressionReading(state([start(10)], 10 + cycle + 5))).toMatchObject({
      word: 'CHECK OVERDUE',
      shape: 'octagon',
      value: '+0:05',
    });
    expect(compressionReading(state([start(10), stop(30)], 34))).toMatchObject({ word: 'PAUSED', value: '0:04' });
  });

  it('follows the epinephrine window', () => {
    const { min, max } = DEFAULT_PROTOCOL.epinephrineWindowSeconds;
    expect(epinephrineReading(state([], 5)).word).toBe('NONE GIVEN');
    expect(epinephrineReading(state([epi(10)], 20))).toMatchObject({ word: 'NOT YET DUE', shape: 'ring' });
    expect(epinephrineReading(state([epi(10)], 10 + min))).toMatchObject({ word: 'DUE', shape: 'triangle' });
    expect(epinephrineReading(state([epi(10)], 10 + max + 1))).toMatchObject({ word: 'OVERDUE', shape: 'octagon' });
  });

  it('gives one sound cue key per rhythm check and per dose falling due', () => {
    const cycle = DEFAULT_PROTOCOL.cprCycleSeconds;
    const entries = [start(0), epi(0)];
    expect(dueCueKeys(state(entries, cycle - 1))).toEqual([]);
    const atDue = dueCueKeys(state(entries, cycle));
    expect(atDue).toHaveLength(1);
    expect(dueCueKeys(state(entries, cycle + 3))).toEqual(atDue);
    expect(dueCueKeys(state(entries, DEFAULT_PROTOCOL.epinephrineWindowSeconds.min))).toHaveLength(2);
    expect(fractionText(0.824)).toBe('82 %');
    expect(fractionText(null)).toBe('—');
  });

  it('names defibrillations and synchronised shocks apart, and says the fraction comes from taps', () => {
    const sync: LogEntry = { id: id(), at: at(40), kind: 'shock', joules: 100, synchronized: true };
    const defib: LogEntry = { id: id(), at: at(30), kind: 'shock', joules: 200, synchronized: false };
    const r = stateReadings(state([start(0), defib, sync], 50));
    expect(shockReading(state([start(0), defib, sync], 50))).toMatchObject({ value: '2', word: '1 defib. · 1 synchronised', note: 'Last 100 J SYNCHRONISED' });
    expect(r.fraction.word).toBe('FROM TAPS');
  });
});
