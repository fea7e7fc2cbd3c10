import { z } from 'zod';
import type { AttachmentJson } from './attachments.js';
import { id, idText, isoDate, paging, text } from './common.js';
import type { ItemJson } from './items.js';

/** Visible damage the dock checks for. */
export const DAMAGE = ['cracked', 'broken', 'seized', 'burnt', 'water_damaged'] as const;
export const DAMAGE_LABELS: Record<(typeof DAMAGE)[number], string> = {
  cracked: 'Cracked',
  broken: 'Broken',
  seized: 'Seized',
  burnt: 'Burnt',
  water_damaged: 'Water damaged',
};

/** Major parts a core should arrive with; any that are missing are ticked. */
export const CORE_PARTS = [
  'block',
  'crankshaft',
  'cylinder_heads',
  'camshaft',
  'connecting_rods',
  'oil_pan',
  'timing_cover',
] as const;
export const CORE_PART_LABELS: Record<(typeof CORE_PARTS)[number], string> = {
  block: 'Block',
  crankshaft: 'Crankshaft',
  cylinder_heads: 'Cylinder head(s)',
  camshaft: 'Camshaft',
  connecting_rods: 'Connecting rods',
  oil_pan: 'Oil pan',
  timing_cover: 'Timing cover',
};

/** Coretrail's core grades: how much of the core the dock expects to survive the line. */
export const GRADES = ['sound', 'workable', 'doubtful', 'unusable'] as const;
export const GRADE_LABELS: Record<(typeof GRADES)[number], string> = {
  sound: 'Sound — expect every major part to be reused',
  workable: 'Workable — expect machining beyond the usual',
  doubtful: 'Doubtful — some major parts likely lost',
  unusable: 'Unusable — nothing worth reusing',
};

export const CREDIT_DECISIONS = ['full', 'partial', 'none'] as const;
export const SOURCES = ['customer_return', 'purchased'] as const;

const line = (max: number) => text().trim().max(max);
const partNumber = text()
  .trim()
  .toUpperCase()
  .min(3, 'Enter the number as cast or stamped.')
  .max(40)
  .regex(/^[A-Z0-9][A-Z0-9 ./-]*$/, 'Use letters, digits, spaces, dots, dashes or slashes.');
const receivedDate = isoDate('Use a date like 2026-12-01.');

export const receiveCoreBody = z
  .strictObject({
    familyId: id(),
    castingNumber: partNumber,
    idNumber: partNumber.optional(),
    source: z.enum(SOURCES),
    customerId: id().optional(),
    supplierId: id().optional(),
    sourceReference: line(60).min(1, 'Enter the return or purchase reference.'),
    receivedOn: receivedDate,
    complete: z.boolean(),
    missing: z.array(z.enum(CORE_PARTS)).max(CORE_PARTS.length).default([]),
    damage: z.array(z.enum(DAMAGE)).max(DAMAGE.length).default([]),
    grade: z.enum(GRADES),
    accepted: z.boolean(),
    rejectReason: line(500).optional(),
    creditDecision: z.enum(CREDIT_DECISIONS).optional(),
    creditReason: line(500).optional(),
    notes: line(2000).default(''),
    photoIds: z.array(id()).max(12).default([]),
    // a matching recent core was shown and the person says this one is different
    confirmNotDuplicate: z.boolean().default(false),
    /** Why the receipt goes on although its condition, grade, credit or casting number disagree (intakeMismatches). */
    mismatchReason: line(500).optional(),
  })
  .superRefine(
    (b, ctx) => {
      const need = (path: string, message: string) => ctx.addIssue({ code: 'custom', path: [path], message });
      if (b.source === 'customer_return') {
        if (!b.customerId) need('customerId', 'Choose the customer returning the core.');
        if (b.supplierId) need('supplierId', 'A customer return has no supplier.');
        if (!b.creditDecision) need('creditDecision', 'Decide the core credit.');
        if (b.creditDecision && b.creditDecision !== 'full' && !b.creditReason) {
          need('creditReason', 'Say why the credit is partial or none.');
        }
      } else {
        if (!b.supplierId) need('supplierId', 'Choose the supplier the core was bought from.');
        if (b.customerId) need('customerId', 'A purchased core has no customer.');
        if (b.creditDecision) need('creditDecision', 'Core credit applies to customer returns only.');
      }
      if (b.accepted === false && !b.rejectReason) need('rejectReason', 'Say why the core is rejected.');
      if (b.accepted && b.rejectReason) need('rejectReason', 'An accepted core has no reject reason.');
      const missing = Array.isArray(b.missing) ? b.missing : [];
      if (b.complete === true && missing.length) need('missing', 'A complete core has nothing missing.');
      if (b.complete === false && !missing.length) need('missing', 'Tick what is missing.');
      // the latest calendar date anywhere on Earth right now (UTC+14), so no plant's today is refused
      const latest = new Date(Date.now() + 14 * 3600_000).toISOString().slice(0, 10);
      if (typeof b.receivedOn === 'string' && b.receivedOn > latest)
        need('receivedOn', 'The received date cannot be in the future.');
      if (typeof b.receivedOn === 'string' && b.receivedOn < '1990-01-01')
        need('receivedOn', 'Check the year of the received date.');
      if (b.accepted === false && b.creditDecision === 'full') {
        need('creditDecision', 'A rejected core cannot get full core credit.');
      }
    },
    {
      // check the cross-field rules even when a single field is also wrong, so every problem shows at once
      when: (payload: { value: unknown }) => typeof payload.value === 'object' && payload.value !== null,
    } as never,
  );
