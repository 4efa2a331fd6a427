import { describe, it, expect } from 'vitest';
import { computeDosing, DosingInputError, nextDose, nextShockJoules, type DosingSheet, type DoseLine, type DrugDosing } from './dosing.js';
import { DEFAULT_PROTOCOL, parseStoredProtocol, type ProtocolSettings } from './protocol.js';

/*
 * Check values come from the product's clinical reference sheet (sections 1, 2 and the
 * "Arithmetic check values" of section 6), listed with their status in docs/clinical-sources.md.
 * Each rule number is written out beside its source and the expected value is computed from it
 * in the test, so a wrong default or a wrong formula fails.
 *
 * The pediatric drug doses were read in the PALS "Medications for Pediatric Resuscitation" table
 * as published with the AHA 2010 PALS guidelines (Table 1) and repeated in the 2015 ECC Handbook
 * (a copy of the table; confirmed, primary copy). The protocol's edition says AHA 2020 for the
 * algorithms; that the 2020 pediatric guidelines (Topjian AA et al., Circulation 2020) left these
 * doses unchanged is from memory, and the edition string says so.
 */
const PALS_TABLE = 'PALS medications table (AHA 2010 Table 1 / 2015 ECC Handbook, copy)';

const peds = (weightKg: number | null, settings: ProtocolSettings = DEFAULT_PROTOCOL, ageMonths: number | null = null): DosingSheet =>
  computeDosing({ category: 'pediatric', weightKg, ageMonths }, settings);
const adult = (weightKg: number | null = null, settings: ProtocolSettings = DEFAULT_PROTOCOL): DosingSheet =>
  computeDosing({ category: 'adult', weightKg }, settings);

function drugOf(sheet: DosingSheet, key: string): DrugDosing {
  const d = sheet.drugs.find((x) => x.key === key);
  if (!d) throw new Error(`no ${key} on the sheet`);
  return d;
}

/** The dose suggested after `count` doses totalling `total` (default: the listed doses' amounts). */
function next(sheet: DosingSheet, key: string, count: number, total?: number): ReturnType<typeof nextDose> {
  const drug = drugOf(sheet, key);
  const given = total ?? drug.doses.slice(0, count).reduce((sum, d) => sum + d.amount, 0);
  return nextDose(drug, { count, total: given });
}

function dose(sheet: DosingSheet, key: string, count: number, total?: number): DoseLine {
  const n = next(sheet, key, count, total);
  if (n.line === null || n.limit !== null) throw new Error(`no dose for ${key} after ${count}`);
  return n.line;
}

function shock(sheet: DosingSheet, soFar: number, mode: 'defibrillation' | 'cardioversion' = 'defibrillation') {
  const s = nextShockJoules(sheet, soFar, mode);
  if (s === null) throw new Error(`no energy after ${soFar} shocks`);
  return s;
}

/** A deep copy, so a test can edit the protocol without touching the default. */
const copyProtocol = (): ProtocolSettings => JSON.parse(JSON.stringify(DEFAULT_PROTOCOL)) as ProtocolSettings;

