import { z } from 'zod';
import type { AttachmentJson } from './attachments.js';
import { LOT_KIND_LABELS, LOT_KINDS, type LotKind } from './build.js';
import { id, idText, isoDate, paging, text } from './common.js';

/** Purchased lots as receiving logs them: what came in, its certificate, its inspection, what is left. */

/** Receiving inspection of a lot. Only an accepted lot can go into a unit. */
export const INSPECTION_STATES = ['pending', 'accepted', 'on_hold', 'refused'] as const;
export type InspectionState = (typeof INSPECTION_STATES)[number];
export const INSPECTION_LABELS: Record<InspectionState, string> = {
  pending: 'Waiting for inspection',
  accepted: 'Accepted',
  on_hold: 'On hold',
  refused: 'Refused',
};

const code = (what: string, max = 60) =>
  text(`Enter the ${what}.`)
    .trim()
    .min(1, `Enter the ${what}.`)
    .max(max, `At most ${max} characters.`)
    .regex(/^[A-Za-z0-9][A-Za-z0-9 ./_-]*$/, 'Use letters, digits, spaces, dots, dashes or slashes.')
    .transform((s) => s.toUpperCase());

const reason = (what: string) =>
  text(`Say why ${what}.`)
    .trim()
    .min(5, `Say why ${what}, in at least 5 characters.`)
    .max(500, 'At most 500 characters.');

export const receiveLotBody = z
  .strictObject({
    supplierId: id('Choose the supplier.'),
    kind: z.enum(LOT_KINDS, 'Choose what the lot is.'),
    partNumber: code('part number'),
    lotCode: code('lot code'),
    description: text().trim().max(200, 'At most 200 characters.').default(''),
    quantity: z
      .number('Enter how many parts came in.')
      .int('Use a whole number.')
      .min(1, 'At least 1.')
      .max(1_000_000, 'At most 1 000 000.'),
    receivedOn: isoDate(),
    /** Pistons only: how far over the standard bore they are made, in inches (0.030 for "+.030"). */
    oversizeIn: z.number('Enter the oversize in inches (0 for standard).').min(0).max(0.2).optional(),
    inspection: z.enum(INSPECTION_STATES, 'Choose the inspection state.').default('pending'),
    reason: text().trim().max(500, 'At most 500 characters.').default(''),
    /** The supplier's certificate of conformance, uploaded first (POST /api/receiving/certificates). */
    certificateAttachmentId: id('Upload the certificate again.').nullable().default(null),
  })
  .superRefine((b, ctx) => {
    if ((b.inspection === 'on_hold' || b.inspection === 'refused') && b.reason.length < 5) {
      ctx.addIssue({
        code: 'custom',
        path: ['reason'],
        message: `Say why the lot is ${b.inspection === 'refused' ? 'refused' : 'on hold'}, in at least 5 characters.`,
      });
    }
    if (b.oversizeIn !== undefined && b.kind !== 'pistons') {
      ctx.addIssue({ code: 'custom', path: ['oversizeIn'], message: 'Only pistons have an oversize.' });
    }
  });
export type ReceiveLotBody = z.output<typeof receiveLotBody>;

export const inspectionBody = z.strictObject({
  inspection: z.enum(INSPECTION_STATES, 'Choose the inspection state.'),
  reason: reason('the inspection changes'),
});
export type InspectionBody = z.output<typeof inspectionBody>;

export const lotIdParam = z.strictObject({ id: idText() });

export const lotListQuery = z.strictObject({
  /** Part of a lot code or part number. */
  q: text().trim().max(60).optional(),
  supplierId: idText().optional(),
  inspection: z.enum(INSPECTION_STATES).optional(),
  /** Only lots with parts left to draw. */
  available: z.enum(['true', 'false']).optional(),
  ...paging,
});
export type LotListQuery = z.output<typeof lotListQuery>;

/** Why a lot can or cannot go into a unit now, in words. */
export type Drawable = { ok: true } | { ok: false; why: string };

export type ReceivedLotJson = {
  id: number;
  supplier: { id: number; name: string };
  kind: string;
  kindLabel: string;
  partNumber: string;
  lotCode: string;
  description: string;
  quantityReceived: number;
  quantityDrawn: number;
  quantityLeft: number;
  receivedOn: string;
  receivedBy: string | null;
  inspection: InspectionState;
  inspectionReason: string | null;
  /** Set by an NCR's disposition: usable, returned or scrapped. */
  status: string;
  oversizeIn: number | null;
  certificate: AttachmentJson | null;
  /** Other part numbers (with their supplier) that carry the same lot code: a code alone is not enough. */
  sameCode: { id: number; supplier: string; partNumber: string }[];
  drawable: Drawable;
};

export type ReceivedLotDetailJson = ReceivedLotJson & {
  /** The units the lot went into, newest first. */
  draws: { unit: string; quantity: number; at: string; by: string | null }[];
};

export const kindLabel = (kind: string) => LOT_KIND_LABELS[kind as LotKind] ?? kind.replace(/_/g, ' ');
