import type { CodeCategory } from './codes.js';
import { doseUnitLabel } from './drug-catalogue.js';
import type { DoseUnit } from './entries.js';
import type { ConcentrationBand, DoseRule, DoseSchedule, DrugDefinition, ProtocolSettings } from './protocol.js';

/**
 * The dosing sheet: the doses, limits and energies the pad and the wall show for one code,
 * computed from the code's protocol version alone. Exact numbers stay in the data; only the
 * display strings are rounded, so a later check can always recompute from the same numbers.
 * What has been given so far is the timeline's business (timeline.ts); `nextDose` joins the two.
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
  /** Age in months when known (from the birth date): picks age-banded concentrations. */
  ageMonths?: number | null;
}

export interface DoseLine {
  /** 1-based: dose 1, dose 2... */
  doseNumber: number;
  /** True on the last line when that dose may be repeated with no count limit. */
  repeats: boolean;
  /** per-kg: from the weight; fixed: the protocol's amount; fixed-no-weight: a per-kg rule's fixed stand-in. */
  basis: 'per-kg' | 'fixed' | 'fixed-no-weight';
  unit: DoseUnit;
  /** Exact amount after any cap (the low end for a range rule). */
  amount: number;
  /** Exact high end after any cap, for a range rule (perKgHigh); null otherwise. */
  amountHigh: number | null;
  /** Rounded for display, e.g. "0.2 mg" or "0.5–1 g". */
  display: string;
  perKg: number | null;
  perKgHigh: number | null;
  /** What the formula gave before any cap. */
  uncappedAmount: number | null;
  uncappedAmountHigh: number | null;
  /** Largest single dose configured for this rule; null when none is configured. */
  maxDose: number | null;
  /** e.g. "0.01 mg/kg × 20 kg = 0.2 mg". */
  formula: string;
  capped: boolean;
  /** e.g. "capped at the 1 mg maximum single dose". */
  capNote: string | null;
  /** Exact volume at the concentration shown; null when none is configured. */
  volumeMl: number | null;
  volumeMlHigh: number | null;
  /** e.g. "2 mL of 0.1 mg/mL (1 mg in 10 mL)". */
  volumeText: string | null;
}

export interface DrugConcentration {
  perMl: number;
  label: string;
  /** Why this band: "for a pediatric code", "under 3 months"... */
  why: string;
}

export interface DrugDosing {
  key: string;
  label: string;
  unit: DoseUnit;
  route: DrugDefinition['route'];
  source: string;
  /** Timing in words from the protocol, e.g. "every 3-5 min". */
  timing: string | null;
  concentration: DrugConcentration | null;
  /** e.g. "0.1 mg/mL (1 mg in 10 mL)". */
  concentrationText: string | null;
  /**
   * Exactly the allowed doses, in order, when the schedule has a limit; otherwise the listed
   * doses with the last marked `repeats`. Empty when the protocol has no dose for this patient.
   */
  doses: DoseLine[];
  /** Length of `doses` when the schedule is limited (by count or by total); null when the last dose repeats freely. */
  maxDoses: number | null;
  /** The protocol's own limit on the number of doses; null when only a total (or nothing) limits it. */
  countLimit: number | null;
  /** The repeating dose before any cumulative limit, for doses past the listed ones; null when the last does not repeat. */
  repeatLine: DoseLine | null;
  /** Most in total in one code, in the drug's unit (the lower of the absolute and per-kg limits); null for none. */
  maxTotal: number | null;
  /** e.g. "at most 15 mg/kg (270 mg) in total". */
  maxTotalText: string | null;
  /** Notes about this sheet's numbers: no maximum configured, weight unknown, no concentration... */
  notes: string[];
  /** The drug's own cautions from the protocol. */
  cautions: string[];
}

