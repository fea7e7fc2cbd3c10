import { z } from 'zod';
import type { AttachmentJson } from './attachments.js';
import type { TrailReading } from './trail.js';
import { id, idText, isoDate as commonIsoDate, paging, text } from './common.js';
import { CREDIT_DECISIONS } from './intake.js';

/**
 * Warranty claims: logged by the desk with their coverage, the unit taken back by receiving, torn
 * down on the floor (each finding against the part it concerns), decided and closed; each step
 * signed with the signer's password. Cause codes are the plant's own list.
 */

export const CLAIM_STATES = ['received', 'torn_down', 'decided', 'closed'] as const;
export type ClaimState = (typeof CLAIM_STATES)[number];
export const CLAIM_STATE_LABELS: Record<ClaimState, string> = {
  received: 'Received',
  torn_down: 'Torn down',
  decided: 'Decided',
  closed: 'Closed',
};

export const CLAIM_DECISIONS = ['accepted', 'rejected', 'goodwill'] as const;
export type ClaimDecision = (typeof CLAIM_DECISIONS)[number];
export const CLAIM_DECISION_LABELS: Record<ClaimDecision, string> = {
  accepted: 'Accepted under warranty',
  rejected: 'Rejected',
  goodwill: 'Goodwill (outside the terms)',
};

/** The next step a claim waits for, and who takes it. */
export type ClaimNext = 'return' | 'teardown' | 'decide' | 'close' | null;

/** A month in service, as the analysis counts it: a 365.25-day year over 12 (from memory, the usual average). */
export const DAYS_PER_MONTH = 365.25 / 12;

export const isoDate = commonIsoDate();
const limited = (max: number) => text().trim().max(max, `At most ${max} characters.`);
const said = (min: number, what: string, max = 2000) =>
  text(`Say ${what}.`)
    .trim()
    .min(min, `Say ${what}, in at least ${min} characters.`)
    .max(max, `At most ${max} characters.`);
export const signaturePassword = text('Enter your password to sign.').min(1, 'Enter your password to sign.').max(200);
const serial = text('Scan or type the unit’s serial.').trim().min(1, 'Scan or type the unit’s serial.').max(30);
const kilometres = z
  .number('Enter the distance in kilometres.')
  .int('Whole kilometres.')
  .min(0, 'Not below zero.')
  .max(5_000_000, 'Check the distance: over 5,000,000 km.');
const hoursRun = z
  .number('Enter the hours run.')
  .min(0, 'Not below zero.')
  .max(1_000_000, 'Check the hours: over 1,000,000.');
const ids = (max: number, what: string) => z.array(id()).max(max, `At most ${max} ${what}.`).default([]);

export const CLAIM_NUMBER = /^WC-\d{4}-\d{5,}$/;
export const claimParam = z.strictObject({
  number: text().trim().toUpperCase().regex(CLAIM_NUMBER, 'A claim number looks like WC-2026-00007.'),
});

export const coverageQuery = z.strictObject({
  serial,
  failedOn: isoDate,
  km: z.coerce.number().pipe(kilometres).optional(),
});
export type CoverageQuery = z.output<typeof coverageQuery>;

export const logClaimBody = z
  .strictObject({
    serial,
    customerId: id('Choose the customer.'),
    customerReference: limited(60).default(''),
    failedOn: isoDate,
    distanceKm: kilometres.nullable().default(null),
    hours: hoursRun.nullable().default(null),
    symptom: said(10, 'what the customer reports', 4000),
    installer: said(2, 'who installed the unit', 160),
    password: signaturePassword,
  })
  .superRefine((b, ctx) => {
    if (b.distanceKm === null && b.hours === null) {
      ctx.addIssue({ code: 'custom', path: ['distanceKm'], message: 'Give the distance run, the hours, or both.' });
    }
  });
export type LogClaimBody = z.input<typeof logClaimBody>;

export const claimListQuery = z.strictObject({
  ...paging,
  state: z.enum([...CLAIM_STATES, 'open']).optional(),
  /** The claims waiting for the caller's kind of step: the unit to take back, or to tear down. */
  waiting: z.enum(['return', 'teardown', 'decision']).optional(),
  q: limited(40).optional(),
});
export type ClaimListQuery = z.output<typeof claimListQuery>;

export const returnUnitBody = z.strictObject({ note: limited(500).default(''), password: signaturePassword });
export type ReturnUnitBody = z.input<typeof returnUnitBody>;

