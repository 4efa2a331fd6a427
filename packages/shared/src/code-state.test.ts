import { describe, it, expect } from 'vitest';
import { formatElapsedMs, stateAt, type CodeState } from './code-state.js';
import { resolveDrug } from './drug-catalogue.js';
import { foldLog } from './timeline.js';
import { DEFAULT_PROTOCOL, type ProtocolSettings } from './protocol.js';
import type { LogEntry } from './effective-log.js';
import {
  abs,
  amendOf,
  cprStart,
  cprStop,
  drug,
  end,
  epi,
  iso,
  note,
  rearrest,
  rhythm,
  rosc,
  S,
  shock,
  t,
  voidOf,
} from './log-fixtures.test-support.js';

// --- fixtures (shared builders; times are offsets from the demo arrest at 07:42:10) -----------

function live(
  entries: LogEntry[],
  nowOffsetMs: number,
  opts: { settings?: ProtocolSettings; weightKg?: number | null; recentCount?: number } = {},
): CodeState {
  const timeline = foldLog({ arrestAt: iso(0), category: 'adult', weightKg: opts.weightKg ?? null }, entries, opts.settings ?? DEFAULT_PROTOCOL);
  return stateAt(timeline, abs(nowOffsetMs), opts.recentCount !== undefined ? { recentCount: opts.recentCount } : {});
}

// --- tests ----------------------------------------------------------------------------------

describe('arrest clock and status', () => {
  it('counts from arrestAt to now while the arrest runs', () => {
    const s = live([cprStart(t(0, 15))], t(5, 7));
    expect(s.status).toBe('arrest');
    expect(s.arrestElapsedMs).toBe(t(5, 7));
    expect(s.clockMs).toBe(abs(t(5, 7)));
  });

  it('ROSC stops compressions with no explicit stop and starts the ROSC clock', () => {
    const s = live([cprStart(t(0, 15)), rosc(t(16, 20))], t(18, 0));
    expect(s.status).toBe('rosc');
    expect(s.roscSinceMs).toBe(abs(t(16, 20)));
    expect(s.roscElapsedMs).toBe(t(1, 40));
    expect(s.arrestElapsedMs).toBe(t(18, 0)); // time since the arrest began keeps running
    expect(s.compressions.running).toBe(false);
    expect(s.compressions.compressionMs).toBe(t(16, 5));
    expect(s.compressions.pause).toBeNull();
    expect(s.compressions.cycle).toBeNull();
    expect(s.reminders).toEqual([]);
  });

  it('rearrest resumes the arrest; until compressions restart it is a pause', () => {
    const s = live([cprStart(t(0, 15)), rosc(t(10)), rearrest(t(12))], t(12, 4));
    expect(s.status).toBe('arrest');
    expect(s.roscSinceMs).toBeNull();
    expect(s.compressions.running).toBe(false);
    expect(s.compressions.pause?.startedAtMs).toBe(abs(t(12)));
    expect(s.compressions.pause?.lengthMs).toBe(4 * S);
  });

  it('compressions started during ROSC resume the arrest even without a rearrest tap', () => {
    const s = live([cprStart(t(0)), rosc(t(5)), cprStart(t(7))], t(8));
    expect(s.status).toBe('arrest');
    expect(s.compressions.running).toBe(true);
    // 5 min before ROSC + 1 min after; the 2 min of ROSC are out of the window.
    expect(s.compressions.compressionMs).toBe(t(6));
    expect(s.compressions.arrestWindowMs).toBe(t(6));
  });

  it('end freezes every clock at the end entry and silences reminders', () => {
    const entries = [cprStart(t(0, 15)), epi(t(4)), end(t(20))];
    const atEnd = live(entries, t(20));
    const later = live(entries, t(45));
    expect(later.status).toBe('ended');
    expect(later.endedAtMs).toBe(abs(t(20)));
    expect(later.outcome).toBe('rosc');
    expect(later.clockMs).toBe(abs(t(20)));
    expect(later.arrestElapsedMs).toBe(t(20));
    expect(later.epinephrine.sinceLastMs).toBe(t(16));
    expect(later.compressions.compressionMs).toBe(t(19, 45));
    expect(later.compressions.running).toBe(false);
    expect(later.reminders).toEqual([]);
    expect(later.compressions).toEqual(atEnd.compressions);
  });

  it('after the end, cpr, rosc and rearrest entries change nothing', () => {
    const s = live([cprStart(t(0)), end(t(10)), cprStart(t(11)), rearrest(t(12)), rosc(t(13))], t(20));
    expect(s.status).toBe('ended');
    expect(s.compressions.compressionMs).toBe(t(10));
    expect(s.compressions.cyclesStarted).toBe(1);
  });
});

