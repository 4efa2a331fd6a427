import { describe, it, expect } from 'vitest';
import { computeDosing, DosingInputError, nextDoseFor, nextShockJoules, type DosingSheet, type DoseLine } from './dosing.js';
import { DEFAULT_PROTOCOL, type ProtocolSettings } from './protocol.js';

/*
 * Check values come from the clinical reference sheet (sections 1, 2 and the "Arithmetic check
 * values" of section 6). Each rule number is written out here beside its source and the expected
 * value is computed from it in the test, so a wrong default or a wrong formula fails.
 */

const peds = (weightKg: number | null, settings: ProtocolSettings = DEFAULT_PROTOCOL): DosingSheet =>
  computeDosing({ category: 'pediatric', weightKg }, settings);
const adult = (settings: ProtocolSettings = DEFAULT_PROTOCOL): DosingSheet =>
  computeDosing({ category: 'adult', weightKg: null }, settings);

function dose(sheet: DosingSheet, key: string, given: number): DoseLine {
  const d = nextDoseFor(sheet, key, given);
  if (d === null) throw new Error(`no dose for ${key} after ${given}`);
  return d;
}

function shock(sheet: DosingSheet, soFar: number, mode: 'defibrillation' | 'cardioversion' = 'defibrillation') {
  const s = nextShockJoules(sheet, soFar, mode);
  if (s === null) throw new Error(`no energy after ${soFar} shocks`);
  return s;
}

/** A deep copy, so a test can edit the protocol without touching the default. */
const copyProtocol = (): ProtocolSettings => JSON.parse(JSON.stringify(DEFAULT_PROTOCOL)) as ProtocolSettings;

describe('pediatric epinephrine', () => {
  // PALS medications table (AHA 2010 PALS Table 1 / 2015 ECC Handbook): 0.01 mg/kg IV/IO, max 1 mg. Confirmed (primary, copy).
  const perKg = 0.01;
  const maxDose = 1;
  // Same table: 0.1 mL/kg of 0.1 mg/mL. Confirmed (primary, copy).
  const mgPerMl = 0.1;

  it('20 kg gives 0.2 mg, 2 mL of 0.1 mg/mL', () => {
    // Arithmetic check value (clinical reference §6, derived from the rule): 0.01 × 20 = 0.2 mg; 0.2 / 0.1 = 2 mL.
    const kg = 20;
    const expected = perKg * kg;
    const d = dose(peds(kg), 'epinephrine', 0);
    expect(d.amount).toBeCloseTo(expected, 10);
    expect(d.unit).toBe('mg');
    expect(d.capped).toBe(false);
    expect(d.capNote).toBeNull();
    expect(d.volumeMl).toBeCloseTo(expected / mgPerMl, 10);
    expect(d.display).toBe('0.2 mg');
    expect(d.formula).toBe('0.01 mg/kg × 20 kg = 0.2 mg');
    expect(d.volumeText).toBe('2 mL of 0.1 mg/mL');
  });

  it('120 kg is capped at the 1 mg maximum single dose, not 1.2 mg', () => {
    // Arithmetic check value (§6, derived): 0.01 × 120 = 1.2 mg, so cap at 1 mg.
    const kg = 120;
    const uncapped = perKg * kg;
    expect(uncapped).toBeGreaterThan(maxDose);
    const d = dose(peds(kg), 'epinephrine', 0);
    expect(d.amount).toBe(maxDose);
    expect(d.uncappedAmount).toBeCloseTo(uncapped, 10);
    expect(d.capped).toBe(true);
    expect(d.capNote).toBe('capped at the 1 mg maximum single dose');
    expect(d.formula).toBe('0.01 mg/kg × 120 kg = 1.2 mg');
    expect(d.volumeMl).toBeCloseTo(maxDose / mgPerMl, 10);
  });

  it('the same dose repeats for every later dose', () => {
    // PALS medications table: repeat every 3–5 min at the same dose.
    const sheet = peds(20);
    expect(dose(sheet, 'epinephrine', 4).amount).toBeCloseTo(perKg * 20, 10);
    expect(dose(sheet, 'epinephrine', 4).repeats).toBe(true);
  });

  it('keeps the exact number but rounds a small dose to two significant digits, not two decimals', () => {
    // Derived by arithmetic from the PALS table rule: 0.01 × 3.5 = 0.035 mg (two decimals alone would show 0.04).
    const kg = 3.5;
    const d = dose(peds(kg), 'epinephrine', 0);
    expect(d.amount).toBeCloseTo(perKg * kg, 12);
    expect(d.display).toBe('0.035 mg');
    expect(d.volumeText).toBe('0.35 mL of 0.1 mg/mL');
  });
});

