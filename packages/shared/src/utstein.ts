import { z } from 'zod';
import { textSchema } from './text.js';

/**
 * The registry details of a code that are not taps: how the arrest was found, why it happened,
 * why and when resuscitation stopped, and what was done after ROSC. Named after the Utstein
 * in-hospital cardiac arrest template (Nolan JP et al., Resuscitation 2019 / Circulation
 * 2019;140:e746-e757; clinical sheet §4); docs/utstein-export.md says which element each field
 * is and how sure we are of the name. Every field is optional (not entered yet) and every coded
 * field has "unknown" (looked for, not found): the export keeps the two apart.
 */

export const YES_NO_UNKNOWN = ['yes', 'no', 'unknown'] as const;
export type YesNoUnknown = (typeof YES_NO_UNKNOWN)[number];

export const WITNESSED_BY = ['staff', 'other', 'unknown'] as const;
export const MONITORING_KINDS = ['ecg', 'pulse-oximetry', 'arterial-line'] as const;
export const ARREST_LOCATIONS = [
  'ward',
  'icu',
  'ed',
  'procedure-area',
  'other',
  'unknown',
] as const;
/** The reversible causes as the ERC/RCUK "4 Hs and 4 Ts" list them (clinical sheet §1c), thrombosis split. */
export const ARREST_CAUSES = [
  'hypoxia',
  'hypovolaemia',
  'hypo-hyperkalaemia-metabolic',
  'hypothermia',
  'tension-pneumothorax',
  'tamponade',
  'toxins',
  'coronary-thrombosis',
  'pulmonary-thrombosis',
  'other',
  'unknown',
] as const;
export const SPECIAL_CIRCUMSTANCES = [
  'pregnancy',
  'trauma',
  'drowning',
  'anaphylaxis',
  'hypothermia',
] as const;
/** The special circumstances as entered: some of them, none, or unknown. */
export const SPECIAL_CIRCUMSTANCE_CHOICES = [...SPECIAL_CIRCUMSTANCES, 'none', 'unknown'] as const;
export const TREATMENT_LIMITATIONS = ['none', 'dnacpr', 'other-limitation', 'unknown'] as const;
export const STOP_REASONS = ['rosc', 'futility', 'dnacpr-found', 'other', 'unknown'] as const;
export const TWELVE_LEAD_ECG = ['st-elevation', 'no-st-elevation', 'not-done', 'unknown'] as const;
export const GLUCOSE_UNITS = ['mmol/L', 'mg/dL'] as const;
export const DESTINATIONS = [
  'icu',
  'cath-lab',
  'operating-room',
  'ward',
  'other-hospital',
  'other',
  'unknown',
] as const;

export type ArrestCause = (typeof ARREST_CAUSES)[number];
export type SpecialCircumstanceChoice = (typeof SPECIAL_CIRCUMSTANCE_CHOICES)[number];
export type GlucoseUnit = (typeof GLUCOSE_UNITS)[number];

const when = z.iso.datetime({
  offset: true,
  message: 'must be an ISO 8601 date-time, e.g. 2026-03-04T07:45:00.000Z',
});

/**
 * The details as stored and as sent: every field optional. In `PATCH /api/codes/:id/review`
 * `{"utstein": {...}}` a field sent replaces the one stored, `null` clears it, a field left out
 * stays as it was.
 */
