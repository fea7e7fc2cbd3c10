import { z } from 'zod';
import { enteredPassword } from './auth.js';
import { text, isoDate, id } from './common.js';
import { sizeClassCode } from './spec.js';
import type { ChosenSizeClass, RecordedReading } from './results.js';
import type { FieldActionJson } from './field-actions.js';
import type { NcrSignature, NcrState, NcrTimelineEntry } from './ncr.js';
import type { ItemJson } from './items.js';
import type { AttachmentJson } from './attachments.js';

/** Building a long block, the release gate, shipping, the trail and lot lookup. */

/** Pistons fit a block when the bores' mean oversize is within this of theirs, in inches (common practice). */
export const OVERSIZE_MATCH_IN = 0.002;

/** The purchased parts every long block takes, each from a supplier's lot. */
export const LOT_KINDS = [
  'pistons',
  'rings',
  'main_bearings',
  'rod_bearings',
  'gasket_set',
  'camshaft',
  'lifters',
  'oil_pump',
  'timing_set',
] as const;
export type LotKind = (typeof LOT_KINDS)[number];
/** Purchased parts made in size classes, matched at build to the class a part was finished to. */
export const SIZED_LOT_KINDS: readonly LotKind[] = ['pistons', 'main_bearings', 'rod_bearings'];
export const LOT_KIND_LABELS: Record<LotKind, string> = {
  pistons: 'Pistons',
  rings: 'Piston rings',
  main_bearings: 'Main bearings',
  rod_bearings: 'Rod bearings',
  gasket_set: 'Gasket set',
  camshaft: 'Camshaft',
  lifters: 'Lifters',
  oil_pump: 'Oil pump',
  timing_set: 'Timing set',
};

const code = (what: string, max = 60) =>
  text(`Enter the ${what}.`)
    .trim()
    .min(1, `Enter the ${what}.`)
    .max(max, `At most ${max} characters.`)
    .regex(/^[A-Za-z0-9][A-Za-z0-9 ./_-]*$/, 'Use letters, digits, spaces, dots, dashes or slashes.');

export const lotInput = z.strictObject({
  kind: z.enum(LOT_KINDS, 'Choose what the lot is.'),
  supplierId: id('Choose the supplier.'),
  partNumber: code('part number'),
  lotCode: code('lot code'),
  quantity: z.number().int().min(1).max(64).default(1),
  /** Pistons only: how far over the standard bore they are made, in inches (0.030 for "+.030"). */
  oversizeIn: z.number('Enter the oversize in inches (0 for standard).').min(0).max(0.2).optional(),
  /** The size class of the parts (pistons' oversize, bearings' undersize), matched to the part's at build. */
  /** Left empty ('') when the parts come in one size. */
  sizeClass: z.union([z.literal(''), sizeClassCode]).optional(),
});
export type LotInput = z.output<typeof lotInput>;

const serial = (what: string) => text(`Scan the ${what}.`).trim().min(1, `Scan the ${what}.`).max(24);

export const buildBody = z
  .strictObject({
    family: text('Choose the engine family.').trim().min(1).max(20),
    block: serial('block'),
    crankshaft: serial('crankshaft'),
    heads: z.array(serial('cylinder head')).min(1, 'Scan the cylinder head(s).').max(2),
    lots: z.array(lotInput).max(20),
    notes: text().trim().max(2000).default(''),
  })
  .superRefine((b, ctx) => {
    const kinds = new Set(b.lots.map((l) => l.kind));
    const missing = LOT_KINDS.filter((k) => !kinds.has(k));
    if (missing.length) {
      ctx.addIssue({
        code: 'custom',
        path: ['lots'],
        message: `Record the lots of: ${missing.map((k) => LOT_KIND_LABELS[k].toLowerCase()).join(', ')}.`,
      });
    }
    b.lots.forEach((l, i) => {
      if (l.kind === 'pistons' && l.oversizeIn === undefined) {
        ctx.addIssue({ code: 'custom', path: ['lots', i, 'oversizeIn'], message: 'Enter the pistons’ oversize.' });
      }
    });
    if (new Set(b.heads).size !== b.heads.length) {
      ctx.addIssue({ code: 'custom', path: ['heads'], message: 'Each head is scanned once.' });
    }
  });
export type BuildBody = z.output<typeof buildBody>;

/** Release is a signed act: the shipper's password, checked again, with the meaning "released for shipment". */
export const releaseBody = z.strictObject({
  customerId: id('Choose the customer.'),
  reference: text('Enter the order reference.').trim().min(1, 'Enter the order reference.').max(60),
  shipDate: isoDate('Use a date like 2026-12-02.'),
  carrier: text().trim().max(80).default(''),
  password: enteredPassword('Enter your password to sign the release.'),
});
export const RELEASE_MEANING = 'Released for shipment';

