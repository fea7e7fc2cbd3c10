import { z } from 'zod';
import { enteredPassword } from './auth.js';
import { text } from './common.js';
import { submitResultBody } from './results.js';

export const enrolTabletBody = z.strictObject({
  station: text('Choose the station.').trim().min(1, 'Choose the station.').max(20),
  label: text().trim().min(2, 'Name the tablet (at least 2 characters), e.g. “Bore and hone, left”.').max(80),
});
export type EnrolTabletBody = z.infer<typeof enrolTabletBody>;

/** A badge as the scanner types it: letters, digits and dashes. */
export const badgeSchema = text('Scan your badge.')
  .trim()
  .min(3, 'Scan your badge.')
  .max(40)
  .regex(/^[A-Za-z0-9-]+$/, 'A badge holds letters, digits and dashes only.');

/** Four to eight digits. */
export const pinSchema = text('Enter your PIN.').regex(/^\d{4,8}$/, 'A PIN is 4 to 8 digits.');

/** A new PIN: not one digit repeated, and not a straight run up or down (1234, 9876). */
export const newPinSchema = pinSchema.refine((p) => {
  const d = [...p].map(Number);
  const step = d[1]! - d[0]!;
  const run = Math.abs(step) <= 1 && d.every((x, i) => i === 0 || x - d[i - 1]! === step);
  return !run;
}, 'Choose a PIN that is not one digit repeated or a run like 1234.');

export const setPinBody = z.strictObject({
  pin: newPinSchema,
  password: enteredPassword('Enter your password.'),
});

export const setBadgeBody = z.strictObject({ badge: badgeSchema.nullable() });

/** A result from a shared tablet: the station form's body and who took it, by badge and PIN. */
export const tabletResultBody = submitResultBody.extend({ badge: badgeSchema, pin: pinSchema });
export type TabletResultBody = z.output<typeof tabletResultBody>;

export type TabletJson = {
  id: number;
  label: string;
  station: { code: string; name: string; location: string; stage: { code: string; name: string } | null };
  enrolledBy: string;
  enrolledAt: string;
  retiredAt: string | null;
};
