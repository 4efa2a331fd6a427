import { z } from 'zod';
import { DOSE_UNITS, DRUG_ROUTES } from './entries.js';

/**
 * The local protocol: every timer, reminder, dose list, limit and energy reads from here.
 * Admins edit it (stored on the server, one numbered version per save); each code keeps the
 * version in force when it started. The defaults follow the published values listed in
 * docs/clinical-sources.md; a hospital must check them against its own protocol.
 */

/**
 * One dose of a schedule. Adult rules usually hold a fixed `amount`; weight-based rules hold
 * `perKg` (and `perKgHigh` for a range). A rule with both uses `perKg` when the weight is
 * known and the fixed `amount` (with a note saying so) when it is not.
 */
export const doseRuleSchema = z
  .object({
    /** Fixed amount in the drug's unit. */
    amount: z.number().positive().optional(),
    /** Dose per kilogram, in the drug's unit per kg. */
    perKg: z.number().positive().optional(),
    /** Upper end of a per-kg range (e.g. 1-1.5 mg/kg), shown beside `perKg`. */
    perKgHigh: z.number().positive().optional(),
    /** Largest single dose, in the drug's unit. */
    maxDose: z.number().positive().optional(),
  })
  .refine((r) => r.amount !== undefined || r.perKg !== undefined, 'a dose needs a fixed amount or a dose per kg')
  .refine((r) => r.perKgHigh === undefined || (r.perKg !== undefined && r.perKgHigh >= r.perKg), {
    message: 'the upper end of a range must not be below its dose per kg',
    path: ['perKgHigh'],
  });
export type DoseRule = z.infer<typeof doseRuleSchema>;

/**
 * The doses of one drug for one category of patient, in order, with the limits a recorder
 * must see: how many doses at most, and the most in total (absolute and per kg).
 */
export const doseScheduleSchema = z
  .object({
    doses: z.array(doseRuleSchema).min(1),
    /** The last dose may be given again (until `maxDoses` or a cumulative maximum). */
    repeatLast: z.boolean(),
    /** Most doses in one code. */
    maxDoses: z.number().int().positive().optional(),
    /** Most in total in one code, in the drug's unit. */
    maxTotal: z.number().positive().optional(),
    /** Most in total in one code, per kg of the patient's weight. */
    maxTotalPerKg: z.number().positive().optional(),
    /** Timing in words, e.g. "every 3-5 min". */
    timing: z.string().max(120).optional(),
  })
  .refine((s) => s.maxDoses === undefined || s.repeatLast || s.maxDoses <= s.doses.length, {
    message: 'more doses allowed than listed, and the last dose does not repeat',
    path: ['maxDoses'],
  });
export type DoseSchedule = z.infer<typeof doseScheduleSchema>;

/** A concentration as supplied, chosen by the patient's age or weight (first band that fits). */
export const concentrationBandSchema = z.object({
  /** Amount of the drug's unit per mL. */
  perMl: z.number().positive(),
  /** How the preparation is known on the ward, e.g. "10%" or "0.1 mg/mL (1:10,000)". */
  label: z.string().min(1).max(60),
  /** Applies to adult codes, pediatric codes, or both. */
  appliesTo: z.enum(['adult', 'pediatric', 'any']).default('any'),
  /** Applies below this age in months, when the age is known. */
  underAgeMonths: z.number().positive().optional(),
  /** Applies up to this weight (inclusive): the age band's stand-in when the age is unknown. */
  upToWeightKg: z.number().positive().optional(),
});
export type ConcentrationBand = z.infer<typeof concentrationBandSchema>;

export const drugDefinitionSchema = z.object({
  key: z.string().min(1).max(40),
  label: z.string().min(1).max(60),
  unit: z.enum(DOSE_UNITS),
  route: z.enum(DRUG_ROUTES),
  adult: doseScheduleSchema,
  /** Absent: no pediatric dose is suggested (never the adult dose for a child). */
  pediatric: doseScheduleSchema.optional(),
  /** In order; the first band that fits the patient is shown with the volume. */
  concentrations: z.array(concentrationBandSchema).max(6).default([]),
  /** Drug-specific cautions shown with its doses. */
  cautions: z.array(z.string().min(1).max(240)).max(6).default([]),
  /** Where the default comes from, with its status (confirmed, secondary, from memory, common practice). */
  source: z.string().max(400),
});
export type DrugDefinition = z.infer<typeof drugDefinitionSchema>;