describe('pediatric epinephrine', () => {
  // PALS_TABLE: 0.01 mg/kg IV/IO, max 1 mg, as 0.1 mL/kg of 0.1 mg/mL; repeat every 3-5 min.
  const perKg = 0.01;
  const maxDose = 1;
  const mgPerMl = 0.1;

  it('20 kg gives 0.2 mg, 2 mL of 0.1 mg/mL', () => {
    // Arithmetic check value (clinical sheet §6): 0.01 × 20 = 0.2 mg; 0.2 / 0.1 = 2 mL.
    const d = dose(peds(20), 'epinephrine', 0);
    expect(d.amount).toBeCloseTo(perKg * 20, 10);
    expect(d.display).toBe('0.2 mg');
    expect(d.volumeMl).toBeCloseTo((perKg * 20) / mgPerMl, 10);
    expect(d.volumeText).toBe('2 mL of 0.1 mg/mL (1 mg in 10 mL)');
    expect(d.formula).toBe('0.01 mg/kg × 20 kg = 0.2 mg');
    expect(d.basis).toBe('per-kg');
  });

  it('18 kg gives 0.18 mg', () => {
    // Arithmetic from PALS_TABLE: 0.01 × 18 = 0.18 mg (the child of the end-to-end test).
    expect(dose(peds(18), 'epinephrine', 0).display).toBe('0.18 mg');
  });

  it('120 kg is capped at the 1 mg maximum single dose, not 1.2 mg', () => {
    // Arithmetic check value (§6): the formula gives 1.2 mg; cap at 1 mg.
    const d = dose(peds(120), 'epinephrine', 0);
    expect(d.uncappedAmount).toBeCloseTo(1.2, 10);
    expect(d.amount).toBe(maxDose);
    expect(d.capped).toBe(true);
    expect(d.capNote).toBe('capped at the 1 mg maximum single dose');
  });

  it('repeats with no count limit (every 3-5 min, PALS_TABLE)', () => {
    const drug = drugOf(peds(20), 'epinephrine');
    expect(drug.maxDoses).toBeNull();
    expect(drug.doses).toHaveLength(1);
    expect(drug.doses[0]?.repeats).toBe(true);
    expect(next(peds(20), 'epinephrine', 9).limit).toBeNull();
    expect(dose(peds(20), 'epinephrine', 9).doseNumber).toBe(10);
  });

  it('keeps the exact number but rounds a small dose to two significant digits, not two decimals', () => {
    // Arithmetic from PALS_TABLE: 0.01 × 3.5 kg = 0.035 mg; two decimals would show 0.04 mg (+14%).
    const d = dose(peds(3.5), 'epinephrine', 0);
    expect(d.amount).toBeCloseTo(0.035, 10);
    expect(d.display).toBe('0.035 mg');
  });
});

describe('pediatric amiodarone', () => {
  // PALS_TABLE: 5 mg/kg IV/IO bolus, may repeat twice, up to 15 mg/kg; max single dose 300 mg.
  it('70 kg gives 300 mg, not 350 mg', () => {
    // Arithmetic check value (§6): 5 × 70 = 350 mg, capped at 300 mg.
    const d = dose(peds(70), 'amiodarone', 0);
    expect(d.uncappedAmount).toBe(350);
    expect(d.amount).toBe(300);
    expect(d.capNote).toBe('capped at the 300 mg maximum single dose');
  });

  it('18 kg lists exactly three doses of 90 mg (15 mg/kg in total) and refuses a 4th without a second tap', () => {
    // Arithmetic from PALS_TABLE: 5 × 18 = 90 mg; three doses = 270 mg = 15 mg/kg × 18 kg.
    const drug = drugOf(peds(18), 'amiodarone');
    expect(drug.doses.map((d) => d.amount)).toEqual([90, 90, 90]);
    expect(drug.maxDoses).toBe(3);
    expect(drug.maxTotal).toBe(15 * 18);
    expect(drug.maxTotalText).toBe('at most 15 mg/kg (270 mg) in total');
    const fourth = next(peds(18), 'amiodarone', 3);
    expect(fourth.limit).toEqual({ kind: 'max-doses', message: 'Limit reached: 3 of 3 doses given' });
  });

  it('stops at the cumulative 15 mg/kg even when fewer doses were given', () => {
    // Arithmetic from PALS_TABLE: 18 kg → 270 mg in total; two doses of 135 mg reach it.
    const after = next(peds(18), 'amiodarone', 2, 270);
    expect(after.limit?.kind).toBe('max-total');
    expect(after.limit?.message).toBe('Limit reached: 270 mg given, at most 15 mg/kg (270 mg) in total');
  });
});

