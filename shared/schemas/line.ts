import { z } from 'zod';
import { idText, isoDate, text } from './common.js';
import { PART_KINDS } from './reference.js';
import type { Freshness } from './trail.js';

/** Where a part stands at its current stage on the work-in-process board. */
export const WIP_STATES = ['waiting', 'in_work', 'on_hold'] as const;
export type WipState = (typeof WIP_STATES)[number];

export const wipQuery = z.strictObject({
  family: idText().optional(),
  kind: z.enum(PART_KINDS).optional(),
  stage: text().trim().max(40).optional(),
  station: text().trim().max(20).optional(),
  /** part of a serial, as typed off a tag */
  serial: text().trim().min(2).max(40).optional(),
  /** how many of the oldest parts to send per stage (20 unless asked) */
  perStage: z.coerce.number().int().min(1).max(500).optional(),
});
export type WipQuery = z.output<typeof wipQuery>;

export type WipItem = {
  serial: string;
  kind: string;
  familyCode: string;
  stageCode: string;
  stageName: string;
  state: WipState;
  /** Hours since it reached this stage (or, on hold, since the hold began). */
  ageHours: number;
  ncr: string | null;
};

export type WipStageRow = {
  stageCode: string;
  stageName: string;
  partKind: string;
  stations: string[];
  waiting: number;
  inWork: number;
  onHold: number;
  oldestHours: number | null;
};

export type ThroughputRow = { day: string; shift: number; stageCode: string; passed: number; failed: number };

export type WipJson = {
  /** where it was read and how old it may be */
  readFrom: Freshness;
  asOf: string;
  stages: WipStageRow[];
  /** The oldest `perStage` parts at each stage, oldest first. */
  items: WipItem[];
  /** Every part that matches, of which `items` are the oldest per stage. */
  itemCount: number;
  perStage: number;
  /** Holds by age: under a day, 1–3 days, 3–7 days, over a week. */
  holdAges: { label: string; count: number }[];
  /** The last 7 plant days, per shift (1: 06–14, 2: 14–22, 3: 22–06 in the plant's time zone). */
  throughput: ThroughputRow[];
};

export type ShipRow = {
  serial: string;
  familyCode: string;
  status: string;
  stageName: string | null;
  ageHours: number;
  releasable: boolean;
  reasons: { message: string; link: string | null }[];
};
export type ShippingJson = { ready: ShipRow[]; blocked: ShipRow[]; more: boolean };

export type TeardownQueueRow = {
  serial: string;
  familyCode: string;
  castingNumber: string;
  source: string;
  sourceReference: string | null;
  receivedOn: string;
  ageDays: number;
};

export type NcrAgeJson = {
  buckets: { label: string; count: number }[];
  oldest: {
    number: string;
    serial: string | null;
    lotCode: string | null;
    state: string;
    ageDays: number;
    description: string;
  }[];
};

export type AlertJson = {
  kind: 'ncr_overdue' | 'hold_old';
  message: string;
  link: string;
  ageHours: number;
};
export type AlertsJson = { ncrOverdueDays: number; holdAlertHours: number; alerts: AlertJson[]; total: number };

export const searchQuery = z.strictObject({
  q: text().trim().min(2, 'Type at least two characters.').max(60, 'At most 60 characters.'),
});
export type SearchQuery = z.output<typeof searchQuery>;

export const SEARCH_KINDS = ['item', 'lot', 'ncr', 'shipment', 'core'] as const;
export type SearchKind = (typeof SEARCH_KINDS)[number];
export type SearchHit = { kind: SearchKind; title: string; detail: string; link: string };
export type SearchJson = {
  q: string;
  /** where it was read and how old it may be */
  readFrom: Freshness;
  groups: { kind: SearchKind; label: string; hits: SearchHit[]; more: boolean }[];
};

export const GRAINS = ['week', 'month'] as const;
export type Grain = (typeof GRAINS)[number];

const period = {
  from: isoDate(),
  to: isoDate(),
  family: idText().optional(),
};
const inOrder = (q: { from: string; to: string }) => q.from <= q.to;
const ORDER = { message: 'The period must start on or before its end.', path: ['to'] };

export const yieldQuery = z.strictObject(period).refine(inOrder, ORDER);
export type YieldQuery = z.output<typeof yieldQuery>;

export const PARETO_BY = ['defect', 'stage', 'family'] as const;
export type ParetoBy = (typeof PARETO_BY)[number];
export const paretoQuery = z
  .strictObject({ ...period, by: z.enum(PARETO_BY).default('defect'), grain: z.enum(GRAINS).default('month') })
  .refine(inOrder, ORDER);
export type ParetoQuery = z.output<typeof paretoQuery>;

export type FpyRow = {
  stageCode: string;
  stageName: string;
  station: string | null;
  entered: number;
  firstPass: number;
};
export type RtyRow = {
  familyCode: string;
  stages: { stageCode: string; entered: number; firstPass: number }[];
  rty: number | null;
};
/** Salvage = (parts kept at teardown − those scrapped later) / (parts kept + parts scrapped at teardown). */
export type SalvageRow = {
  source: string;
  castingNumber: string;
  cores: number;
  kept: number;
  scrappedAtTeardown: number;
  scrappedLater: number;
  salvageRate: number | null;
};
export type YieldJson = {
  /** where it was read and how old it may be */
  readFrom: Freshness;
  from: string;
  to: string;
  byStage: FpyRow[];
  byStation: FpyRow[];
  byFamily: RtyRow[];
  losses: { scrapped: number; reworked: number; usedAsIs: number; returned: number };
  salvage: SalvageRow[];
};

export type ParetoJson = {
  /** where it was read and how old it may be */
  readFrom: Freshness;
  from: string;
  to: string;
  by: ParetoBy;
  grain: Grain;
  /** Most first; cumulative share in per cent. */
  rows: { key: string; label: string; count: number; cumulativePct: number }[];
  /** Counts per period (the first day of the week or month) and key. */
  periods: { period: string; key: string; count: number }[];
  total: number;
};