describe('compression cycles and the rhythm-check countdown', () => {
  // 2-min cycle: AHA 2020 Adult Cardiac Arrest Algorithm, "CPR 2 min" boxes (clinical sheet 1a).
  // Checks due at t0+2:00, t0+4:00: arithmetic derived from that rule (clinical sheet section 6).
  const t0 = t(0, 15); // compressions start 07:42:25 as in the brief's demo

  it('first rhythm check is due at t0+2:00', () => {
    const s = live([cprStart(t0)], t0 + t(1, 0));
    expect(s.compressions.cycle).toEqual({
      number: 1,
      startedAtMs: abs(t0),
      checkDueAtMs: abs(t0 + t(2, 0)),
      checkCountdownMs: t(1, 0),
    });
  });

  it('after a check at t0+2:00 (stop, rhythm, restart) the next is due at t0+4:00', () => {
    const entries = [cprStart(t0), cprStop(t0 + t(2), 'rhythm-check'), rhythm(t0 + t(2), 'vf'), cprStart(t0 + t(2))];
    const s = live(entries, t0 + t(3));
    expect(s.compressions.cycle?.number).toBe(2);
    expect(s.compressions.cycle?.checkDueAtMs).toBe(abs(t0 + t(4, 0)));
    expect(s.compressions.cycle?.checkCountdownMs).toBe(t(1));
  });

  it('a rhythm check tapped without a stop also begins the next cycle: due t0+4:00, then t0+6:00', () => {
    const first = live([cprStart(t0), rhythm(t0 + t(2), 'vf')], t0 + t(2, 30));
    expect(first.compressions.cycle?.checkDueAtMs).toBe(abs(t0 + t(4)));
    const second = live([cprStart(t0), rhythm(t0 + t(2), 'vf'), rhythm(t0 + t(4), 'pea')], t0 + t(4, 30));
    expect(second.compressions.cycle?.number).toBe(3);
    expect(second.compressions.cycle?.checkDueAtMs).toBe(abs(t0 + t(6)));
    expect(second.compressions.running).toBe(true);
  });

  it('the cycle restarts when compressions restart after a pause: 8 s pause at 2:00 moves the check to 4:08', () => {
    // Arithmetic from the brief's rule (cycle starts at the restart), not a published value.
    const entries = [cprStart(t0), cprStop(t0 + t(2), 'rhythm-check'), cprStart(t0 + t(2, 8))];
    const s = live(entries, t0 + t(3));
    expect(s.compressions.cycle?.startedAtMs).toBe(abs(t0 + t(2, 8)));
    expect(s.compressions.cycle?.checkDueAtMs).toBe(abs(t0 + t(4, 8)));
  });

  it('a rhythm check tapped a few seconds after the restart does not begin another cycle', () => {
    const entries = [cprStart(t0), cprStop(t0 + t(2)), cprStart(t0 + t(2, 6)), rhythm(t0 + t(2, 9), 'vf')];
    const s = live(entries, t0 + t(2, 30));
    expect(s.compressions.cycle?.number).toBe(2);
    expect(s.compressions.cycle?.startedAtMs).toBe(abs(t0 + t(2, 6)));
  });

  it('countdown goes negative when the check is overdue, and the reminder says so in words', () => {
    const s = live([cprStart(t0)], t0 + t(2, 20));
    expect(s.compressions.cycle?.checkCountdownMs).toBe(-20 * S);
    const r = s.reminders.find((x) => x.kind === 'rhythm-check');
    expect(r?.state).toBe('overdue');
    expect(r?.severity).toBe('urgent');
    expect(r?.message).toBe('Rhythm check overdue by 0:20 (cycle 1).');
  });

  it('the rhythm-check reminder appears 15 s ahead as due, and not before', () => {
    // 15 s lead: our own choice, no published source.
    expect(live([cprStart(t0)], t0 + t(1, 44)).reminders).toEqual([]);
    const soon = live([cprStart(t0)], t0 + t(1, 50));
    expect(soon.reminders).toHaveLength(1);
    expect(soon.reminders[0]).toMatchObject({ kind: 'rhythm-check', state: 'due', severity: 'attention' });
    expect(soon.reminders[0]?.message).toBe('Rhythm check due in 0:10 (cycle 1).');
    expect(live([cprStart(t0)], t0 + t(2)).reminders[0]?.message).toBe('Rhythm check due now (cycle 1).');
  });

  it('no countdown during a pause; the cycle count stays', () => {
    const s = live([cprStart(t0), cprStop(t0 + t(2), 'rhythm-check')], t0 + t(2, 5));
    expect(s.compressions.cycle).toBeNull();
    expect(s.compressions.cyclesStarted).toBe(1);
  });

  it('a repeated start tap changes nothing', () => {
    const s = live([cprStart(t0), cprStart(t0 + t(0, 30))], t0 + t(1));
    expect(s.compressions.cycle?.startedAtMs).toBe(abs(t0));
    expect(s.compressions.cyclesStarted).toBe(1);
  });

  it('follows settings.cprCycleSeconds', () => {
    const settings = { ...DEFAULT_PROTOCOL, cprCycleSeconds: 180 };
    const s = live([cprStart(t0)], t0 + t(1), { settings });
    expect(s.compressions.cycle?.checkDueAtMs).toBe(abs(t0 + t(3)));
  });
});