export interface EnergyStep {
  /** First shock (1-based) of its kind this step applies to; with `repeats`, every later one too. */
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
  /** The guideline edition the code's protocol version follows. */
  edition: string;
  category: CodeCategory;
  weightKg: number | null;
  /** 'weight-needed': a pediatric code without a weight; the sheet then carries no numbers. */
  status: 'ready' | 'weight-needed';
  message: string | null;
  /** An adult code whose weight says child: shown on the pad and the wall with the offer to switch. */
  categoryWarning: string | null;
  drugs: DrugDosing[];
  defibrillation: EnergyPlan;
  cardioversion: EnergyPlan;
  /** The configured adult default; null for a pediatric code. */
  defaultShockJoules: number | null;
  /** The configured adult presets; empty for a pediatric code, whose energies are weight-based. */
  shockPresetsJoules: number[];
  cautions: string[];
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
/** Floating-point slack when comparing a running total with its limit. */
const EPSILON = 1e-9;

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

export const DOSING_CAUTIONS = {
  judgment: "This sheet supports the team leader's judgment and does not replace it, the local protocol or licensed clinical practice.",
  doubleCheck:
    'Every weight-based dose must be double-checked by a second person before it is given. Confirm the weight and how it was obtained (measured, estimated, or length-based tape).',
  units: 'Check the concentration and the units before drawing up (mg vs mcg, mg vs mL, 0.1 mg/mL vs 1 mg/mL): a mix-up causes tenfold errors.',
  device: "Energy settings depend on the defibrillator: the manufacturer's recommended energy comes first. Check synchronised vs unsynchronised mode on the device.",
  noControl: 'This tool does not set the defibrillator; it only shows settings for the team to consider.',
} as const;

function buildCautions(settings: ProtocolSettings): string[] {
  return [
    DOSING_CAUTIONS.judgment,
    DOSING_CAUTIONS.doubleCheck,
    DOSING_CAUTIONS.units,
    DOSING_CAUTIONS.device,
    DOSING_CAUTIONS.noControl,
    `Values follow the configured protocol (${settings.edition}); check them against the local protocol.`,
  ];
}

// ------------------------------------------------------------------------------ concentration

function bandFits(band: ConcentrationBand, patient: DosingInput): boolean {
  if (band.appliesTo !== 'any' && band.appliesTo !== patient.category) return false;
  const age = patient.ageMonths ?? null;
  if (band.underAgeMonths !== undefined && age !== null) return age < band.underAgeMonths;
  if (band.upToWeightKg !== undefined) return patient.weightKg !== null && patient.weightKg <= band.upToWeightKg;
  // An age band with neither an age nor a weight stand-in to check cannot be chosen.
  return band.underAgeMonths === undefined;
}

function bandWhy(band: ConcentrationBand, patient: DosingInput): string {
  const age = patient.ageMonths ?? null;
  if (band.underAgeMonths !== undefined && age !== null) return `under ${fmtInput(band.underAgeMonths)} months of age`;
  if (band.upToWeightKg !== undefined) {
    const stand = band.underAgeMonths !== undefined ? ` (age unknown: stands in for under ${fmtInput(band.underAgeMonths)} months)` : '';
    return `${fmtInput(band.upToWeightKg)} kg or less${stand}`;
  }
  return band.appliesTo === 'any' ? 'as supplied' : `for a ${band.appliesTo} code`;
}

/** The concentration a drug is given at for a category when age and weight are not known (reconciliation of mL doses). */
export function usualConcentration(drug: DrugDefinition, category: CodeCategory): DrugConcentration | null {
  return chooseConcentration(drug, { category, weightKg: null, ageMonths: null });
}

function chooseConcentration(drug: DrugDefinition, patient: DosingInput): DrugConcentration | null {
  const band = drug.concentrations.find((b) => bandFits(b, patient));
  return band ? { perMl: band.perMl, label: band.label, why: bandWhy(band, patient) } : null;
}

// ------------------------------------------------------------------------------ dose lines

interface LineContext {
  drug: DrugDefinition;
  concentration: DrugConcentration | null;
  weightKg: number | null;
}

function volumeOf(ctx: LineContext, amount: number): number | null {
  if (ctx.drug.unit === 'mL') return amount;
  return ctx.concentration === null ? null : amount / ctx.concentration.perMl;
}

function volumeText(ctx: LineContext, low: number | null, high: number | null): string | null {
  if (low === null) return null;
  const ml = rangeText(fmtDose(low), high === null ? null : fmtDose(high), 'mL');
  return ctx.concentration === null || ctx.drug.unit === 'mL' ? ml : `${ml} of ${ctx.concentration.label}`;
}

/** One line of the sheet from one rule; null when the rule cannot give a number (per kg, no weight, no stand-in). */
function lineOf(ctx: LineContext, rule: DoseRule, doseNumber: number): DoseLine | null {
  const u = doseUnitLabel(ctx.drug.unit);
  const weight = ctx.weightKg;
  let basis: DoseLine['basis'];
  let rawLow: number;
  let rawHigh: number | null = null;
  let formula: string;
  if (rule.perKg !== undefined && weight !== null) {
    basis = 'per-kg';
    rawLow = rule.perKg * weight;
    rawHigh = rule.perKgHigh === undefined ? null : rule.perKgHigh * weight;
    const perKgText = rangeText(fmtInput(rule.perKg), rule.perKgHigh === undefined ? null : fmtInput(rule.perKgHigh), `${u}/kg`);
    formula = `${perKgText} × ${fmtInput(weight)} kg = ${rangeText(fmtDose(rawLow), rawHigh === null ? null : fmtDose(rawHigh), u)}`;
  } else if (rule.amount !== undefined) {
    basis = rule.perKg !== undefined ? 'fixed-no-weight' : 'fixed';
    rawLow = rule.amount;
    formula =
      basis === 'fixed-no-weight'
        ? `weight not known: fixed dose ${fmtDose(rule.amount)} ${u} instead of ${rangeText(fmtInput(rule.perKg ?? 0), rule.perKgHigh === undefined ? null : fmtInput(rule.perKgHigh), `${u}/kg`)}`
        : `dose ${doseNumber} from the protocol: ${fmtDose(rule.amount)} ${u}`;
  } else {
    return null;
  }
  const max = rule.maxDose ?? null;
  const low = max === null ? rawLow : Math.min(rawLow, max);
  const high = rawHigh === null ? null : max === null ? rawHigh : Math.min(rawHigh, max);
  const lowCapped = max !== null && rawLow > max;
  const highCapped = max !== null && rawHigh !== null && rawHigh > max;
  let capNote: string | null = null;
  if (max !== null && (lowCapped || highCapped)) {
    capNote = `${highCapped && !lowCapped ? 'upper end capped' : 'capped'} at the ${fmtInput(max)} ${u} maximum single dose`;
  }
  const volLow = volumeOf(ctx, low);
  const volHigh = high === null ? null : volumeOf(ctx, high);
  return {
    doseNumber,
    repeats: false,
    basis,
    unit: ctx.drug.unit,
    amount: low,
    amountHigh: high,
    display: rangeText(fmtDose(low), high === null ? null : fmtDose(high), u),
    perKg: basis === 'per-kg' ? (rule.perKg ?? null) : null,
    perKgHigh: basis === 'per-kg' ? (rule.perKgHigh ?? null) : null,
    uncappedAmount: rawLow,
    uncappedAmountHigh: rawHigh,
    maxDose: max,
    formula,
    capped: lowCapped || highCapped,
    capNote,
    volumeMl: volLow,
    volumeMlHigh: volHigh,
    volumeText: volumeText(ctx, volLow, volHigh),
  };
}

/** The cumulative maximum in the drug's unit: the lower of the absolute and the per-kg limit. */
function cumulativeLimit(schedule: DoseSchedule, weightKg: number | null, unit: string): { total: number | null; text: string | null; note: string | null } {
  const perKgTotal = schedule.maxTotalPerKg !== undefined && weightKg !== null ? schedule.maxTotalPerKg * weightKg : null;
  const abs = schedule.maxTotal ?? null;
  const candidates = [abs, perKgTotal].filter((v): v is number => v !== null);
  const total = candidates.length === 0 ? null : Math.min(...candidates);
  let text: string | null = null;
  if (total !== null) {
    text =
      perKgTotal !== null && total === perKgTotal
        ? `at most ${fmtInput(schedule.maxTotalPerKg ?? 0)} ${unit}/kg (${fmtDose(total)} ${unit}) in total`
        : `at most ${fmtDose(total)} ${unit} in total`;
  }
  const note =
    schedule.maxTotalPerKg !== undefined && weightKg === null
      ? `The total is limited to ${fmtInput(schedule.maxTotalPerKg)} ${unit}/kg: enter the weight to check it.`
      : null;
  return { total, text, note };
}

/** Upper bound on the lines one schedule may list, whatever its limits say. */
const MAX_LISTED_DOSES = 12;

function drugDosing(drug: DrugDefinition, patient: DosingInput): DrugDosing {
  const notes: string[] = [];
  const concentration = chooseConcentration(drug, patient);
  const ctx: LineContext = { drug, concentration, weightKg: patient.weightKg };
  const u = doseUnitLabel(drug.unit);
  const schedule = patient.category === 'adult' ? drug.adult : drug.pediatric;
  const base = {
    key: drug.key,
    label: drug.label,
    unit: drug.unit,
    route: drug.route,
    source: drug.source,
    concentration,
    concentrationText: concentration === null || drug.unit === 'mL' ? null : concentration.label,
    cautions: [...drug.cautions],
  };
  if (drug.unit !== 'mL' && concentration === null) notes.push('No concentration is configured for this patient, so no volume is shown.');
  if (schedule === undefined) {
    // Never fall back to the adult dose for a child: no rule, no number.
    notes.push('No pediatric dose is configured for this drug; none is suggested.');
    return { ...base, timing: null, doses: [], maxDoses: null, countLimit: null, repeatLine: null, maxTotal: null, maxTotalText: null, notes };
  }
  if (patient.category === 'pediatric' && schedule.doses.some((r) => r.maxDose === undefined && r.perKg !== undefined)) {
    notes.push('No maximum single dose is configured for this drug; check the dose against the adult dose.');
  }
  const limit = cumulativeLimit(schedule, patient.weightKg, u);
  if (limit.note) notes.push(limit.note);
  if (patient.weightKg === null && schedule.doses.some((r) => r.perKg !== undefined && r.amount !== undefined)) {
    notes.push('Weight not known: the fixed dose is shown. Enter the weight for the weight-based dose.');
  }

  const bounded = schedule.maxDoses !== undefined || !schedule.repeatLast || limit.total !== null;
  const doses: DoseLine[] = [];
  let listedTotal = 0;
  for (let i = 0; i < MAX_LISTED_DOSES; i++) {
    if (schedule.maxDoses !== undefined && i >= schedule.maxDoses) break;
    if (i >= schedule.doses.length && !schedule.repeatLast) break;
    if (!bounded && i >= schedule.doses.length) break;
    const rule = schedule.doses[Math.min(i, schedule.doses.length - 1)];
    if (!rule) break;
    let line = lineOf(ctx, rule, i + 1);
    if (line === null) break;
    if (limit.total !== null && limit.text !== null) {
      const remaining = limit.total - listedTotal;
      if (remaining <= EPSILON) break;
      line = limitLine({ unit: drug.unit, concentration, concentrationText: base.concentrationText, maxTotalText: limit.text }, line, remaining);
    }
    doses.push(line);
    listedTotal += line.amount;
  }
  const last = doses[doses.length - 1];
  if (last && !bounded) last.repeats = true;
  const lastRule = schedule.doses[schedule.doses.length - 1];
  const repeatLine = schedule.repeatLast && lastRule ? lineOf(ctx, lastRule, doses.length + 1) : null;
  return {
    ...base,
    timing: schedule.timing ?? null,
    doses,
    maxDoses: bounded ? doses.length : null,
    countLimit: schedule.maxDoses ?? (schedule.repeatLast ? null : schedule.doses.length),
    repeatLine,
    maxTotal: limit.total,
    maxTotalText: limit.text,
    notes,
  };
}

// ------------------------------------------------------------------------------ energies

/** One weight-based energy, limited by `ceiling`; `ceilingNote` says which limit that is. */
function capEnergy(raw: number, ceiling: number, ceilingNote: string): { joules: number; capped: boolean; capNote: string | null } {
  return raw > ceiling ? { joules: ceiling, capped: true, capNote: ceilingNote } : { joules: raw, capped: false, capNote: null };
}

function energyStep(step: Omit<EnergyStep, 'display'>): EnergyStep {
  const display =
    step.joulesHigh === null ? fmtJ(step.joules) : `${roundJoulesForDisplay(step.joules)}–${fmtJ(step.joulesHigh)}`;
  return { ...step, display };
}

/**
 * Pediatric defibrillation: 2 J/kg, then 4 J/kg, then at least 4 J/kg up to 10 J/kg or the
 * adult dose, whichever is lower (AHA 2020 PALS). The adult dose is the protocol's adult energy.
 */
function pediatricDefibrillation(settings: ProtocolSettings, kg: number): EnergyPlan {
  const pe = settings.pediatricEnergy;
  const w = fmtInput(kg);
  const perKgMax = pe.maxJoulesPerKg * kg;
  const adult = settings.defaultShockJoules;
  const ceiling = Math.min(perKgMax, adult);
  const ceilingNote =
    adult < perKgMax ? `capped at the ${fmtJ(adult)} adult dose` : `capped at ${fmtInput(pe.maxJoulesPerKg)} J/kg (${fmtJ(perKgMax)})`;
  const firstRaw = pe.firstJoulesPerKg * kg;
  const first = capEnergy(firstRaw, ceiling, ceilingNote);
  const secondRaw = pe.secondJoulesPerKg * kg;
  const second = capEnergy(secondRaw, ceiling, ceilingNote);
  const laterHigh = ceiling > second.joules ? ceiling : null;
  const laterNote =
    second.capNote ?? (adult < perKgMax ? `upper limit is the ${fmtJ(adult)} adult dose rather than ${fmtJ(perKgMax)} (${fmtInput(pe.maxJoulesPerKg)} J/kg)` : null);
  return {
    synchronized: false,
    steps: [
      energyStep({
        shockNumber: 1,
        repeats: false,
        synchronized: false,
        joules: first.joules,
        joulesHigh: null,
        formula: `${fmtInput(pe.firstJoulesPerKg)} J/kg × ${w} kg = ${fmtJ(firstRaw)}`,
        capped: first.capped,
        capNote: first.capNote,
      }),
      energyStep({
        shockNumber: 2,
        repeats: false,
        synchronized: false,
        joules: second.joules,
        joulesHigh: null,
        formula: `${fmtInput(pe.secondJoulesPerKg)} J/kg × ${w} kg = ${fmtJ(secondRaw)}`,
        capped: second.capped,
        capNote: second.capNote,
      }),
      energyStep({
        shockNumber: 3,
        repeats: true,
        synchronized: false,
        joules: second.joules,
        joulesHigh: laterHigh,
        formula:
          `at least ${fmtInput(pe.secondJoulesPerKg)} J/kg (${fmtJ(secondRaw)}),` +
          ` up to the lower of ${fmtInput(pe.maxJoulesPerKg)} J/kg × ${w} kg = ${fmtJ(perKgMax)} and the ${fmtJ(adult)} adult dose`,
        capped: laterNote !== null,
        capNote: laterNote,
      }),
    ],
    note: "Weight-based energies; the device's selectable settings and the manufacturer's recommendation come first.",
  };
}

/** Pediatric synchronised cardioversion: 0.5-1 J/kg, then 2 J/kg (AHA 2020 Pediatric Tachycardia), never above the adult dose. */
function pediatricCardioversion(settings: ProtocolSettings, kg: number): EnergyPlan {
  const pe = settings.pediatricEnergy;
  const w = fmtInput(kg);
  const adult = settings.defaultShockJoules;
  const note = `capped at the ${fmtJ(adult)} adult dose`;
  const lowRaw = pe.cardioversionFirstJoulesPerKg * kg;
  const highRaw = pe.cardioversionFirstJoulesPerKgHigh * kg;
  const low = capEnergy(lowRaw, adult, note);
  const high = capEnergy(highRaw, adult, note);
  const nextRaw = pe.cardioversionNextJoulesPerKg * kg;
  const next = capEnergy(nextRaw, adult, note);
  return {
    synchronized: true,
    steps: [
      energyStep({
        shockNumber: 1,
        repeats: false,
        synchronized: true,
        joules: low.joules,
        joulesHigh: high.joules > low.joules ? high.joules : null,
        formula:
          `${fmtInput(pe.cardioversionFirstJoulesPerKg)}–${fmtInput(pe.cardioversionFirstJoulesPerKgHigh)} J/kg × ${w} kg` +
          ` = ${roundJoulesForDisplay(lowRaw)}–${fmtJ(highRaw)}`,
        capped: low.capped || high.capped,
        capNote: low.capped ? note : high.capped ? `upper end ${note}` : null,
      }),
      energyStep({
        shockNumber: 2,
        repeats: true,
        synchronized: true,
        joules: next.joules,
        joulesHigh: null,
        formula: `${fmtInput(pe.cardioversionNextJoulesPerKg)} J/kg × ${w} kg = ${fmtJ(nextRaw)}`,
        capped: next.capped,
        capNote: next.capNote,
      }),
    ],
    note: 'Synchronised mode: confirm the device marks each QRS before every shock. Raise to the next step if a shock fails.',
  };
}

function adultDefibrillation(settings: ProtocolSettings): EnergyPlan {
  const raw = settings.defaultShockJoules;
  return {
    synchronized: false,
    steps: [
      energyStep({
        shockNumber: 1,
        repeats: true,
        synchronized: false,
        joules: raw,
        joulesHigh: null,
        formula: `configured local default: ${fmtJ(raw)}`,
        capped: false,
        capNote: null,
      }),
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
      "Synchronised cardioversion energy depends on the rhythm and the device: follow the manufacturer's recommendation and the local protocol." +
      ` Presets: ${settings.shockPresetsJoules.map(fmtJ).join(', ')}.`,
  };
}

/** The warning an adult code gets when its weight says child (configurable threshold, common practice). */
export function adultWeightWarning(input: DosingInput, settings: ProtocolSettings): string | null {
  if (input.category !== 'adult' || input.weightKg === null || input.weightKg >= settings.adultWeightWarningKg) return null;
  return `Weight ${fmtInput(input.weightKg)} kg is under ${fmtInput(settings.adultWeightWarningKg)} kg: if this is a child, switch to a pediatric code for weight-based doses and energies.`;
}

export function computeDosing(input: DosingInput, settings: ProtocolSettings): DosingSheet {
  if (input.category !== 'adult' && input.category !== 'pediatric') {
    throw new DosingInputError("category must be 'adult' or 'pediatric'");
  }
  checkWeight(input.weightKg);
  const cautions = buildCautions(settings);
  const categoryWarning = adultWeightWarning(input, settings);

  if (input.category === 'adult') {
    return {
      edition: settings.edition,
      category: 'adult',
      weightKg: input.weightKg,
      status: 'ready',
      message: null,
      categoryWarning,
      drugs: settings.drugs.map((d) => drugDosing(d, input)),
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
      categoryWarning: null,
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
    categoryWarning: null,
    drugs: settings.drugs.map((d) => drugDosing(d, input)),
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

/** Why the next dose is past the protocol's limit, in words for the button. */
export interface DoseLimit {
  kind: 'max-doses' | 'max-total';
  message: string;
}

export interface NextDose {
  /** The dose to suggest; when a limit is reached, the dose a second tap would record. Null when the sheet has none. */
  line: DoseLine | null;
  /** Set when the protocol's limit is reached: the pad asks for a second tap. */
  limit: DoseLimit | null;
}

/**
 * The dose to suggest after `given` doses totalling `givenTotal` (in the drug's unit) of one
 * drug, against the sheet's list and limits.
 */
export function nextDose(drug: DrugDosing, given: { count: number; total: number }): NextDose {
  checkCount(given.count, 'given.count');
  const u = doseUnitLabel(drug.unit);
  const last = drug.doses[drug.doses.length - 1] ?? null;
  if (last === null) return { line: null, limit: null };
  const plural = (n: number) => (n === 1 ? 'dose' : 'doses');
  if (drug.countLimit !== null && given.count >= drug.countLimit) {
    return { line: last, limit: { kind: 'max-doses', message: `Limit reached: ${given.count} of ${drug.countLimit} ${plural(drug.countLimit)} given` } };
  }
  if (drug.maxTotal !== null && given.total >= drug.maxTotal - EPSILON) {
    return {
      line: drug.repeatLine ?? last,
      limit: { kind: 'max-total', message: `Limit reached: ${fmtDose(given.total)} ${u} given, ${drug.maxTotalText ?? 'the total allowed'}` },
    };
  }
  const listed = given.count < drug.doses.length ? drug.doses[given.count] : drug.repeatLine;
  if (!listed) return { line: last, limit: { kind: 'max-doses', message: `Limit reached: ${given.count} ${plural(given.count)} given` } };
  const numbered = { ...listed, doseNumber: given.count + 1 };
  // The list assumed its own doses were given; the next one is limited by what is really left.
  if (drug.maxTotal === null) return { line: numbered, limit: null };
  return { line: limitLine(drug, numbered, drug.maxTotal - given.total), limit: null };
}

/** The rule's own amount, limited to what is left of the cumulative maximum. */
function limitLine(
  drug: Pick<DrugDosing, 'unit' | 'concentration' | 'concentrationText' | 'maxTotalText'>,
  line: DoseLine,
  remaining: number,
): DoseLine {
  const u = doseUnitLabel(drug.unit);
  const ruleLow = line.uncappedAmount === null ? line.amount : Math.min(line.uncappedAmount, line.maxDose ?? Infinity);
  const ruleHigh = line.uncappedAmountHigh === null ? null : Math.min(line.uncappedAmountHigh, line.maxDose ?? Infinity);
  const low = Math.min(ruleLow, remaining);
  const highRaw = ruleHigh === null ? null : Math.min(ruleHigh, remaining);
  const high = highRaw === null || highRaw === low ? null : highRaw;
  const perMl = drug.concentration?.perMl ?? null;
  const vol = (x: number | null) => (x === null ? null : drug.unit === 'mL' ? x : perMl === null ? null : x / perMl);
  const limited = ruleLow > remaining + EPSILON || (ruleHigh !== null && ruleHigh > remaining + EPSILON);
  return {
    ...line,
    amount: low,
    amountHigh: high,
    display: rangeText(fmtDose(low), high === null ? null : fmtDose(high), u),
    capped: limited || line.amount !== line.uncappedAmount,
    capNote: limited
      ? `limited to the ${fmtDose(remaining)} ${u} left of ${drug.maxTotalText ?? 'the total allowed'}`
      : ruleLow < (line.uncappedAmount ?? ruleLow)
        ? `capped at the ${fmtDose(line.maxDose ?? ruleLow)} ${u} maximum single dose`
        : null,
    volumeMl: vol(low),
    volumeMlHigh: vol(high),
    volumeText:
      vol(low) === null
        ? null
        : `${rangeText(fmtDose(vol(low) ?? 0), high === null ? null : fmtDose(vol(high) ?? 0), 'mL')}${drug.unit !== 'mL' && drug.concentrationText ? ` of ${drug.concentrationText}` : ''}`,
  };
}

/** Picks the step for the next event: the steps run in order and the last one repeats. */
function stepAt<T>(steps: readonly T[], soFar: number): T | null {
  if (steps.length === 0) return null;
  return steps[Math.min(soFar, steps.length - 1)] ?? null;
}

/**
 * The energy step to suggest after `soFar` shocks of the same kind (defibrillations and
 * cardioversions are counted apart). Null when the sheet holds no energies (pediatric code
 * without a weight, or adult cardioversion).
 */
export function nextShockJoules(
  sheet: DosingSheet,
  soFar: number,
  mode: 'defibrillation' | 'cardioversion' = 'defibrillation',
): EnergyStep | null {
  checkCount(soFar, 'soFar');
  const plan = mode === 'cardioversion' ? sheet.cardioversion : sheet.defibrillation;
  return stepAt(plan.steps, soFar);
}
