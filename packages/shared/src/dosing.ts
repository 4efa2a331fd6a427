import type { CodeCategory } from './codes.js';
import type { DoseUnit } from './entries.js';
import type { DrugDefinition, PerKgRule, ProtocolSettings } from './protocol.js';

/**
 * The dosing sheet: the doses and energies the pad and the wall show for one code, computed
 * from the configured protocol alone. Exact numbers stay in the data; only the display strings
 * are rounded, so a later check can always recompute from the same numbers.
 */

/** Heaviest weight accepted; matches the limit on `weightKg` when a code is created. */
export const MAX_PLAUSIBLE_WEIGHT_KG = 250;

export class DosingInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'DosingInputError';
  }
}

export interface DosingInput {
  category: CodeCategory;
  weightKg: number | null;
}

export interface DoseLine {
  /** 1-based: dose 1, dose 2... */
  doseNumber: number;
  /** True on the last line: every later dose repeats it. */
  repeats: boolean;
  basis: 'per-kg' | 'adult-fixed';
  unit: DoseUnit;
  /** Exact amount after any cap (the low end for a range rule). */
  amount: number;
  /** Exact high end after any cap, for a range rule (perKgHigh); null otherwise. */
  amountHigh: number | null;
  /** Rounded for display, e.g. "0.2 mg" or "0.5–1 g". */
  display: string;
  perKg: number | null;
  perKgHigh: number | null;
  /** What the formula gave before the cap. */
  uncappedAmount: number | null;
  uncappedAmountHigh: number | null;
  /** Largest single dose configured for this rule; null when none is configured. */
  maxDose: number | null;
  /** e.g. "0.01 mg/kg × 20 kg = 0.2 mg". */
  formula: string;
  capped: boolean;
  /** e.g. "capped at the 1 mg maximum single dose". */
  capNote: string | null;
  /** Exact volume at the catalogue concentration; null when no concentration is configured. */
  volumeMl: number | null;
  volumeMlHigh: number | null;
  /** e.g. "2 mL of 0.1 mg/mL". */
  volumeText: string | null;
}

export interface DrugDosing {
  key: string;
  label: string;
  unit: DoseUnit;
  route: DrugDefinition['route'];
  source: string;
  concentrationPerMl: number | null;
  /** e.g. "0.1 mg/mL". */
  concentrationText: string | null;
  /** Dose 1, dose 2...; the last repeats. Empty when the protocol has no dose for this patient. */
  doses: DoseLine[];
  notes: string[];
}

export interface EnergyStep {
  /** First shock (1-based) this step applies to; with `repeats`, every later shock too. */
  shockNumber: number;
  repeats: boolean;
  synchronized: boolean;
  /** Exact energy to suggest (the low end when there is a range). */
  joules: number;
  /** Exact upper limit for a range; null for a single value. */
  joulesHigh: number | null;
  /** Whole joules, e.g. "30 J" or "60–150 J". */
  display: string;
  formula: string;
  capped: boolean;
  capNote: string | null;
}

export interface EnergyPlan {
  synchronized: boolean;
  steps: EnergyStep[];
  note: string;
}

export interface DosingSheet {
  /** The guideline edition the configured protocol follows. */
  edition: string;
  category: CodeCategory;
  weightKg: number | null;
  /** 'weight-needed': a pediatric code without a weight; the sheet then carries no numbers. */
  status: 'ready' | 'weight-needed';
  message: string | null;
  drugs: DrugDosing[];
  defibrillation: EnergyPlan;
  cardioversion: EnergyPlan;
  /** The configured adult default; null for a pediatric code. */
  defaultShockJoules: number | null;
  /** The configured adult presets; empty for a pediatric code, whose energies are weight-based. */
  shockPresetsJoules: number[];
  cautions: string[];
}

const UNIT_LABEL: Record<DoseUnit, string> = {
  mg: 'mg',
  // Shown as "mcg": "ug" and "µg" are easily misread as "mg".
  ug: 'mcg',
  g: 'g',
  meq: 'mEq',
  mL: 'mL',
};

export function doseUnitLabel(unit: DoseUnit): string {
  return UNIT_LABEL[unit];
}

/**
 * Display rounding for doses and volumes: two decimals, but never fewer than two significant
 * digits, so a small child's 0.035 mg is not shown as 0.04 mg.
 */