describe('pediatric atropine', () => {
  // PALS_TABLE: 0.02 mg/kg IV/IO, may repeat once, max single dose 0.5 mg.
  it('20 kg gives 0.4 mg twice, then the limit', () => {
    const drug = drugOf(peds(20), 'atropine');
    expect(drug.doses.map((d) => d.amount)).toEqual([0.02 * 20, 0.02 * 20]);
    expect(drug.maxDoses).toBe(2);
    expect(next(peds(20), 'atropine', 2).limit?.kind).toBe('max-doses');
  });

  it('30 kg is capped at 0.5 mg, not 0.6 mg', () => {
    expect(dose(peds(30), 'atropine', 0).amount).toBe(0.5);
  });
});

describe('pediatric adenosine', () => {
  // PALS_TABLE and AHA 2020 Pediatric Tachycardia algorithm (copy): 0.1 mg/kg (max 6 mg), then 0.2 mg/kg (max 12 mg).
  it('70 kg gives 6 mg then 12 mg, not 7 and 14, and no third dose', () => {
    // Arithmetic check value (§6): the first dose caps at 6 mg (not 7), the second at 12 mg (not 14).
    const drug = drugOf(peds(70), 'adenosine');
    expect(drug.doses.map((d) => [d.uncappedAmount, d.amount])).toEqual([
      [7, 6],
      [14, 12],
    ]);
    expect(drug.maxDoses).toBe(2);
    expect(next(peds(70), 'adenosine', 2).limit?.message).toBe('Limit reached: 2 of 2 doses given');
  });

  it('10 kg gives 1 mg then 2 mg', () => {
    expect(drugOf(peds(10), 'adenosine').doses.map((d) => d.amount)).toEqual([0.1 * 10, 0.2 * 10]);
  });
});

describe('pediatric range doses (perKgHigh)', () => {
  // PALS_TABLE: magnesium sulfate 25-50 mg/kg, max 2 g.
  it('20 kg shows the low–high amounts', () => {
    const d = dose(peds(20), 'magnesium-sulfate', 0);
    expect(d.amount).toBeCloseTo(0.025 * 20, 10);
    expect(d.amountHigh).toBeCloseTo(0.05 * 20, 10);
    expect(d.display).toBe('0.5–1 g');
  });

  it('60 kg caps the upper end at 2 g', () => {
    const d = dose(peds(60), 'magnesium-sulfate', 0);
    expect(d.amount).toBeCloseTo(1.5, 10);
    expect(d.amountHigh).toBe(2);
    expect(d.capNote).toBe('upper end capped at the 2 g maximum single dose');
  });
});

describe('concentrations by age and weight', () => {
  it('a 3 kg infant gets dextrose as 10%, not 0.5 g/mL', () => {
    // Glucose 0.5-1 g/kg as dextrose 10% 5-10 mL/kg: PALS table glucose row (from memory).
    // Arithmetic: 0.5-1 g/kg × 3 kg = 1.5-3 g = 15-30 mL of 0.1 g/mL.
    const d = dose(peds(3), 'dextrose', 0);
    expect(d.display).toBe('1.5–3 g');
    expect(d.volumeMl).toBeCloseTo(15, 10);
    expect(d.volumeMlHigh).toBeCloseTo(30, 10);
    expect(d.volumeText).toBe('15–30 mL of 10% (0.1 g/mL)');
    expect(drugOf(peds(3), 'dextrose').concentration?.why).toBe('for a pediatric code');
  });

  it('an adult gets dextrose 25 g as 50 mL of 50%', () => {
    // 25 g as 50 mL of 50%: common practice, no published source in the clinical sheet.
    expect(dose(adult(), 'dextrose', 0).volumeText).toBe('50 mL of 50% (0.5 g/mL)');
  });

  it('sodium bicarbonate is 4.2% under 3 months and 8.4% after, with 5 kg standing in for an unknown age', () => {
    // 4.2% (0.5 mEq/mL) under about 3 months: neonatal practice (from memory); 1 mEq/kg: PALS_TABLE.
    // 5 kg as the stand-in for 3 months when the age is unknown: common practice, no source.
    const infant = drugOf(peds(4), 'sodium-bicarbonate');
    expect(infant.concentration?.label).toBe('4.2% (0.5 mEq/mL)');
    expect(infant.concentration?.why).toBe('5 kg or less (age unknown: stands in for under 3 months)');
    expect(infant.doses[0]?.volumeText).toBe('8 mL of 4.2% (0.5 mEq/mL)');
    // A known age wins over the weight stand-in.
    expect(drugOf(peds(5.5, DEFAULT_PROTOCOL, 2), 'sodium-bicarbonate').concentration?.label).toBe('4.2% (0.5 mEq/mL)');
    expect(drugOf(peds(5, DEFAULT_PROTOCOL, 6), 'sodium-bicarbonate').concentration?.label).toBe('8.4% (1 mEq/mL)');
    expect(dose(peds(20), 'sodium-bicarbonate', 0).volumeText).toBe('20 mL of 8.4% (1 mEq/mL)');
  });
});