describe('compression pauses', () => {
  // Limit 10 s: AHA "BLS Dos and Don'ts of Adult High-Quality CPR" table, "Do not pause
  // compressions for more than 10 s" (clinical sheet 1b).
  const entries = [cprStart(t(0, 15)), cprStop(t(2, 15), 'shock')];

  it('gives the pause length and its reason', () => {
    const s = live(entries, t(2, 22));
    expect(s.compressions.running).toBe(false);
    expect(s.compressions.pause).toEqual({ startedAtMs: abs(t(2, 15)), lengthMs: 7 * S, reason: 'shock', tooLong: false });
  });

  it('10 s is not over the limit; 11 s is, with an urgent reminder in words', () => {
    expect(live(entries, t(2, 25)).compressions.pause?.tooLong).toBe(false);
    const s = live(entries, t(2, 26));
    expect(s.compressions.pause?.tooLong).toBe(true);
    const r = s.reminders.find((x) => x.kind === 'pause');
    expect(r).toMatchObject({ state: 'too-long', severity: 'urgent' });
    expect(r?.message).toBe('Compressions paused 0:11 for shock: longer than 10 s. Resume compressions.');
  });

  it('a stop without a reason gives a null reason', () => {
    const s = live([cprStart(t(0)), cprStop(t(1))], t(1, 3));
    expect(s.compressions.pause?.reason).toBeNull();
  });

  it('no pause before the first compressions start', () => {
    const s = live([rhythm(t(0, 30), 'asystole')], t(1));
    expect(s.compressions.pause).toBeNull();
    expect(s.compressions.firstStartedAtMs).toBeNull();
  });
});