export function roundDoseForDisplay(x: number): number {
  if (x === 0 || !Number.isFinite(x)) return x;
  const decimals = Math.min(6, Math.max(2, Math.ceil(-Math.log10(Math.abs(x))) + 1));
  return Number(x.toFixed(decimals));
}

/** Display rounding for energies: whole joules. */
export function roundJoulesForDisplay(x: number): number {
  return Math.round(x);
}

const fmtDose = (x: number): string => String(roundDoseForDisplay(x));
/** Configured rule numbers and weights are shown as entered, minus float noise. */
const fmtInput = (x: number): string => String(Number(x.toPrecision(6)));
const fmtJ = (x: number): string => `${roundJoulesForDisplay(x)} J`;

function rangeText(low: string, high: string | null, suffix: string): string {
  return high === null || high === low ? `${low} ${suffix}` : `${low}–${high} ${suffix}`;
}

function checkWeight(weightKg: number | null): void {
  if (weightKg === null) return;
  if (typeof weightKg !== 'number' || !Number.isFinite(weightKg)) {
    throw new DosingInputError('weightKg must be a number of kilograms');
  }
  if (weightKg <= 0) throw new DosingInputError('weightKg must be above 0');
  if (weightKg > MAX_PLAUSIBLE_WEIGHT_KG) {
    throw new DosingInputError(`weightKg above ${MAX_PLAUSIBLE_WEIGHT_KG} is not plausible`);
  }
}

function buildCautions(settings: ProtocolSettings): string[] {
  return [
    "This sheet supports the team leader's judgment and does not replace it, the local protocol or licensed clinical practice.",
    'Every weight-based dose must be double-checked by a second person before it is given. Confirm the weight and how it was obtained (measured, estimated, or length-based tape).',
    'Check the concentration and the units before drawing up (mg vs mcg, mg vs mL, 0.1 mg/mL vs 1 mg/mL): a mix-up causes tenfold errors.',
    "Energy settings depend on the defibrillator: the manufacturer's recommended energy comes first. Check synchronized vs unsynchronized mode on the device.",
    'This tool does not control the defibrillator; it only shows settings for the team to consider.',
    `Values follow the configured protocol (${settings.edition}); check them against the local protocol.`,
  ];
}

function volumeOf(drug: DrugDefinition, amount: number): number | null {
  if (drug.unit === 'mL') return amount;
  return drug.concentrationPerMl === undefined ? null : amount / drug.concentrationPerMl;
}

function concentrationText(drug: DrugDefinition): string | null {
  if (drug.unit === 'mL' || drug.concentrationPerMl === undefined) return null;
  return `${fmtInput(drug.concentrationPerMl)} ${UNIT_LABEL[drug.unit]}/mL`;
}

function volumeText(drug: DrugDefinition, low: number | null, high: number | null): string | null {
  if (low === null) return null;
  const ml = rangeText(fmtDose(low), high === null ? null : fmtDose(high), 'mL');
  const conc = concentrationText(drug);
  return conc === null ? ml : `${ml} of ${conc}`;
}

function perKgLine(drug: DrugDefinition, rule: PerKgRule, weightKg: number, index: number, count: number): DoseLine {
  const u = UNIT_LABEL[drug.unit];
  const rawLow = rule.perKg * weightKg;
  const rawHigh = rule.perKgHigh === undefined ? null : rule.perKgHigh * weightKg;
  const max = rule.maxDose ?? null;
  const low = max === null ? rawLow : Math.min(rawLow, max);
  const high = rawHigh === null ? null : max === null ? rawHigh : Math.min(rawHigh, max);
  const lowCapped = max !== null && rawLow > max;
  const highCapped = max !== null && rawHigh !== null && rawHigh > max;

  const perKgText = rangeText(
    fmtInput(rule.perKg),
    rule.perKgHigh === undefined ? null : fmtInput(rule.perKgHigh),
    `${u}/kg`,
  );
  const rawText = rangeText(fmtDose(rawLow), rawHigh === null ? null : fmtDose(rawHigh), u);
  const formula = `${perKgText} × ${fmtInput(weightKg)} kg = ${rawText}`;

  let capNote: string | null = null;
  if (max !== null && (lowCapped || highCapped)) {
    const where = highCapped && !lowCapped ? 'upper end capped' : 'capped';
    capNote = `${where} at the ${fmtInput(max)} ${u} maximum single dose`;
  }

  const volLow = volumeOf(drug, low);
  const volHigh = high === null ? null : volumeOf(drug, high);
  return {
    doseNumber: index + 1,
    repeats: index === count - 1,
    basis: 'per-kg',
    unit: drug.unit,
    amount: low,
    amountHigh: high,
    display: rangeText(fmtDose(low), high === null ? null : fmtDose(high), u),
    perKg: rule.perKg,
    perKgHigh: rule.perKgHigh ?? null,
    uncappedAmount: rawLow,
    uncappedAmountHigh: rawHigh,
    maxDose: max,
    formula,
    capped: lowCapped || highCapped,
    capNote,
    volumeMl: volLow,
    volumeMlHigh: high === null ? null : volHigh,
    volumeText: volumeText(drug, volLow, high === null ? null : volHigh),
  };
}