const utsteinShape = {
  witnessed: z.enum(YES_NO_UNKNOWN),
  witnessedBy: z.enum(WITNESSED_BY),
  monitored: z.enum(YES_NO_UNKNOWN),
  monitoring: z
    .array(z.enum(MONITORING_KINDS))
    .min(1, 'name at least one kind of monitoring, or leave it out')
    .max(MONITORING_KINDS.length)
    .refine((list) => new Set(list).size === list.length, 'each kind of monitoring once'),
  arrestLocation: z.enum(ARREST_LOCATIONS),
  teamArrivedAt: when,
  padsOnAt: when,
  cause: z.enum(ARREST_CAUSES),
  causeNote: textSchema().trim().min(1, 'write the cause, or leave it out').max(200),
  specialCircumstances: z
    .array(z.enum(SPECIAL_CIRCUMSTANCE_CHOICES))
    .min(1, 'name at least one, or "none", or "unknown"')
    .max(SPECIAL_CIRCUMSTANCE_CHOICES.length)
    .refine((list) => new Set(list).size === list.length, 'each circumstance once')
    .refine(
      (list) => list.length === 1 || (!list.includes('none') && !list.includes('unknown')),
      '"none" and "unknown" stand alone',
    ),
  treatmentLimitation: z.enum(TREATMENT_LIMITATIONS),
  mechanicalCpr: z.enum(YES_NO_UNKNOWN),
  ecpr: z.enum(YES_NO_UNKNOWN),
  stopReason: z.enum(STOP_REASONS),
  deathPronouncedAt: when,
  deathPronouncedBy: textSchema()
    .trim()
    .min(1, 'write who pronounced death, or leave it out')
    .max(120),
  temperatureControl: z.enum(YES_NO_UNKNOWN),
  twelveLeadEcg: z.enum(TWELVE_LEAD_ECG),
  handoverSystolicMmHg: z
    .number()
    .int('whole mmHg')
    .min(0)
    .max(300, 'above 300 mmHg is not plausible'),
  handoverDiastolicMmHg: z
    .number()
    .int('whole mmHg')
    .min(0)
    .max(250, 'above 250 mmHg is not plausible'),
  handoverSpo2Percent: z.number().int('whole percent').min(0).max(100, 'at most 100%'),
  handoverGlucose: z
    .object({ value: z.number().min(0, 'must not be negative'), unit: z.enum(GLUCOSE_UNITS) })
    .strict()
    .refine((g) => g.value <= (g.unit === 'mmol/L' ? 100 : 1800), {
      message: 'above 100 mmol/L (1800 mg/dL) is not plausible',
      path: ['value'],
    }),
  destination: z.enum(DESTINATIONS),
};

export const utsteinFieldsSchema = z.object(utsteinShape).partial().strict();

export type UtsteinDetails = z.infer<typeof utsteinFieldsSchema>;
export type UtsteinField = keyof UtsteinDetails;
export const UTSTEIN_FIELDS = Object.keys(utsteinShape) as UtsteinField[];

function nullableOptional<T extends Record<string, z.ZodType>>(
  shape: T,
): { [K in keyof T]: z.ZodOptional<z.ZodNullable<T[K]>> } {
  return Object.fromEntries(
    Object.entries(shape).map(([k, s]) => [k, s.nullable().optional()]),
  ) as { [K in keyof T]: z.ZodOptional<z.ZodNullable<T[K]>> };
}

/** A change as sent: each field a value, or null to clear it. */
export const utsteinPatchSchema = z
  .object(nullableOptional(utsteinShape))
  .strict()
  .refine((v) => Object.keys(v).length > 0, 'Send at least one registry detail to change');
export type UtsteinPatch = z.infer<typeof utsteinPatchSchema>;

/** The details after a change: a field sent replaces, null clears, a field left out stays. */
export function applyUtsteinPatch(details: UtsteinDetails, patch: UtsteinPatch): UtsteinDetails {
  const next: Record<string, unknown> = { ...details };
  for (const [k, v] of Object.entries(patch)) {
    if (v === undefined) continue;
    if (v === null) delete next[k];
    else next[k] = v;
  }
  return next;
}

const same = (a: unknown, b: unknown) => JSON.stringify(a ?? null) === JSON.stringify(b ?? null);

/** Each field that differs, with its old and new value (null: not entered). */
export function utsteinChanges(
  before: UtsteinDetails,
  after: UtsteinDetails,
): Partial<Record<UtsteinField, { from: unknown; to: unknown }>> {
  const changes: Partial<Record<UtsteinField, { from: unknown; to: unknown }>> = {};
  for (const k of UTSTEIN_FIELDS) {
    if (!same(before[k], after[k])) changes[k] = { from: before[k] ?? null, to: after[k] ?? null };
  }
  return changes;
}

/** A change to the details after the record's first signature: the signed details stay as signed. */
export interface UtsteinAddendum {
  id: string;
  /** When the server stored it. */
  recordedAt: string;
  userId: string;
  /** The writer's display name when it was stored. */
  userName: string;
  changes: Partial<Record<UtsteinField, { from: unknown; to: unknown }>>;
}

/** The details as they read now: the signed ones with every later addendum applied in order. */
export function effectiveUtstein(
  details: UtsteinDetails | undefined,
  addenda: readonly UtsteinAddendum[] = [],
): UtsteinDetails {
  const now: Record<string, unknown> = { ...(details ?? {}) };
  for (const a of addenda) {
    for (const [k, c] of Object.entries(a.changes)) {
      if (c.to === null || c.to === undefined) delete now[k];
      else now[k] = c.to;
    }
  }
  return now;
}