describe('epinephrine window', () => {
  // Window 3-5 min: AHA 2020 Adult Cardiac Arrest Algorithm, Drug Therapy box ("1 mg IV/IO every
  // 3-5 min"). The 02:00 / 06:30 / 08:00 doses and T+3:00 / T+5:00 are arithmetic check values
  // derived from that rule (clinical sheet section 6).

  it('is none-yet before any dose', () => {
    const s = live([cprStart(t(0))], t(3));
    expect(s.epinephrine).toEqual({
      doseCount: 0,
      lastDoseAtMs: null,
      sinceLastMs: null,
      state: 'none-yet',
      dueFromMs: null,
      overdueFromMs: null,
      earlyDoses: [],
    });
  });

  it('doses at 02:00 and 06:30 (gap 4:30) are inside the window; 08:00 (gap 1:30) is flagged early', () => {
    const d1 = epi(t(2));
    const d2 = epi(t(6, 30));
    const inside = live([cprStart(t(0)), d1, d2], t(7));
    expect(inside.epinephrine.earlyDoses).toEqual([]);
    expect(inside.epinephrine.doseCount).toBe(2);

    const d3 = epi(t(8));
    const s = live([cprStart(t(0)), d1, d2, d3], t(8, 10));
    expect(s.epinephrine.earlyDoses).toEqual([d3.id]);
    expect(s.epinephrine.state).toBe('early');
    const r = s.reminders.find((x) => x.kind === 'epinephrine-early');
    expect(r).toMatchObject({ state: 'early', severity: 'attention', atMs: abs(t(8)) });
  });

  it('after a dose at T: early before T+3:00, due from T+3:00 to T+5:00, overdue after T+5:00', () => {
    const T = t(2);
    const entries = [cprStart(t(0)), epi(T)];
    const early = live(entries, T + t(2, 59));
    expect(early.epinephrine.state).toBe('early');
    expect(early.epinephrine.dueFromMs).toBe(abs(T + t(3)));
    expect(early.epinephrine.overdueFromMs).toBe(abs(T + t(5)));
    expect(early.reminders.some((r) => r.kind === 'epinephrine')).toBe(false);

    const due = live(entries, T + t(3));
    expect(due.epinephrine.state).toBe('due');
    expect(due.epinephrine.sinceLastMs).toBe(t(3));
    const dueReminder = due.reminders.find((r) => r.kind === 'epinephrine');
    expect(dueReminder).toMatchObject({ state: 'due', severity: 'attention', atMs: abs(T + t(3)) });
    expect(dueReminder?.message).toBe('Epinephrine due: last dose 3:00 ago (window 3:00 to 5:00).');

    expect(live(entries, T + t(5)).epinephrine.state).toBe('due');

    const overdue = live(entries, T + t(5, 1));
    expect(overdue.epinephrine.state).toBe('overdue');
    const overdueReminder = overdue.reminders.find((r) => r.kind === 'epinephrine');
    expect(overdueReminder).toMatchObject({ state: 'overdue', severity: 'urgent', atMs: abs(T + t(5)) });
    expect(overdueReminder?.message).toBe('Epinephrine overdue: last dose 5:01 ago (window 3:00 to 5:00).');
  });

  it('follows settings.epinephrineWindowSeconds', () => {
    const settings = { ...DEFAULT_PROTOCOL, epinephrineWindowSeconds: { min: 240, max: 240 } };
    const entries = [cprStart(t(0)), epi(t(1))];
    expect(live(entries, t(4, 59), { settings }).epinephrine.state).toBe('early');
    expect(live(entries, t(5), { settings }).epinephrine.state).toBe('due');
    expect(live(entries, t(5, 1), { settings }).epinephrine.state).toBe('overdue');
  });

  it('counts free-text "Adrenaline" as epinephrine', () => {
    const s = live([cprStart(t(0)), drug(t(1), ' Adrenaline ', 1)], t(2));
    expect(s.epinephrine.doseCount).toBe(1);
    expect(s.drugTotals[0]?.key).toBe('epinephrine');
  });

  it('uses an amended time: a dose moved from 04:00 to 03:00 counts from 03:00', () => {
    const d = epi(t(4));
    const s = live([cprStart(t(0)), d, amendOf(t(10), d, { at: iso(t(3)) })], t(6, 30));
    expect(s.epinephrine.lastDoseAtMs).toBe(abs(t(3)));
    expect(s.epinephrine.state).toBe('due');
  });
});