describe('pediatric amiodarone', () => {
  // PALS medications table (AHA 2010 PALS Table 1 / 2015 ECC Handbook): 5 mg/kg IV/IO, max single dose 300 mg. Confirmed (primary, copy).
  const perKg = 5;
  const maxDose = 300;

  it('70 kg gives 300 mg, not 350 mg', () => {
    // Arithmetic check value (§6, derived): 5 × 70 = 350 mg, so cap the single dose at 300 mg.
    const kg = 70;
    const d = dose(peds(kg), 'amiodarone', 0);
    expect(perKg * kg).toBe(350);
    expect(d.amount).toBe(maxDose);
    expect(d.amount).not.toBe(perKg * kg);
    expect(d.capped).toBe(true);
    expect(d.capNote).toBe('capped at the 300 mg maximum single dose');
  });

  it('20 kg is below the cap: 100 mg', () => {
    // Derived by arithmetic from the PALS table rule: 5 × 20 = 100 mg.
    const d = dose(peds(20), 'amiodarone', 0);
    expect(d.amount).toBe(perKg * 20);
    expect(d.capped).toBe(false);
  });
});

describe('pediatric adenosine', () => {
  // PALS medications table (AHA 2010 PALS Table 1 / 2015 ECC Handbook) and AHA 2020 Pediatric Tachycardia algorithm:
  // 0.1 mg/kg (max 6 mg), then 0.2 mg/kg (max 12 mg). Confirmed (primary, copy).
  const first = { perKg: 0.1, max: 6 };
  const second = { perKg: 0.2, max: 12 };

  it('70 kg gives 6 mg then 12 mg, not 7 and 14', () => {
    // Arithmetic check value (§6, derived): 0.1 × 70 = 7 → 6 mg; 0.2 × 70 = 14 → 12 mg.
    const kg = 70;
    const sheet = peds(kg);
    const d1 = dose(sheet, 'adenosine', 0);
    const d2 = dose(sheet, 'adenosine', 1);
    expect(d1.amount).toBe(Math.min(first.perKg * kg, first.max));
    expect(d1.amount).toBe(6);
    expect(d1.capNote).toBe('capped at the 6 mg maximum single dose');
    expect(d2.amount).toBe(Math.min(second.perKg * kg, second.max));
    expect(d2.amount).toBe(12);
    expect(d2.capNote).toBe('capped at the 12 mg maximum single dose');
    // The last dose repeats.
    expect(dose(sheet, 'adenosine', 2).amount).toBe(12);
  });

  it('10 kg gives 1 mg then 2 mg', () => {
    // Derived by arithmetic from the PALS table rule: 0.1 × 10 = 1 mg; 0.2 × 10 = 2 mg.
    const kg = 10;
    const sheet = peds(kg);
    expect(dose(sheet, 'adenosine', 0).amount).toBeCloseTo(first.perKg * kg, 10);
    expect(dose(sheet, 'adenosine', 1).amount).toBeCloseTo(second.perKg * kg, 10);
    expect(dose(sheet, 'adenosine', 0).capped).toBe(false);
    expect(dose(sheet, 'adenosine', 1).display).toBe('2 mg');
  });
});

