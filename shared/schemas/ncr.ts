import { z } from 'zod';
import { enteredPassword } from './auth.js';
import type { AttachmentJson } from './attachments.js';
import { id, idText, paging, text } from './common.js';
import type { ItemJson } from './items.js';

/** Nonconformances (NCRs): states of Coretrail's own naming, dispositions in the trade's terms. */

export const NCR_STATES = ['raised', 'in_review', 'decided', 'closed', 'voided'] as const;
export type NcrState = (typeof NCR_STATES)[number];
export const NCR_STATE_LABELS: Record<NcrState, string> = {
  raised: 'Raised',
  in_review: 'In review',
  decided: 'Decided',
  closed: 'Closed',
  voided: 'Voided',
};
/** An NCR in one of these states holds its item. */
export const OPEN_NCR_STATES: NcrState[] = ['raised', 'in_review', 'decided'];

export const SEVERITIES = ['critical', 'major', 'minor'] as const;
export type Severity = (typeof SEVERITIES)[number];

export const DISPOSITIONS = ['use_as_is', 'rework', 'repair', 'scrap', 'return_to_supplier'] as const;
export type Disposition = (typeof DISPOSITIONS)[number];
export const DISPOSITION_LABELS: Record<Disposition, string> = {
  use_as_is: 'Use as is',
  rework: 'Rework',
  repair: 'Repair',
  scrap: 'Scrap',
  return_to_supplier: 'Return to supplier',
};

/** The steps a person can take on an NCR; the server answers an impossible one with the possible ones. */
export const NCR_ACTIONS = ['review', 'disposition', 'countersign', 'close', 'void'] as const;
export type NcrAction = (typeof NCR_ACTIONS)[number];

const reasonText = (min: number, what: string) =>
  text(`Say ${what}.`)
    .trim()
    .min(min, `Say ${what}, in at least ${min} characters.`)
    .max(2000, 'At most 2000 characters.');

/** About a part (its serial) or a purchased lot (its code, and the supplier or part number when a code is shared). */
export const raiseNcrBody = z.strictObject({
  serial: text().trim().max(24).optional(),
  lotCode: text().trim().max(60).optional(),
  supplierId: id().optional(),
  /** When one supplier uses the lot code on more than one part number. */
  partNumber: text().trim().max(60).optional(),
  description: reasonText(10, 'what was seen'),
  severity: z.enum(SEVERITIES, 'Choose how serious it is.'),
  defectCode: text('Choose a defect code.').trim().min(1, 'Choose a defect code.').max(20),
  containment: text().trim().max(2000).default(''),
  photoIds: z.array(id()).max(10, 'At most 10 photos.').default([]),
});
export type RaiseNcrBody = z.output<typeof raiseNcrBody>;
export const raiseNcrChecked = raiseNcrBody.superRefine((b, ctx) => {
  if (!b.serial && !b.lotCode) {
    ctx.addIssue({
      code: 'custom',
      path: ['serial'],
      message: 'Scan or type the serial of the part, or give a lot code.',
    });
  }
  if (b.serial && b.lotCode) {
    ctx.addIssue({ code: 'custom', path: ['lotCode'], message: 'One concern is about a part or a lot, not both.' });
  }
});

export const DEFECT_CODE_PATTERN = /^[A-Z0-9][A-Z0-9-]{1,19}$/;
export const defectCodeBody = z.strictObject({
  code: text('Enter a code.').trim().toUpperCase().regex(DEFECT_CODE_PATTERN, 'Use 2–20 letters, digits or dashes.'),
  description: text('Describe the defect.').trim().min(3, 'At least 3 characters.').max(200, 'At most 200 characters.'),
});
export const updateDefectCodeBody = z
  .strictObject({
    description: text().trim().min(3, 'At least 3 characters.').max(200).optional(),
    active: z.boolean().optional(),
  })
  .refine((b) => Object.keys(b).length > 0, 'Change at least one field.');
export const defectCodeParam = z.strictObject({
  code: text().trim().toUpperCase().regex(DEFECT_CODE_PATTERN, 'Not a defect code.'),
});
export type DefectCodeJson = { code: string; description: string; active: boolean };

export const ncrParam = z.strictObject({
  number: text()
    .trim()
    .toUpperCase()
    .regex(/^NC-\d{4}-\d{5,}$/, 'An NCR number looks like NC-2026-00042.'),
});