describe('pediatric naloxone (common practice, no published source)', () => {
  it('25 kg is capped at 2 mg', () => {
    // 0.1 mg/kg, max 2 mg: from memory (no source in the clinical sheet).
    const d = dose(peds(25), 'naloxone', 0);
    expect(d.uncappedAmount).toBeCloseTo(2.5, 10);
    expect(d.amount).toBe(2);
  });
});

describe('pediatric defibrillation', () => {
  // AHA 2020 Pediatric Cardiac Arrest Algorithm (acls.net and nhcps.com copies; confirmed secondary):
  // 2 J/kg first shock, 4 J/kg second, then ≥ 4 J/kg, up to 10 J/kg or the adult dose.
  const firstPerKg = 2;
  const secondPerKg = 4;
  const maxPerKg = 10;
  // The adult dose is the protocol's adult energy (200 J default: AHA 2020 adult algorithm,
  // manufacturer's energy e.g. 120-200 J; ANZCOR 11.4: 200 J). Not the 360 J monophasic maximum.
  const adultDose = 200;

  it('15 kg gives 30 J, 60 J, then 60 J up to 150 J', () => {
    // Arithmetic check value (§6): 2 × 15 = 30 J, 4 × 15 = 60 J, then ≥ 60 J capped at 10 × 15 = 150 J.
    const sheet = peds(15);
    expect(shock(sheet, 0).joules).toBe(firstPerKg * 15);
    expect(shock(sheet, 0).formula).toBe('2 J/kg × 15 kg = 30 J');
    expect(shock(sheet, 1).joules).toBe(secondPerKg * 15);
    const s3 = shock(sheet, 2);
    expect(s3.joules).toBe(secondPerKg * 15);
    expect(s3.joulesHigh).toBe(Math.min(maxPerKg * 15, adultDose));
    expect(s3.display).toBe('60–150 J');
    expect(s3.capped).toBe(false);
    expect(shock(sheet, 7)).toEqual(s3);
  });

  it('18 kg starts at 36 J', () => {
    // Arithmetic: 2 × 18 = 36 J (the child of the end-to-end test).
    expect(shock(peds(18), 0).display).toBe('36 J');
  });

  it('a 40 kg child is offered 160–200 J after the second shock, not 160–360 J', () => {
    // Arithmetic: 4 × 40 = 160 J; 10 × 40 = 400 J is above the 200 J adult dose, so 200 J is the ceiling.
    const s3 = shock(peds(40), 2);
    expect(s3.joules).toBe(160);
    expect(s3.joulesHigh).toBe(adultDose);
    expect(s3.display).toBe('160–200 J');
    expect(s3.capNote).toContain('200 J adult dose');
  });

  it('caps even the second shock at the adult dose for a heavy child', () => {
    // Arithmetic: 4 × 60 = 240 J > 200 J.
    const s2 = shock(peds(60), 1);
    expect(s2.joules).toBe(adultDose);
    expect(s2.capped).toBe(true);
  });

  it('keeps exact joules in the data and shows whole joules', () => {
    // Arithmetic: 2 × 7.3 = 14.6 J, shown as 15 J.
    const s1 = shock(peds(7.3), 0);
    expect(s1.joules).toBeCloseTo(14.6, 10);
    expect(s1.display).toBe('15 J');
  });
});