function adultLine(drug: DrugDefinition, amount: number, index: number, count: number): DoseLine {
  const u = UNIT_LABEL[drug.unit];
  const vol = volumeOf(drug, amount);
  return {
    doseNumber: index + 1,
    repeats: index === count - 1,
    basis: 'adult-fixed',
    unit: drug.unit,
    amount,
    amountHigh: null,
    display: `${fmtDose(amount)} ${u}`,
    perKg: null,
    perKgHigh: null,
    uncappedAmount: null,
    uncappedAmountHigh: null,
    maxDose: null,
    formula: `adult dose ${index + 1} from the protocol: ${fmtDose(amount)} ${u}`,
    capped: false,
    capNote: null,
    volumeMl: vol,
    volumeMlHigh: null,
    volumeText: volumeText(drug, vol, null),
  };
}

function drugDosing(drug: DrugDefinition, category: CodeCategory, weightKg: number | null): DrugDosing {
  const notes: string[] = [];
  let doses: DoseLine[];
  if (category === 'adult') {
    doses = drug.adultDoses.map((a, i) => adultLine(drug, a, i, drug.adultDoses.length));
  } else {
    const rules = drug.pediatric ?? [];
    // Never fall back to the adult dose for a child: no rule, no number.
    if (rules.length === 0) notes.push('No pediatric dose is configured for this drug; none is suggested.');
    doses = weightKg === null ? [] : rules.map((r, i) => perKgLine(drug, r, weightKg, i, rules.length));
    if (rules.some((r) => r.maxDose === undefined)) {
      notes.push('No maximum single dose is configured for this drug; check the dose against the adult dose.');
    }
  }
  if (drug.unit !== 'mL' && drug.concentrationPerMl === undefined) {
    notes.push('No concentration is configured, so no volume is shown.');
  }
  return {
    key: drug.key,
    label: drug.label,
    unit: drug.unit,
    route: drug.route,
    source: drug.source,
    concentrationPerMl: drug.concentrationPerMl ?? null,
    concentrationText: concentrationText(drug),
    doses,
    notes,
  };
}

/** One weight-based energy, limited by `ceiling`; `ceilingNote` says which limit that is. */
function capEnergy(raw: number, ceiling: number, ceilingNote: string): { joules: number; capped: boolean; capNote: string | null } {
  return raw > ceiling ? { joules: ceiling, capped: true, capNote: ceilingNote } : { joules: raw, capped: false, capNote: null };
}

