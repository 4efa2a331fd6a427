import { z } from 'zod';

/** The five jobs people do in Steadyhand. A user may hold several. */
export const ROLES = ['recorder', 'leader', 'pharmacist', 'reviewer', 'admin'] as const;
export const roleSchema = z.enum(ROLES);
export type Role = z.infer<typeof roleSchema>;

export const ROLE_LABELS: Record<Role, string> = {
  recorder: 'Recorder',
  leader: 'Team leader',
  pharmacist: 'Pharmacist',
  reviewer: 'Quality reviewer',
  admin: 'Administrator',
};

/** Roles that may add entries to a live code. */
export const WRITER_ROLES: readonly Role[] = ['recorder', 'leader'];

export function hasAnyRole(userRoles: readonly Role[], wanted: readonly Role[]): boolean {
  return wanted.some((r) => userRoles.includes(r));
}
