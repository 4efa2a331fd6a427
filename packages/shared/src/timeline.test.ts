import { describe, expect, it } from 'vitest';
import { stateAt } from './code-state.js';
import type { LogEntry } from './effective-log.js';
import {
  abs,
  adultCode,
  amendOf,
  childCode,
  cprStart,
  cprStop,
  drug,
  end,
  epi,
  etco2,
  rearrest,
  rhythm,
  rosc,
  shock,
  swap,
  t,
} from './log-fixtures.test-support.js';
import { DEFAULT_PROTOCOL } from './protocol.js';
import { stateReadings } from './state-words.js';
import { summarize } from './summary.js';
import { foldLog, type TimelineCode } from './timeline.js';
import { estimateWeightFromAge } from './weight-estimate.js';

/*
 * The clinical core's rules on the cases a resuscitation nurse and a pharmacist raise: each test
 * names where its rule comes from (docs/clinical-sources.md lists the same with their status).
 */

const fold = (entries: LogEntry[], code: TimelineCode = adultCode()) => foldLog(code, entries, DEFAULT_PROTOCOL);
const at = (entries: LogEntry[], offsetMs: number, code: TimelineCode = adultCode()) => stateAt(fold(entries, code), abs(offsetMs));
const kinds = (entries: LogEntry[], offsetMs: number, code?: TimelineCode) => at(entries, offsetMs, code).reminders.map((r) => r.kind);

describe('the 2-minute cycle', () => {
  // AHA 2020 Adult and Pediatric Cardiac Arrest Algorithms: 2 min of CPR between rhythm checks
  // (the "CPR 2 min" boxes; copy of the algorithm, confirmed). Only a rhythm check or a shock ends a cycle.

  it('a 6 s airway pause at 1:50 does not move the rhythm check from 2:00', () => {
    const log = [cprStart(t(0)), cprStop(t(1, 50), 'airway'), cprStart(t(1, 56))];
    const s = at(log, t(1, 58));
    expect(s.compressions.cycle).toMatchObject({ number: 1, startedAtMs: abs(t(0)), checkDueAtMs: abs(t(2)) });
    expect(s.reminders.find((r) => r.kind === 'rhythm-check')?.message).toBe('Rhythm check due in 0:02 (cycle 1).');
    expect(at(log, t(2, 5)).reminders[0]?.message).toBe('Rhythm check overdue by 0:05 (cycle 1).');
  });

  it('the cycle keeps running through the airway pause itself, and says so', () => {
    const s = at([cprStart(t(0)), cprStop(t(1, 50), 'airway')], t(1, 53));
    expect(s.compressions.pause).toMatchObject({ reason: 'airway', lengthMs: 3000 });
    expect(s.compressions.cycle?.checkDueAtMs).toBe(abs(t(2)));
    expect(stateReadings(s).compressions.note).toBe('Paused for airway · check in 0:07');
  });

  it('a swap or an "other" pause does not restart the cycle either', () => {
    const s = at([cprStart(t(0)), swap(t(1)), cprStop(t(1, 10), 'other'), cprStart(t(1, 15))], t(1, 30));
    expect(s.compressions.cycle?.number).toBe(1);
    expect(s.compressions.cycle?.checkDueAtMs).toBe(abs(t(2)));
  });

  it('a rhythm check ends the cycle; the next one runs from the compressions after it', () => {
    const log = [cprStart(t(0)), cprStop(t(2), 'rhythm-check'), rhythm(t(2, 4), 'asystole'), cprStart(t(2, 8))];
    const s = at(log, t(2, 30));
    expect(s.compressions.cycle).toMatchObject({ number: 2, startedAtMs: abs(t(2, 8)), checkDueAtMs: abs(t(4, 8)) });
  });

  it('a shock ends the cycle too', () => {
    const log = [cprStart(t(0)), cprStop(t(2), 'other'), rhythm(t(2, 2), 'vf'), shock(t(2, 6), 200), cprStart(t(2, 8))];
    expect(at(log, t(3)).compressions.cycle).toMatchObject({ number: 2, startedAtMs: abs(t(2, 8)) });
  });

  it('a rhythm check tapped just after compressions restarted belongs to the pause before', () => {
    // 15 s grace: our own choice, no published source.
    const log = [cprStart(t(0)), cprStop(t(2), 'other'), cprStart(t(2, 8)), rhythm(t(2, 15), 'vf')];
    expect(at(log, t(2, 30)).compressions.cycle).toMatchObject({ number: 2, startedAtMs: abs(t(2, 8)) });
    // Replayed before that tap, the screens still showed cycle 1, as they did at the time.
    expect(at(log, t(2, 12)).compressions.cycle).toMatchObject({ number: 1, startedAtMs: abs(t(0)) });
  });
});

