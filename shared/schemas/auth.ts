import { z } from 'zod';
import { text } from './common.js';
import { ROLES } from '../roles.js';

const utf8 = new TextEncoder();

/** bcrypt reads at most 72 bytes of a password, so a longer one would be silently truncated. */
export const MAX_PASSWORD_BYTES = 72;
const fitsBcrypt = (p: string) => utf8.encode(p).length <= MAX_PASSWORD_BYTES;
const TOO_LONG = 'Use at most 72 bytes (about 72 plain letters).';

/** A new password: twelve characters is the floor, 72 bytes the ceiling. */
export const passwordSchema = text().min(12, 'Use at least 12 characters.').refine(fitsBcrypt, TOO_LONG);

/**
 * A password typed to sign in or to sign a record. Refused past 72 bytes exactly as setting one
 * is: otherwise a right password followed by anything would pass, since bcrypt reads no further.
 */
export const enteredPassword = (message: string) => text(message).min(1, message).refine(fitsBcrypt, TOO_LONG);

/** The six digits an authenticator app shows, or a recovery code (spaces and dashes as typed). */
export const secondFactorCode = text('Enter the code.').trim().min(1, 'Enter the code.').max(40);

export const emailSchema = text().trim().toLowerCase().pipe(z.email('Enter an e-mail address.')).pipe(text().max(254));

export const loginBody = z.strictObject({
  email: text().trim().toLowerCase().min(1, 'Enter your e-mail address.').max(254),
  password: enteredPassword('Enter your password.'),
  code: secondFactorCode.optional(),
});
export type LoginBody = z.infer<typeof loginBody>;

export const changePasswordBody = z.strictObject({
  currentPassword: enteredPassword('Enter your current password.'),
  newPassword: passwordSchema,
});
export type ChangePasswordBody = z.infer<typeof changePasswordBody>;

export const roleSchema = z.enum(ROLES);

export const sessionUser = z.object({
  id: z.number(),
  email: text(),
  name: text(),
  role: roleSchema,
  stationId: z.number().nullable(),
  language: z.enum(['en', 'es']),
  unitSystem: z.enum(['inch', 'metric']),
});

/** The languages of the floor screens, and the unit systems readings start in. */
export const LANGUAGES = ['en', 'es'] as const;
export const UNIT_SYSTEMS = ['inch', 'metric'] as const;
export const preferencesBody = z
  .strictObject({ language: z.enum(LANGUAGES).optional(), unitSystem: z.enum(UNIT_SYSTEMS).optional() })
  .refine((b) => b.language !== undefined || b.unitSystem !== undefined, 'Send a language, a unit system or both.');
export type PreferencesBody = z.infer<typeof preferencesBody>;
export type SessionUser = z.infer<typeof sessionUser>;

/** Whether a person has a second factor, and whether their role must. */
export type SecondFactorFlags = { enrolled: boolean; required: boolean };

export type MeResponse = { user: SessionUser; permissions: string[]; secondFactor: SecondFactorFlags };

/** GET /api/auth/session: the same as /me when signed in; nobody, with a 200, when not. */
export type SessionResponse = MeResponse | { user: null; permissions: []; secondFactor?: undefined };

export type SecondFactorStatus = SecondFactorFlags & { recoveryCodesLeft: number };
export type SecondFactorStart = { secret: string; uri: string; qrSvg: string };

export const confirmSecondFactorBody = z.strictObject({ code: secondFactorCode });
export const removeSecondFactorBody = z.strictObject({ password: enteredPassword('Enter your password.') });

/** One of your own sessions, as the account page lists them. */
export type OwnSession = {
  id: string;
  createdAt: string;
  lastSeenAt: string;
  ip: string | null;
  userAgent: string | null;
  current: boolean;
};

/** A sign-in or password lock-out in force in this API process. */
export type Lockout = {
  kind: 'sign-in' | 'password';
  email: string;
  userId: number | null;
  name: string | null;
  failures: number;
  until: string;
};
export type LockoutsJson = { accounts: Lockout[]; addresses: { address: string; failures: number; until: string }[] };

export const liftLockoutBody = z.union([
  z.strictObject({ email: text().trim().toLowerCase().min(1).max(254) }),
  z.strictObject({ address: text().trim().min(1).max(64) }),
]);
export type LiftLockoutBody = z.infer<typeof liftLockoutBody>;
