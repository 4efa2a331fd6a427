import { z } from 'zod';
import { textSchema } from './text.js';
import { DOSE_UNITS, DRUG_ROUTES } from './entries.js';

/**
 * The local protocol: every timer, reminder, preset and default dose reads from here.
 * Admins edit it (stored on the server); these defaults follow the published values in
 * docs/clinical-sources.md. A hospital must check them against its own protocol.
 */

const perKgRuleSchema = z.object({
  /** Dose per kilogram, in `unit` per kg. */
  perKg: z.number().positive(),
  /** Upper end of a range (e.g. 25-50 mg/kg), shown beside `perKg`. */
  perKgHigh: z.number().positive().optional(),
  /** Largest single dose, in `unit`. */
  maxDose: z.number().positive().optional(),
});
export type PerKgRule = z.infer<typeof perKgRuleSchema>;

export const drugDefinitionSchema = z.object({
  key: textSchema().min(1).max(40),
  label: textSchema().min(1).max(60),
  unit: z.enum(DOSE_UNITS),
  route: z.enum(DRUG_ROUTES),
  /** Adult doses in order: first dose, second dose... The last repeats. */
  adultDoses: z.array(z.number().nonnegative()).min(1),
  /** Pediatric doses per kg in order, with caps. The last repeats. */
  pediatric: z.array(perKgRuleSchema).optional(),
  /** Concentration as supplied, to show the volume: amount of `unit` per mL. */
  concentrationPerMl: z.number().positive().optional(),
  /** Where the default comes from. */
  source: textSchema().max(300),
});
export type DrugDefinition = z.infer<typeof drugDefinitionSchema>;

export const protocolSettingsSchema = z.object({
  /** Which guideline edition the defaults follow; shown on every reminder surface. */
  edition: textSchema().min(1).max(120),
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
  defaultShockJoules: z.number().positive().max(400),
  /** Adult maximum energy, the cap for pediatric escalation ("or the adult dose"). */
  adultMaxJoules: z.number().positive().max(400),
  pediatricEnergy: z.object({
    firstJoulesPerKg: z.number().positive(),
    secondJoulesPerKg: z.number().positive(),
    maxJoulesPerKg: z.number().positive(),
    cardioversionFirstJoulesPerKg: z.number().positive(),
    cardioversionFirstJoulesPerKgHigh: z.number().positive(),
    cardioversionNextJoulesPerKg: z.number().positive(),
  }),
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
    const seen = new Set<string>();
    p.drugs.forEach((drug, index) => {
      if (seen.has(drug.key)) {
        ctx.addIssue({ code: 'custom', path: ['drugs', index, 'key'], message: `duplicate drug key "${drug.key}": each drug needs its own key` });
      }
      seen.add(drug.key);
    });
  });
export type ProtocolSettings = z.infer<typeof protocolSettingsSchema>;

/** GET /api/protocol and the answers of the admin's changes: the settings and who last saved them. */
export interface ProtocolDocument {
  protocol: ProtocolSettings;
  /** When an admin last saved; null while the published defaults have never been changed. */
  updatedAt: string | null;
  /** Display name of that admin. */
  updatedBy: string | null;
}

const AHA_ADULT = 'AHA 2020 Adult Cardiac Arrest Algorithm';
const PALS_TABLE = 'AHA PALS Medications for Pediatric Resuscitation table (2010 Table 1 / 2015 ECC Handbook)';

