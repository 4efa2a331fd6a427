import { z } from 'zod';
import { OUTCOMES } from './entries.js';

export const CODE_CATEGORIES = ['adult', 'pediatric'] as const;
export type CodeCategory = (typeof CODE_CATEGORIES)[number];
export const CODE_STATUSES = ['active', 'ended'] as const;
export type CodeStatus = (typeof CODE_STATUSES)[number];

export const patientSchema = z.object({
  name: z.string().trim().max(120).optional(),
  mrn: z.string().trim().max(40).optional(),
  birthDate: z.iso.date().optional(),
  sex: z.enum(['female', 'male', 'unknown']).optional(),
});
export type Patient = z.infer<typeof patientSchema>;

/** How a weight was obtained; shown beside it, since every weight-based dose depends on it. */
export const WEIGHT_SOURCES = ['measured', 'stated', 'length-tape', 'estimated-age'] as const;
export type WeightSource = (typeof WEIGHT_SOURCES)[number];

export const createCodeSchema = z
  .object({
    location: z.string().trim().max(120).optional(),
    unitId: z.string().max(64).optional(),
    patient: patientSchema.optional(),
    category: z.enum(CODE_CATEGORIES).default('adult'),
    weightKg: z.number().positive('weightKg must be above 0').max(250, 'weightKg above 250 is not plausible').optional(),
    weightSource: z.enum(WEIGHT_SOURCES).optional(),
    arrestAt: z.iso.datetime({ offset: true }).optional(),
    /** A device-made id, so a retried start does not open a second code. */
    id: z.uuid().optional(),
  })
  .strict();
export type CreateCodeRequest = z.input<typeof createCodeSchema>;

export const codeSchema = z.object({
  id: z.string(),
  status: z.enum(CODE_STATUSES),
  category: z.enum(CODE_CATEGORIES),
  weightKg: z.number().nullable(),
  location: z.string().nullable(),
  unitId: z.string().nullable(),
  patient: patientSchema.nullable(),
  arrestAt: z.string(),
  createdAt: z.string(),
  createdBy: z.string(),
  endedAt: z.string().nullable(),
  outcome: z.enum(OUTCOMES).nullable(),
  weightSource: z.enum(WEIGHT_SOURCES).nullable().default(null),
  /** The protocol version in force when the code started: its timers, doses and record use it. */
  protocolVersion: z.number().int().positive().nullable().default(null),
  /** When adult/child was last switched during the code (doses and energies were recalculated). */
  categoryChangedAt: z.string().nullable().default(null),
});
export type Code = z.infer<typeof codeSchema>;

export const listCodesQuerySchema = z.object({
  status: z.enum(CODE_STATUSES).optional(),
});

/** Details completed during or after the code: where, who, a pediatric weight, and when the arrest was recognised. */
export const updateCodeSchema = z
  .object({
    location: z.string().trim().max(120).nullable().optional(),
    unitId: z.string().max(64).nullable().optional(),
    patient: patientSchema.nullable().optional(),
    category: z.enum(CODE_CATEGORIES).optional(),
    weightKg: z.number().positive('weightKg must be above 0').max(250, 'weightKg above 250 is not plausible').nullable().optional(),
    weightSource: z.enum(WEIGHT_SOURCES).nullable().optional(),
    /** When the arrest was recognised, if recording began late: every interval follows it. */
    arrestAt: z.iso.datetime({ offset: true, message: 'arrestAt must be an ISO 8601 date-time, e.g. 2026-03-04T07:42:10.000Z' }).optional(),
  })
  .strict()
  .refine((v) => Object.keys(v).length > 0, 'Send at least one field to change');
export type UpdateCodeRequest = z.infer<typeof updateCodeSchema>;