describe('shocks', () => {
  // 200 J biphasic: AHA 2020 Adult Cardiac Arrest Algorithm, "Shock Energy for Defibrillation"
  // box (manufacturer's energy, e.g. 120-200 J). 100 J synchronized: Adult Tachycardia With a
  // Pulse algorithm, Doses/Details box (wide regular).
  it('counts shocks and gives the last energy, mode and time', () => {
    const s = live([cprStart(t(0)), shock(t(1, 30), 200), shock(t(3, 40), 200), shock(t(6), 100, true)], t(7));
    expect(s.shocks).toEqual({
      count: 3,
      // Defibrillations and synchronised cardioversions are counted apart (the energies differ).
      defibrillations: 2,
      cardioversions: 1,
      lastJoules: 100,
      lastSynchronized: true,
      lastAtMs: abs(t(6)),
      sinceLastMs: t(1),
    });
  });

  it('a voided shock is not counted and the last energy falls back to the one before', () => {
    const first = shock(t(1, 30), 200);
    const wrong = shock(t(3, 40), 360);
    const s = live([cprStart(t(0)), first, wrong, voidOf(t(3, 45), wrong)], t(4));
    expect(s.shocks.count).toBe(1);
    expect(s.shocks.lastJoules).toBe(200);
    expect(s.shocks.lastAtMs).toBe(abs(t(1, 30)));
  });

  it('an amended energy is used', () => {
    const sh = shock(t(1, 30), 150);
    const s = live([sh, amendOf(t(2), sh, { joules: 200 })], t(3));
    expect(s.shocks.lastJoules).toBe(200);
  });
});

describe('rhythm', () => {
  it('gives the first documented rhythm and the current (last) one', () => {
    const first = rhythm(t(1, 30), 'vf'); // demo: first rhythm check VF
    const s = live([cprStart(t(0, 15)), first, rhythm(t(3, 40), 'pvt'), rhythm(t(5, 50), 'organized', true)], t(6));
    expect(s.rhythm.first).toEqual({ id: first.id, atMs: abs(t(1, 30)), rhythm: 'vf', pulse: false, rhythmClass: 'vf' });
    expect(s.rhythm.current).toMatchObject({ rhythm: 'organized', pulse: true, atMs: abs(t(5, 50)) });
  });

  it('uses amended rhythm values and skips voided checks', () => {
    const a = rhythm(t(1), 'asystole');
    const b = rhythm(t(3), 'pea');
    const s = live([a, b, amendOf(t(4), a, { rhythm: 'vf' }), voidOf(t(4), b)], t(5));
    expect(s.rhythm.first?.rhythm).toBe('vf');
    expect(s.rhythm.current?.id).toBe(a.id);
  });
});

