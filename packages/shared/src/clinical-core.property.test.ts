import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { stateAt, type CodeState } from './code-state.js';
import type { LogEntry } from './effective-log.js';
import type { DoseUnit, Rhythm } from './entries.js';
import { ARREST_MS } from './log-fixtures.test-support.js';
import { DEFAULT_PROTOCOL } from './protocol.js';
import { summarize } from './summary.js';
import { documentedRhythm, foldLog } from './timeline.js';

/*
 * Properties of the clinical core on thousands of random logs: the record's summary and the
 * screens' state at the end agree on every figure they share, and the state at any moment is the
 * same whether or not the later entries exist (so a replay shows the code as it was).
 */

type Step =
  | { kind: 'cpr'; action: 'start' | 'stop' | 'swap'; reason?: 'rhythm-check' | 'shock' | 'airway' | 'other' }
  | { kind: 'rhythm'; rhythm: Rhythm; pulse: boolean }
  | { kind: 'shock'; joules: number; synchronized: boolean }
  | { kind: 'drug'; drug: string; dose: number; unit: DoseUnit }
  | { kind: 'etco2'; mmHg: number }
  | { kind: 'rosc' }
  | { kind: 'rearrest' }
  | { kind: 'note'; text: string };

const stepArb: fc.Arbitrary<Step> = fc.oneof(
  { weight: 6, arbitrary: fc.constantFrom<'start' | 'stop' | 'swap'>('start', 'stop', 'swap').chain((action) =>
    action === 'stop'
      ? fc.constantFrom<'rhythm-check' | 'shock' | 'airway' | 'other'>('rhythm-check', 'shock', 'airway', 'other').map((reason) => ({ kind: 'cpr' as const, action, reason }))
      : fc.constant({ kind: 'cpr' as const, action }),
  ) },
  { weight: 3, arbitrary: fc.record({ kind: fc.constant('rhythm' as const), rhythm: fc.constantFrom<Rhythm>('vf', 'pvt', 'pea', 'asystole', 'organized', 'other'), pulse: fc.boolean() }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('shock' as const), joules: fc.constantFrom(120, 150, 200), synchronized: fc.boolean() }) },
  {
    weight: 3,
    arbitrary: fc.record({
      kind: fc.constant('drug' as const),
      drug: fc.constantFrom('epinephrine', 'Adrenaline', 'amiodarone', 'lidocaine', 'atropine', 'sodium-bicarbonate', 'Other drug'),
      dose: fc.constantFrom(0.5, 1, 50, 100, 150, 300),
      unit: fc.constantFrom<DoseUnit>('mg', 'ug', 'meq'),
    }),
  },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('etco2' as const), mmHg: fc.integer({ min: 0, max: 60 }) }) },
  { weight: 1, arbitrary: fc.constant({ kind: 'rosc' as const }) },
  { weight: 1, arbitrary: fc.constant({ kind: 'rearrest' as const }) },
  { weight: 1, arbitrary: fc.constant({ kind: 'note' as const, text: 'note' }) },
);

interface RandomLog {
  entries: LogEntry[];
  lastMs: number;
  endMs: number | null;
}

/** Steps at random gaps (0-90 s, whole or half seconds so ties happen), an end or not, and some voids. */
const logArb = (withVoids: boolean): fc.Arbitrary<RandomLog> =>
  fc
    .record({
      steps: fc.array(fc.record({ gap: fc.integer({ min: 0, max: 180 }), step: stepArb }), { minLength: 1, maxLength: 40 }),
      ends: fc.boolean(),
      endGap: fc.integer({ min: 0, max: 120 }),
      voids: withVoids ? fc.array(fc.nat(), { maxLength: 4 }) : fc.constant([]),
      weightKg: fc.constantFrom(null, 12, 18, 70),
      category: fc.constantFrom<'adult' | 'pediatric'>('adult', 'pediatric'),
    })
    .map(({ steps, ends, endGap, voids }) => {
      let ms = ARREST_MS;
      let n = 0;
      const id = () => `00000000-0000-4000-8000-${String(++n).padStart(12, '0')}`;
      const entries: LogEntry[] = steps.map(({ gap, step }) => {
        ms += gap * 500;
        return { ...step, id: id(), at: new Date(ms).toISOString(), ...(step.kind === 'drug' ? { route: 'iv' } : {}) } as LogEntry;
      });
      let endMs: number | null = null;
      if (ends) {
        endMs = ms + endGap * 500;
        entries.push({ id: id(), at: new Date(endMs).toISOString(), kind: 'end', outcome: 'died' });
      }
      const clinical = entries.length;
      for (const v of voids) {
        const target = entries[v % clinical];
        if (target) entries.push({ id: id(), at: new Date(ms).toISOString(), kind: 'void', target: target.id, reason: 'random void' });
      }
      return { entries, lastMs: ms, endMs };
    });