function pediatricDefibrillation(settings: ProtocolSettings, kg: number): EnergyPlan {
  const pe = settings.pediatricEnergy;
  const w = fmtInput(kg);
  const perKgMax = pe.maxJoulesPerKg * kg;
  const adultMax = settings.adultMaxJoules;
  // "Up to 10 J/kg or the adult dose, whichever is lower".
  const ceiling = Math.min(perKgMax, adultMax);
  const ceilingNote =
    adultMax < perKgMax
      ? `capped at the ${fmtJ(adultMax)} adult maximum`
      : `capped at ${fmtInput(pe.maxJoulesPerKg)} J/kg (${fmtJ(perKgMax)})`;

  const firstRaw = pe.firstJoulesPerKg * kg;
  const first = capEnergy(firstRaw, ceiling, ceilingNote);
  const secondRaw = pe.secondJoulesPerKg * kg;
  const second = capEnergy(secondRaw, ceiling, ceilingNote);

  let laterNote: string | null = second.capNote;
  if (laterNote === null && adultMax < perKgMax) {
    laterNote = `upper limit capped at the ${fmtJ(adultMax)} adult maximum rather than ${fmtJ(perKgMax)} (${fmtInput(pe.maxJoulesPerKg)} J/kg × ${w} kg)`;
  }
  const laterHigh = ceiling > second.joules ? ceiling : null;

  const steps: EnergyStep[] = [
    {
      shockNumber: 1,
      repeats: false,
      synchronized: false,
      joules: first.joules,
      joulesHigh: null,
      display: fmtJ(first.joules),
      formula: `${fmtInput(pe.firstJoulesPerKg)} J/kg × ${w} kg = ${fmtJ(firstRaw)}`,
      capped: first.capped,
      capNote: first.capNote,
    },
    {
      shockNumber: 2,
      repeats: false,
      synchronized: false,
      joules: second.joules,
      joulesHigh: null,
      display: fmtJ(second.joules),
      formula: `${fmtInput(pe.secondJoulesPerKg)} J/kg × ${w} kg = ${fmtJ(secondRaw)}`,
      capped: second.capped,
      capNote: second.capNote,
    },
    {
      shockNumber: 3,
      repeats: true,
      synchronized: false,
      joules: second.joules,
      joulesHigh: laterHigh,
      display: laterHigh === null ? fmtJ(second.joules) : `${roundJoulesForDisplay(second.joules)}–${fmtJ(laterHigh)}`,
      formula:
        `from ${fmtInput(pe.secondJoulesPerKg)} J/kg × ${w} kg = ${fmtJ(secondRaw)}` +
        ` up to the lower of ${fmtInput(pe.maxJoulesPerKg)} J/kg × ${w} kg = ${fmtJ(perKgMax)} and the ${fmtJ(adultMax)} adult maximum`,
      capped: laterNote !== null,
      capNote: laterNote,
    },
  ];
  return {
    synchronized: false,
    steps,
    note: "Weight-based energies; the device's selectable settings and the manufacturer's recommendation come first.",
  };
}

function pediatricCardioversion(settings: ProtocolSettings, kg: number): EnergyPlan {
  const pe = settings.pediatricEnergy;
  const w = fmtInput(kg);
  const adultMax = settings.adultMaxJoules;
  const note = `capped at the ${fmtJ(adultMax)} adult maximum`;
  const lowRaw = pe.cardioversionFirstJoulesPerKg * kg;
  const highRaw = pe.cardioversionFirstJoulesPerKgHigh * kg;
  const low = capEnergy(lowRaw, adultMax, note);
  const high = capEnergy(highRaw, adultMax, note);
  const nextRaw = pe.cardioversionNextJoulesPerKg * kg;
  const next = capEnergy(nextRaw, adultMax, note);
  const firstHigh = high.joules > low.joules ? high.joules : null;
  return {
    synchronized: true,
    steps: [
      {
        shockNumber: 1,
        repeats: false,
        synchronized: true,
        joules: low.joules,
        joulesHigh: firstHigh,
        display:
          firstHigh === null ? fmtJ(low.joules) : `${roundJoulesForDisplay(low.joules)}–${fmtJ(firstHigh)}`,
        formula:
          `${fmtInput(pe.cardioversionFirstJoulesPerKg)}–${fmtInput(pe.cardioversionFirstJoulesPerKgHigh)} J/kg × ${w} kg` +
          ` = ${roundJoulesForDisplay(lowRaw)}–${fmtJ(highRaw)}`,
        capped: low.capped || high.capped,
        capNote: low.capped ? note : high.capped ? `upper end ${note}` : null,
      },
      {
        shockNumber: 2,
        repeats: true,
        synchronized: true,
        joules: next.joules,
        joulesHigh: null,
        display: fmtJ(next.joules),
        formula: `${fmtInput(pe.cardioversionNextJoulesPerKg)} J/kg × ${w} kg = ${fmtJ(nextRaw)}`,
        capped: next.capped,
        capNote: next.capNote,
      },
    ],
    note: 'Synchronized mode: confirm the device marks each QRS before every shock. Raise to the next step if a shock fails.',
  };
}

function adultDefibrillation(settings: ProtocolSettings): EnergyPlan {
  const raw = settings.defaultShockJoules;
  const e = capEnergy(raw, settings.adultMaxJoules, `capped at the ${fmtJ(settings.adultMaxJoules)} adult maximum`);
  return {
    synchronized: false,
    steps: [
      {
        shockNumber: 1,
        repeats: true,
        synchronized: false,
        joules: e.joules,
        joulesHigh: null,
        display: fmtJ(e.joules),
        formula: `configured local default: ${fmtJ(raw)}`,
        capped: e.capped,
        capNote: e.capNote,
      },
    ],
    note:
      `${fmtJ(raw)} is this hospital's configured default, not a universal value. Use the energy the device's manufacturer` +
      ' recommends; if unknown, the maximum available. Later shocks at the same or a higher energy.' +
      ` Presets: ${settings.shockPresetsJoules.map(fmtJ).join(', ')}.`,
  };
}