export const DEFAULT_PROTOCOL: ProtocolSettings = {
  edition: 'AHA 2020 (verify against the 2025 update and local protocol)',
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
  drugs: [
    {
      key: 'epinephrine',
      label: 'Epinephrine',
      unit: 'mg',
      route: 'iv',
      adultDoses: [1],
      pediatric: [{ perKg: 0.01, maxDose: 1 }],
      concentrationPerMl: 0.1,
      source: `${AHA_ADULT} (1 mg every 3-5 min); ${PALS_TABLE} (0.01 mg/kg, max 1 mg)`,
    },
    {
      key: 'amiodarone',
      label: 'Amiodarone',
      unit: 'mg',
      route: 'iv',
      adultDoses: [300, 150],
      pediatric: [{ perKg: 5, maxDose: 300 }],
      concentrationPerMl: 50,
      source: `${AHA_ADULT} (300 mg then 150 mg); ${PALS_TABLE} (5 mg/kg, max 300 mg)`,
    },
    {
      key: 'lidocaine',
      label: 'Lidocaine',
      unit: 'mg',
      route: 'iv',
      adultDoses: [100, 50],
      pediatric: [{ perKg: 1 }],
      concentrationPerMl: 20,
      source: `${AHA_ADULT} (1-1.5 mg/kg then 0.5-0.75 mg/kg; 100/50 mg is common practice for 70 kg); ${PALS_TABLE} (1 mg/kg)`,
    },
    {
      key: 'atropine',
      label: 'Atropine',
      unit: 'mg',
      route: 'iv',
      adultDoses: [1],
      pediatric: [{ perKg: 0.02, maxDose: 0.5 }],
      concentrationPerMl: 0.1,
      source: `AHA 2020 Adult Bradycardia Algorithm (1 mg, max 3 mg); ${PALS_TABLE} (0.02 mg/kg, max single 0.5 mg)`,
    },
    {
      key: 'adenosine',
      label: 'Adenosine',
      unit: 'mg',
      route: 'iv',
      adultDoses: [6, 12],
      pediatric: [
        { perKg: 0.1, maxDose: 6 },
        { perKg: 0.2, maxDose: 12 },
      ],
      concentrationPerMl: 3,
      source: `AHA Adult Tachycardia With a Pulse Algorithm (6 mg then 12 mg); ${PALS_TABLE} (0.1 mg/kg max 6 mg, then 0.2 mg/kg max 12 mg)`,
    },
    {
      key: 'calcium-chloride',
      label: 'Calcium chloride 10%',
      unit: 'mg',
      route: 'iv',
      adultDoses: [1000],
      pediatric: [{ perKg: 20, maxDose: 2000 }],
      concentrationPerMl: 100,
      source: `AHA ECC Handbook 500-1000 mg (from memory, verify); ${PALS_TABLE} (20 mg/kg, max 2 g)`,
    },
    {
      key: 'sodium-bicarbonate',
      label: 'Sodium bicarbonate 8.4%',
      unit: 'meq',
      route: 'iv',
      adultDoses: [50],
      pediatric: [{ perKg: 1, maxDose: 50 }],
      concentrationPerMl: 1,
      source: `AHA ECC Handbook 1 mEq/kg (from memory; 50 mEq adult is common practice); ${PALS_TABLE} (1 mEq/kg)`,
    },
    {
      key: 'magnesium-sulfate',
      label: 'Magnesium sulfate',
      unit: 'g',
      route: 'iv',
      adultDoses: [2],
      pediatric: [{ perKg: 0.025, perKgHigh: 0.05, maxDose: 2 }],
      concentrationPerMl: 0.5,
      source: `2020 AHA ECC Handbook (1-2 g for torsades); ${PALS_TABLE} (25-50 mg/kg, max 2 g)`,
    },
    {
      key: 'naloxone',
      label: 'Naloxone',
      unit: 'mg',
      route: 'iv',
      adultDoses: [0.4],
      pediatric: [{ perKg: 0.1, maxDose: 2 }],
      concentrationPerMl: 0.4,
      source: 'Common practice, no source in the clinical sheet (0.4 mg adult; 0.1 mg/kg max 2 mg pediatric, from memory)',
    },
    {
      key: 'dextrose',
      label: 'Dextrose',
      unit: 'g',
      route: 'iv',
      adultDoses: [25],
      pediatric: [{ perKg: 0.5, perKgHigh: 1, maxDose: 25 }],
      concentrationPerMl: 0.5,
      source: 'Common practice, no source in the clinical sheet (25 g as 50 mL of 50%; 0.5-1 g/kg pediatric, from memory)',
    },
  ],
};

export function findDrug(settings: ProtocolSettings, key: string): DrugDefinition | undefined {
  return settings.drugs.find((d) => d.key === key);
}