describe('pediatric synchronised cardioversion', () => {
  // AHA 2020 Pediatric Tachycardia algorithm (copy; confirmed): 0.5-1 J/kg, raised to 2 J/kg if it fails.
  it('20 kg gives 10–20 J then 40 J, synchronised, counted apart from defibrillations', () => {
    const sheet = peds(20);
    const c1 = shock(sheet, 0, 'cardioversion');
    expect([c1.joules, c1.joulesHigh, c1.synchronized]).toEqual([10, 20, true]);
    expect(shock(sheet, 1, 'cardioversion').joules).toBe(40);
    // After one cardioversion the first defibrillation is still 2 J/kg.
    expect(shock(sheet, 0, 'defibrillation').joules).toBe(40);
  });
});

describe('adult sheet', () => {
  it('epinephrine 1 mg, repeating with no count limit', () => {
    // AHA 2020 Adult Cardiac Arrest Algorithm, Drug Therapy box: 1 mg every 3-5 min (copy; confirmed).
    const drug = drugOf(adult(), 'epinephrine');
    expect(drug.doses.map((d) => d.amount)).toEqual([1]);
    expect(drug.doses[0]?.repeats).toBe(true);
    expect(drug.maxDoses).toBeNull();
    expect(drug.timing).toBe('every 3-5 min');
  });

  it('amiodarone 300 mg then 150 mg, exactly two doses: a third needs a second tap', () => {
    // AHA 2020 Adult Cardiac Arrest Algorithm, Drug Therapy box: 300 mg bolus, second dose 150 mg (copy; confirmed).
    // Arithmetic check value (§6): 300 + 150 = 450 mg across the two doses.
    const drug = drugOf(adult(), 'amiodarone');
    expect(drug.doses.map((d) => d.amount)).toEqual([300, 150]);
    expect(drug.maxDoses).toBe(2);
    expect(drug.doses.some((d) => d.repeats)).toBe(false);
    const third = next(adult(), 'amiodarone', 2);
    expect(third.limit).toEqual({ kind: 'max-doses', message: 'Limit reached: 2 of 2 doses given' });
    expect(third.line?.amount).toBe(150); // what a second tap would record
  });

  it('lidocaine is weight-based when the weight is known: 1-1.5 then 0.5-0.75 mg/kg, up to 3 mg/kg', () => {
    // AHA 2020 Adult Cardiac Arrest Algorithm: 1-1.5 mg/kg, then 0.5-0.75 mg/kg (copy; confirmed).
    // Cumulative 3 mg/kg: older AHA ACLS dosing (from memory). Arithmetic check value (§6): 80 kg → 240 mg.
    const sheet = adult(80);
    const drug = drugOf(sheet, 'lidocaine');
    expect(drug.doses[0]?.display).toBe('80–120 mg');
    expect(drug.doses[1]?.display).toBe('40–60 mg');
    expect(drug.maxTotal).toBe(240);
    // 120 + 60 + 40 given: 20 mg of the 240 mg are left.
    const limited = dose(sheet, 'lidocaine', 3, 220);
    expect(limited.display).toBe('20 mg');
    expect(limited.capNote).toBe('limited to the 20 mg left of at most 3 mg/kg (240 mg) in total');
    expect(next(sheet, 'lidocaine', 3, 240).limit?.kind).toBe('max-total');
  });

  it('lidocaine without a weight is a fixed 100 then 50 mg, and says so', () => {
    // 100/50 mg for about 70 kg: common practice (about 1.4 and 0.7 mg/kg), no published source.
    const drug = drugOf(adult(), 'lidocaine');
    expect(drug.doses.slice(0, 2).map((d) => [d.amount, d.basis])).toEqual([
      [100, 'fixed-no-weight'],
      [50, 'fixed-no-weight'],
    ]);
    expect(drug.notes.join(' ')).toMatch(/Weight not known: the fixed dose is shown/);
    expect(drug.notes.join(' ')).toMatch(/limited to 3 mg\/kg: enter the weight/);
  });

  it('atropine 1 mg up to 3 mg in total', () => {
    // AHA 2020 Adult Bradycardia Algorithm: 1 mg every 3-5 min, maximum 3 mg (acls.net copy; confirmed secondary).
    const drug = drugOf(adult(), 'atropine');
    expect(drug.doses.map((d) => d.amount)).toEqual([1, 1, 1]);
    expect(drug.maxTotal).toBe(3);
    expect(next(adult(), 'atropine', 3).limit?.message).toBe('Limit reached: 3 mg given, at most 3 mg in total');
  });

  it('adenosine 6 mg then 12 mg, and no third dose', () => {
    // AHA 2020 Adult Tachycardia With a Pulse algorithm, Doses/Details box: 6 mg, second dose 12 mg (copy; confirmed).
    expect(drugOf(adult(), 'adenosine').doses.map((d) => d.amount)).toEqual([6, 12]);
    expect(next(adult(), 'adenosine', 2).limit?.kind).toBe('max-doses');
  });

  it('default shock 200 J for every shock, with the presets', () => {
    // AHA 2020 adult algorithm: the manufacturer's energy (e.g. 120-200 J); 200 J is the local default.
    const sheet = adult();
    expect(shock(sheet, 0).joules).toBe(200);
    expect(shock(sheet, 5).joules).toBe(200);
    expect(sheet.shockPresetsJoules).toEqual([120, 150, 200, 300, 360]);
  });

  it('offers no adult cardioversion number, only the device-first note', () => {
    const sheet = adult();
    expect(nextShockJoules(sheet, 0, 'cardioversion')).toBeNull();
    expect(sheet.cardioversion.note).toMatch(/manufacturer's recommendation/);
  });

  it('warns when an adult code is given a child-sized weight', () => {
    // 40 kg: common practice threshold, no published source (configurable).
    expect(adult(12).categoryWarning).toBe(
      'Weight 12 kg is under 40 kg: if this is a child, switch to a pediatric code for weight-based doses and energies.',
    );
    expect(adult(45).categoryWarning).toBeNull();
    expect(peds(12).categoryWarning).toBeNull();
  });
});

describe('the sheet as a whole', () => {
  it('lists every catalogue drug in catalogue order, with its source and the protocol edition', () => {
    const sheet = peds(20);
    expect(sheet.drugs.map((d) => d.key)).toEqual(DEFAULT_PROTOCOL.drugs.map((d) => d.key));
    expect(sheet.drugs.every((d) => d.source.length > 0)).toBe(true);
    expect(sheet.edition).toBe(DEFAULT_PROTOCOL.edition);
  });

  it('a pediatric code without a weight says weight is needed and gives no numbers', () => {
    const sheet = peds(null);
    expect(sheet.status).toBe('weight-needed');
    expect(sheet.drugs).toEqual([]);
    expect(sheet.defibrillation.steps).toEqual([]);
    expect(nextShockJoules(sheet, 0)).toBeNull();
  });

  it('rejects an impossible weight', () => {
    expect(() => peds(0)).toThrow(DosingInputError);
    expect(() => peds(251)).toThrow(/not plausible/);
    expect(() => peds(Number.NaN)).toThrow(DosingInputError);
    expect(peds(250).status).toBe('ready');
  });

  it('rejects a negative or fractional count of doses or shocks', () => {
    const sheet = peds(20);
    expect(() => nextDose(drugOf(sheet, 'epinephrine'), { count: -1, total: 0 })).toThrow(RangeError);
    expect(() => nextShockJoules(sheet, 1.5)).toThrow(RangeError);
  });

  it('carries the cautions a dosing aid must show', () => {
    const all = peds(20).cautions.join('\n');
    expect(all).toMatch(/does not replace/);
    expect(all).toMatch(/team leader's judgment/);
    expect(all).toMatch(/local protocol/);
    expect(all).toMatch(/licensed clinical practice/);
    expect(all).toMatch(/double-checked by a second person/);
    expect(all).toMatch(/Confirm the weight and how it was obtained/);
    expect(all).toMatch(/mg vs mcg/);
    expect(all).toMatch(/manufacturer's recommended energy comes first/);
    expect(all).toMatch(/does not set the defibrillator/);
  });

  it('notes a pediatric rule with no maximum single dose', () => {
    // Pediatric lidocaine 1 mg/kg has no maximum single dose in the PALS table.
    expect(drugOf(peds(20), 'lidocaine').notes.join(' ')).toMatch(/No maximum single dose is configured/);
  });
});

describe('the sheet follows the configured protocol', () => {
  it('a different epinephrine cap changes the capped dose', () => {
    const settings = copyProtocol();
    const rule = settings.drugs.find((d) => d.key === 'epinephrine')?.pediatric?.doses[0];
    if (rule === undefined) throw new Error('epinephrine pediatric rule missing');
    rule.maxDose = 0.5;
    expect(dose(peds(120, settings), 'epinephrine', 0).amount).toBe(0.5);
    expect(dose(peds(120), 'epinephrine', 0).amount).toBe(1);
  });

  it('a different adult dose list changes the suggested sequence', () => {
    const settings = copyProtocol();
    const amio = settings.drugs.find((d) => d.key === 'amiodarone');
    if (amio === undefined) throw new Error('amiodarone missing');
    amio.adult = { doses: [{ amount: 300 }], repeatLast: true, maxDoses: 3 };
    const drug = drugOf(adult(null, settings), 'amiodarone');
    expect(drug.doses.map((d) => d.amount)).toEqual([300, 300, 300]);
    expect(drug.maxDoses).toBe(3);
  });

  it('energies, edition and catalogue follow the settings', () => {
    const settings = copyProtocol();
    settings.edition = 'Local protocol 2026';
    settings.shockPresetsJoules = [120, 150, 200];
    settings.defaultShockJoules = 150;
    settings.adultMaxJoules = 200;
    settings.pediatricEnergy.secondJoulesPerKg = 3;
    settings.drugs = settings.drugs.filter((d) => d.key !== 'naloxone');
    const a = adult(null, settings);
    expect(a.edition).toBe('Local protocol 2026');
    expect(shock(a, 0).joules).toBe(150);
    const p = peds(15, settings);
    expect(shock(p, 1).joules).toBe(3 * 15);
    // 10 J/kg × 15 kg = 150 J equals the configured 150 J adult dose.
    expect(shock(p, 2).joulesHigh).toBe(150);
    expect(shock(peds(30, settings), 2).joulesHigh).toBe(150);
    expect(p.drugs.some((d) => d.key === 'naloxone')).toBe(false);
  });

  it('a drug with no pediatric rule gets no pediatric number, never the adult dose', () => {
    const settings = copyProtocol();
    const epi = settings.drugs.find((d) => d.key === 'epinephrine');
    if (epi === undefined) throw new Error('epinephrine missing');
    delete epi.pediatric;
    const drug = drugOf(peds(20, settings), 'epinephrine');
    expect(drug.doses).toEqual([]);
    expect(drug.notes.join(' ')).toMatch(/No pediatric dose is configured/);
  });

  it('reads a protocol saved in the earlier shape, the last dose repeating as it then meant', () => {
    const old = {
      ...copyProtocol(),
      drugs: [{ key: 'epinephrine', label: 'Epinephrine', unit: 'mg', route: 'iv', adultDoses: [1], pediatric: [{ perKg: 0.01, maxDose: 1 }], concentrationPerMl: 0.1, source: 'x' }],
    };
    const parsed = parseStoredProtocol(old);
    expect(parsed.success).toBe(true);
    if (!parsed.success) return;
    const epi = parsed.data.drugs[0];
    expect(epi?.adult).toEqual({ doses: [{ amount: 1 }], repeatLast: true });
    expect(epi?.concentrations[0]?.perMl).toBe(0.1);
    expect(dose(peds(20, parsed.data), 'epinephrine', 3).amount).toBeCloseTo(0.2, 10);
  });
});