describe('pediatric range doses (perKgHigh)', () => {
  // PALS medications table (AHA 2010 PALS Table 1 / 2015 ECC Handbook): magnesium sulfate 25–50 mg/kg, max 2 g. Confirmed (primary, copy).
  const lowGPerKg = 25 / 1000;
  const highGPerKg = 50 / 1000;
  const maxG = 2;

  it('20 kg shows the low–high amounts', () => {
    // Derived by arithmetic: 0.025 × 20 = 0.5 g; 0.05 × 20 = 1 g.
    const d = dose(peds(20), 'magnesium-sulfate', 0);
    expect(d.amount).toBeCloseTo(lowGPerKg * 20, 10);
    expect(d.amountHigh).toBeCloseTo(highGPerKg * 20, 10);
    expect(d.display).toBe('0.5–1 g');
    expect(d.capped).toBe(false);
  });

  it('60 kg caps the upper end at 2 g', () => {
    // Derived by arithmetic: 0.025 × 60 = 1.5 g; 0.05 × 60 = 3 g → 2 g.
    const d = dose(peds(60), 'magnesium-sulfate', 0);
    expect(d.amount).toBeCloseTo(lowGPerKg * 60, 10);
    expect(d.amountHigh).toBe(maxG);
    expect(d.uncappedAmountHigh).toBeCloseTo(highGPerKg * 60, 10);
    expect(d.capped).toBe(true);
    expect(d.capNote).toBe('upper end capped at the 2 g maximum single dose');
  });
});

describe('pediatric naloxone (common practice, no published source)', () => {
  it('25 kg is capped at 2 mg', () => {
    // Common practice, no published source in the clinical reference; 0.1 mg/kg max 2 mg is from memory.
    const perKg = 0.1;
    const max = 2;
    const d = dose(peds(25), 'naloxone', 0);
    expect(perKg * 25).toBeGreaterThan(max);
    expect(d.amount).toBe(max);
  });
});

describe('pediatric defibrillation', () => {
  // AHA 2020 Pediatric Cardiac Arrest Algorithm (as reproduced at acls.net and nhcps.com; Confirmed (secondary)):
  // 2 J/kg first shock, 4 J/kg second, then ≥4 J/kg, up to 10 J/kg or the adult dose.
  const firstPerKg = 2;
  const secondPerKg = 4;
  const maxPerKg = 10;
  // Configured adult maximum (adultMaxJoules); AHA 2020 Adult Cardiac Arrest Algorithm, Shock Energy box: monophasic 360 J.
  const adultMax = 360;

  it('15 kg gives 30 J, 60 J, then 60 J up to 150 J', () => {
    // Arithmetic check value (§6, derived): 2 × 15 = 30 J, 4 × 15 = 60 J, then ≥ 60 J capped at 10 × 15 = 150 J
    // or the adult dose, whichever is lower.
    const kg = 15;
    const sheet = peds(kg);
    const s1 = shock(sheet, 0);
    const s2 = shock(sheet, 1);
    const s3 = shock(sheet, 2);
    expect(s1.joules).toBe(firstPerKg * kg);
    expect(s1.display).toBe('30 J');
    expect(s1.formula).toBe('2 J/kg × 15 kg = 30 J');
    expect(s2.joules).toBe(secondPerKg * kg);
    expect(s3.joules).toBe(secondPerKg * kg);
    expect(s3.joulesHigh).toBe(Math.min(maxPerKg * kg, adultMax));
    expect(s3.joulesHigh).toBe(150);
    expect(s3.display).toBe('60–150 J');
    expect(s3.capped).toBe(false);
    expect(s1.synchronized).toBe(false);
    // Later shocks keep the same step.
    expect(shock(sheet, 7)).toEqual(s3);
  });

  it('a 50 kg child is capped at the adult maximum, not 500 J', () => {
    // Derived by arithmetic: 10 × 50 = 500 J is above the 360 J adult maximum, so the ceiling is 360 J.
    const kg = 50;
    const sheet = peds(kg);
    const s3 = shock(sheet, 2);
    expect(maxPerKg * kg).toBe(500);
    expect(s3.joulesHigh).toBe(adultMax);
    expect(s3.joulesHigh).not.toBe(500);
    expect(s3.capped).toBe(true);
    expect(s3.capNote).toContain('360 J adult maximum');
    expect(shock(sheet, 0).joules).toBe(firstPerKg * kg);
    expect(shock(sheet, 1).joules).toBe(secondPerKg * kg);
  });

  it('caps even the second shock at the adult maximum for a heavy child', () => {
    // Derived by arithmetic: 4 × 100 = 400 J > 360 J.
    const s2 = shock(peds(100), 1);
    expect(secondPerKg * 100).toBeGreaterThan(adultMax);
    expect(s2.joules).toBe(adultMax);
    expect(s2.capped).toBe(true);
  });

  it('keeps exact joules in the data and shows whole joules', () => {
    // Derived by arithmetic: 2 × 7.3 = 14.6 J, shown as 15 J.
    const s1 = shock(peds(7.3), 0);
    expect(s1.joules).toBeCloseTo(firstPerKg * 7.3, 10);
    expect(s1.display).toBe('15 J');
  });
});