export const protocolSettingsSchema = z
  .object({
    /** Which guideline edition the defaults follow; shown on every reminder surface. */
    edition: z.string().min(1).max(120),
    /** Length of one compression cycle between rhythm checks. */
    cprCycleSeconds: z.number().int().min(30).max(600),
    /** Epinephrine is due from `min` after the last dose and overdue after `max`. */
    epinephrineWindowSeconds: z
      .object({ min: z.number().int().min(30), max: z.number().int().min(30) })
      .refine((w) => w.max >= w.min, 'max must not be below min'),
    /** A compressions pause longer than this is flagged. */
    pauseWarningSeconds: z.number().int().min(1).max(60),
    /** ROSC lasting this long counts as sustained. */
    sustainedRoscSeconds: z.number().int().min(60),
    shockPresetsJoules: z.array(z.number().positive().max(400)).min(1).max(8),
    /** The adult energy: the default shock, and the ceiling of pediatric escalation ("or the adult dose"). */
    defaultShockJoules: z.number().positive().max(400),
    /** Highest energy the adult presets may reach (the device's maximum). */
    adultMaxJoules: z.number().positive().max(400),
    pediatricEnergy: z.object({
      firstJoulesPerKg: z.number().positive(),
      secondJoulesPerKg: z.number().positive(),
      maxJoulesPerKg: z.number().positive(),
      cardioversionFirstJoulesPerKg: z.number().positive(),
      cardioversionFirstJoulesPerKgHigh: z.number().positive(),
      cardioversionNextJoulesPerKg: z.number().positive(),
    }),
    /** An adult code given a weight below this is probably a child: the pad warns and offers to switch. */
    adultWeightWarningKg: z.number().positive().max(100).default(40),
    /** The drug sequence of the arrest algorithms, for the reminders. */
    sequence: z
      .object({
        /** Shockable rhythm: first epinephrine after this many defibrillations. */
        epinephrineAfterShocks: z.number().int().min(1).max(10),
        /** Shockable rhythm: an antiarrhythmic after this many defibrillations. */
        antiarrhythmicAfterShocks: z.number().int().min(1).max(10),
        /** Catalogue keys that count as the antiarrhythmic. */
        antiarrhythmicKeys: z.array(z.string().min(1).max(40)).max(4),
      })
      .default({ epinephrineAfterShocks: 2, antiarrhythmicAfterShocks: 3, antiarrhythmicKeys: ['amiodarone', 'lidocaine'] }),
    /** Capnography cues, information only. */
    etco2: z
      .object({
        /** Below this during CPR: check compression quality. */
        lowMmHg: z.number().positive().max(100),
        /** A reading at or above this, rising by at least `riseMmHg` from the one before: check for a pulse. */
        roscMmHg: z.number().positive().max(150),
        riseMmHg: z.number().positive().max(100),
      })
      .default({ lowMmHg: 10, roscMmHg: 40, riseMmHg: 10 }),
    drugs: z.array(drugDefinitionSchema).min(1),
  })
  // Checks across fields, so the server and the admin form refuse the same settings.
  .superRefine((p, ctx) => {
    if (!p.shockPresetsJoules.includes(p.defaultShockJoules)) {
      ctx.addIssue({
        code: 'custom',
        path: ['defaultShockJoules'],
        message: `the default energy (${String(p.defaultShockJoules)} J) must be one of the shock presets (${p.shockPresetsJoules.join(', ')} J)`,
      });
    }
    if (p.defaultShockJoules > p.adultMaxJoules) {
      ctx.addIssue({
        code: 'custom',
        path: ['defaultShockJoules'],
        message: `the default energy (${String(p.defaultShockJoules)} J) is above the adult maximum (${String(p.adultMaxJoules)} J)`,
      });
    }
    const seen = new Set<string>();
    p.drugs.forEach((drug, index) => {
      if (seen.has(drug.key)) {
        ctx.addIssue({ code: 'custom', path: ['drugs', index, 'key'], message: `duplicate drug key "${drug.key}": each drug needs its own key` });
      }
      seen.add(drug.key);
    });
  });
export type ProtocolSettings = z.infer<typeof protocolSettingsSchema>;
export type ProtocolSettingsInput = z.input<typeof protocolSettingsSchema>;