export const measurementBody = z.strictObject({
  characteristic: text('Choose the characteristic.').trim().min(1, 'Choose the characteristic.').max(40),
  position: text().trim().max(40).default(''),
  value: z.number('Enter the value measured.').finite(),
});

export const findingBody = z
  .strictObject({
    /** The serial of the part (or of the unit itself), or a purchased lot's code. */
    part: text().trim().max(30).optional(),
    lotCode: text().trim().max(60).optional(),
    causeCode: text('Choose a cause code.').trim().toUpperCase().min(1, 'Choose a cause code.').max(20),
    description: said(5, 'what was found'),
    measurements: z.array(measurementBody).max(30, 'At most 30 measurements per finding.').default([]),
    photoIds: ids(8, 'photos'),
  })
  .superRefine((f, ctx) => {
    if (!f.part === !f.lotCode) {
      ctx.addIssue({
        code: 'custom',
        path: ['part'],
        message: 'Say which part (or lot) the finding concerns: one of them.',
      });
    }
    if (f.lotCode && f.measurements.length) {
      ctx.addIssue({ code: 'custom', path: ['measurements'], message: 'Measurements are recorded against a part.' });
    }
  });

export const teardownClaimBody = z.strictObject({
  findings: z.array(findingBody).min(1, 'Record at least one finding.').max(20, 'At most 20 findings.'),
  notes: limited(2000).default(''),
  password: signaturePassword,
});
export type TeardownClaimBody = z.input<typeof teardownClaimBody>;

export const decideClaimBody = z.strictObject({
  decision: z.enum(CLAIM_DECISIONS, 'Choose the decision.'),
  reason: said(5, 'why'),
  password: signaturePassword,
});
export type DecideClaimBody = z.input<typeof decideClaimBody>;

export const closeClaimBody = z.strictObject({ note: limited(1000).default(''), password: signaturePassword });
export type CloseClaimBody = z.input<typeof closeClaimBody>;

export const CAUSE_CODE_PATTERN = /^[A-Z0-9][A-Z0-9-]{1,19}$/;
export const causeCodeBody = z.strictObject({
  code: text('Enter a code.').trim().toUpperCase().regex(CAUSE_CODE_PATTERN, 'Use 2–20 letters, digits or dashes.'),
  description: said(3, 'what the cause is', 200),
  countsAsFailure: z.boolean('Say whether it counts as a failure of the product.'),
});
export type CauseCodeBody = z.input<typeof causeCodeBody>;
export const updateCauseCodeBody = z
  .strictObject({
    description: said(3, 'what the cause is', 200).optional(),
    countsAsFailure: z.boolean().optional(),
    active: z.boolean().optional(),
  })
  .refine((b) => Object.keys(b).length > 0, { message: 'Change something.' });
export const causeCodeParam = z.strictObject({
  code: text().trim().toUpperCase().regex(CAUSE_CODE_PATTERN, 'Not a cause code.'),
});
export type CauseCodeJson = { code: string; description: string; countsAsFailure: boolean; active: boolean };

export const creditRevisionBody = z.strictObject({
  creditDecision: z.enum(CREDIT_DECISIONS, 'Choose the settled credit.'),
  reason: said(5, 'what the teardown showed', 500),
  photoIds: ids(8, 'photos'),
});
export type CreditRevisionBody = z.input<typeof creditRevisionBody>;

export type CreditRevisionJson = {
  creditDecision: (typeof CREDIT_DECISIONS)[number];
  reason: string;
  revisedBy: string;
  revisedAt: string;
  photos: AttachmentJson[];
};

export const analysisQuery = z.strictObject({
  family: idText().optional(),
  /** Ship dates from … to, inclusive. */
  from: isoDate.optional(),
  to: isoDate.optional(),
});
export type AnalysisQuery = z.output<typeof analysisQuery>;

// ——— replies ———

export type CoverageJson = {
  unit: { serial: string; familyCode: string; familyName: string; status: string };
  shipment: { reference: string; shipDate: string; customer: { id: number; code: string; name: string } | null };
  covered: boolean;
  reason: string;
  endsOn: string;
  months: number;
  km: number | null;
  /** Days in service from the ship date to the failure. */
  daysInService: number;
};

export type ClaimSummaryJson = {
  number: string;
  state: ClaimState;
  demo: boolean;
  unit: { serial: string; familyCode: string };
  customer: string;
  failedOn: string;
  distanceKm: number | null;
  hours: number | null;
  covered: boolean;
  decision: ClaimDecision | null;
  unitReturned: boolean;
  next: ClaimNext;
  openedAt: string;
};

