import { z } from 'zod';
import type { Capability, ChartKind, Histogram, NormalityCheck, RunRule } from '../domain/spc/index.js';
import { RUN_RULE_TEXT } from '../domain/spc/run-rules.js';
import type { RuleLimits } from './spec.js';

/**
 * Statistical process control on critical characteristics: control charts over a period, limits
 * frozen from a baseline, run-rule signals, capability, and rehearsing a draft rule over stored
 * readings before it is signed.
 */

export { RUN_RULE_TEXT };

/** How readings are grouped on a chart; `auto` picks part means for a characteristic read at several
 * positions on a part, individuals for one reading per part. */
export const CHART_METHODS = ['auto', 'part-means', 'xbar-r', 'xbar-s', 'i-mr'] as const;
export type ChartMethodChoice = (typeof CHART_METHODS)[number];
export type ChartMethod = Exclude<ChartMethodChoice, 'auto'>;

export const CHART_METHOD_LABELS: Record<ChartMethod, string> = {
  'part-means': 'Part means and within-part spread',
  'xbar-r': 'X̄–R',
  'xbar-s': 'X̄–S',
  'i-mr': 'Individuals and moving range',
};

export const CHART_KIND_LABELS: Record<ChartKind, string> = {
  xbar: 'Subgroup mean (X̄)',
  range: 'Subgroup range (R)',
  s: 'Subgroup standard deviation (s)',
  individuals: 'Individual readings',
  'moving-range': 'Moving range',
  'part-mean': 'Part mean',
  'part-moving-range': 'Moving range of part means',
  'within-range': 'Range within a part',
  'within-s': 'Standard deviation within a part',
};

/** The longest period a chart, capability or rehearsal reads at once. */
export const MAX_PERIOD_DAYS = 1100;

/** A day (`2026-12-01`, the whole UTC day) or an instant with its offset. */
const when = (what: string) =>
  z.union([z.iso.date(), z.iso.datetime({ offset: true })], `Use a date like 2026-12-01 for the ${what}.`);

/** `from` as the start of its day, `to` as the end of its day when a bare date is given. */
export function periodBounds(from: string, to: string): { from: Date; to: Date } {
  const start = new Date(from.length === 10 ? `${from}T00:00:00Z` : from);
  const end = new Date(to.length === 10 ? `${to}T00:00:00Z` : to);
  if (to.length === 10) end.setUTCDate(end.getUTCDate() + 1);
  return { from: start, to: end };
}

const checkPeriod = (
  r: { from: string; to: string; baselineFrom?: string; baselineTo?: string },
  ctx: z.RefinementCtx,
) => {
  const { from, to } = periodBounds(r.from, r.to);
  if (!(from < to)) ctx.addIssue({ code: 'custom', path: ['to'], message: 'The period must end after it starts.' });
  else if (to.getTime() - from.getTime() > MAX_PERIOD_DAYS * 86_400_000) {
    ctx.addIssue({ code: 'custom', path: ['to'], message: `At most ${MAX_PERIOD_DAYS} days at once.` });
  }
  if ((r.baselineFrom === undefined) !== (r.baselineTo === undefined)) {
    ctx.addIssue({ code: 'custom', path: ['baselineTo'], message: 'Give the baseline a start and an end.' });
  } else if (r.baselineFrom && r.baselineTo) {
    const b = periodBounds(r.baselineFrom, r.baselineTo);
    if (!(b.from < b.to)) {
      ctx.addIssue({ code: 'custom', path: ['baselineTo'], message: 'The baseline must end after it starts.' });
    }
  }
};

const scope = {
  family: z.string().trim().min(1).max(20),
  characteristicId: z.coerce.number().int().positive(),
  from: when('start'),
  to: when('end'),
  /** A station code: only results recorded there. */
  station: z.string().trim().min(1).max(20).optional(),
  /** A gauge code: only readings taken with it. */
  gauge: z.string().trim().min(1).max(30).optional(),
};

export const spcChartQuery = z
  .strictObject({
    ...scope,
    chart: z.enum(CHART_METHODS, 'Choose a chart.').default('auto'),
    /** Consecutive parts per subgroup, for an X̄ chart of a characteristic read once per part. */
    subgroup: z.coerce.number().int().min(2, 'At least 2.').max(25, 'At most 25.').optional(),
    baselineFrom: when('baseline start').optional(),
    baselineTo: when('baseline end').optional(),
    /** `trial` ignores frozen limits and computes them from the baseline. */
    limits: z.enum(['frozen', 'trial']).default('frozen'),
  })
  .superRefine(checkPeriod);