/** GET /api/protocol and the answers of the admin's changes: the settings in force and who saved them. */
export interface ProtocolDocument {
  protocol: ProtocolSettings;
  /** The version number in force; a code keeps the version it started with. */
  version: number;
  /** When an admin last saved; null while the published defaults have never been changed. */
  updatedAt: string | null;
  /** Display name of that admin. */
  updatedBy: string | null;
}

/** One saved version of the protocol (GET /api/protocol/versions/:version). */
export interface ProtocolVersion {
  version: number;
  protocol: ProtocolSettings;
  savedAt: string;
  savedBy: string | null;
}

const AHA_ADULT = 'AHA 2020 Adult Cardiac Arrest Algorithm (Panchal AR et al., Circulation 2020;142:S366), confirmed (copy of the algorithm)';
const PALS_TABLE =
  'AHA PALS "Medications for Pediatric Resuscitation" table (AHA 2010 PALS Table 1; the same values in the 2015 ECC Handbook), confirmed (copy of the table)';

/** Shown with every drug that is drawn up from a choice of concentrations. */
const CHECK_CONCENTRATION = 'Check the concentration on the syringe or vial against the one shown here.';

export const DEFAULT_PROTOCOL: ProtocolSettings = {
  edition: 'AHA 2020 algorithms; PALS drug table 2010/2015 (verify against the 2025 update and local protocol)',
  cprCycleSeconds: 120,
  epinephrineWindowSeconds: { min: 180, max: 300 },
  pauseWarningSeconds: 10,
  sustainedRoscSeconds: 20 * 60,
  shockPresetsJoules: [120, 150, 200, 300, 360],
  defaultShockJoules: 200,
  adultMaxJoules: 360,
  pediatricEnergy: {
    firstJoulesPerKg: 2,
    secondJoulesPerKg: 4,
    maxJoulesPerKg: 10,
    cardioversionFirstJoulesPerKg: 0.5,
    cardioversionFirstJoulesPerKgHigh: 1,
    cardioversionNextJoulesPerKg: 2,
  },
  adultWeightWarningKg: 40,
  sequence: { epinephrineAfterShocks: 2, antiarrhythmicAfterShocks: 3, antiarrhythmicKeys: ['amiodarone', 'lidocaine'] },
  etco2: { lowMmHg: 10, roscMmHg: 40, riseMmHg: 10 },
  drugs: [
    {
      key: 'epinephrine',
      label: 'Epinephrine',
      unit: 'mg',
      route: 'iv',
      adult: { doses: [{ amount: 1 }], repeatLast: true, timing: 'every 3-5 min' },
      pediatric: { doses: [{ perKg: 0.01, maxDose: 1 }], repeatLast: true, timing: 'every 3-5 min' },
      concentrations: [{ perMl: 0.1, label: '0.1 mg/mL (1 mg in 10 mL)', appliesTo: 'any' }],
      cautions: ['0.1 mg/mL for IV/IO use; 1 mg/mL is ten times stronger.'],
      source: `${AHA_ADULT}: 1 mg every 3-5 min; ${PALS_TABLE}: 0.01 mg/kg IV/IO, max 1 mg`,
    },
    {
      key: 'amiodarone',
      label: 'Amiodarone',
      unit: 'mg',
      route: 'iv',
      adult: { doses: [{ amount: 300 }, { amount: 150 }], repeatLast: false, maxDoses: 2, timing: 'after the 3rd shock, then once more' },
      pediatric: {
        doses: [{ perKg: 5, maxDose: 300 }],
        repeatLast: true,
        maxDoses: 3,
        maxTotalPerKg: 15,
        timing: 'after the 3rd shock; may repeat twice',
      },
      concentrations: [{ perMl: 50, label: '50 mg/mL', appliesTo: 'any' }],
      cautions: [],
      source: `${AHA_ADULT}: 300 mg then 150 mg; ${PALS_TABLE}: 5 mg/kg, may repeat twice up to 15 mg/kg, max single dose 300 mg`,
    },
    {
      key: 'lidocaine',
      label: 'Lidocaine',
      unit: 'mg',
      route: 'iv',
      adult: {
        doses: [
          { perKg: 1, perKgHigh: 1.5, amount: 100 },
          { perKg: 0.5, perKgHigh: 0.75, amount: 50 },
        ],
        repeatLast: true,
        maxTotalPerKg: 3,
        timing: 'instead of amiodarone, after the 3rd shock',
      },
      pediatric: { doses: [{ perKg: 1 }], repeatLast: true, maxTotalPerKg: 3 },
      concentrations: [{ perMl: 20, label: '20 mg/mL (2%)', appliesTo: 'any' }],
      cautions: [],
      source:
        `${AHA_ADULT}: 1-1.5 mg/kg then 0.5-0.75 mg/kg; cumulative 3 mg/kg from older AHA ACLS dosing (from memory); ` +
        `the fixed 100/50 mg without a weight is common practice (about 1.4 mg/kg for 70 kg); ${PALS_TABLE}: 1 mg/kg (the 3 mg/kg total for children is from memory)`,
    },
    {
      key: 'atropine',
      label: 'Atropine',
      unit: 'mg',
      route: 'iv',
      adult: { doses: [{ amount: 1 }], repeatLast: true, maxTotal: 3, timing: 'every 3-5 min, for bradycardia' },
      pediatric: { doses: [{ perKg: 0.02, maxDose: 0.5 }], repeatLast: true, maxDoses: 2, timing: 'may repeat once' },
      concentrations: [{ perMl: 0.1, label: '0.1 mg/mL', appliesTo: 'any' }],
      cautions: ['For bradycardia: atropine is not part of the cardiac arrest algorithm.'],
      source: `AHA 2020 Adult Bradycardia Algorithm: 1 mg every 3-5 min, max 3 mg (secondary: acls.net, hospitalist copy); ${PALS_TABLE}: 0.02 mg/kg, may repeat once, max single dose 0.5 mg`,
    },
    {
      key: 'adenosine',
      label: 'Adenosine',
      unit: 'mg',
      route: 'iv',
      adult: { doses: [{ amount: 6 }, { amount: 12 }], repeatLast: false, maxDoses: 2, timing: 'rapid push with a flush' },
      pediatric: {
        doses: [
          { perKg: 0.1, maxDose: 6 },
          { perKg: 0.2, maxDose: 12 },
        ],
        repeatLast: false,
        maxDoses: 2,
        timing: 'rapid push with a flush',
      },
      concentrations: [{ perMl: 3, label: '3 mg/mL', appliesTo: 'any' }],
      cautions: ['Only for a regular rhythm with a pulse: not a cardiac arrest drug.'],
      source: `AHA 2020 Adult Tachycardia With a Pulse Algorithm: 6 mg, second dose 12 mg (copy); ${PALS_TABLE} and AHA 2020 Pediatric Tachycardia Algorithm: 0.1 mg/kg (max 6 mg), then 0.2 mg/kg (max 12 mg)`,
    },
    {
      key: 'calcium-chloride',
      label: 'Calcium chloride 10%',
      unit: 'mg',
      route: 'iv',
      adult: { doses: [{ amount: 1000 }], repeatLast: true },
      pediatric: { doses: [{ perKg: 20, maxDose: 2000 }], repeatLast: true },
      concentrations: [{ perMl: 100, label: '10% (100 mg/mL)', appliesTo: 'any' }],
      cautions: [
        'Not routine in cardiac arrest: for hyperkalaemia or calcium-channel-blocker toxicity.',
        'Do not give through the same line as sodium bicarbonate.',
      ],
      source: `Adult 500-1000 mg: AHA ECC Handbook (from memory); adult 10 mL of 10% may be repeated: RCUK 2005 via GPnotebook (secondary); ${PALS_TABLE}: 20 mg/kg, max 2 g`,
    },
    {
      key: 'sodium-bicarbonate',
      label: 'Sodium bicarbonate',
      unit: 'meq',
      route: 'iv',
      adult: { doses: [{ perKg: 1, amount: 50 }], repeatLast: true },
      pediatric: { doses: [{ perKg: 1, maxDose: 50 }], repeatLast: true },
      concentrations: [
        { perMl: 0.5, label: '4.2% (0.5 mEq/mL)', appliesTo: 'pediatric', underAgeMonths: 3, upToWeightKg: 5 },
        { perMl: 1, label: '8.4% (1 mEq/mL)', appliesTo: 'any' },
      ],
      cautions: ['Not routine in cardiac arrest.', 'Do not give through the same line as calcium.', CHECK_CONCENTRATION],
      source:
        `Adult 1 mEq/kg: AHA ECC Handbook (from memory); 50 mEq without a weight is common practice; ${PALS_TABLE}: 1 mEq/kg; ` +
        '4.2% under about 3 months (neonatal practice, from memory; 5 kg stands in for 3 months when the age is unknown, common practice)',
    },
    {
      key: 'magnesium-sulfate',
      label: 'Magnesium sulfate',
      unit: 'g',
      route: 'iv',
      adult: { doses: [{ amount: 2 }], repeatLast: true, timing: '1-2 g, for torsades de pointes' },
      pediatric: { doses: [{ perKg: 0.025, perKgHigh: 0.05, maxDose: 2 }], repeatLast: true },
      concentrations: [{ perMl: 0.5, label: '50% (0.5 g/mL)', appliesTo: 'any' }],
      cautions: ['Only for torsades de pointes or a low magnesium: not routine.'],
      source: `2020 AHA ECC Handbook table (via tomwademd.net, secondary): 1-2 g for torsades; ${PALS_TABLE}: 25-50 mg/kg, max 2 g`,
    },
    {
      key: 'naloxone',
      label: 'Naloxone',
      unit: 'mg',
      route: 'iv',
      adult: { doses: [{ amount: 0.4 }], repeatLast: true },
      pediatric: { doses: [{ perKg: 0.1, maxDose: 2 }], repeatLast: true },
      concentrations: [{ perMl: 0.4, label: '0.4 mg/mL', appliesTo: 'any' }],
      cautions: [],
      source: 'Common practice, not in the clinical sheet: 0.4 mg adult; 0.1 mg/kg, max 2 mg pediatric (from memory)',
    },
    {
      key: 'dextrose',
      label: 'Dextrose',
      unit: 'g',
      route: 'iv',
      adult: { doses: [{ amount: 25 }], repeatLast: true },
      pediatric: { doses: [{ perKg: 0.5, perKgHigh: 1, maxDose: 25 }], repeatLast: true },
      concentrations: [
        { perMl: 0.1, label: '10% (0.1 g/mL)', appliesTo: 'pediatric' },
        { perMl: 0.5, label: '50% (0.5 g/mL)', appliesTo: 'adult' },
      ],
      cautions: ['Give only for a measured low glucose.', CHECK_CONCENTRATION],
      source:
        'Adult 25 g as 50 mL of 50%: common practice, not in the clinical sheet; pediatric 0.5-1 g/kg as dextrose 10% (5-10 mL/kg): PALS table glucose row (from memory); ' +
        '50% only for adults (from memory)',
    },
  ],
};

