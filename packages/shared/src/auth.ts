import { z } from 'zod';
import { textSchema } from './text.js';
import { roleSchema } from './roles.js';

export const loginRequestSchema = z.object({
  username: textSchema().trim().min(1, 'Enter your username').max(64, 'Username is too long'),
  password: textSchema().min(1, 'Enter your password').max(256, 'Password is too long'),
});
export type LoginRequest = z.infer<typeof loginRequestSchema>;

export const publicUserSchema = z.object({
  id: textSchema(),
  username: textSchema(),
  displayName: textSchema(),
  roles: z.array(roleSchema),
});
export type PublicUser = z.infer<typeof publicUserSchema>;

export const MIN_PASSWORD_LENGTH = 12;
/** New passwords: length only, no composition rules (checked against a common-password list on the server). */
export const newPasswordSchema = textSchema()
  .min(MIN_PASSWORD_LENGTH, `Use at least ${MIN_PASSWORD_LENGTH} characters`)
  .max(256, 'Password is too long');

export const usernameSchema = textSchema()
  .trim()
  .min(2, 'Username needs at least 2 characters')
  .max(64, 'Username is too long')
  .regex(/^[a-z0-9][a-z0-9._-]*$/, 'Use lower-case letters, digits, dot, dash or underscore');