describe('the end of a code', () => {
  it('the last stop before the code is ended is not a pause', () => {
    // Compression fraction = compression time / resuscitation time (clinical sheet §3, secondary):
    // once compressions stop for good, resuscitation is over. A terminated code that showed a 54 s
    // "pause over 10 s" now shows none, and its fraction runs to the last compressions.
    const log = [cprStart(t(0)), cprStop(t(2), 'rhythm-check'), cprStart(t(2, 6)), cprStop(t(10), 'other'), end(t(10, 54), 'died')];
    const sum = summarize(fold(log));
    expect(sum.pauses.map((p) => p.seconds)).toEqual([6]);
    expect(sum.longPauses).toEqual([]);
    expect(sum.compressionWindowSeconds).toBe(600);
    expect(sum.compressionFraction).toBeCloseTo(594 / 600, 10);
    // While it was happening the stop was a pause like any other.
    expect(at(log, t(10, 30)).compressions.pause?.tooLong).toBe(true);
  });
});

describe('rhythm classes', () => {
  // An organised rhythm without a pulse is PEA by definition (AHA 2020 adult algorithm, asystole/PEA
  // pathway; Utstein IHCA 2019 first documented rhythm: VF, pVT, PEA, asystole; from memory for the wording).
  it('counts an organised rhythm without a pulse as PEA in the state, the summary and the reminders', () => {
    const log = [cprStart(t(0)), cprStop(t(1, 30), 'rhythm-check'), rhythm(t(1, 32), 'organized', false), cprStart(t(1, 40))];
    const s = at(log, t(1, 45));
    expect(s.rhythm.current?.rhythmClass).toBe('pea');
    expect(stateReadings(s).rhythm.value).toBe('PEA');
    expect(s.reminders.map((r) => r.kind)).toContain('epinephrine-first');
    const sum = summarize(fold(log));
    expect(sum.firstRhythm).toBe('pea');
    expect(sum.firstRhythmShockable).toBe(false);
  });

  it('an organised rhythm with a pulse is not PEA', () => {
    const s = at([rhythm(t(1), 'organized', true)], t(2));
    expect(s.rhythm.current?.rhythmClass).toBe('perfusing');
    expect(summarize(fold([rhythm(t(1), 'organized', true)])).firstRhythm).toBe('organized');
  });
});

describe('sustained ROSC', () => {
  // Sustained ROSC = no compressions for 20 consecutive minutes (Utstein 2004 update, Jacobs et al.,
  // Circulation 2004; clinical sheet §4, confirmed secondary).
  const base = [cprStart(t(0)), cprStop(t(4), 'rhythm-check'), rhythm(t(4, 2), 'organized', true), rosc(t(4, 5))];

  it('is not observed when the team hands over after 17 min of ROSC', () => {
    const sum = summarize(fold([...base, end(t(21, 5), 'rosc')]));
    expect(sum.sustainedRosc).toBeNull();
    expect(sum.sustainedRoscText).toBe('not observed: handed over after 17 min of ROSC');
    expect(sum.anyRosc).toBe(true);
  });

  it('is yes after 20 min of ROSC', () => {
    expect(summarize(fold([...base, end(t(24, 5), 'rosc')])).sustainedRosc).toBe(true);
    // The live state says so at the 20th minute, before the code is ended.
    expect(at(base, t(24, 5)).sustainedRosc).toBe(true);
    expect(at(base, t(24, 4)).sustainedRosc).toBeNull();
  });

  it('is no after a re-arrest within 20 min, or when compressions restart', () => {
    expect(summarize(fold([...base, rearrest(t(14)), cprStart(t(14, 5)), end(t(30), 'died')])).sustainedRosc).toBe(false);
    expect(summarize(fold([...base, cprStart(t(9)), end(t(30), 'died')])).sustainedRosc).toBe(false);
    expect(summarize(fold([cprStart(t(0)), end(t(30), 'died')])).sustainedRoscText).toBe('no: no ROSC');
  });
});