export function findDrug(settings: ProtocolSettings, key: string): DrugDefinition | undefined {
  return settings.drugs.find((d) => d.key === key);
}

/**
 * A protocol saved before dose schedules existed (adultDoses, pediatric rules, one
 * concentration) read in today's shape, so the versions that past codes keep still open.
 * The last dose repeated without a limit then; that is what such a version meant.
 */
export function upgradeStoredProtocol(value: unknown): unknown {
  if (typeof value !== 'object' || value === null) return value;
  const v = value as Record<string, unknown>;
  if (!Array.isArray(v.drugs)) return value;
  const drugs = v.drugs.map((d: unknown) => {
    if (typeof d !== 'object' || d === null) return d;
    const drug = d as Record<string, unknown>;
    if (!Array.isArray(drug.adultDoses)) return d;
    const { adultDoses, pediatric, concentrationPerMl, ...rest } = drug;
    const upgraded: Record<string, unknown> = {
      ...rest,
      adult: { doses: (adultDoses as number[]).map((amount) => ({ amount })), repeatLast: true },
    };
    if (Array.isArray(pediatric) && pediatric.length > 0) upgraded.pediatric = { doses: pediatric, repeatLast: true };
    if (typeof concentrationPerMl === 'number') {
      upgraded.concentrations = [{ perMl: concentrationPerMl, label: `${String(concentrationPerMl)} per mL`, appliesTo: 'any' }];
    }
    return upgraded;
  });
  return { ...v, drugs };
}

/** Parses a stored protocol (any version's shape). */
export function parseStoredProtocol(value: unknown): ReturnType<typeof protocolSettingsSchema.safeParse> {
  return protocolSettingsSchema.safeParse(upgradeStoredProtocol(value));
}
