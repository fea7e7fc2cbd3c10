import type { Sequelize, Transaction } from 'sequelize';
import type { BuildBody } from '../../../shared/schemas/build.js';
import type { PartKind } from '../../../shared/schemas/reference.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { AppError } from '../../errors.js';
import { Item, ItemLink, type EngineFamily } from '../../models/index.js';
import { findBySerial, newSerial, presentItem, routeFor } from '../items.js';
import { moveItemQuietly } from '../item-moves.js';
import { matchSizeClasses, type SizeMatch } from '../size-classes.js';
import { familyByCode } from '../spec/rules.js';
import { fitProblem, pistonMismatch } from './fit.js';
import { drawLots, lotsToDraw, type Drawn } from './lots.js';

/**
 * Building a long block: a finished block, crankshaft and the family's heads, plus purchased lots.
 * Every part is checked (finished its route, not held or scrapped, same family, not already in a
 * unit) and every problem is reported at once; the pistons' oversize must agree with the block's
 * finished bores. The unit gets its serial and its route; each part an "installed in" link.
 */

/** A part the build names, in its slot, with its row locked. */
type Slotted = { field: string; kind: PartKind; item: Item; locked: Item };

export async function buildUnit(sequelize: Sequelize, ctx: Ctx, body: BuildBody) {
  const serial = await sequelize.transaction(async (transaction) => {
    const family = await familyByCode(body.family, transaction);
    const problems: Record<string, string> = {};
    const parts = await lockParts(body, problems, transaction);
    await checkParts(sequelize, body, family, parts, problems, transaction);
    // pistons and bearings of the size class the block's bores and the crankshaft's journals were
    // finished to (as each part's current result recorded it)
    const sizes = await matchSizeClasses(
      parts.filter((f) => !problems[f.field]).map((f) => ({ item: f.locked })),
      body.lots,
      transaction,
    );
    Object.assign(problems, sizes.problems);
    const lots = await lotsToDraw(body, problems, transaction);
    const count = Object.keys(problems).length;
    if (count) {
      throw new AppError(
        'build_refused',
        `The long block was not started: ${Object.values(problems).join(' ')}`,
        problems,
      );
    }
    return assemble(ctx, transaction, { family, body, parts, lots, matched: sizes.matched });
  });
  return presentItem(await findBySerial(serial));
}

/** The parts in their slots, each found by serial, then locked in id order (two builds sharing a part cannot deadlock). */
async function lockParts(body: BuildBody, problems: Record<string, string>, transaction: Transaction) {
  const slots: { field: string; kind: PartKind; input: string }[] = [
    { field: 'block', kind: 'block', input: body.block },
    { field: 'crankshaft', kind: 'crankshaft', input: body.crankshaft },
    ...body.heads.map((h, i) => ({ field: `heads.${i}`, kind: 'cylinder_head' as PartKind, input: h })),
  ];
  const found: { field: string; kind: PartKind; item: Item }[] = [];
  for (const s of slots) {
    try {
      found.push({ ...s, item: await findBySerial(s.input, transaction) });
    } catch (err) {
      problems[s.field] = (err as Error).message;
    }
  }
  const locked = new Map<number, Item>();
  for (const f of [...found].sort((a, b) => a.item.id - b.item.id)) {
    locked.set(f.item.id, (await Item.findByPk(f.item.id, { transaction, lock: transaction.LOCK.UPDATE }))!);
  }
  return found.map((f): Slotted => ({ field: f.field, kind: f.kind, item: f.item, locked: locked.get(f.item.id)! }));
}

/** The family's number of heads (one left and one right on a V), each part's fit, the pistons' oversize. */
async function checkParts(
  sequelize: Sequelize,
  body: BuildBody,
  family: EngineFamily,
  parts: Slotted[],
  problems: Record<string, string>,
  transaction: Transaction,
) {
  if (family.headsPerEngine !== body.heads.length) {
    problems.heads = `A ${family.code} takes ${family.headsPerEngine} cylinder head${family.headsPerEngine > 1 ? 's' : ''}, not ${body.heads.length}.`;
  }
  for (const f of parts) {
    const problem = await fitProblem(f.locked, f.kind, family, transaction);
    if (problem) problems[f.field] = problem;
  }
  if (family.headsPerEngine === 2) {
    const sides = parts.filter((f) => f.kind === 'cylinder_head').map((f) => f.locked.positionLabel);
    if (sides.length === 2 && new Set(sides).size !== 2) {
      problems.heads = 'A V engine takes one left and one right head.';
    }
  }
  // the pistons must be made for the bore the block was finished to
  const pistons = body.lots.find((l) => l.kind === 'pistons');
  const block = parts.find((f) => f.kind === 'block');
  if (pistons && block && !problems.block) {
    const mismatch = await pistonMismatch(sequelize, block.item, family, pistons.oversizeIn ?? 0, transaction);
    if (mismatch) problems['lots.pistons'] = mismatch;
  }
}

/** The unit with its serial and route, each part fitted in it, each lot drawn, and the build's event. */
async function assemble(
  ctx: Ctx,
  transaction: Transaction,
  {
    family,
    body,
    parts,
    lots,
    matched,
  }: { family: EngineFamily; body: BuildBody; parts: Slotted[]; lots: Drawn[]; matched: Map<number, SizeMatch> },
) {
  const route = await routeFor(family.id, 'long_block', transaction);
  const unit = await Item.create(
    {
      serial: await newSerial('long_block', transaction),
      kind: 'long_block',
      engineFamilyId: family.id,
      status: 'in_process',
      routeId: route?.route.id ?? null,
      currentStageId: route?.steps[0]?.stageId ?? null,
      positionLabel: null,
      attributes: body.notes ? { buildNotes: body.notes } : {},
      createdById: ctx.actor!.id,
    },
    { transaction },
  );
  for (const f of parts) await fitIn(ctx, transaction, unit, f.locked);
  await drawLots(ctx, transaction, unit, lots, body, matched);
  await recordAudit(ctx, transaction, {
    action: 'unit.built',
    entity: 'item',
    entityId: unit.serial,
    after: {
      family: family.code,
      parts: parts.map((f) => ({ kind: f.kind, serial: f.item.serial })),
      lots: lots.map(({ lot, quantity, i }) => ({
        kind: lot.partKind,
        partNumber: lot.partNumber,
        lotCode: lot.lotCode,
        quantity,
        ...(matched.get(i) ?? (body.lots[i]!.sizeClass ? { sizeClass: body.lots[i]!.sizeClass } : {})),
      })),
    },
  });
  return unit.serial;
}

/**
 * A part fitted in a unit: its "installed in" link, and the part moved to installed (a finished
 * part, or one whose remaining stages are optional) with its event, which names the unit and not
 * the stage the part leaves.
 */
export async function fitIn(ctx: Ctx, transaction: Transaction, unit: Item, part: Item) {
  await ItemLink.create(
    {
      parentItemId: unit.id,
      childItemId: part.id,
      linkType: 'installed_in',
      createdById: ctx.actor!.id,
      removedAt: null,
      removedReason: null,
    },
    { transaction },
  );
  const before = { status: part.status, currentStage: part.currentStageId };
  await moveItemQuietly(transaction, part, { status: 'installed', currentStageId: null });
  await recordAudit(ctx, transaction, {
    action: 'item.installed',
    entity: 'item',
    entityId: part.serial,
    before,
    after: { status: 'installed', installedIn: unit.serial },
  });
}