describe('cumulative dose per drug', () => {
  it('amiodarone 300 mg + 150 mg = 450 mg', () => {
    // AHA 2020 Adult Cardiac Arrest Algorithm, Drug Therapy box (300 mg, then 150 mg); the
    // 450 mg total is arithmetic (clinical sheet section 6).
    const s = live([drug(t(6), 'amiodarone', 300), drug(t(10), 'Amiodarone', 150)], t(11));
    const amio = s.drugTotals.find((d) => d.key === 'amiodarone');
    expect(amio?.totalInCatalogueUnit).toBe(450);
    expect(amio?.byUnit).toEqual([{ unit: 'mg', total: 450, doseCount: 2 }]);
    expect(amio?.doseCount).toBe(2);
    expect(amio?.label).toBe('Amiodarone');
  });

  it('an amended epinephrine dose: the total uses the amended dose', () => {
    // 1 mg per dose: AHA 2020 Adult Cardiac Arrest Algorithm, Drug Therapy box.
    const wrong = epi(t(5), 10);
    const s = live([epi(t(1)), wrong, amendOf(t(5, 20), wrong, { dose: 1 })], t(6));
    const total = s.drugTotals.find((d) => d.key === 'epinephrine');
    expect(total?.totalInCatalogueUnit).toBe(2);
    expect(total?.byUnit[0]?.total).toBe(2);
    expect(s.epinephrine.doseCount).toBe(2);
  });

  it('a voided dose is left out of the total', () => {
    const dup = epi(t(5));
    const s = live([epi(t(1)), dup, voidOf(t(5, 5), dup)], t(6));
    expect(s.drugTotals[0]?.totalInCatalogueUnit).toBe(1);
    expect(s.epinephrine.doseCount).toBe(1);
  });

  it('keeps g and mg apart per unit, and converts mass units to the catalogue unit', () => {
    // Magnesium 1-2 g: 2020 AHA ECC Handbook table (clinical sheet 1f, secondary). 2 g + 500 mg
    // = 2.5 g is arithmetic.
    const s = live([drug(t(3), 'magnesium-sulfate', 2, 'g'), drug(t(9), 'Magnesium sulfate', 500, 'mg')], t(10));
    const mg = s.drugTotals.find((d) => d.key === 'magnesium-sulfate');
    expect(mg?.byUnit).toEqual([
      { unit: 'g', total: 2, doseCount: 1 },
      { unit: 'mg', total: 500, doseCount: 1 },
    ]);
    expect(mg?.catalogueUnit).toBe('g');
    expect(mg?.totalInCatalogueUnit).toBe(2.5);
    expect(mg?.allConverted).toBe(true);
  });

  it('mEq and mL are not converted: the catalogue total leaves the mL dose out and says so', () => {
    // 50 mEq sodium bicarbonate: common practice (clinical sheet 1f: 1 mEq/kg, from memory).
    const s = live([drug(t(3), 'sodium-bicarbonate', 50, 'meq'), drug(t(9), 'sodium-bicarbonate', 50, 'mL')], t(10));
    const bicarb = s.drugTotals[0];
    expect(bicarb?.totalInCatalogueUnit).toBe(50);
    expect(bicarb?.allConverted).toBe(false);
    expect(bicarb?.byUnit.map((u) => [u.unit, u.total])).toEqual([
      ['meq', 50],
      ['mL', 50],
    ]);
  });

  it('adds micrograms to a milligram drug after converting', () => {
    // 1 mg + 100 ug = 1.1 mg: unit arithmetic, no clinical source needed.
    const s = live([epi(t(1)), drug(t(5), 'epinephrine', 100, 'ug')], t(6));
    expect(s.drugTotals[0]?.totalInCatalogueUnit).toBe(1.1);
  });

  it('gives the total per kg when the weight is known: lidocaine 240 mg for 80 kg is 3 mg/kg', () => {
    // Lidocaine cumulative cap 3 mg/kg: older AHA ACLS dosing, from memory (clinical sheet 1a);
    // 80 kg -> 240 mg is the sheet's arithmetic check value.
    const entries = [drug(t(6), 'lidocaine', 100), drug(t(10), 'lidocaine', 50), drug(t(14), 'lidocaine', 90)];
    expect(live(entries, t(15), { weightKg: 80 }).drugTotals[0]?.totalPerKg).toBe(3);
    expect(live(entries, t(15)).drugTotals[0]?.totalPerKg).toBeNull();
  });

  it('hides float noise: three 0.1 mg doses make 0.3 mg', () => {
    const s = live([epi(t(1), 0.1), epi(t(5), 0.1), epi(t(9), 0.1)], t(10));
    expect(s.drugTotals[0]?.totalInCatalogueUnit).toBe(0.3);
    expect(s.drugTotals[0]?.byUnit[0]?.total).toBe(0.3);
  });

  it('keeps free-text drugs by name, without a catalogue total', () => {
    const s = live([drug(t(2), 'Vasopressin', 40, 'mg'), drug(t(4), 'vasopressin ', 40, 'mg')], t(5));
    expect(s.drugTotals).toHaveLength(1);
    expect(s.drugTotals[0]).toMatchObject({ key: 'vasopressin', label: 'Vasopressin', inCatalogue: false, catalogueUnit: null, totalInCatalogueUnit: null });
    expect(s.drugTotals[0]?.byUnit[0]?.total).toBe(80);
  });

  it('resolveDrug finds catalogue drugs by key, label or synonym', () => {
    expect(resolveDrug(DEFAULT_PROTOCOL, 'Calcium chloride 10%')?.key).toBe('calcium-chloride');
    expect(resolveDrug(DEFAULT_PROTOCOL, 'ADRENALINE')?.key).toBe('epinephrine');
    expect(resolveDrug(DEFAULT_PROTOCOL, 'unknown-drug')).toBeUndefined();
  });
});

