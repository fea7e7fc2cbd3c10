import { z } from 'zod';
import { id, text } from './common.js';
import { sizeClassCode } from './spec.js';

/** Building a long block: its purchased lots, the parts scanned in, and replacing a part in one. */

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