export type SpcChartQuery = z.output<typeof spcChartQuery>;

export const spcCapabilityQuery = z.strictObject(scope).superRefine(checkPeriod);
export type SpcCapabilityQuery = z.output<typeof spcCapabilityQuery>;

export const freezeLimitsBody = z
  .strictObject({
    family: z.string().trim().min(1).max(20),
    characteristicId: z.number().int().positive(),
    /** Limits for one station's results; every station's when left out. */
    station: z.string().trim().min(1).max(20).nullable().default(null),
    chart: z.enum(CHART_METHODS, 'Choose a chart.').default('auto'),
    baselineFrom: when('baseline start'),
    baselineTo: when('baseline end'),
    reason: z
      .string('Say why.')
      .trim()
      .min(5, 'Say why, in at least 5 characters.')
      .max(500, 'At most 500 characters.'),
    /** Put a part on hold (an NCR) when its result breaks a run rule. */
    holdOnSignal: z.boolean().default(false),
  })
  .superRefine((r, ctx) => checkPeriod({ from: r.baselineFrom, to: r.baselineTo }, ctx));
export type FreezeLimitsBody = z.output<typeof freezeLimitsBody>;

export const limitsListQuery = z.strictObject({
  family: z.string().trim().min(1).max(20),
  characteristicId: z.coerce.number().int().positive(),
});

export const signalsQuery = z.strictObject({
  family: z.string().trim().min(1).max(20),
  characteristicId: z.coerce.number().int().positive(),
  from: when('start').optional(),
  to: when('end').optional(),
});

export const holdSignalBody = z.strictObject({
  reason: z.string('Say why.').trim().min(5, 'Say why, in at least 5 characters.').max(500, 'At most 500 characters.'),
});

export const rehearseBody = z
  .strictObject({
    from: when('start'),
    to: when('end'),
    station: z.string().trim().min(1).max(20).optional(),
    gauge: z.string().trim().min(1).max(30).optional(),
  })
  .superRefine(checkPeriod);
export type RehearseBody = z.output<typeof rehearseBody>;

/** The stored limits object: the baseline's statistics, from which the lines are drawn. */
const finite = z.number().refine(Number.isFinite);
export const chartLimitsSchema = z.discriminatedUnion('method', [
  z.strictObject({
    method: z.literal('xbar-r'),
    n: z.number().int().min(2).max(10),
    baselineCount: z.number().int().min(2),
    grandMean: finite,
    rBar: finite.nonnegative(),
  }),
  z.strictObject({
    method: z.literal('xbar-s'),
    n: z.number().int().min(2),
    baselineCount: z.number().int().min(2),
    grandMean: finite,
    sBar: finite.nonnegative(),
  }),
  z.strictObject({
    method: z.literal('i-mr'),
    baselineCount: z.number().int().min(2),
    mean: finite,
    mrBar: finite.nonnegative(),
  }),
  z.strictObject({
    method: z.literal('part-means'),
    n: z.number().int().min(2),
    baselineCount: z.number().int().min(2),
    mean: finite,
    mrBar: finite.nonnegative(),
    within: z.enum(['range', 's']),
    withinBar: finite.nonnegative(),
  }),
]);

// ——— replies ———

export type SpecLimitsJson = { lower: number | null; upper: number | null; ruleVersion: number; unit: string | null };

export type FrozenLimitsJson = {
  id: number;
  family: string;
  characteristicId: number;
  station: string | null;
  method: ChartMethod;
  limits: z.output<typeof chartLimitsSchema>;
  /** The lines the limits draw on the location chart, for reading at a glance. */
  centre: number;
  lower: number;
  upper: number;
  sigmaWithin: number;
  baselineFrom: string;
  baselineTo: string;
  baselinePoints: number;
  reason: string;
  holdOnSignal: boolean;
  frozenBy: string;
  frozenAt: string;
  supersededAt: string | null;
};

export type ChartLineJson = {
  kind: ChartKind;
  label: string;
  centre: number;
  lower: number;
  upper: number;
  sigma: number;
  rules: RunRule[];
  /** One value per point of the chart, aligned with `points`; null where the chart has none (the first moving range). */
  values: (number | null)[];
};

export type SignalJson = {
  index: number;
  chart: ChartKind;
  rule: RunRule;
  text: string;
  serial: string;
  at: string;
  value: number;
};

export type ChartPointJson = { resultId: number; serial: string; at: string; station: string | null };

