import { z } from 'zod';
import { enteredPassword } from './auth.js';
import { decimal, id, idText, isoDateTime, text } from './common.js';
import type { Derivation, CharacteristicKind } from '../domain/evaluate.js';
import type { PositionScheme } from '../domain/positions.js';
import type { LimitType } from '../domain/tolerance.js';

/** The spec book: tolerance rules per engine family × characteristic, versioned and approved. */

export const LIMIT_TYPES = ['nominal', 'range', 'min', 'max'] as const;
export const LIMIT_TYPE_LABELS: Record<LimitType, string> = {
  nominal: 'Nominal ± tolerance',
  range: 'Between two limits',
  min: 'At least',
  max: 'At most',
  attribute: 'Pass / fail',
};

export const RULE_STATUS_LABELS = {
  draft: 'Draft',
  approved: 'In force',
  superseded: 'Superseded',
  withdrawn: 'Discarded draft',
} as const;

const limit = decimal(14, 6, 'Enter a number.').min(-1e6, 'Too small.').max(1e6, 'Too large.');
const optionalLimit = limit.nullable().default(null);

/** A size class's code as the plant writes it on parts and boxes: "STD", "+0.25", "-0.010". */
export const sizeClassCode = text('Enter the size class.')
  .trim()
  .min(1, 'Enter the size class.')
  .max(20, 'At most 20 characters.')
  .regex(/^[A-Za-z0-9+.\-_]+$/, 'Use letters, digits, +, -, dots or underscores.');

/**
 * One size class of a characteristic (standard, +0.25 mm, 0.010 in under …) with its own nominal
 * and tolerances, in the rule's unit. Part of a rule version: drafted, approved and fixed with it.
 */
export const sizeClassInput = z.strictObject({
  code: sizeClassCode,
  name: text('Name the size class.').trim().min(1, 'Name the size class.').max(40, 'At most 40 characters.'),
  nominal: limit,
  minusTol: limit.min(0, 'A tolerance is not negative.'),
  plusTol: limit.min(0, 'A tolerance is not negative.'),
});
export type SizeClass = z.output<typeof sizeClassInput>;
export type SizeClassJson = SizeClass & { lower: number; upper: number };

/** The limits of a draft; which fields it needs depends on the kind of limit. */
export const ruleLimits = z
  .strictObject({
    limitType: z.enum(LIMIT_TYPES, 'Choose how the limit is set.'),
    nominal: optionalLimit,
    minusTol: optionalLimit,
    plusTol: optionalLimit,
    lowerLimit: optionalLimit,
    upperLimit: optionalLimit,
    resolution: decimal(12, 6, 'Enter the resolution readings are rounded to.')
      .positive('The resolution must be more than 0.')
      .max(1000, 'At most 1000.'),
    sourceNote: text().trim().max(300, 'At most 300 characters.').default(''),
    sizeClasses: z.array(sizeClassInput).max(12, 'At most 12 size classes.').default([]),
  })
  .superRefine((r, ctx) => {
    const seen = new Set<string>();
    r.sizeClasses.forEach((c, i) => {
      if (seen.has(c.code.toUpperCase())) {
        ctx.addIssue({ code: 'custom', path: ['sizeClasses', i, 'code'], message: `${c.code} comes twice.` });
      }
      seen.add(c.code.toUpperCase());
    });
    const need = (field: keyof typeof r, message: string) => {
      if (r[field] === null || r[field] === undefined) ctx.addIssue({ code: 'custom', path: [field], message });
    };
    if (r.limitType === 'nominal') {
      need('nominal', 'Enter the nominal.');
      need('minusTol', 'Enter the minus tolerance (0 if none).');
      need('plusTol', 'Enter the plus tolerance (0 if none).');
      if (r.minusTol !== null && r.minusTol < 0) {
        ctx.addIssue({ code: 'custom', path: ['minusTol'], message: 'A tolerance is not negative.' });
      }
      if (r.plusTol !== null && r.plusTol < 0) {
        ctx.addIssue({ code: 'custom', path: ['plusTol'], message: 'A tolerance is not negative.' });
      }
    }
    if (r.limitType === 'range') {
      need('lowerLimit', 'Enter the lower limit.');
      need('upperLimit', 'Enter the upper limit.');
      if (r.lowerLimit !== null && r.upperLimit !== null && r.lowerLimit >= r.upperLimit) {
        ctx.addIssue({ code: 'custom', path: ['upperLimit'], message: 'The upper limit must be above the lower.' });
      }
    }
    if (r.limitType === 'min') need('lowerLimit', 'Enter the lowest value that passes.');
    if (r.limitType === 'max') need('upperLimit', 'Enter the highest value that passes.');
  });
export type RuleLimits = z.output<typeof ruleLimits>;

export const createDraftBody = z.strictObject({
  family: text().trim().min(1).max(20),
  characteristicId: id(),
  limits: ruleLimits,
});

export const updateDraftBody = z.strictObject({ limits: ruleLimits });

export const approveRuleBody = z.strictObject({
  reason: text('Say why.').trim().min(5, 'Say why, in at least 5 characters.').max(500, 'At most 500 characters.'),
  password: enteredPassword('Enter your password to sign.'),
  /** When the new version takes over; now when left out. Never in the past. */
  effectiveFrom: isoDateTime('Use a date and time like 2026-12-02T08:00:00Z.').optional(),
  /** The rehearsal of this draft the approver saw: kept with the approval. */
  rehearsalId: z.number().int().positive().optional(),
});

export const specBookQuery = z.strictObject({ family: text().trim().min(1).max(20) });
export const ruleHistoryQuery = z.strictObject({
  family: text().trim().min(1).max(20),
  characteristicId: idText(),
});

export type SignatureJson = { printedName: string; meaning: string; signedAt: string };

export type RuleJson = {
  id: number;
  version: number;
  status: keyof typeof RULE_STATUS_LABELS;
  limitType: LimitType;
  nominal: number | null;
  minusTol: number | null;
  plusTol: number | null;
  lowerLimit: number | null;
  upperLimit: number | null;
  /** The specification limits the rule sets, worked out from the fields above. */
  lower: number | null;
  upper: number | null;
  unit: string | null;
  resolution: number | null;
  sourceNote: string;
  /** The size classes of this version; a station chooses one and is judged to its limits. */
  sizeClasses: SizeClassJson[];
  effectiveFrom: string | null;
  supersededAt: string | null;
  createdBy: string;
  /** The author: a draft is approved by another quality engineer. */
  createdById: number;
  createdAt: string;
  approvedBy: string | null;
  approvedAt: string | null;
  approvalReason: string | null;
  signature: SignatureJson | null;
};

export type SpecCharacteristicJson = {
  id: number;
  code: string;
  name: string;
  kind: CharacteristicKind;
  unit: string | null;
  resolution: number | null;
  critical: boolean;
  positions: PositionScheme;
  positionsLabel: string;
  derivation: Derivation | null;
  help: string;
  inForce: RuleJson | null;
  /** A version approved to take over later. */
  scheduled: RuleJson | null;
  draft: RuleJson | null;
  versions: number;
};

export type SpecBookJson = {
  family: { id: number; code: string; name: string };
  stages: { code: string; name: string; partKind: string; characteristics: SpecCharacteristicJson[] }[];
};

export type RuleHistoryJson = {
  family: { id: number; code: string; name: string };
  characteristic: SpecCharacteristicJson;
  stage: { code: string; name: string };
  versions: RuleJson[];
};
