import { z } from 'zod';
import { text } from './common.js';
import type { ChosenSizeClass, RecordedReading } from './results.js';
import type { FieldActionJson } from './field-actions.js';
import type { NcrSignature, NcrState, NcrTimelineEntry } from './ncr.js';
import type { ItemJson } from './items.js';
import type { AttachmentJson } from './attachments.js';
import type { ShipmentJson, WarrantyJson } from './release.js';

/** The trail of a part or unit (its tree, lots, results, NCRs and shipment) and the lookup of a lot. */

export const lotCodeParam = z.strictObject({ lotCode: text().trim().min(1).max(60) });

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