describe('compression fraction', () => {
  // CCF = compression time / arrest time, ROSC periods left out of the denominator: formula from
  // secondary explainers (clinical sheet section 3; ROSC exclusion per Meaney 2013 AHA consensus,
  // Circulation 2013;128:417-435, marked from memory in the sheet). 780 s in 1,000 s = 78% is the
  // sheet's arithmetic fixture, equal to the Vestergaard 2021 median CCF 78% (IQR 69-86), Open
  // Access Emerg Med 2021;13:553-560.
  const c0 = t(0, 15);
  const at = (sec: number): number => c0 + sec * S;

  it('is null before the first compressions', () => {
    expect(live([rhythm(t(0, 10), 'vf')], t(1)).compressions.fraction).toBeNull();
  });

  it('780 s of compressions in 1,000 s gives 78%', () => {
    // Runs 0-250, 320-600, 750-1000 s: 250 + 280 + 250 = 780 s; pauses 70 + 150 s.
    const entries = [
      cprStart(at(0)),
      cprStop(at(250), 'rhythm-check'),
      cprStart(at(320)),
      cprStop(at(600), 'airway'),
      cprStart(at(750)),
    ];
    const s = live(entries, at(1000));
    expect(s.compressions.compressionMs).toBe(780 * S);
    expect(s.compressions.arrestWindowMs).toBe(1000 * S); // from the first compressions, not arrestAt
    expect(s.compressions.fraction).toBeCloseTo(0.78, 10);
  });

  it('leaves ROSC periods out of the denominator (780 s in 1,300 s minus 300 s of ROSC = 78%)', () => {
    // ROSC at 600 s stops compressions with no stop entry; rearrest at 900; restart at 1,050.
    const entries = [
      cprStart(at(0)),
      cprStop(at(250), 'rhythm-check'),
      cprStart(at(320)),
      rosc(at(600)),
      rearrest(at(900)),
      cprStart(at(1050)),
    ];
    const s = live(entries, at(1300));
    expect(s.compressions.compressionMs).toBe(780 * S);
    expect(s.compressions.arrestWindowMs).toBe(1000 * S);
    expect(s.compressions.fraction).toBeCloseTo(0.78, 10);
    // Without the ROSC exclusion it would be 780 / 1300 = 60%.
    expect(s.compressions.fraction).not.toBeCloseTo(0.6, 2);
  });

  it('leaves out a ROSC period that is still running', () => {
    const s = live([cprStart(at(0)), cprStop(at(100)), cprStart(at(120)), rosc(at(200))], at(500));
    expect(s.compressions.compressionMs).toBe(180 * S);
    expect(s.compressions.arrestWindowMs).toBe(200 * S);
    expect(s.compressions.fraction).toBeCloseTo(0.9, 10);
  });

  it('stops at the end entry', () => {
    const s = live([cprStart(at(0)), cprStop(at(100)), cprStart(at(150)), end(at(400))], at(900));
    expect(s.compressions.fraction).toBeCloseTo(350 / 400, 10);
  });

  it('a voided stop means compressions never paused', () => {
    const stop = cprStop(at(100));
    const s = live([cprStart(at(0)), stop, voidOf(at(130), stop), cprStart(at(120))], at(200));
    expect(s.compressions.fraction).toBe(1);
    expect(s.compressions.running).toBe(true);
  });
});