const codeArb = fc.record({ weightKg: fc.constantFrom(null, 12, 18, 70), category: fc.constantFrom<'adult' | 'pediatric'>('adult', 'pediatric') });

const RUNS = 2000;

describe('summary and state agree (property)', () => {
  it('on every shared figure at the end of the code', () => {
    fc.assert(
      fc.property(logArb(true), codeArb, (log, who) => {
        const code = { arrestAt: new Date(ARREST_MS).toISOString(), ...who };
        const tl = foldLog(code, log.entries, DEFAULT_PROTOCOL);
        const sum = summarize(tl);
        const moment = Math.max(tl.end?.atMs ?? 0, tl.lastEntryMs);
        const st = stateAt(tl, moment);
        const c = st.compressions;
        expect(Math.round(sum.compressionSeconds * 1000)).toBe(c.compressionMs);
        expect(sum.compressionWindowSeconds === null ? 0 : Math.round(sum.compressionWindowSeconds * 1000)).toBe(c.arrestWindowMs);
        expect(sum.compressionFraction).toBe(c.fraction);
        expect(sum.pauses.length).toBe(c.pauseCount);
        expect(sum.longPauses.length).toBe(c.longPauseCount);
        expect(sum.cycleCount).toBe(c.cyclesStarted);
        expect(sum.shocks.length).toBe(st.shocks.count);
        expect(sum.defibrillationCount).toBe(st.shocks.defibrillations);
        expect(sum.cardioversionCount).toBe(st.shocks.cardioversions);
        expect(sum.epinephrineDoses.length).toBe(st.epinephrine.doseCount);
        expect(sum.drugs).toEqual(st.drugTotals);
        for (const d of st.drugTotals) {
          for (const u of d.byUnit) {
            expect(sum.drugTotals.find((r) => r.drug === d.key && r.unit === u.unit)).toMatchObject({ total: u.total, doses: u.doseCount });
          }
        }
        const first = st.rhythm.first;
        expect(sum.firstRhythm).toBe(first ? documentedRhythm(first.rhythm, first.pulse) : null);
        expect(sum.anyRosc).toBe(st.anyRosc);
        expect(sum.sustainedRosc).toBe(st.sustainedRosc);
        expect(sum.flaggedDoses.map((d) => d.id)).toEqual([...st.flaggedDoses].reverse().map((d) => d.id));
        expect(st.status === 'ended').toBe(tl.end !== null);
      }),
      { numRuns: RUNS, seed: 20261205 },
    );
  });
});

/** What the screens show, without the parts that name the moment itself. */
function shown(s: CodeState) {
  return {
    status: s.status,
    clockMs: s.clockMs,
    compressions: s.compressions,
    epinephrine: s.epinephrine,
    shocks: s.shocks,
    rhythm: s.rhythm,
    etco2: s.etco2,
    drugTotals: s.drugTotals,
    flagged: s.flaggedDoses.map((d) => d.id),
    nextDoses: s.nextDoses,
    nextEnergy: s.nextEnergy,
    sustainedRosc: s.sustainedRosc,
    reminders: s.reminders,
    recent: s.recent.map((e) => e.id),
  };
}

describe('the state at a moment does not depend on later entries (property)', () => {
  it('folding the whole log or only what had happened by then gives the same screens', () => {
    fc.assert(
      fc.property(logArb(false), codeArb, fc.double({ min: 0, max: 1, noNaN: true }), (log, who, cut) => {
        const code = { arrestAt: new Date(ARREST_MS).toISOString(), ...who };
        const last = Math.max(log.lastMs, log.endMs ?? 0);
        const moment = Math.round(ARREST_MS + cut * (last + 60_000 - ARREST_MS));
        const prefix = log.entries.filter((e) => Date.parse(e.at) <= moment);
        const whole = stateAt(foldLog(code, log.entries, DEFAULT_PROTOCOL), moment);
        const then = stateAt(foldLog(code, prefix, DEFAULT_PROTOCOL), moment);
        expect(shown(whole)).toEqual(shown(then));
      }),
      { numRuns: RUNS, seed: 51220261 },
    );
  });
});