describe('pediatric synchronized cardioversion', () => {
  // AHA 2020 Pediatric Tachycardia algorithm (scribd copy; Confirmed (primary, copy)): 0.5–1 J/kg, raised to 2 J/kg if it fails.
  const low = 0.5;
  const high = 1;
  const next = 2;

  it('20 kg gives 10–20 J then 40 J, synchronized', () => {
    // Derived by arithmetic: 0.5 × 20 = 10 J, 1 × 20 = 20 J, then 2 × 20 = 40 J.
    const kg = 20;
    const sheet = peds(kg);
    const c1 = shock(sheet, 0, 'cardioversion');
    const c2 = shock(sheet, 1, 'cardioversion');
    expect(c1.joules).toBe(low * kg);
    expect(c1.joulesHigh).toBe(high * kg);
    expect(c1.display).toBe('10–20 J');
    expect(c1.synchronized).toBe(true);
    expect(c2.joules).toBe(next * kg);
    expect(c2.synchronized).toBe(true);
    expect(shock(sheet, 5, 'cardioversion').joules).toBe(next * kg);
  });
});

describe('adult sheet', () => {
  const sheet = adult();

  it('epinephrine 1 mg', () => {
    // AHA 2020 Adult Cardiac Arrest Algorithm, Drug Therapy box: epinephrine 1 mg IV/IO every 3–5 min. Confirmed (primary, copy).
    const d = dose(sheet, 'epinephrine', 0);
    expect(d.amount).toBe(1);
    expect(d.basis).toBe('adult-fixed');
    expect(dose(sheet, 'epinephrine', 3).amount).toBe(1);
  });

  it('amiodarone 300 mg then 150 mg, and the last dose repeats', () => {
    // AHA 2020 Adult Cardiac Arrest Algorithm, Drug Therapy box: amiodarone 300 mg bolus, then 150 mg. Confirmed (primary, copy).
    expect(dose(sheet, 'amiodarone', 0).amount).toBe(300);
    expect(dose(sheet, 'amiodarone', 1).amount).toBe(150);
    expect(dose(sheet, 'amiodarone', 2).amount).toBe(150);
    // Same box: 300 mg at 50 mg/mL is 6 mL (derived by arithmetic).
    expect(dose(sheet, 'amiodarone', 0).volumeText).toBe('6 mL of 50 mg/mL');
  });

  it('adenosine 6 mg then 12 mg', () => {
    // AHA Adult Tachycardia With a Pulse algorithm, Doses/Details box: 6 mg rapid IV push, then 12 mg. Confirmed (primary, copy).
    expect(dose(sheet, 'adenosine', 0).amount).toBe(6);
    expect(dose(sheet, 'adenosine', 1).amount).toBe(12);
  });

  it('default shock 200 J for every shock, with the presets', () => {
    // 200 J is a configurable local default, not a universal value. The AHA 2020 Adult Cardiac Arrest Algorithm
    // (Shock Energy box) says the manufacturer's recommended energy, e.g. 120–200 J biphasic; ANZCOR Guideline 11.4
    // uses 200 J for all shocks. Confirmed (primary).
    const defaultJ = 200;
    expect(shock(sheet, 0).joules).toBe(defaultJ);
    expect(shock(sheet, 1).joules).toBe(defaultJ);
    expect(shock(sheet, 5).joules).toBe(defaultJ);
    expect(sheet.defaultShockJoules).toBe(defaultJ);
    expect(sheet.shockPresetsJoules).toEqual(DEFAULT_PROTOCOL.shockPresetsJoules);
    expect(sheet.defibrillation.note).toMatch(/configured default/);
    expect(sheet.defibrillation.note).toMatch(/manufacturer/);
  });

  it('offers no adult cardioversion number, only the device-first note', () => {
    expect(nextShockJoules(sheet, 0, 'cardioversion')).toBeNull();
    expect(sheet.cardioversion.note).toMatch(/manufacturer/);
  });

  it('uses the catalogue adult doses even when a weight is known', () => {
    // AHA 2020 Adult Cardiac Arrest Algorithm: epinephrine 1 mg (a fixed adult dose, not per kg).
    const withWeight = computeDosing({ category: 'adult', weightKg: 80 }, DEFAULT_PROTOCOL);
    expect(dose(withWeight, 'epinephrine', 0).amount).toBe(1);
  });
});

