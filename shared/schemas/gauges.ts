import { z } from 'zod';
import { enteredPassword } from './auth.js';
import { decimal, id, isoDate, isoDateTime, text } from './common.js';

/**
 * The gauge register, calibrations, suitability, the blast radius of a bad gauge (or lot, rule
 * version, operator, station, spell) with its signed containment, and gauge studies.
 */
export const GAUGE_STATUSES = ['in_use', 'out_for_calibration', 'out_of_tolerance', 'retired'] as const;
export type GaugeStatus = (typeof GAUGE_STATUSES)[number];
/** What the register shows: the stored status, or due / overdue worked out from the plant's calendar. */
export type GaugeState = GaugeStatus | 'due' | 'overdue' | 'never_calibrated';
export const GAUGE_STATE_LABELS: Record<GaugeState, string> = {
  in_use: 'In use',
  due: 'Due soon',
  overdue: 'Overdue',
  never_calibrated: 'No calibration on record',
  out_for_calibration: 'Out for calibration',
  out_of_tolerance: 'Out of tolerance',
  retired: 'Retired',
};
/** Days before the due date a gauge shows as due soon (common practice: a month's notice). */
export const DUE_SOON_DAYS = 30;

const code = () =>
  z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9-]{0,29}$/, 'A gauge code is letters, digits and dashes, like BG-014.');
export const gaugeParam = z.strictObject({ code: code() });

const words = (max: number, what: string) => text(`Enter ${what}.`).trim().max(max, `At most ${max} characters.`);
const measure = decimal(14, 6, 'Enter a number.');

export const gaugeBody = z
  .strictObject({
    code: code(),
    description: words(120, 'a description').min(1, 'Enter a description.'),
    kind: words(40, 'the kind of gauge').min(1, 'Enter the kind of gauge.'),
    serial: words(60, 'the serial').default(''),
    unit: words(20, 'the unit').min(1, 'Enter the unit it reads in.'),
    resolution: decimal(12, 6, 'Enter the resolution.').refine((v) => v > 0, 'The resolution must be above 0.'),
    rangeLow: measure,
    rangeHigh: measure,
    location: words(80, 'where it is kept').default(''),
    owner: words(80, 'who owns it').default(''),
    intervalDays: z.number('Enter the interval in days.').int('Use whole days.').min(1).max(3660),
  })
  .refine((b) => b.rangeLow < b.rangeHigh, {
    path: ['rangeHigh'],
    message: 'The top of the range must be above its bottom.',
  });
export type GaugeBody = z.output<typeof gaugeBody>;

export const gaugeStatusBody = z.strictObject({
  status: z.enum(GAUGE_STATUSES, 'Choose a status.'),
  reason: text('Say why.').trim().min(5, 'Say why, in at least 5 characters.').max(500, 'At most 500 characters.'),
});

export const calibrationPoint = z.strictObject({
  reference: measure,
  asFound: measure,
  asLeft: measure,
  tolerance: measure.refine((v) => v > 0, 'The permitted error must be above 0.'),
});

export const calibrationBody = z
  .strictObject({
    calibratedOn: isoDate(),
    performedBy: z.enum(['in_house', 'lab'], 'Say who calibrated it.'),
    performer: words(120, 'who calibrated it').min(2, 'Name the technician or the laboratory.'),
    certificate: words(60, 'the certificate number').default(''),
    certificateAttachmentId: id().nullable().default(null),
    points: z.array(calibrationPoint).min(1, 'Enter at least one check point.').max(20, 'At most 20 check points.'),
    notes: words(500, 'notes').default(''),
  })
  .refine((b) => b.performedBy === 'in_house' || b.certificate.length > 0, {
    path: ['certificate'],
    message: 'A laboratory calibration needs its certificate number.',
  });
export type CalibrationBody = z.output<typeof calibrationBody>;

export const gaugeRatioBody = z.strictObject({
  ratio: z.number('Enter the ratio.').min(1, 'At least 1.').max(100, 'At most 100.').nullable(),
  reason: text('Say why.').trim().min(5, 'Say why, in at least 5 characters.').max(500, 'At most 500 characters.'),
});

