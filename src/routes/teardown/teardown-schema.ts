import { z } from 'zod';
import { teardownBody, type CoreReceipt, type TeardownBody, type TeardownPart } from '../../../shared/schemas/intake';
import { PART_KIND_LABELS } from '../../../shared/schemas/reference';
import type { ItemJson } from '../../api/items/types';

export type PartRow = { kind: TeardownPart; position?: 'left' | 'right'; label: string; optional: boolean };

/** The major parts one core of this family gives, in the order they come off the engine. */
export function rowsFor(family: ItemJson['family']): PartRow[] {
  const heads: PartRow[] =
    family.headsPerEngine > 1
      ? (['left', 'right'] as const).map((position) => ({
          kind: 'cylinder_head',
          position,
          label: `${PART_KIND_LABELS.cylinder_head} (${position})`,
          optional: false,
        }))
      : [{ kind: 'cylinder_head', label: PART_KIND_LABELS.cylinder_head, optional: false }];
  return [
    { kind: 'block', label: PART_KIND_LABELS.block, optional: false },
    { kind: 'crankshaft', label: PART_KIND_LABELS.crankshaft, optional: false },
    ...heads,
    { kind: 'camshaft', label: PART_KIND_LABELS.camshaft, optional: true },
    { kind: 'rod_set', label: PART_KIND_LABELS.rod_set, optional: true },
  ];
}

type IntakePart = CoreReceipt['condition']['missing'][number];

/** The intake checklist's names for the parts a teardown row stands for (heads: every head row). */
const INTAKE_PART: Record<TeardownPart, IntakePart> = {
  block: 'block',
  crankshaft: 'crankshaft',
  cylinder_head: 'cylinder_heads',
  camshaft: 'camshaft',
  rod_set: 'connecting_rods',
};

/** Whether intake ticked this row's part as missing. */
export const missingAtIntake = (row: PartRow, missing: readonly IntakePart[]) =>
  missing.includes(INTAKE_PART[row.kind]);

export const DECISIONS = ['keep', 'scrap', 'absent'] as const;
export type Decision = (typeof DECISIONS)[number];

/**
 * One decision per row on screen, turned into the server's kept/scrapped lists and then checked by
 * the shared teardownBody itself, so the form can never send what the server would refuse.
 */
export function teardownForm(rows: PartRow[]) {
  return z
    .object({
      parts: z.array(
        z.object({ decision: z.enum(DECISIONS).optional(), reason: z.string().trim().max(300).optional() }),
      ),
      notes: z.string().trim().max(2000),
    })
    .superRefine((v, ctx) => {
      v.parts.forEach((p, i) => {
        const row = rows[i]!;
        if (!p.decision) {
          ctx.addIssue({
            code: 'custom',
            path: ['parts', i, 'decision'],
            message: `Choose keep, scrap or not there for the ${row.label.toLowerCase()}.`,
          });
        }
        if (p.decision === 'scrap' && (p.reason ?? '').length < 3) {
          ctx.addIssue({ code: 'custom', path: ['parts', i, 'reason'], message: 'Say why it is scrapped.' });
        }
      });
      if (!v.parts.some((p) => p.decision === 'keep' || p.decision === 'scrap')) {
        ctx.addIssue({ code: 'custom', path: ['parts', 0, 'decision'], message: 'Record at least one part.' });
      }
    })
    .transform((v): TeardownBody => {
      const picked = (d: Decision) => rows.map((r, i) => ({ r, p: v.parts[i]! })).filter(({ p }) => p.decision === d);
      return {
        kept: picked('keep').map(({ r }) => ({ kind: r.kind, ...(r.position ? { position: r.position } : {}) })),
        scrapped: picked('scrap').map(({ r, p }) => ({
          kind: r.kind,
          ...(r.position ? { position: r.position } : {}),
          reason: p.reason ?? '',
        })),
        notes: v.notes,
      };
    })
    .pipe(teardownBody);
}