export const reviewBody = z.strictObject({ note: text().trim().max(2000).default('') });
export const assignBody = z.strictObject({ assigneeId: id().nullable() });
export const containmentBody = z.strictObject({ containment: text().trim().max(2000) });

const password = enteredPassword('Enter your password to sign.');

export const dispositionBody = z
  .strictObject({
    disposition: z.enum(DISPOSITIONS, 'Choose a disposition.'),
    reason: reasonText(5, 'why'),
    /** For rework and repair: the stage the item goes back to. */
    reworkStage: text().trim().min(1).max(40).optional(),
    password,
  })
  .superRefine((b, ctx) => {
    if ((b.disposition === 'rework' || b.disposition === 'repair') && !b.reworkStage) {
      ctx.addIssue({ code: 'custom', path: ['reworkStage'], message: 'Choose the stage the part goes back to.' });
    }
    if (b.disposition !== 'rework' && b.disposition !== 'repair' && b.reworkStage) {
      ctx.addIssue({ code: 'custom', path: ['reworkStage'], message: 'Only rework and repair send a part back.' });
    }
  });
export type DispositionBody = z.output<typeof dispositionBody>;

export const countersignBody = z.strictObject({ reason: reasonText(5, 'why you agree'), password });
export const closeBody = z.strictObject({ note: text().trim().max(2000).default('') });
export const voidBody = z.strictObject({ reason: reasonText(5, 'why it was raised in error') });

export const NCR_SORTS = ['raised', 'number', 'severity', 'state', 'serial'] as const;
export const ncrListQuery = z.strictObject({
  ...paging,
  state: z.enum([...NCR_STATES, 'open']).optional(),
  severity: z.enum(SEVERITIES).optional(),
  defect: text().trim().max(20).optional(),
  family: idText().optional(),
  stage: text().trim().max(40).optional(),
  /** Raised at least this many days ago. */
  olderThanDays: z.coerce.number<number>().int().min(0).max(3650).optional(),
  assignee: z.union([idText(), z.literal('none')]).optional(),
  q: text().trim().max(60).optional(),
  /** `me`: critical use-as-is decisions signed once, waiting for the signed-in engineer's countersignature. */
  awaiting: z.literal('me').optional(),
  sort: z.enum(NCR_SORTS).default('raised'),
  dir: z.enum(['asc', 'desc']).default('desc'),
});
export type NcrListQuery = z.output<typeof ncrListQuery>;

export type NcrRow = {
  number: string;
  state: NcrState;
  severity: Severity;
  /** For an NCR on a purchased lot instead of a part. */
  lotCode: string | null;
  awaitingSecondSignature: boolean;
  assigneeId: number | null;
  serial: string | null;
  itemKind: string | null;
  familyCode: string | null;
  stageCode: string | null;
  stageName: string | null;
  defectCode: string | null;
  description: string;
  disposition: Disposition | null;
  raisedBy: string;
  assignee: string | null;
  raisedAt: string;
  ageDays: number;
};

/** A step (a change of state) or a signature, each with its own person, time and words. */
export type NcrTimelineEntry = {
  at: string;
  kind: 'step' | 'signature';
  /** For a step: the states before and after; null for a signature. */
  from: NcrState | null;
  to: NcrState | null;
  actor: string;
  reason: string;
  /** For a signature: what the signer declared by signing. */
  meaning: string | null;
};

export type NcrSignature = { printedName: string; meaning: string; reason: string; signedAt: string };

/** The result an NCR was raised by, in words a person reads (no row numbers). */
export type NcrOrigin = { stageName: string; stationName: string | null; operator: string; finishedAt: string };

export type NcrDetail = NcrRow & {
  failing: {
    characteristic: string;
    name: string;
    position: string;
    positionLabel: string;
    value: number | null;
    passed: boolean | null;
    unit: string | null;
    lower: number | null;
    upper: number | null;
    reason: string;
    ruleVersion: number | null;
    location: string | null;
  }[];
  containment: string;
  dispositionReason: string | null;
  reworkStage: { code: string; name: string } | null;
  awaitingSecondSignature: boolean;
  decidedBy: string | null;
  decidedById: number | null;
  decidedAt: string | null;
  lot: { lotCode: string; partNumber: string; kind: string; supplier: string; status: string } | null;
  closedAt: string | null;
  stageResultId: number | null;
  origin: NcrOrigin | null;
  item: ItemJson | null;
  timeline: NcrTimelineEntry[];
  signatures: NcrSignature[];
  photos: AttachmentJson[];
  /** What the signed-in person may do next. */
  allowed: NcrAction[];
};