export type SpcChartJson = {
  family: { id: number; code: string; name: string };
  characteristic: { id: number; code: string; name: string; unit: string | null; stage: string };
  period: { from: string; to: string };
  station: string | null;
  gauge: string | null;
  method: ChartMethod;
  /** Readings per point (positions on a part, or parts per subgroup). */
  subgroupSize: number;
  /** Each point: the part (or the last part of a subgroup of parts). */
  points: ChartPointJson[];
  /** Points in the baseline: inclusive indices. */
  baseline: { from: number; to: number } | null;
  charts: ChartLineJson[];
  signals: SignalJson[];
  limits:
    | { source: 'frozen'; frozen: FrozenLimitsJson }
    | { source: 'trial'; baselineFrom: string | null; baselineTo: string | null }
    | null;
  /** Frozen limits on record that this chart could not use (another chart, subgroup size or station). */
  frozenElsewhere: FrozenLimitsJson | null;
  spec: SpecLimitsJson | null;
  readings: number;
  capability: Capability | null;
  normality: NormalityCheck | null;
  histogram: Histogram | null;
  /** Plain-language notes: parts left out, why no limits could be drawn, and the like. */
  notes: string[];
};

export type CapabilityRowJson = {
  station: string | null;
  gauge: string | null;
  parts: number;
  readings: number;
  mean: number | null;
  sigmaWithin: number | null;
  cp: number | null;
  cpk: number | null;
  cpkLower: number | null;
  cpkUpper: number | null;
  pp: number | null;
  ppk: number | null;
  normal: boolean | null;
  pValue: number | null;
  note: string | null;
};

export type SpcCapabilityJson = {
  family: { id: number; code: string; name: string };
  characteristic: { id: number; code: string; name: string; unit: string | null };
  period: { from: string; to: string };
  spec: SpecLimitsJson | null;
  /** Every station and gauge together first, then one row per station and gauge. */
  rows: CapabilityRowJson[];
};

export type StoredSignalJson = {
  id: number;
  serial: string;
  resultId: number;
  at: string;
  station: string | null;
  chart: ChartKind;
  chartLabel: string;
  rule: RunRule;
  text: string;
  value: number;
  centre: number;
  lower: number;
  upper: number;
  limitsId: number;
  ncr: string | null;
  heldBy: string | null;
  heldAt: string | null;
};

export type RehearsalIndices = {
  cp: number | null;
  cpk: number | null;
  cpkLower: number | null;
  cpkUpper: number | null;
  ppk: number | null;
};

export type RehearsalPartJson = {
  serial: string;
  itemId: number;
  at: string;
  flip: 'pass-to-fail' | 'fail-to-pass';
  failingPositions: string[];
};

export type ShippedUnitJson = {
  unit: string;
  part: string;
  shipDate: string | null;
  reference: string;
  customer: string | null;
};

export type RehearsalSummary = {
  period: { from: string; to: string };
  station: string | null;
  gauge: string | null;
  /** The version in force the draft is compared with. */
  current: { version: number; lower: number | null; upper: number | null } | null;
  draft: { version: number; lower: number | null; upper: number | null; resolution: number | null };
  counts: {
    parts: number;
    readings: number;
    skipped: number;
    partsPassToFail: number;
    partsFailToPass: number;
    partsFailingBefore: number;
    partsFailingAfter: number;
    readingsPassToFail: number;
    readingsFailToPass: number;
    shippedUnits: number;
  };
  before: RehearsalIndices | null;
  after: RehearsalIndices | null;
  sigmaWithin: number | null;
  /** Where σ within came from: the frozen limits, or the rehearsed readings themselves. */
  sigmaSource: 'frozen limits' | 'readings' | null;
  /** Parts whose verdict would change, oldest first (at most LIST_LIMIT). */
  parts: RehearsalPartJson[];
  /** Shipped units that hold a part that would now fail (at most LIST_LIMIT). */
  shipped: ShippedUnitJson[];
  truncated: boolean;
};

/** What a rehearsal judged with: the draft's limits and resolution (its source note changes no verdict). */
export type RehearsedLimits = Omit<RuleLimits, 'sourceNote' | 'sizeClasses'>;

export const REHEARSAL_LIST_LIMIT = 500;

export type RehearsalJson = {
  id: number;
  ruleId: number;
  runBy: string;
  runAt: string;
  /** The draft changed after this rehearsal: rehearse again before approving. */
  stale: boolean;
  keptWithApprovalAt: string | null;
  summary: RehearsalSummary;
};
