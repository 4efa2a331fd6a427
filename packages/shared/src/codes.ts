import { z } from 'zod';
import { textSchema } from './text.js';
import { OUTCOMES } from './entries.js';

export const CODE_CATEGORIES = ['adult', 'pediatric'] as const;
export type CodeCategory = (typeof CODE_CATEGORIES)[number];
export const CODE_STATUSES = ['active', 'ended'] as const;
export type CodeStatus = (typeof CODE_STATUSES)[number];

export const patientSchema = z.object({
  name: textSchema().trim().max(120).optional(),
  mrn: textSchema().trim().max(40).optional(),
  birthDate: z.iso.date().optional(),
  sex: z.enum(['female', 'male', 'unknown']).optional(),
});
export type Patient = z.infer<typeof patientSchema>;

export const createCodeSchema = z
  .object({
    location: textSchema().trim().max(120).optional(),
    unitId: textSchema().max(64).optional(),
    patient: patientSchema.optional(),
    category: z.enum(CODE_CATEGORIES).default('adult'),
    weightKg: z.number().positive('weightKg must be above 0').max(250, 'weightKg above 250 is not plausible').optional(),
    arrestAt: z.iso.datetime({ offset: true }).optional(),
    /** A device-made id, so a retried start does not open a second code. */
    id: z.uuid().optional(),
  })
  .strict();
export type CreateCodeRequest = z.input<typeof createCodeSchema>;

export const codeSchema = z.object({
  id: textSchema(),
  status: z.enum(CODE_STATUSES),
  category: z.enum(CODE_CATEGORIES),
  weightKg: z.number().nullable(),
  location: textSchema().nullable(),
  unitId: textSchema().nullable(),
  patient: patientSchema.nullable(),
  arrestAt: textSchema(),
  createdAt: textSchema(),
  createdBy: textSchema(),
  endedAt: textSchema().nullable(),
  outcome: z.enum(OUTCOMES).nullable(),
});
export type Code = z.infer<typeof codeSchema>;

export const listCodesQuerySchema = z.object({
  status: z.enum(CODE_STATUSES).optional(),
});

/** Details completed during or after the code: where, who, and a pediatric weight. */
export const updateCodeSchema = z
  .object({
    location: textSchema().trim().max(120).nullable().optional(),
    unitId: textSchema().max(64).nullable().optional(),
    patient: patientSchema.nullable().optional(),
    category: z.enum(CODE_CATEGORIES).optional(),
    weightKg: z.number().positive('weightKg must be above 0').max(250, 'weightKg above 250 is not plausible').nullable().optional(),
  })
  .strict()
  .refine((v) => Object.keys(v).length > 0, 'Send at least one field to change');
export type UpdateCodeRequest = z.infer<typeof updateCodeSchema>;