function adultCardioversion(settings: ProtocolSettings): EnergyPlan {
  return {
    synchronized: true,
    // Adult cardioversion energy depends on the rhythm and the device; the protocol holds no per-rhythm values.
    steps: [],
    note:
      "Synchronized cardioversion energy depends on the rhythm and the device: follow the manufacturer's recommendation and the local protocol." +
      ` Presets: ${settings.shockPresetsJoules.map(fmtJ).join(', ')}.`,
  };
}

export function computeDosing(input: DosingInput, settings: ProtocolSettings): DosingSheet {
  if (input.category !== 'adult' && input.category !== 'pediatric') {
    throw new DosingInputError("category must be 'adult' or 'pediatric'");
  }
  checkWeight(input.weightKg);
  const cautions = buildCautions(settings);

  if (input.category === 'adult') {
    return {
      edition: settings.edition,
      category: 'adult',
      weightKg: input.weightKg,
      status: 'ready',
      message: null,
      drugs: settings.drugs.map((d) => drugDosing(d, 'adult', input.weightKg)),
      defibrillation: adultDefibrillation(settings),
      cardioversion: adultCardioversion(settings),
      defaultShockJoules: settings.defaultShockJoules,
      shockPresetsJoules: [...settings.shockPresetsJoules],
      cautions,
    };
  }

  if (input.weightKg === null) {
    // Never guess a weight: no weight, no numbers.
    const needed = 'Weight needed: enter the weight to see doses and energies.';
    return {
      edition: settings.edition,
      category: 'pediatric',
      weightKg: null,
      status: 'weight-needed',
      message:
        'Weight needed. Enter the weight (measured, estimated, or from a length-based tape) to see weight-based doses and energies; no weight is assumed.',
      drugs: [],
      defibrillation: { synchronized: false, steps: [], note: needed },
      cardioversion: { synchronized: true, steps: [], note: needed },
      defaultShockJoules: null,
      shockPresetsJoules: [],
      cautions,
    };
  }

  const kg = input.weightKg;
  return {
    edition: settings.edition,
    category: 'pediatric',
    weightKg: kg,
    status: 'ready',
    message: null,
    drugs: settings.drugs.map((d) => drugDosing(d, 'pediatric', kg)),
    defibrillation: pediatricDefibrillation(settings, kg),
    cardioversion: pediatricCardioversion(settings, kg),
    defaultShockJoules: null,
    shockPresetsJoules: [],
    cautions,
  };
}

function checkCount(n: number, what: string): void {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`${what} must be a whole number, 0 or more`);
}

/** Picks the step for the next event: the steps run in order and the last one repeats. */
function stepAt<T>(steps: readonly T[], soFar: number): T | null {
  if (steps.length === 0) return null;
  return steps[Math.min(soFar, steps.length - 1)] ?? null;
}

/**
 * The dose to suggest after `dosesGivenSoFar` doses of `drugKey` (0 = the first dose).
 * Null when the drug is not on the sheet or the sheet has no dose for it (e.g. weight needed).
 */
export function nextDoseFor(sheet: DosingSheet, drugKey: string, dosesGivenSoFar: number): DoseLine | null {
  checkCount(dosesGivenSoFar, 'dosesGivenSoFar');
  const drug = sheet.drugs.find((d) => d.key === drugKey);
  return drug === undefined ? null : stepAt(drug.doses, dosesGivenSoFar);
}

/**
 * The energy step to suggest after `shocksSoFar` shocks (0 = the first shock): `joules` is the
 * value to suggest, `joulesHigh` the upper limit when the step is a range. Pediatric codes
 * escalate by weight; adult codes get the configured default for every shock. Null when the
 * sheet holds no energies (pediatric code without a weight, or adult cardioversion).
 */
export function nextShockJoules(
  sheet: DosingSheet,
  shocksSoFar: number,
  mode: 'defibrillation' | 'cardioversion' = 'defibrillation',
): EnergyStep | null {
  checkCount(shocksSoFar, 'shocksSoFar');
  const plan = mode === 'cardioversion' ? sheet.cardioversion : sheet.defibrillation;
  return stepAt(plan.steps, shocksSoFar);
}