export type ReceiveCoreBody = z.input<typeof receiveCoreBody>;

/**
 * What the dock recorded that does not hang together: damage against the grade and the credit,
 * major parts missing against full credit. Each is a warning in words; the receipt goes on only
 * with a reason. (The server adds one more: a casting number seen before on another family.)
 */
export function intakeMismatches(b: {
  damage?: readonly string[];
  missing?: readonly string[];
  grade?: string;
  creditDecision?: string;
  accepted?: boolean;
}): string[] {
  const out: string[] = [];
  const damage = (b.damage ?? []).map((d) => DAMAGE_LABELS[d as (typeof DAMAGE)[number]]?.toLowerCase() ?? d);
  const structural = (b.damage ?? []).filter((d) => d === 'cracked' || d === 'broken');
  if (structural.length && b.grade === 'sound') {
    out.push(
      `The core is recorded as ${structural.join(' and ')}, but graded sound (every major part expected to be reused).`,
    );
  }
  if (damage.length && b.creditDecision === 'full') {
    out.push(`Full core credit for a core recorded as ${damage.join(', ')}.`);
  }
  const major = (b.missing ?? []).filter((m) => m === 'block' || m === 'crankshaft' || m === 'cylinder_heads');
  if (major.length && b.creditDecision === 'full') {
    out.push(
      `Full core credit though ${major.map((m) => CORE_PART_LABELS[m as (typeof CORE_PARTS)[number]].toLowerCase()).join(', ')} ${major.length > 1 ? 'are' : 'is'} missing.`,
    );
  }
  if (b.grade === 'unusable' && b.accepted && b.creditDecision === 'full') {
    out.push('Full core credit for a core graded unusable.');
  }
  return out;
}

export const duplicateQuery = z.strictObject({
  castingNumber: partNumber,
  idNumber: partNumber.optional(),
});

export const INTAKE_SORTS = ['receivedOn', 'serial', 'family', 'grade', 'castingNumber'] as const;
export const intakeLogQuery = z.strictObject({
  ...paging,
  family: idText().optional(),
  source: z.enum(SOURCES).optional(),
  grade: z.enum(GRADES).optional(),
  accepted: z.enum(['true', 'false']).optional(),
  from: receivedDate.optional(),
  to: receivedDate.optional(),
  q: line(40).optional(),
  sort: z.enum(INTAKE_SORTS).default('receivedOn'),
  dir: z.enum(['asc', 'desc']).default('desc'),
});
export type IntakeLogQuery = z.input<typeof intakeLogQuery>;