export interface FieldProblem {
  path: string;
  message: string;
}

const DAY_MS = 24 * 3600 * 1000;
const BEFORE_ARREST_MS = 12 * 3600 * 1000;

/**
 * What does not fit together in a set of details, or with the code's arrest time: each problem
 * names its field. The server answers 400 with these; the form shows them before sending.
 */
export function utsteinProblems(d: UtsteinDetails, code: { arrestAt: string }): FieldProblem[] {
  const problems: FieldProblem[] = [];
  const add = (path: string, message: string) =>
    problems.push({ path: `utstein.${path}`, message });
  if (d.witnessedBy !== undefined && d.witnessed !== 'yes')
    add(
      'witnessedBy',
      'is entered only for a witnessed arrest: set witnessed to yes, or clear witnessedBy (null)',
    );
  if (d.monitoring !== undefined && d.monitored !== 'yes')
    add(
      'monitoring',
      'is entered only for a monitored arrest: set monitored to yes, or clear monitoring (null)',
    );
  if (d.causeNote !== undefined && d.cause !== 'other')
    add(
      'causeNote',
      'is entered only when the cause is "other": clear it (null), or set cause to other',
    );
  if (
    d.stopReason === 'rosc' &&
    (d.deathPronouncedAt !== undefined || d.deathPronouncedBy !== undefined)
  ) {
    add(
      d.deathPronouncedAt !== undefined ? 'deathPronouncedAt' : 'deathPronouncedBy',
      'resuscitation stopped for ROSC: the time and name of a death pronounced belong to a resuscitation stopped for another reason',
    );
  }
  if (
    d.handoverSystolicMmHg !== undefined &&
    d.handoverDiastolicMmHg !== undefined &&
    d.handoverDiastolicMmHg >= d.handoverSystolicMmHg
  ) {
    add(
      'handoverDiastolicMmHg',
      `must be below the systolic pressure (${d.handoverSystolicMmHg} mmHg)`,
    );
  }
  const arrest = Date.parse(code.arrestAt);
  const near = (field: 'teamArrivedAt' | 'padsOnAt', words: string) => {
    const v = d[field];
    if (v === undefined) return;
    const t = Date.parse(v);
    if (t < arrest - BEFORE_ARREST_MS || t > arrest + DAY_MS)
      add(
        field,
        `${words} must be within 12 hours before and 24 hours after the arrest was recognised (${code.arrestAt})`,
      );
  };
  near('teamArrivedAt', 'the time the team arrived');
  near('padsOnAt', 'the time the pads were on');
  if (d.deathPronouncedAt !== undefined) {
    const t = Date.parse(d.deathPronouncedAt);
    if (t < arrest || t > arrest + DAY_MS)
      add(
        'deathPronouncedAt',
        `must be after the arrest was recognised (${code.arrestAt}) and within 24 hours of it`,
      );
  }
  return problems;
}

/** The witnessed-or-monitored answer the time-to-shock target needs: yes, no, or null when not known. */
export function witnessedOrMonitored(
  d: Pick<UtsteinDetails, 'witnessed' | 'monitored'>,
): boolean | null {
  if (d.witnessed === 'yes' || d.monitored === 'yes') return true;
  if (d.witnessed === 'no' && d.monitored === 'no') return false;
  return null;
}

// --- words ------------------------------------------------------------------------------------

export const YES_NO_WORDS: Record<YesNoUnknown, string> = {
  yes: 'Yes',
  no: 'No',
  unknown: 'Unknown',
};

