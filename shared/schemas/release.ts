import { z } from 'zod';
import { enteredPassword } from './auth.js';
import { text, isoDate, id } from './common.js';

/** The release gate, the signed release for shipment, the shipment and its warranty, the printed papers. */

/** Release is a signed act: the shipper's password, checked again, with the meaning "released for shipment". */
export const releaseBody = z.strictObject({
  customerId: id('Choose the customer.'),
  reference: text('Enter the order reference.').trim().min(1, 'Enter the order reference.').max(60),
  shipDate: isoDate('Use a date like 2026-12-02.'),
  carrier: text().trim().max(80).default(''),
  password: enteredPassword('Enter your password to sign the release.'),
});
export const RELEASE_MEANING = 'Released for shipment';

export type ReleaseBody = z.output<typeof releaseBody>;

/** Which paper a printed document is laid out for. */
export const paperQuery = z.strictObject({ paper: z.enum(['a4', 'letter']).default('a4') });

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
