import { z } from 'zod';
import { enteredPassword } from './auth.js';
import { id, isoDate, text } from './common.js';

/** A supervisor's or admin's signed sign-off: this person may record this stage until the expiry day. */
export const signQualificationBody = z
  .strictObject({
    userId: id('Choose a person.'),
    stage: text('Choose a stage.').trim().min(1, 'Choose a stage.').max(20),
    trainedOn: isoDate(),
    expiresOn: isoDate(),
    reason: text().trim().min(3, 'Say what the training was (at least 3 characters).').max(500),
    password: enteredPassword('Enter your password to sign.'),
  })
  .refine((b) => b.expiresOn > b.trainedOn, {
    path: ['expiresOn'],
    message: 'The expiry must come after the training day.',
  });
export type SignQualificationBody = z.infer<typeof signQualificationBody>;

export const withdrawQualificationBody = z.strictObject({
  reason: text().trim().min(3, 'Say why (at least 3 characters).').max(500),
  password: enteredPassword('Enter your password to sign.'),
});
export type WithdrawQualificationBody = z.infer<typeof withdrawQualificationBody>;

export const expiringQuery = z.strictObject({
  days: z.coerce.number().int().min(1).max(365).default(30),
});

/** Where a qualification stands on a given day. */
export type QualificationState = 'current' | 'expiring' | 'expired' | 'withdrawn';

export type QualificationJson = {
  id: number;
  person: { id: number; name: string };
  stage: { code: string; name: string };
  trainedOn: string;
  expiresOn: string;
  state: QualificationState;
  signature: { printedName: string; meaning: string; reason: string; signedAt: string };
  withdrawn: { at: string; reason: string } | null;
};

export type QualificationMatrixJson = {
  today: string;
  /** How many days before its expiry a qualification counts as expiring. */
  warnDays: number;
  stages: { code: string; name: string }[];
  people: { id: number; name: string; role: string; cells: Record<string, QualificationJson> }[];
};