export const UTSTEIN_VALUE_WORDS = {
  witnessedBy: {
    staff: 'Hospital staff',
    other: 'Someone else (visitor, patient)',
    unknown: 'Unknown',
  },
  monitoring: { ecg: 'ECG', 'pulse-oximetry': 'Pulse oximetry', 'arterial-line': 'Arterial line' },
  arrestLocation: {
    ward: 'Ward',
    icu: 'Intensive care',
    ed: 'Emergency department',
    'procedure-area': 'Procedure area (cath lab, theatre, endoscopy)',
    other: 'Other',
    unknown: 'Unknown',
  },
  cause: {
    hypoxia: 'Hypoxia',
    hypovolaemia: 'Hypovolaemia',
    'hypo-hyperkalaemia-metabolic': 'Hypo-/hyperkalaemia or other metabolic',
    hypothermia: 'Hypothermia',
    'tension-pneumothorax': 'Tension pneumothorax',
    tamponade: 'Cardiac tamponade',
    toxins: 'Toxins',
    'coronary-thrombosis': 'Thrombosis, coronary',
    'pulmonary-thrombosis': 'Thrombosis, pulmonary',
    other: 'Other',
    unknown: 'Unknown',
  },
  specialCircumstances: {
    pregnancy: 'Pregnancy',
    trauma: 'Trauma',
    drowning: 'Drowning',
    anaphylaxis: 'Anaphylaxis',
    hypothermia: 'Hypothermia',
    none: 'None',
    unknown: 'Unknown',
  },
  treatmentLimitation: {
    none: 'None',
    dnacpr: 'DNACPR order',
    'other-limitation': 'Other treatment limitation',
    unknown: 'Unknown',
  },
  stopReason: {
    rosc: 'ROSC',
    futility: 'Further resuscitation judged futile',
    'dnacpr-found': 'A DNACPR order came to light',
    other: 'Other',
    unknown: 'Unknown',
  },
  twelveLeadEcg: {
    'st-elevation': 'Done: ST elevation',
    'no-st-elevation': 'Done: no ST elevation',
    'not-done': 'Not done',
    unknown: 'Unknown',
  },
  destination: {
    icu: 'Intensive care',
    'cath-lab': 'Cardiac catheter laboratory',
    'operating-room': 'Operating theatre',
    ward: 'Ward',
    'other-hospital': 'Another hospital',
    other: 'Other',
    unknown: 'Unknown',
  },
} as const;

/** Each field's label, in the order the form, the PDF and the export list them, grouped. */
export const UTSTEIN_FIELD_LABELS: Record<UtsteinField, string> = {
  witnessed: 'Witnessed',
  witnessedBy: 'Witnessed by',
  monitored: 'Monitored',
  monitoring: 'Monitoring in place',
  arrestLocation: 'Where the arrest happened',
  teamArrivedAt: 'Team arrived',
  padsOnAt: 'Defibrillator pads on',
  cause: 'Cause, as far as known',
  causeNote: 'Cause (other), in words',
  specialCircumstances: 'Special circumstances',
  treatmentLimitation: 'DNACPR or treatment limitation before the event',
  mechanicalCpr: 'Mechanical CPR',
  ecpr: 'Extracorporeal CPR (ECPR)',
  stopReason: 'Why resuscitation stopped',
  deathPronouncedAt: 'Death pronounced at',
  deathPronouncedBy: 'Death pronounced by',
  temperatureControl: 'Temperature control started',
  twelveLeadEcg: '12-lead ECG after ROSC',
  handoverSystolicMmHg: 'Systolic pressure at hand-over (mmHg)',
  handoverDiastolicMmHg: 'Diastolic pressure at hand-over (mmHg)',
  handoverSpo2Percent: 'SpO2 at hand-over (%)',
  handoverGlucose: 'Glucose at hand-over',
  destination: 'Where the patient went',
};

export const UTSTEIN_GROUPS: { title: string; fields: UtsteinField[] }[] = [
  {
    title: 'The arrest',
    fields: [
      'witnessed',
      'witnessedBy',
      'monitored',
      'monitoring',
      'arrestLocation',
      'teamArrivedAt',
      'padsOnAt',
    ],
  },
  {
    title: 'Cause and circumstances',
    fields: ['cause', 'causeNote', 'specialCircumstances', 'treatmentLimitation'],
  },
  {
    title: 'Resuscitation',
    fields: ['mechanicalCpr', 'ecpr', 'stopReason', 'deathPronouncedAt', 'deathPronouncedBy'],
  },
  {
    title: 'After ROSC',
    fields: [
      'temperatureControl',
      'twelveLeadEcg',
      'handoverSystolicMmHg',
      'handoverDiastolicMmHg',
      'handoverSpo2Percent',
      'handoverGlucose',
      'destination',
    ],
  },
];

/** One detail in words (times as ISO; the screens format them), or null when not entered. */
export function utsteinValueText(field: UtsteinField, d: UtsteinDetails): string | null {
  const v = d[field];
  if (v === undefined) return null;
  if (field === 'handoverGlucose') {
    const g = v as NonNullable<UtsteinDetails['handoverGlucose']>;
    return `${g.value} ${g.unit}`;
  }
  if (Array.isArray(v)) {
    const words = (
      field === 'monitoring'
        ? UTSTEIN_VALUE_WORDS.monitoring
        : UTSTEIN_VALUE_WORDS.specialCircumstances
    ) as Record<string, string>;
    return v.map((x: string) => words[x] ?? x).join(', ');
  }
  if (typeof v === 'number') return String(v);
  if (typeof v !== 'string') return null;
  const words = (UTSTEIN_VALUE_WORDS as Record<string, Record<string, string>>)[field];
  if (words) return words[v] ?? v;
  if (v === 'yes' || v === 'no' || v === 'unknown') return YES_NO_WORDS[v];
  return v;
}