export type GaugeJson = {
  code: string;
  description: string;
  kind: string;
  serial: string;
  unit: string | null;
  resolution: number | null;
  rangeLow: number | null;
  rangeHigh: number | null;
  location: string;
  owner: string;
  intervalDays: number | null;
  status: GaugeStatus;
  state: GaugeState;
  calibrated: boolean;
  lastCalibratedOn: string | null;
  calibrationDueOn: string | null;
  /** Days from the plant's today to the due date; negative when overdue. */
  daysLeft: number | null;
  studyVerdict: 'acceptable' | 'conditional' | 'unacceptable' | null;
};

export type CalibrationJson = {
  id: number;
  calibratedOn: string;
  dueOn: string;
  result: 'in_tolerance' | 'out_of_tolerance' | 'adjusted';
  asFoundInTolerance: boolean;
  asLeftInTolerance: boolean;
  asFoundError: number;
  points: z.output<typeof calibrationPoint>[];
  performedBy: 'in_house' | 'lab';
  performer: string;
  certificate: string | null;
  certificateUrl: string | null;
  notes: string;
  recordedBy: string | null;
  recordedAt: string;
};

// ——— the blast radius ———

export const TRIGGER_KINDS = ['gauge', 'lot', 'rule', 'operator', 'station', 'window'] as const;
export type TriggerKind = (typeof TRIGGER_KINDS)[number];

/** What went bad: exactly one subject, or a time window alone. */
export const blastQuery = z
  .strictObject({
    gauge: code().optional(),
    lot: z.string().trim().toUpperCase().min(1).max(40).optional(),
    ruleId: z.coerce.number().int().positive().max(2_147_483_647).optional(),
    operatorId: z.coerce.number().int().positive().max(2_147_483_647).optional(),
    station: code().optional(),
    from: isoDateTime().optional(),
    to: isoDateTime().optional(),
  })
  .refine((q) => [q.gauge, q.lot, q.ruleId, q.operatorId, q.station].filter((v) => v !== undefined).length <= 1, {
    message: 'Choose one of gauge, lot, rule version, operator or station.',
    path: ['gauge'],
  })
  .refine((q) => [q.gauge, q.lot, q.ruleId, q.operatorId, q.station, q.from].some((v) => v !== undefined), {
    message: 'Say what went bad: a gauge, a lot, a rule version, an operator, a station or a time window.',
    path: ['gauge'],
  })
  .refine((q) => !q.from || !q.to || Date.parse(q.from) < Date.parse(q.to), {
    message: 'The window must end after it starts.',
    path: ['to'],
  });
export type BlastQuery = z.output<typeof blastQuery>;

export type WhereNow = 'in_plant' | 'on_hold' | 'shipped' | 'scrapped';
export const WHERE_NOW_LABELS: Record<WhereNow, string> = {
  in_plant: 'In the plant',
  on_hold: 'On hold',
  shipped: 'Shipped',
  scrapped: 'Scrapped',
};

export type BlastPartJson = {
  serial: string;
  kind: string;
  status: string;
  readings: number;
  couldChange: number;
  unit: string | null;
  unitStatus: string | null;
  where: WhereNow;
  customer: string | null;
  shipDate: string | null;
  order: string | null;
};

export type BlastReadingJson = {
  serial: string;
  stage: string;
  characteristic: string;
  position: string;
  value: number | null;
  unit: string | null;
  verdict: 'pass' | 'fail';
  lower: number | null;
  upper: number | null;
  couldChange: boolean;
  takenAt: string;
  operator: string;
  gauge: string | null;
};

export type BlastRadiusJson = {
  trigger: { kind: TriggerKind; label: string; from: string | null; to: string | null };
  /** For a gauge: the as-found error used as the guard band, in the gauge's unit (0 when none). */
  guardBand: { error: number; unit: string | null } | null;
  totals: {
    readings: number;
    couldChange: number;
    parts: number;
    units: number;
    inPlant: number;
    onHold: number;
    shipped: number;
    customers: number;
  };
  parts: BlastPartJson[];
  /** The first readings, most doubtful first (all of them in the CSV). */
  readings: BlastReadingJson[];
  customers: { name: string; email: string | null; units: { serial: string; shipDate: string; order: string }[] }[];
};

