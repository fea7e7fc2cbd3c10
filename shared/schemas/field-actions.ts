import { z } from 'zod';
import { enteredPassword } from './auth.js';
import { paging, text } from './common.js';
import type { Severity } from './ncr.js';

/**
 * Field actions: a problem found in something that has already shipped. Opened by the NCR that
 * found it, one per shipment it reaches, and closed with quality's signed decision.
 */
export const FIELD_ACTION_DECISIONS = ['no_action', 'notify_customer', 'recall'] as const;
export type FieldActionDecision = (typeof FIELD_ACTION_DECISIONS)[number];
export const FIELD_ACTION_DECISION_LABELS: Record<FieldActionDecision, string> = {
  no_action: 'No action in the field',
  notify_customer: 'Notify the customer',
  recall: 'Recall the unit',
};
export const FIELD_ACTION_STATES = ['open', 'closed'] as const;
export type FieldActionState = (typeof FIELD_ACTION_STATES)[number];

export const fieldActionParam = z.strictObject({
  number: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^FA-\d{4}-\d{5,}$/, 'A field action number looks like FA-2026-00007.'),
});

export const fieldActionListQuery = z.strictObject({
  ...paging,
  state: z.enum(FIELD_ACTION_STATES).optional(),
});
export type FieldActionListQuery = z.output<typeof fieldActionListQuery>;

export const decideFieldActionBody = z.strictObject({
  decision: z.enum(FIELD_ACTION_DECISIONS, 'Choose what is to be done in the field.'),
  reason: text('Say why.').trim().min(5, 'Say why, in at least 5 characters.').max(1000, 'At most 1000 characters.'),
  password: enteredPassword('Enter your password to sign.'),
});
export type DecideFieldActionBody = z.output<typeof decideFieldActionBody>;

export type FieldActionJson = {
  number: string;
  state: FieldActionState;
  unit: { serial: string; familyCode: string };
  shipment: { customer: string | null; reference: string; shipDate: string };
  ncr: { number: string; severity: Severity; description: string; subject: string };
  openedAt: string;
  decision: FieldActionDecision | null;
  decisionReason: string | null;
  decidedBy: string | null;
  decidedAt: string | null;
  signature: { printedName: string; meaning: string; reason: string; signedAt: string } | null;
};