describe('the drug sequence reminders', () => {
  // AHA 2020 Adult Cardiac Arrest Algorithm (copy, confirmed): non-shockable, epinephrine as soon as
  // possible (box 9); shockable, epinephrine after the 2nd shock (boxes 5-6), amiodarone or lidocaine
  // after the 3rd shock (boxes 7-8). The AHA 2020 PALS algorithm has the same sequence (copy, confirmed).
  it('asks for epinephrine as soon as possible for asystole', () => {
    const log = [cprStart(t(0)), cprStop(t(1), 'rhythm-check'), rhythm(t(1, 2), 'asystole'), cprStart(t(1, 5))];
    const s = at(log, t(1, 10));
    expect(s.reminders.find((r) => r.kind === 'epinephrine-first')?.message).toBe(
      'Epinephrine: give as soon as possible for asystole (non-shockable rhythm).',
    );
    expect(stateReadings(s).epinephrine.word).toBe('FIRST DOSE DUE');
    expect(kinds([...log, epi(t(1, 40))], t(1, 45))).not.toContain('epinephrine-first');
  });

  it('asks for epinephrine after the 2nd shock for VF, not after the 1st', () => {
    const log = [cprStart(t(0)), cprStop(t(2), 'rhythm-check'), rhythm(t(2, 1), 'vf'), shock(t(2, 5), 200), cprStart(t(2, 7))];
    expect(kinds(log, t(3))).not.toContain('epinephrine-first');
    const two = [...log, cprStop(t(4, 7), 'rhythm-check'), rhythm(t(4, 8), 'vf'), shock(t(4, 12), 200), cprStart(t(4, 14))];
    expect(at(two, t(4, 20)).reminders.find((r) => r.kind === 'epinephrine-first')?.message).toBe(
      'Epinephrine due: 2 shocks given for VF (first dose after shock 2).',
    );
  });

  it('asks for amiodarone or lidocaine after the 3rd shock while the rhythm stays shockable', () => {
    const log: LogEntry[] = [cprStart(t(0))];
    for (let i = 1; i <= 3; i++) log.push(cprStop(t(2 * i), 'rhythm-check'), rhythm(t(2 * i, 1), 'vf'), shock(t(2 * i, 4), 200), cprStart(t(2 * i, 6)));
    expect(at(log, t(6, 10)).reminders.find((r) => r.kind === 'antiarrhythmic')?.message).toBe(
      'Consider amiodarone or lidocaine: 3 shocks given for VF (after shock 3).',
    );
    expect(kinds([...log, drug(t(6, 30), 'amiodarone', 300)], t(6, 40))).not.toContain('antiarrhythmic');
    expect(kinds([...log, cprStop(t(8, 6), 'rhythm-check'), rhythm(t(8, 7), 'asystole'), cprStart(t(8, 9))], t(8, 20))).not.toContain(
      'antiarrhythmic',
    );
  });

  it('counts only defibrillations: synchronised shocks do not bring the sequence forward', () => {
    const log = [rhythm(t(0, 30), 'pvt'), shock(t(1), 100, true), shock(t(2), 100, true), cprStart(t(2, 2))];
    expect(kinds(log, t(2, 10))).not.toContain('epinephrine-first');
  });
});

describe('capnography cues (information only)', () => {
  // AHA 2020 adult algorithm (copy, confirmed): PETCO2 < 10 mmHg, try to improve CPR quality; an
  // abrupt sustained rise, typically ≥ 40 mmHg, is a sign of ROSC. The 10 mmHg rise that makes it
  // "abrupt" is our own choice, no published source.
  it('says check compression quality under 10 mmHg while compressions run', () => {
    const s = at([cprStart(t(0)), etco2(t(1), 8)], t(1, 5));
    expect(s.reminders.find((r) => r.kind === 'etco2-low')?.message).toBe('ETCO2 8 mmHg, under 10: check compression quality. Information only.');
    expect(s.reminders.find((r) => r.kind === 'etco2-low')?.severity).toBe('info');
  });

  it('says check for a pulse after an abrupt rise to 40 or more', () => {
    const s = at([cprStart(t(0)), etco2(t(1), 14), etco2(t(2), 44)], t(2, 5));
    expect(s.reminders.find((r) => r.kind === 'etco2-rise')?.message).toBe('ETCO2 rose from 14 to 44 mmHg: check for a pulse. Information only.');
    expect(kinds([cprStart(t(0)), etco2(t(1), 38), etco2(t(2), 42)], t(2, 5))).not.toContain('etco2-rise');
  });
});

