import { z } from 'zod';
import { ROLES } from '../roles.js';

const utf8 = new TextEncoder();

/**
 * bcrypt reads at most 72 bytes of a password, so a longer one would be silently truncated:
 * refuse it instead. Twelve characters is the floor.
 */
export const passwordSchema = z
  .string()
  .min(12, 'Use at least 12 characters.')
  .refine((p) => utf8.encode(p).length <= 72, 'Use at most 72 bytes (about 72 plain letters).');

export const emailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .pipe(z.email('Enter an e-mail address.'))
  .pipe(z.string().max(254));

export const loginBody = z.strictObject({
  email: z.string().trim().toLowerCase().min(1, 'Enter your e-mail address.').max(254),
  password: z.string().min(1, 'Enter your password.').max(200),
});
export type LoginBody = z.infer<typeof loginBody>;

export const changePasswordBody = z.strictObject({
  currentPassword: z.string().min(1, 'Enter your current password.').max(200),
  newPassword: passwordSchema,
});
export type ChangePasswordBody = z.infer<typeof changePasswordBody>;

export const roleSchema = z.enum(ROLES);

export const sessionUser = z.object({
  id: z.number(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  stationId: z.number().nullable(),
});
export type SessionUser = z.infer<typeof sessionUser>;

export type MeResponse = { user: SessionUser; permissions: string[] };