describe('log order, recent entries and scale', () => {
  it('gives the same state whatever order the entries arrive in', () => {
    const entries = [
      cprStart(t(0, 15)),
      rhythm(t(1, 30), 'vf'),
      shock(t(1, 35), 200),
      cprStop(t(2, 15), 'rhythm-check'),
      cprStart(t(2, 22)),
      epi(t(5, 45)),
      drug(t(6), 'amiodarone', 300),
    ];
    const inOrder = live(entries, t(7));
    const shuffled = live([entries[5]!, entries[2]!, entries[6]!, entries[0]!, entries[4]!, entries[1]!, entries[3]!], t(7));
    expect(shuffled).toEqual(inOrder);
    expect(inOrder.compressions.compressionMs).toBe(t(2) + t(4, 38));
  });

  it('lists the last 8 entries newest first, voided ones left out', () => {
    const entries: LogEntry[] = [];
    for (let i = 0; i < 12; i++) entries.push(note(t(0, i * 5), `note ${i}`));
    const voided = entries[11]!;
    entries.push(voidOf(t(1), voided));
    const s = live(entries, t(2));
    expect(s.recent).toHaveLength(8);
    expect(s.recent.map((e) => (e.kind === 'note' ? e.text : ''))).toEqual([
      'note 10',
      'note 9',
      'note 8',
      'note 7',
      'note 6',
      'note 5',
      'note 4',
      'note 3',
    ]);
    expect(live(entries, t(2), { recentCount: 3 }).recent).toHaveLength(3);
  });

  it('handles a 90-minute code of about 600 entries (counts checked by arithmetic)', () => {
    // 41 cycles: every 2 min a stop for a check, rhythm, shock, restart 7 s later (cycle c
    // starts at c * 127 s); epinephrine every 4 min; notes fill the log to 600 entries.
    const entries: LogEntry[] = [cprStart(0)];
    for (let c = 1; c <= 40; c++) {
      const check = c * t(2) + (c - 1) * 7 * S; // each cycle starts 7 s later than 2 min after the last
      entries.push(cprStop(check, 'rhythm-check'), rhythm(check + 2 * S, 'vf'), shock(check + 5 * S, 200));
      entries.push(cprStart(check + 7 * S));
    }
    for (let m = 4; m <= 88; m += 4) entries.push(epi(t(m)));
    while (entries.length < 600) entries.push(note(t(0, entries.length), 'x'));
    const s = live(entries, t(90));
    expect(entries).toHaveLength(600);
    expect(s.compressions.cyclesStarted).toBe(41);
    expect(s.compressions.cycle?.startedAtMs).toBe(abs(40 * 127 * S));
    expect(s.shocks.count).toBe(40);
    expect(s.epinephrine.doseCount).toBe(22);
    expect(s.epinephrine.earlyDoses).toEqual([]);
    expect(s.compressions.compressionMs).toBe(t(90) - 40 * 7 * S);
  });
});

describe('formatElapsedMs', () => {
  it('writes m:ss and h:mm:ss', () => {
    expect(formatElapsedMs(0)).toBe('0:00');
    expect(formatElapsedMs(t(4, 30))).toBe('4:30');
    expect(formatElapsedMs(-20 * S)).toBe('0:20');
    expect(formatElapsedMs(t(62, 5))).toBe('1:02:05');
  });
});
