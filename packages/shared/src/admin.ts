import { z } from 'zod';
import { textSchema } from './text.js';
import { newPasswordSchema, publicUserSchema, usernameSchema } from './auth.js';
import { roleSchema } from './roles.js';

/* The admin area and the account pages: people, places, sessions, audit trail, second factor. */

// ---- signing in -----------------------------------------------------------------------------

/** What `GET /api/auth/me` says about the signed-in person, beyond who they are. */
export const meUserSchema = publicUserSchema.extend({
  mustChangePassword: z.boolean().optional(),
  secondFactor: z
    .object({
      /** A TOTP authenticator is set up for this account. */
      enrolled: z.boolean(),
      /** This session has passed the second factor (sign-in, step-up or enrolment). */
      satisfied: z.boolean(),
    })
    .optional(),
});
export type MeUser = z.infer<typeof meUserSchema>;

/** `POST /api/auth/login` answers this; `secondFactor: 'required'` means the sign-in is half done. */
export const loginResponseSchema = z.object({
  user: publicUserSchema,
  secondFactor: z.literal('required').optional(),
});
export type LoginResponse = z.infer<typeof loginResponseSchema>;

export const totpCodeSchema = textSchema()
  .trim()
  .regex(/^\d{6}$/, 'Enter the 6 digits from your authenticator app');
export const recoveryCodeSchema = textSchema()
  .trim()
  .min(8, 'Recovery codes look like abcd-efgh-ijkl')
  .max(40, 'That is too long for a recovery code');

/** `POST /api/auth/totp`: a code from the app, or one of the recovery codes. */
export const secondFactorRequestSchema = z.union([
  z.object({ code: totpCodeSchema }).strict(),
  z.object({ recoveryCode: recoveryCodeSchema }).strict(),
]);
export type SecondFactorRequest = z.infer<typeof secondFactorRequestSchema>;

export const totpConfirmSchema = z.object({ code: totpCodeSchema }).strict();

export interface TotpEnrolment {
  /** Base32, for typing into an app by hand. */
  secret: string;
  otpauthUrl: string;
  /** A PNG data URL of the QR code. */
  qrDataUrl: string;
}
export interface TotpStatus {
  enrolled: boolean;
  enabledAt: string | null;
  recoveryCodesLeft: number;
}

export const RECOVERY_CODE_COUNT = 10;

// ---- my account -----------------------------------------------------------------------------

export const changePasswordSchema = z
  .object({
    currentPassword: textSchema().min(1, 'Enter your current password').max(256),
    newPassword: newPasswordSchema,
  })
  .strict();
export type ChangePasswordRequest = z.infer<typeof changePasswordSchema>;

export interface SessionInfo {
  /** An opaque handle (a hash of the session id, never the id itself). */
  id: string;
  userId: string;
  username: string;
  displayName: string;
  userAgent: string | null;
  createdAt: string;
  lastSeenAt: string;
  /** The session this request came from. */
  current: boolean;
}

// ---- people ---------------------------------------------------------------------------------

const displayNameSchema = textSchema().trim().min(1, 'Enter a name').max(120, 'Name is too long');
const rolesSchema = z.array(roleSchema).max(5);

export const createUserSchema = z
  .object({
    username: usernameSchema,
    displayName: displayNameSchema,
    password: newPasswordSchema,
    roles: rolesSchema,
  })
  .strict();
export type CreateUserRequest = z.infer<typeof createUserSchema>;

export const updateUserSchema = z.object({ displayName: displayNameSchema }).strict();
export const setRolesSchema = z.object({ roles: rolesSchema }).strict();
export const resetPasswordSchema = z.object({ password: newPasswordSchema }).strict();

export interface AdminUser {
  id: string;
  username: string;
  displayName: string;
  roles: z.infer<typeof roleSchema>[];
  disabledAt: string | null;
  mustChangePassword: boolean;
  secondFactor: boolean;
  createdAt: string;
  activeSessions: number;
}

// ---- places ---------------------------------------------------------------------------------

const placeNameSchema = textSchema().trim().min(1, 'Enter a name').max(120, 'Name is too long');
export const facilitySchema = z.object({ name: placeNameSchema }).strict();
export const placeNameInputSchema = z.object({ name: placeNameSchema }).strict();
export const unitPatchSchema = z
  .object({ name: placeNameSchema.optional(), active: z.boolean().optional() })
  .strict()
  .refine((v) => v.name !== undefined || v.active !== undefined, 'Send a name or active');

export interface PlaceBed {
  id: string;
  name: string;
}
export interface PlaceRoom {
  id: string;
  name: string;
  beds: PlaceBed[];
}
export interface PlaceUnit {
  id: string;
  name: string;
  active: boolean;
  rooms: PlaceRoom[];
}
export interface Places {
  facility: { name: string };
  units: PlaceUnit[];
}

// ---- audit trail ----------------------------------------------------------------------------

export const AUDIT_PAGE_SIZE = 50;

export const auditQuerySchema = z.object({
  /** A user id or a username (failed sign-ins carry only the name typed). */
  person: textSchema().trim().max(64).optional(),
  codeId: textSchema().trim().max(64).optional(),
  action: textSchema().trim().max(64).optional(),
  /** Inclusive, ISO date (day) or date-time. */
  from: z.union([z.iso.date(), z.iso.datetime({ offset: true })]).optional(),
  /** Inclusive when a day; exclusive when a date-time. */
  to: z.union([z.iso.date(), z.iso.datetime({ offset: true })]).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
});
export type AuditQuery = z.input<typeof auditQuerySchema>;

export interface AuditEvent {
  id: number;
  at: string;
  action: string;
  userId: string | null;
  username: string | null;
  codeId: string | null;
  ip: string | null;
  detail: Record<string, unknown> | null;
}
export interface AuditPage {
  events: AuditEvent[];
  total: number;
  page: number;
  pageSize: number;
}
