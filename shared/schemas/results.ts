import { z } from 'zod';
import { decimal, id, isoDateTime, text } from './common.js';
import type { EvaluatedReading, FormCharacteristic } from '../domain/evaluate.js';
import type { Verdict } from '../domain/tolerance.js';
import type { RuleShape } from '../documents/format.js';
import type { AttachmentJson } from './attachments.js';
import type { ItemJson } from './items.js';
import { sizeClassCode } from './spec.js';

/** The size class a station chose for a characteristic, kept with the result. */
export type ChosenSizeClass = { code: string; name: string; ruleId: number };

/** Station results: what a tablet sends for one pass of a part through a stage, and the replies. */

export const readingInput = z.strictObject({
  characteristic: text().trim().min(1, 'Name the characteristic.').max(40),
  position: text().trim().max(40).default(''),
  // JSON has no NaN; 1e999 parses to Infinity, which z.number() refuses; stored as numeric(14, 6)
  value: decimal(14, 6, 'Enter a number.').optional(),
  passed: z.boolean('Choose pass or fail.').optional(),
  /** The unit the value was typed in; another unit of the characteristic's quantity is converted. */
  unit: text().trim().max(20).optional(),
  location: text().trim().max(200, 'At most 200 characters.').optional(),
});
export type ReadingInput = z.output<typeof readingInput>;

export const submitResultBody = z.strictObject({
  idempotencyKey: z.uuid('Send a UUID as the idempotency key.'),
  serial: text().trim().min(1, 'Scan or type a serial.').max(24),
  station: text().trim().min(1, 'Choose the station.').max(20),
  gauge: text().trim().max(30).nullable().default(null),
  /** A gauge per measured characteristic where it differs from \`gauge\` (the profilometer for a finish). */
  gauges: z.record(text().trim().max(40), text().trim().min(1).max(30)).default({}),
  startedAt: isoDateTime().nullable().default(null),
  /** When the operator recorded it on the tablet: a result queued with no network arrives later. */
  takenAt: isoDateTime().nullish(),
  notes: text().trim().max(2000, 'At most 2000 characters.').default(''),
  readings: z.array(readingInput).min(1, 'Record at least one reading.').max(2000),
  photoIds: z.array(id()).max(10, 'At most 10 photos.').default([]),
  /** The size class chosen per characteristic that has classes (the bore's oversize …): code → class. */
  sizeClasses: z.record(text().trim().min(1).max(40), sizeClassCode).default({}),
});
export type SubmitResultBody = z.output<typeof submitResultBody>;

/** A correction: a whole new result for the same part and stage, superseding the current one. */
export const correctResultBody = submitResultBody.extend({
  reason: text().trim().min(5, 'Say why, in at least 5 characters.').max(500, 'At most 500 characters.'),
});
export type CorrectResultBody = z.output<typeof correctResultBody>;

export const stationFormQuery = z.strictObject({ serial: text().trim().min(1).max(24) });
export const stationParam = z.strictObject({ code: text().trim().min(1).max(20) });

export const reentryBody = z.strictObject({
  stage: text().trim().min(1, 'Choose the stage.').max(40),
  reason: text().trim().min(5, 'Say why, in at least 5 characters.').max(500, 'At most 500 characters.'),
});

/** Why a part can or cannot be recorded at a station now. */
export type SequenceCheck =
  | { ok: true; code: 'ready' | 'reentry'; message: string }
  | {
      ok: false;
      code: 'out_of_sequence' | 'on_hold' | 'finished' | 'wrong_part' | 'scrapped' | 'not_on_route';
      message: string;
      expectedStage: { code: string; name: string } | null;
    };

export type GaugeChoice = {
  code: string;
  description: string;
  unit: string | null;
  resolution: number | null;
  rangeLow: number | null;
  rangeHigh: number | null;
  calibrationDueOn: string | null;
  usable: boolean;
  why: string;
  /** Measured characteristics of this form the gauge cannot read, with the reason (unit, range, resolution). */
  unfit: Record<string, string>;
  /** Its last gauge study was unacceptable: offered, but flagged. */
  studyFailed: boolean;
};

export type HoldJson = { number: string; state: string; description: string };

export type StationFormJson = {
  station: { code: string; name: string; location: string };
  /** `runTest`: the unit's run test, whose readings may come from the test stand's CSV. */
  stage: { code: string; name: string; hazard: string | null; description: string; runTest: boolean };
  item: ItemJson;
  sequence: SequenceCheck;
  holds: HoldJson[];
  characteristics: (FormCharacteristic & { help: string })[];
  gauges: GaugeChoice[];
  /** The current result at this stage, for a correction. */
  currentResult: { id: number; verdict: Verdict; finishedAt: string; operator: string } | null;
  /** Why the part is here again: quality sent it back to this stage by a rework or repair. */
  rework: { number: string; disposition: string; reason: string } | null;
};

/**
 * One stored reading, as the history screens show it (the trail, an item's results, a claim's
 * build record), with the limits of the rule version it was judged by. The one declaration of a
 * reading's shape; the station's reply below takes its names from it.
 */
export type RecordedReading = {
  characteristic: string;
  name: string;
  kind: 'variable' | 'attribute' | 'derived';
  position: string;
  positionLabel: string;
  value: number | null;
  passed: boolean | null;
  unit: string | null;
  /** What the operator typed, when it was in another unit of the same quantity (value and rounded are in `unit`). */
  entered: { value: number; unit: string } | null;
  verdict: Verdict;
  ruleId: number | null;
  ruleVersion: number | null;
  lower: number | null;
  upper: number | null;
  /** The rule version's limits and resolution as written, for printed documents. */
  rule: RuleShape | null;
  location: string | null;
  /** The gauge this reading was taken with (a characteristic may be read with its own). */
  gauge: string | null;
};

/** A reading as the station judged it (verdict null while a reading it needs is missing), with its names. */
export type ReadingJson = EvaluatedReading &
  Pick<RecordedReading, 'name' | 'positionLabel' | 'unit' | 'entered' | 'kind' | 'location'>;

export type ResultJson = {
  id: number;
  serial: string;
  stage: { code: string; name: string };
  station: { code: string; name: string } | null;
  operator: string;
  gauge: string | null;
  verdict: Verdict;
  finishedAt: string;
  /** When it was taken on the tablet, where that is known; \`finishedAt\` is when the server stored it. */
  takenAt: string | null;
  notes: string;
  readings: ReadingJson[];
  /** The size class chosen per characteristic code, where the rule has classes. */
  sizeClasses: Record<string, ChosenSizeClass>;
  failing: ReadingJson[];
  nonconformance: { number: string; severity: string } | null;
  supersedes: number | null;
  correctionReason: string | null;
  reentryReason: string | null;
  photos: AttachmentJson[];
  /** Where the part stands after this result. */
  item: { status: string; currentStage: { code: string; name: string } | null };
};