describe('the sheet as a whole', () => {
  it('lists every catalogue drug in catalogue order, with its source and the protocol edition', () => {
    const sheet = peds(20);
    expect(sheet.edition).toBe(DEFAULT_PROTOCOL.edition);
    expect(sheet.drugs.map((d) => d.key)).toEqual(DEFAULT_PROTOCOL.drugs.map((d) => d.key));
    expect(sheet.drugs.map((d) => d.source)).toEqual(DEFAULT_PROTOCOL.drugs.map((d) => d.source));
  });

  it('a pediatric code without a weight says weight is needed and gives no numbers', () => {
    const sheet = peds(null);
    expect(sheet.status).toBe('weight-needed');
    expect(sheet.message).toMatch(/weight/i);
    expect(sheet.drugs).toEqual([]);
    expect(sheet.defibrillation.steps).toEqual([]);
    expect(sheet.cardioversion.steps).toEqual([]);
    expect(sheet.shockPresetsJoules).toEqual([]);
    expect(sheet.defaultShockJoules).toBeNull();
    expect(nextDoseFor(sheet, 'epinephrine', 0)).toBeNull();
    expect(nextShockJoules(sheet, 0)).toBeNull();
    expect(sheet.cautions.length).toBeGreaterThan(0);
  });

  it.each([0, -5, 250.1, 300, Number.NaN, Number.POSITIVE_INFINITY])('rejects the nonsense weight %s', (w) => {
    expect(() => peds(w)).toThrow(DosingInputError);
    expect(() => computeDosing({ category: 'adult', weightKg: w }, DEFAULT_PROTOCOL)).toThrow(DosingInputError);
  });

  it('accepts the 250 kg limit', () => {
    expect(peds(250).status).toBe('ready');
  });

  it('rejects a negative or fractional count of doses or shocks', () => {
    const sheet = peds(20);
    expect(() => nextDoseFor(sheet, 'epinephrine', -1)).toThrow(RangeError);
    expect(() => nextShockJoules(sheet, 1.5)).toThrow(RangeError);
  });

  it('returns null for a drug that is not in the catalogue', () => {
    expect(nextDoseFor(peds(20), 'no-such-drug', 0)).toBeNull();
  });

  it.each([
    ['adult', adult()],
    ['pediatric', peds(20)],
    ['pediatric without weight', peds(null)],
  ])('the %s sheet carries every caution', (_name, sheet) => {
    const all = sheet.cautions.join('\n');
    expect(all).toMatch(/does not replace/);
    expect(all).toMatch(/team leader's judgment/);
    expect(all).toMatch(/local protocol/);
    expect(all).toMatch(/licensed clinical practice/);
    expect(all).toMatch(/double-checked by a second person/);
    expect(all).toMatch(/Confirm the weight and how it was obtained/);
    expect(all).toMatch(/concentration and the units/);
    expect(all).toMatch(/mg vs mcg/);
    expect(all).toMatch(/manufacturer's recommended energy comes first/);
    expect(all).toMatch(/does not control the defibrillator/);
  });
});

describe('the sheet follows the configured protocol', () => {
  it('a different epinephrine cap changes the capped dose', () => {
    const settings = copyProtocol();
    const epi = settings.drugs.find((d) => d.key === 'epinephrine');
    const rule = epi?.pediatric?.[0];
    if (rule === undefined) throw new Error('epinephrine pediatric rule missing');
    rule.maxDose = 0.5;
    const d = dose(peds(120, settings), 'epinephrine', 0);
    expect(d.amount).toBe(0.5);
    expect(d.capNote).toBe('capped at the 0.5 mg maximum single dose');
    // The default protocol is untouched.
    expect(dose(peds(120), 'epinephrine', 0).amount).toBe(1);
  });

  it('a different adult dose cycle changes the suggested sequence', () => {
    const settings = copyProtocol();
    const amio = settings.drugs.find((d) => d.key === 'amiodarone');
    if (amio === undefined) throw new Error('amiodarone missing');
    amio.adultDoses = [300];
    const sheet = adult(settings);
    expect(dose(sheet, 'amiodarone', 1).amount).toBe(300);
    expect(dose(sheet, 'amiodarone', 0).repeats).toBe(true);
  });

  it('energies, edition and catalogue follow the settings', () => {
    const settings = copyProtocol();
    settings.edition = 'Local protocol 2026';
    settings.defaultShockJoules = 150;
    settings.adultMaxJoules = 200;
    settings.pediatricEnergy.secondJoulesPerKg = 3;
    settings.drugs = settings.drugs.filter((d) => d.key !== 'naloxone');

    const a = adult(settings);
    expect(a.edition).toBe('Local protocol 2026');
    expect(shock(a, 0).joules).toBe(150);
    expect(a.cautions.join('\n')).toContain('Local protocol 2026');

    const p = peds(15, settings);
    // 3 J/kg × 15 kg = 45 J; 10 J/kg × 15 kg = 150 J stays below the 200 J adult maximum.
    expect(shock(p, 1).joules).toBe(3 * 15);
    expect(shock(p, 2).joulesHigh).toBe(150);
    // 10 J/kg × 30 kg = 300 J is above the configured 200 J adult maximum.
    expect(shock(peds(30, settings), 2).joulesHigh).toBe(200);
    expect(p.drugs.some((d) => d.key === 'naloxone')).toBe(false);
  });

  it('a drug with no pediatric rule gets no pediatric number, never the adult dose', () => {
    const settings = copyProtocol();
    const epi = settings.drugs.find((d) => d.key === 'epinephrine');
    if (epi === undefined) throw new Error('epinephrine missing');
    delete epi.pediatric;
    const drug = peds(20, settings).drugs.find((d) => d.key === 'epinephrine');
    expect(drug?.doses).toEqual([]);
    expect(drug?.notes.join(' ')).toMatch(/No pediatric dose is configured/);
  });
});
