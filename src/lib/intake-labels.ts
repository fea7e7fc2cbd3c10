import type { CREDIT_DECISIONS, SOURCES } from '../../shared/schemas/intake';

/* Words for the intake codes the shared schema leaves unlabelled (its GRADE_LABELS etc. are used as they are). */

export const SOURCE_LABELS: Record<(typeof SOURCES)[number], string> = {
  customer_return: 'Customer return',
  purchased: 'Purchased',
};

export const CREDIT_LABELS: Record<(typeof CREDIT_DECISIONS)[number], string> = {
  full: 'Full credit',
  partial: 'Partial credit',
  none: 'No credit',
};

/** "Sound" from "Sound — expect every major part to be reused": the word for a narrow column. */
export const gradeWord = (label: string) => label.split(' — ')[0] ?? label;