// --- follow-up after the code ------------------------------------------------------------------

export const SURVIVAL_TO_DISCHARGE = ['yes', 'no', 'unknown'] as const;
export const STATUS_30_DAYS = ['alive', 'dead', 'unknown'] as const;
/** Cerebral Performance Category 1-5 and modified Rankin Scale 0-6 (clinical sheet §4, from memory). */
export const NEUROLOGICAL_OUTCOMES = [
  'cpc-1',
  'cpc-2',
  'cpc-3',
  'cpc-4',
  'cpc-5',
  'mrs-0',
  'mrs-1',
  'mrs-2',
  'mrs-3',
  'mrs-4',
  'mrs-5',
  'mrs-6',
  'unknown',
] as const;
export type SurvivalToDischarge = (typeof SURVIVAL_TO_DISCHARGE)[number];
export type Status30Days = (typeof STATUS_30_DAYS)[number];
export type NeurologicalOutcome = (typeof NEUROLOGICAL_OUTCOMES)[number];

/** The scales' usual short descriptions (from memory; the scales themselves are the standard). */
export const NEUROLOGICAL_OUTCOME_WORDS: Record<NeurologicalOutcome, string> = {
  'cpc-1': 'CPC 1: good cerebral performance',
  'cpc-2': 'CPC 2: moderate cerebral disability',
  'cpc-3': 'CPC 3: severe cerebral disability',
  'cpc-4': 'CPC 4: coma or vegetative state',
  'cpc-5': 'CPC 5: brain death or death',
  'mrs-0': 'mRS 0: no symptoms',
  'mrs-1': 'mRS 1: no significant disability',
  'mrs-2': 'mRS 2: slight disability',
  'mrs-3': 'mRS 3: moderate disability',
  'mrs-4': 'mRS 4: moderately severe disability',
  'mrs-5': 'mRS 5: severe disability',
  'mrs-6': 'mRS 6: dead',
  unknown: 'Unknown',
};
export const SURVIVAL_WORDS: Record<SurvivalToDischarge, string> = {
  yes: 'Survived to discharge',
  no: 'Died in hospital',
  unknown: 'Unknown',
};
export const STATUS_30_DAYS_WORDS: Record<Status30Days, string> = {
  alive: 'Alive at 30 days',
  dead: 'Dead at 30 days',
  unknown: 'Unknown',
};

const DEATH_SCORES: readonly NeurologicalOutcome[] = ['cpc-5', 'mrs-6'];
const day = z.iso.date({ message: 'must be a date, YYYY-MM-DD, e.g. 2026-03-20' });

/**
 * `PUT /api/quality/codes/:id/follow-up`: any of the three items with its date; a field sent
 * replaces the one stored, null clears it, a field left out stays.
 */
export const followUpSchema = z
  .object({
    survivalToDischarge: z.enum(SURVIVAL_TO_DISCHARGE).nullable().optional(),
    /** The day of discharge (yes) or of death in hospital (no). */
    survivalToDischargeDate: day.nullable().optional(),
    status30Days: z.enum(STATUS_30_DAYS).nullable().optional(),
    /** The day the 30-day status was found out (for dead: the day of death). */
    status30DaysDate: day.nullable().optional(),
    neurologicalOutcome: z.enum(NEUROLOGICAL_OUTCOMES).nullable().optional(),
    /** The day the outcome was assessed (at discharge). */
    neurologicalOutcomeDate: day.nullable().optional(),
  })
  .strict()
  .refine((v) => Object.keys(v).length > 0, 'Send at least one follow-up field to change');
export type FollowUpRequest = z.infer<typeof followUpSchema>;

export const FOLLOW_UP_ITEMS = [
  'survivalToDischarge',
  'status30Days',
  'neurologicalOutcome',
] as const;
export type FollowUpItem = (typeof FOLLOW_UP_ITEMS)[number];

/** One follow-up answer with its date, and who entered it and when. */
export interface FollowUpAnswer<T extends string> {
  value: T;
  date: string | null;
  enteredBy: { id: string; displayName: string };
  enteredAt: string;
}