export type CoreSummary = {
  serial: string;
  familyCode: string;
  castingNumber: string;
  idNumber: string | null;
  source: (typeof SOURCES)[number];
  partyName: string | null;
  sourceReference: string | null;
  receivedOn: string;
  receivedBy: string;
  grade: (typeof GRADES)[number] | null;
  accepted: boolean;
  creditDecision: (typeof CREDIT_DECISIONS)[number] | null;
  /** The credit as settled after teardown (the newest revision), when it was revised. */
  settledCredit: (typeof CREDIT_DECISIONS)[number] | null;
  settledReason: string | null;
  settledBy: string | null;
  settledAt: string | null;
  status: string;
};

export type Party = { id: number; code: string; name: string };

export const TEARDOWN_PARTS = ['block', 'crankshaft', 'cylinder_head', 'camshaft', 'rod_set'] as const;
export type TeardownPart = (typeof TEARDOWN_PARTS)[number];

/** Wear parts are never reused (common practice): teardown records them as discarded by rule. */
export const WEAR_PARTS = [
  'pistons',
  'piston rings',
  'main and rod bearings',
  'gaskets and seals',
  'lifters',
  'timing chain or belt',
  'oil pump',
] as const;

export const teardownBody = z
  .strictObject({
    kept: z.array(z.strictObject({ kind: z.enum(TEARDOWN_PARTS), position: line(20).optional() })).max(8),
    scrapped: z
      .array(
        z.strictObject({
          kind: z.enum(TEARDOWN_PARTS),
          position: line(20).optional(),
          reason: line(300).min(3, 'Say why it is scrapped.'),
        }),
      )
      .max(8)
      .default([]),
    notes: line(2000).default(''),
  })
  .refine((b) => b.kept.length + b.scrapped.length > 0, { message: 'Record at least one part.', path: ['kept'] });
export type TeardownBody = z.input<typeof teardownBody>;

export const serialParam = z.strictObject({ serial: text().trim().min(1).max(30) });

export const labelStocks = ['2x1in', '50x25mm'] as const;
export const labelsPrintedBody = z.strictObject({
  serials: z.array(text().trim().min(1).max(30)).min(1).max(100),
  stock: z.enum(labelStocks),
  /** Needed when any of the labels was printed before. */
  reprintReason: line(300).min(3, 'Say why, in at least 3 characters.').optional(),
});

/** The teardown as recorded on the core (server/services/teardown.ts). */
export type TeardownRecord = {
  at: string;
  byId: number;
  /** The name of the person who recorded it (absent on teardowns recorded before it was kept). */
  by?: string;
  kept: { serial: string; kind: TeardownPart; position: string | null }[];
  scrapped: { kind: TeardownPart; position?: string; reason: string }[];
  discardedByRule: string[];
  notes: string;
};

export type CoreReceipt = {
  castingNumber: string;
  idNumber: string | null;
  source: (typeof SOURCES)[number];
  customer: Party | null;
  supplier: Party | null;
  sourceReference: string | null;
  receivedOn: string;
  receivedBy: string;
  condition: {
    complete: boolean;
    missing: (typeof CORE_PARTS)[number][];
    damage: (typeof DAMAGE)[number][];
  };
  grade: (typeof GRADES)[number] | null;
  accepted: boolean;
  rejectReason: string | null;
  creditDecision: (typeof CREDIT_DECISIONS)[number] | null;
  creditReason: string | null;
  notes: string;
};

export type CoreDetail = ItemJson & { receipt: CoreReceipt; teardown: TeardownRecord | null; photos: AttachmentJson[] };

/** A recent core with the same number, as GET /api/cores/duplicates and a 409 possible_duplicate list them. */
export type Duplicate = {
  serial: string;
  castingNumber: string;
  idNumber: string | null;
  receivedOn: string;
  accepted: boolean;
};
