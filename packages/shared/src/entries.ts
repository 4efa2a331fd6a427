import { z } from 'zod';

/**
 * The entry log. A code is an append-only list of these; everything else is computed from it.
 * Field names follow docs/api.md. Clinical words (CPR, ROSC, VF, pVT, PEA...) are the trade's own.
 */

export const ENTRY_KINDS = [
  'cpr',
  'rhythm',
  'shock',
  'drug',
  'airway',
  'access',
  'etco2',
  'lab',
  'rosc',
  'rearrest',
  'note',
  'end',
  'void',
  'amend',
] as const;
export type EntryKind = (typeof ENTRY_KINDS)[number];

export const CPR_ACTIONS = ['start', 'stop', 'swap'] as const;
export const CPR_STOP_REASONS = ['rhythm-check', 'shock', 'airway', 'rosc', 'other'] as const;
export const RHYTHMS = ['vf', 'pvt', 'pea', 'asystole', 'organized', 'other'] as const;
export type Rhythm = (typeof RHYTHMS)[number];
export const SHOCKABLE_RHYTHMS: readonly Rhythm[] = ['vf', 'pvt'];
export const DOSE_UNITS = ['mg', 'ug', 'g', 'meq', 'mL'] as const;
export type DoseUnit = (typeof DOSE_UNITS)[number];
export const DRUG_ROUTES = ['iv', 'io', 'et', 'other'] as const;
export const AIRWAY_DEVICES = ['bag-mask', 'supraglottic', 'endotracheal'] as const;
export const AIRWAY_CONFIRMATIONS = ['waveform-capnography', 'colorimetric', 'auscultation', 'other'] as const;
export const ACCESS_ROUTES = ['iv', 'io'] as const;
/**
 * How a code ended. `rosc`: ended in ROSC and care handed over. `sustained-rosc` is the older
 * word for the same and is still accepted; whether ROSC was sustained (20 min) is computed
 * from the log, so the choices offered never say it.
 */
export const OUTCOMES = ['sustained-rosc', 'rosc', 'died', 'transferred', 'other'] as const;
export type Outcome = (typeof OUTCOMES)[number];
/** The outcomes the pad and the review offer. */
export const END_OUTCOME_CHOICES = ['rosc', 'died', 'transferred', 'other'] as const satisfies readonly Outcome[];

const isoTime = z.iso.datetime({ offset: true, message: 'must be an ISO 8601 date-time, e.g. 2026-03-04T07:42:10.000Z' });

/** Text must be well-formed Unicode: a lone surrogate cannot be canonicalised, hashed or printed. */
const LONE_SURROGATE = /\p{Cs}/u;
const wellFormed = (s: string) => !LONE_SURROGATE.test(s);

/** Fields every entry carries, as sent by a device. */
const entryBaseShape = {
  id: z.uuid({ message: 'id must be a UUID made on the device' }),
  at: isoTime,
  deviceId: z.string().trim().min(1).max(64).refine(wellFormed, 'must be well-formed text').optional(),
  seq: z.number().int().nonnegative().optional(),
  offsetMs: z.number().finite().optional(),
  /** Half the round trip of the clock sample used: how far off `at` may be. */
  offsetUncertaintyMs: z.number().finite().nonnegative().optional(),
};

const shortText = (max: number) => z.string().trim().min(1).max(max).refine(wellFormed, 'must be well-formed text (a lone surrogate was found)');

export const cprEntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('cpr'),
  action: z.enum(CPR_ACTIONS),
  reason: z.enum(CPR_STOP_REASONS).optional(),
});
export const rhythmEntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('rhythm'),
  rhythm: z.enum(RHYTHMS),
  pulse: z.boolean(),
});
export const shockEntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('shock'),
  joules: z.number().positive('joules must be above 0').max(400, 'joules above 400 is not a defibrillator setting'),
  synchronized: z.boolean(),
});
export const drugEntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('drug'),
  drug: shortText(80),
  dose: z.number().nonnegative('dose cannot be negative').max(100000),
  unit: z.enum(DOSE_UNITS),
  route: z.enum(DRUG_ROUTES),
});
export const airwayEntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('airway'),
  device: z.enum(AIRWAY_DEVICES),
  confirmation: z.enum(AIRWAY_CONFIRMATIONS).optional(),
});
export const accessEntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('access'),
  route: z.enum(ACCESS_ROUTES),
  site: shortText(80).optional(),
});
export const etco2EntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('etco2'),
  mmHg: z.number().nonnegative().max(200),
});
export const labEntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('lab'),
  name: shortText(60),
  value: z.number().finite(),
  unit: shortText(20),
});
export const roscEntrySchema = z.object({ ...entryBaseShape, kind: z.literal('rosc') });
export const rearrestEntrySchema = z.object({ ...entryBaseShape, kind: z.literal('rearrest') });
export const noteEntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('note'),
  text: shortText(2000),
});
export const endEntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('end'),
  outcome: z.enum(OUTCOMES),
});
export const voidEntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('void'),
  target: z.uuid(),
  reason: shortText(500),
});
export const amendEntrySchema = z.object({
  ...entryBaseShape,
  kind: z.literal('amend'),
  target: z.uuid(),
  /** Kind-specific fields of the target (and/or `at`), validated against the target's kind when applied. */
  changes: z.record(z.string(), z.unknown()).refine((c) => Object.keys(c).length > 0, 'changes is empty'),
  reason: shortText(500),
});

/** What a device sends: one entry. */
export const newEntrySchema = z.discriminatedUnion('kind', [
  cprEntrySchema,
  rhythmEntrySchema,
  shockEntrySchema,
  drugEntrySchema,
  airwayEntrySchema,
  accessEntrySchema,
  etco2EntrySchema,
  labEntrySchema,
  roscEntrySchema,
  rearrestEntrySchema,
  noteEntrySchema,
  endEntrySchema,
  voidEntrySchema,
  amendEntrySchema,
]);
export type NewEntry = z.infer<typeof newEntrySchema>;
export type EntryOfKind<K extends EntryKind> = Extract<NewEntry, { kind: K }>;

/** Schemas by kind, for validating an amendment's result against its target's kind. */
export const entrySchemaByKind = {
  cpr: cprEntrySchema,
  rhythm: rhythmEntrySchema,
  shock: shockEntrySchema,
  drug: drugEntrySchema,
  airway: airwayEntrySchema,
  access: accessEntrySchema,
  etco2: etco2EntrySchema,
  lab: labEntrySchema,
  rosc: roscEntrySchema,
  rearrest: rearrestEntrySchema,
  note: noteEntrySchema,
  end: endEntrySchema,
  void: voidEntrySchema,
  amend: amendEntrySchema,
} as const satisfies Record<EntryKind, z.ZodType>;

/** Fields the server adds when it stores an entry. */
export const storedEntryFieldsSchema = z.object({
  codeId: z.string(),
  userId: z.string(),
  /** Server-assigned, strictly increasing across the whole database: the sync cursor. */
  cursor: z.number().int().positive(),
  receivedAt: z.string(),
  recordedAt: z.string(),
  /** True when added after the record's first signature. */
  addendum: z.boolean(),
});
export type StoredEntryFields = z.infer<typeof storedEntryFieldsSchema>;
export type StoredEntry = NewEntry & StoredEntryFields;

/** Fields an amendment may not change. */
export const UNAMENDABLE_FIELDS = ['id', 'kind', 'deviceId', 'seq', 'offsetMs', 'offsetUncertaintyMs', 'target'] as const;