export interface FollowUp {
  survivalToDischarge: FollowUpAnswer<SurvivalToDischarge> | null;
  status30Days: FollowUpAnswer<Status30Days> | null;
  neurologicalOutcome: FollowUpAnswer<NeurologicalOutcome> | null;
  /** Every item the code still waits for is known (see `followUpMissing`). */
  complete: boolean;
  /** What is still waited for, in words. */
  missing: string[];
}

/** The values alone, as the rules read them. */
export interface FollowUpValues {
  survivalToDischarge?: SurvivalToDischarge | null;
  survivalToDischargeDate?: string | null;
  status30Days?: Status30Days | null;
  status30DaysDate?: string | null;
  neurologicalOutcome?: NeurologicalOutcome | null;
  neurologicalOutcomeDate?: string | null;
}

/**
 * What a code still waits for: survival to discharge (yes or no), the status at 30 days (alive or
 * dead), and, for a survivor, the neurological outcome at discharge. "Unknown" counts as waiting.
 */
export function followUpMissing(v: FollowUpValues): string[] {
  const missing: string[] = [];
  const known = (x: string | null | undefined) => x !== undefined && x !== null && x !== 'unknown';
  if (!known(v.survivalToDischarge)) missing.push('survival to discharge');
  if (!known(v.status30Days)) missing.push('status at 30 days');
  if (v.survivalToDischarge === 'yes' && !known(v.neurologicalOutcome))
    missing.push('neurological outcome at discharge');
  return missing;
}

const addDays = (date: string, days: number) =>
  new Date(Date.parse(`${date}T00:00:00.000Z`) + days * DAY_MS).toISOString().slice(0, 10);

/**
 * What does not fit together in a follow-up, or with the arrest and today (UTC days): each
 * problem names its field.
 */
export function followUpProblems(
  v: FollowUpValues,
  code: { arrestAt: string },
  today: string,
): FieldProblem[] {
  const problems: FieldProblem[] = [];
  const add = (path: string, message: string) => problems.push({ path, message });
  const arrestDay = code.arrestAt.slice(0, 10);
  for (const item of FOLLOW_UP_ITEMS) {
    const date = v[`${item}Date`];
    if (date === undefined || date === null) continue;
    const value = v[item];
    if (value === undefined || value === null || value === 'unknown')
      add(
        `${item}Date`,
        `a date goes with a known ${item} answer: set ${item}, or clear the date (null)`,
      );
    if (date < arrestDay) add(`${item}Date`, `must not be before the arrest (${arrestDay})`);
    if (date > today) add(`${item}Date`, `must not be in the future (today is ${today})`);
  }
  const neuro = v.neurologicalOutcome;
  if (
    v.survivalToDischarge === 'no' &&
    neuro &&
    neuro !== 'unknown' &&
    !DEATH_SCORES.includes(neuro)
  ) {
    add(
      'neurologicalOutcome',
      'the patient died in hospital: the outcome is CPC 5 or mRS 6, or unknown',
    );
  }
  if (v.survivalToDischarge === 'yes' && neuro && DEATH_SCORES.includes(neuro)) {
    add('neurologicalOutcome', 'CPC 5 and mRS 6 mean death, but the patient survived to discharge');
  }
  const day30 = addDays(arrestDay, 30);
  if (v.status30Days === 'alive') {
    if (today < day30)
      add(
        'status30Days',
        `alive at 30 days can be entered from ${day30}, 30 days after the arrest`,
      );
    if (
      v.survivalToDischarge === 'no' &&
      v.survivalToDischargeDate &&
      v.survivalToDischargeDate < day30
    ) {
      add(
        'status30Days',
        `the patient died in hospital on ${v.survivalToDischargeDate}, within 30 days of the arrest`,
      );
    }
  }
  if (
    v.status30Days === 'dead' &&
    v.survivalToDischarge === 'yes' &&
    v.survivalToDischargeDate &&
    v.status30DaysDate &&
    v.status30DaysDate < v.survivalToDischargeDate
  ) {
    add(
      'status30DaysDate',
      `the patient was discharged alive on ${v.survivalToDischargeDate}: a death after discharge comes after that day`,
    );
  }
  return problems;
}

/** Whole days from the arrest to `now` (UTC), for "how long since the arrest". */
export function daysSince(arrestAt: string, now: number): number {
  return Math.max(0, Math.floor((now - Date.parse(arrestAt)) / DAY_MS));
}