export type MeasurementJson = {
  characteristic: string;
  name: string;
  position: string;
  positionLabel: string;
  value: number;
  unit: string | null;
};

/** A reading taken when the part was built, with the gauge it was read with. */
export type BuiltReading = TrailReading;

export type BuiltResult = {
  stage: { code: string; name: string };
  station: string | null;
  operator: string;
  gauge: string | null;
  verdict: 'pass' | 'fail';
  finishedAt: string;
  superseded: boolean;
  readings: BuiltReading[];
};

export type FindingSubject =
  | { kind: 'item'; serial: string; kindLabel: string; positionLabel: string | null; core: string | null }
  | { kind: 'lot'; lotCode: string; partKind: string; supplier: string; partNumber: string };

export type FindingJson = {
  id: number;
  subject: FindingSubject;
  cause: CauseCodeJson;
  description: string;
  measurements: MeasurementJson[];
  photos: AttachmentJson[];
  recordedBy: string;
  recordedAt: string;
  /** What was measured on that part when it was built (for a lot: the unit's own stages, where its parts were fitted). */
  built: BuiltResult[];
};

export type ClaimPart = {
  serial: string;
  kind: string;
  kindLabel: string;
  positionLabel: string | null;
  /** The characteristics measured on it when it was built, for teardown measurements beside them. */
  characteristics: { code: string; name: string; unit: string | null; positions: { code: string; label: string }[] }[];
};

export type ClaimJson = ClaimSummaryJson & {
  unit: { serial: string; familyCode: string; familyName: string; status: string };
  shipment: { reference: string; shipDate: string; customer: string | null };
  customerId: number;
  customerReference: string;
  symptom: string;
  installer: string;
  coverage: { covered: boolean; reason: string; endsOn: string };
  daysInService: number;
  openedBy: string;
  unitReturnedAt: string | null;
  returnedBy: string | null;
  tornDownAt: string | null;
  tornDownBy: string | null;
  teardownNotes: string;
  decisionReason: string | null;
  decidedBy: string | null;
  decidedAt: string | null;
  closedBy: string | null;
  closedAt: string | null;
  /** What was in the unit when it shipped: the parts and lots a finding can concern. */
  parts: ClaimPart[];
  lots: { lotCode: string; kind: string; supplier: string; partNumber: string }[];
  findings: FindingJson[];
  signatures: { printedName: string; meaning: string; reason: string; signedAt: string }[];
  correctiveActions: { number: string; title: string; state: 'open' | 'closed' }[];
};

export type RateRow = {
  key: string;
  label: string;
  units: number;
  claims: number;
  failures: number;
  /** Claims (or failures) per 100 units shipped. */
  claimRate: number;
  failureRate: number;
};

export const RATE_DIMENSIONS = [
  'family',
  'buildMonth',
  'lot',
  'coreSource',
  'coreGrade',
  'station',
  'gauge',
  'operator',
] as const;
export type RateDimension = (typeof RATE_DIMENSIONS)[number];
export const RATE_DIMENSION_LABELS: Record<RateDimension, string> = {
  family: 'Engine family',
  buildMonth: 'Build month',
  lot: 'Purchased lot',
  coreSource: 'Core source',
  coreGrade: 'Core grade at the dock',
  station: 'Station (parts concerned)',
  gauge: 'Gauge (parts concerned)',
  operator: 'Operator (parts concerned)',
};

export type MonthInService = { month: number; atRisk: number; claims: number; failures: number };

export type AnalysisJson = {
  asOf: string;
  family: string | null;
  fleet: { units: number; claims: number; failures: number };
  rates: Record<RateDimension, RateRow[]>;
  monthsInService: MonthInService[];
};

export type WeibullFitJson = {
  shape: number;
  scale: number;
  b10: number;
  rSquared: number | null;
  logLikelihood: number | null;
  line: { time: number; fractionFailed: number }[];
};

export type WeibullJson = {
  asOf: string;
  family: string | null;
  /** Times are months in service. */
  unitOfTime: 'months';
  units: number;
  failures: number;
  suspensions: number;
  /** Shipped on the last day counted: not yet in service, so left out. */
  notInService: number;
  regression: WeibullFitJson | null;
  mle: WeibullFitJson | null;
  /** Why there is no fit, in words (too few failures, …). */
  message: string | null;
  points: { time: number; medianRank: number; adjustedRank: number; serial: string }[];
};