describe('a child started as an adult', () => {
  it('warns an adult code given 12 kg, and flags the adult doses once switched to a child', () => {
    // 40 kg threshold: common practice, no published source. 0.01 mg/kg epinephrine: PALS medications table.
    const log = [cprStart(t(0)), epi(t(1), 1)];
    expect(at(log, t(1, 30), adultCode(12)).categoryWarning).toMatch(/^Weight 12 kg is under 40 kg/);
    const switched = { ...childCode(12), categoryChangedAt: new Date(abs(t(2))).toISOString() };
    const s = at(log, t(2, 30), switched);
    expect(s.flaggedDoses[0]).toMatchObject({ key: 'epinephrine', dose: 1, expectedDose: 0.12, flags: ['above-dose'] });
    expect(s.nextDoses['epinephrine']?.line?.display).toBe('0.12 mg');
    expect(s.nextEnergy.defibrillation?.display).toBe('24 J');
    expect(s.categoryChange).toEqual({ atMs: abs(t(2)), to: 'pediatric' });
  });
});

describe('dose limits in the live state', () => {
  it('offers no third adult amiodarone dose without a second tap, and flags one recorded anyway', () => {
    // AHA 2020 adult algorithm: amiodarone 300 mg then 150 mg.
    const log = [drug(t(5), 'amiodarone', 300), drug(t(10), 'amiodarone', 150)];
    expect(at(log, t(11)).nextDoses['amiodarone']?.limit?.message).toBe('Limit reached: 2 of 2 doses given');
    const third = [...log, drug(t(15), 'amiodarone', 150)];
    expect(at(third, t(16)).flaggedDoses[0]?.flags).toEqual(['past-max-doses']);
  });

  it('converts a dose recorded in mcg into the catalogue unit and flags the other unit', () => {
    const s = at([drug(t(1), 'epinephrine', 100, 'ug')], t(2));
    expect(s.drugTotals[0]).toMatchObject({ totalInCatalogueUnit: 0.1, byUnit: [{ unit: 'ug', total: 100, doseCount: 1 }] });
    expect(s.flaggedDoses[0]?.flags).toContain('other-unit');
  });
});

describe('defibrillations and cardioversions are counted apart', () => {
  // AHA 2020 Pediatric algorithms: defibrillation 2 J/kg then 4 J/kg; cardioversion 0.5-1 J/kg then 2 J/kg.
  it('a cardioversion does not move a child to the second defibrillation energy', () => {
    const s = at([shock(t(1), 10, true)], t(2), childCode(20));
    expect(s.nextEnergy.defibrillation?.joules).toBe(40);
    expect(s.nextEnergy.cardioversion?.joules).toBe(40);
    expect(s.shocks).toMatchObject({ defibrillations: 0, cardioversions: 1 });
  });
});

describe('when the arrest was recognised', () => {
  it('every interval follows a corrected arrest time', () => {
    const log = [cprStart(t(1)), shock(t(3), 200), end(t(20), 'died')];
    const late = summarize(fold(log));
    const corrected = summarize(fold(log, { ...adultCode(), arrestAt: new Date(abs(-t(2))).toISOString() }));
    expect(late.intervals.arrestToFirstCompressions).toBe(60);
    expect(corrected.intervals.arrestToFirstCompressions).toBe(180);
    expect(corrected.intervals.arrestToFirstShock).toBe(300);
  });
});

describe('the protocol version', () => {
  it('folds with the version the code kept, and the summary names it', () => {
    const old = { ...DEFAULT_PROTOCOL, cprCycleSeconds: 180, edition: 'Local protocol 2025' };
    const tl = foldLog({ ...adultCode(), protocolVersion: 3 }, [cprStart(t(0))], old);
    expect(stateAt(tl, abs(t(1))).compressions.cycle?.checkDueAtMs).toBe(abs(t(3)));
    expect(summarize(tl)).toMatchObject({ protocolVersion: 3, protocolEdition: 'Local protocol 2025' });
  });
});

describe('amendments in the fold', () => {
  it('an amended rhythm changes the sequence reminders', () => {
    const r = rhythm(t(1), 'vf');
    const log = [cprStart(t(0)), r, amendOf(t(5), r, { rhythm: 'asystole' })];
    expect(kinds(log, t(1, 30))).toContain('epinephrine-first');
  });
});

describe('weight estimate by age', () => {
  // APLS age formulas, 2011 revision (from memory): 0.5 × months + 4; 2 × years + 8; 3 × years + 7.
  it('gives 7 kg at 6 months, 16 kg at 4 years, 31 kg at 8 years, and nothing past 12 years', () => {
    expect(estimateWeightFromAge(6)?.weightKg).toBe(7);
    expect(estimateWeightFromAge(4 * 12 + 5)).toEqual({ weightKg: 16, formula: 'estimate for 4 years: 2 × 4 + 8 = 16 kg' });
    expect(estimateWeightFromAge(8 * 12)?.weightKg).toBe(31);
    expect(estimateWeightFromAge(13 * 12)).toBeNull();
  });
});