export const containBody = z.strictObject({
  trigger: blastQuery,
  reason: text('Say why.').trim().min(5, 'Say why, in at least 5 characters.').max(500, 'At most 500 characters.'),
  defectCode: z.string().trim().toUpperCase().min(1, 'Choose a defect code.').max(20),
  fieldActions: z.boolean().default(true),
  password: enteredPassword('Enter your password to sign.'),
});
export type ContainBody = z.output<typeof containBody>;

export const containmentParam = z.strictObject({
  number: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^CT-\d{4}-\d{5,}$/, 'A containment number looks like CT-2026-00003.'),
});

export const noticeBody = z.strictObject({
  message: text('Write the notice.')
    .trim()
    .min(20, 'Write at least 20 characters.')
    .max(4000, 'At most 4000 characters.'),
});

export type ContainmentJson = {
  number: string;
  triggerKind: TriggerKind;
  trigger: BlastQuery;
  reason: string;
  defectCode: string;
  held: { serial: string; ncr: string | null; outcome: 'held' | 'already_held' | 'field_action' | 'scrapped' }[];
  fieldActions: string[];
  notices: number;
  signedBy: string;
  signedAt: string;
};

// ——— gauge studies ———

const reading = z.number('Enter every reading.').refine(Number.isFinite, 'Enter a number.');
export const variableStudyBody = z.strictObject({
  method: z.enum(['range', 'anova'], 'Choose the method.'),
  characteristic: words(120, 'what was measured').min(1, 'Say what was measured.'),
  tolerance: decimal(14, 6, 'Enter the tolerance band.')
    .refine((v) => v > 0, 'Above 0.')
    .nullable(),
  /** readings[appraiser][part][trial] */
  readings: z
    .array(z.array(z.array(reading).min(2).max(3)).min(2).max(15))
    .min(2, 'At least 2 appraisers.')
    .max(3, 'At most 3 appraisers.'),
});
export const attributeStudyBody = z.strictObject({
  method: z.literal('attribute'),
  characteristic: words(120, 'what was checked').min(1, 'Say what was checked.'),
  /** ratings[appraiser][part][trial], each 'pass' or 'fail' */
  ratings: z
    .array(
      z
        .array(
          z
            .array(z.enum(['pass', 'fail']))
            .min(1)
            .max(3),
        )
        .min(2)
        .max(50),
    )
    .min(2, 'At least 2 appraisers.')
    .max(5, 'At most 5 appraisers.'),
  reference: z
    .array(z.enum(['pass', 'fail']))
    .max(50)
    .nullable(),
});
export const studyBody = z.discriminatedUnion('method', [
  variableStudyBody.extend({ method: z.literal('range') }),
  variableStudyBody.extend({ method: z.literal('anova') }),
  attributeStudyBody,
]);
export type StudyBody = z.output<typeof studyBody>;

export type StudyJson = {
  id: number;
  gauge: string;
  method: 'range' | 'anova' | 'attribute';
  characteristic: string;
  tolerance: number | null;
  verdict: 'acceptable' | 'conditional' | 'unacceptable';
  /** What was entered: the readings of a variable study, or the ratings and reference of an attribute one. */
  data: { readings: number[][][] } | { ratings: ('pass' | 'fail')[][][]; reference: ('pass' | 'fail')[] | null };
  result: unknown;
  recordedBy: string;
  recordedAt: string;
  /** Quality's signature approving the study as a record; null until then. */
  approval: { printedName: string; meaning: string; reason: string; signedAt: string } | null;
};

export const approveStudyBody = z.strictObject({
  reason: text('Say why.').trim().min(5, 'Say why, in at least 5 characters.').max(500, 'At most 500 characters.'),
  password: enteredPassword('Enter your password to sign.'),
});
export type ApproveStudyBody = z.output<typeof approveStudyBody>;