/** Take a part out of a built unit and fit another in its place. */
export const replacePartBody = z.strictObject({
  remove: serial('part to take out'),
  fit: serial('part to fit'),
  reason: text('Say why the part is replaced.')
    .trim()
    .min(5, 'Say why the part is replaced, in at least 5 characters.')
    .max(300, 'At most 300 characters.'),
});
export type ReplacePartBody = z.output<typeof replacePartBody>;
export type ReleaseBody = z.output<typeof releaseBody>;

export const lotCodeParam = z.strictObject({ lotCode: text().trim().min(1).max(60) });

/** Which paper a printed document is laid out for. */
export const paperQuery = z.strictObject({ paper: z.enum(['a4', 'letter']).default('a4') });

export const runCsvBody = z.strictObject({
  csv: text('Attach the test stand export.').min(1, 'The file is empty.').max(200_000, 'At most 200 kB.'),
});

export type BlockingReason = {
  code:
    | 'stage_missing'
    | 'stage_failed'
    | 'ncr_open'
    | 'lot_ncr_open'
    | 'run_test'
    | 'not_finished'
    | 'shipped'
    | 'returned'
    | 'part_scrapped'
    | 'part_on_hold'
    | 'lot_unusable';
  message: string;
  serial: string | null;
  link: string;
};

export type ReleaseCheckJson = {
  serial: string;
  releasable: boolean;
  reasons: BlockingReason[];
  /** Every check that was made, passed or not, for the checklist. */
  checks: { label: string; ok: boolean; link: string | null }[];
};

export type WarrantyJson = {
  months: number;
  km: number | null;
  startsOn: string;
  endsOn: string;
  inWarranty: boolean;
  daysLeft: number;
  /** The cover in words: until when, and up to what distance. */
  reason: string;
};

export type ShipmentJson = {
  customer: { code: string; name: string } | null;
  reference: string;
  carrier: string | null;
  shipDate: string;
  releasedBy: string;
  releasedAt: string;
  warranty: WarrantyJson;
};

export type TrailNode = {
  serial: string;
  kind: string;
  kindLabel: string;
  status: string;
  positionLabel: string | null;
  familyCode: string;
  /** How it is joined to its parent in the tree: harvested from a core, installed in a unit. */
  link: 'harvested_from' | 'installed_in' | null;
  /** For a part in a unit: when it was fitted, and when and why it was taken out again (if it was). */
  fittedAt: string | null;
  removedAt: string | null;
  removedReason: string | null;
  children: TrailNode[];
};

/** A reading on the trail: the stored reading without what only the station's forms use. */
export type TrailReading = Omit<RecordedReading, 'kind' | 'ruleId'>;

export type TrailResult = {
  id: number;
  serial: string;
  stage: { code: string; name: string };
  station: string | null;
  operator: string;
  gauge: string | null;
  verdict: 'pass' | 'fail';
  finishedAt: string;
  supersedes: number | null;
  supersededBy: number | null;
  correctionReason: string | null;
  reentryReason: string | null;
  /** The size class the station chose per characteristic code. */
  sizeClasses: Record<string, ChosenSizeClass>;
  readings: TrailReading[];
  photos: AttachmentJson[];
};

export type TrailNcr = {
  number: string;
  serial: string | null;
  lotCode: string | null;
  state: NcrState;
  severity: string;
  description: string;
  disposition: string | null;
  dispositionReason: string | null;
  raisedAt: string;
  timeline: NcrTimelineEntry[];
  signatures: NcrSignature[];
};

export type TrailLot = {
  kind: string;
  supplier: string;
  partNumber: string;
  lotCode: string;
  quantity: number;
  attributes: Record<string, unknown>;
  /** The lot's size class, and the part and class it was matched to at build. */
  sizeClass: string | null;
  matchedTo: string | null;
};

export type TrailJson = {
  item: ItemJson;
  /** The unit at the top of the tree (or the item itself when it is in none). */
  tree: TrailNode;
  lots: TrailLot[];
  results: TrailResult[];
  ncrs: TrailNcr[];
  shipment: ShipmentJson | null;
  warranty: WarrantyJson | null;
  /** Problems found after the unit shipped, open or decided. */
  fieldActions: FieldActionJson[];
  /** Where this was read and how old it may be. */
  readFrom: Freshness;
};

/**
 * Where a read-only page's data came from: the primary, or a hot standby that may be `lagSeconds`
 * behind it (0 when it has replayed everything it received).
 */
export type Freshness = { source: 'primary' | 'standby'; lagSeconds: number; asOf: string };

export type LotLookupJson = {
  lotCode: string;
  readFrom: Freshness;
  lots: {
    kind: string;
    supplier: string;
    partNumber: string;
    lotCode: string;
    status: string;
    units: {
      serial: string;
      family: string;
      status: string;
      installedAt: string;
      shipDate: string | null;
      customer: string | null;
    }[];
  }[];
};
