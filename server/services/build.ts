import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import {
  LOT_KIND_LABELS,
  OVERSIZE_MATCH_IN,
  type BuildBody,
  type ReplacePartBody,
} from '../../shared/schemas/build.js';
import { PART_KIND_LABELS, type PartKind } from '../../shared/schemas/reference.js';
import { mmToIn } from '../../shared/domain/units.js';
import { recordAudit, type Ctx } from '../audit.js';
import { AppError, conflict, invalid } from '../errors.js';
import { EngineFamily, Item, ItemLink, PartLot, Stage, Supplier, UnitLot } from '../models/index.js';
import { findBySerial, newSerial, presentItem, routeFor, routeOfItem } from './items.js';
import { drawableOf, holdingNcrs } from './lots.js';
import { blockingNcrsOf } from './ncrs/index.js';
import { familyByCode } from './spec.js';
import { lockUnitsReachedBy } from './unit-locks.js';
import { matchSizeClasses } from './size-classes.js';
import { currentResultSql } from './results/current.js';
import { restOptional } from '../../shared/domain/route.js';

/**
 * Building a long block: a finished block, crankshaft and the family's heads, plus purchased lots.
 * Every part is checked (finished its route, not held or scrapped, same family, not already in a
 * unit) and every problem is reported at once; the pistons' oversize must agree with the block's
 * finished bores. The unit gets its serial and its route; each part an "installed in" link.
 */

/** Why a part cannot go into a unit of this family in this slot, in words; null when it can. */
async function fitProblem(item: Item, kind: PartKind, family: EngineFamily, transaction: Transaction) {
  const name = `${item.serial} (${PART_KIND_LABELS[item.kind].toLowerCase()})`;
  if (item.kind !== kind) {
    return `${item.serial} is a ${PART_KIND_LABELS[item.kind].toLowerCase()}, not a ${PART_KIND_LABELS[kind].toLowerCase()}.`;
  }
  if (item.engineFamilyId !== family.id) return `${name} belongs to another engine family, not ${family.code}.`;
  if (item.status === 'scrapped') return `${name} has been scrapped.`;
  const unit = await ItemLink.findOne({
    where: { childItemId: item.id, linkType: 'installed_in', removedAt: null },
    include: [{ model: Item, as: 'parent', attributes: ['serial'] }],
    transaction,
  });
  if (unit || item.status === 'installed') {
    const into = (unit as (ItemLink & { parent?: Item }) | null)?.parent?.serial;
    return `${name} is already installed${into ? ` in ${into}` : ''}.`;
  }
  const holds = await blockingNcrsOf(item.id, undefined, transaction);
  if (holds.length) return `${name} is on hold: ${holds.map((h) => h.number).join(', ')} open.`;
  if (item.status === 'on_hold') return `${name} is on hold.`;
  if (!(await finishedRoute(item, transaction))) {
    const stage = item.currentStageId ? await Stage.findByPk(item.currentStageId, { transaction }) : null;
    return `${name} has not finished its route${stage ? `: it is due at ${stage.name}` : ''}.`;
  }
  return null;
}

/** Why pistons of an oversize do not fit a block's finished bores; null when they do. */
async function pistonMismatch(
  sequelize: Sequelize,
  block: Item,
  family: EngineFamily,
  oversizeIn: number,
  transaction: Transaction,
) {
  const mean = await finishedBore(sequelize, block.id, transaction);
  const standard = mmToIn(family.boreMm);
  if (mean === null) return `${block.serial} has no bore-and-hone result to match pistons against.`;
  const over = mean - standard;
  if (Math.abs(over - oversizeIn) <= OVERSIZE_MATCH_IN) return null;
  return `The pistons are +${oversizeIn.toFixed(3)} in, but ${block.serial} was finished +${over.toFixed(3)} in over its ${standard.toFixed(4)} in standard bore (mean ${mean.toFixed(4)} in).`;
}

async function finishedRoute(item: Item, transaction: Transaction) {
  if (item.status === 'finished') return true;
  if (item.status !== 'in_process') return false;
  const route = await routeOfItem(item, transaction);
  const steps = route?.steps ?? [];
  return restOptional(steps, item.currentStageId);
}

/** The mean finished bore of a block, from its current bore-and-hone result. */
export async function finishedBore(sequelize: Sequelize, blockId: number, transaction?: Transaction) {
  const [row] = await sequelize.query<{ mean: string | null; n: number }>(
    `SELECT avg(rd.value)::text AS mean, count(*)::int AS n
       FROM readings rd
       JOIN characteristics c ON c.id = rd.characteristic_id AND c.code = 'bore'
      WHERE rd.stage_result_id = (${currentResultSql({
        columns: 'r.id',
        itemId: ':blockId',
        stageId: "(SELECT id FROM stages WHERE code = 'bore-hone')",
      })})`,
    { type: QueryTypes.SELECT, replacements: { blockId }, transaction },
  );
  return row?.mean ? Number(row.mean) : null;
}

export async function buildUnit(sequelize: Sequelize, ctx: Ctx, body: BuildBody) {
  const serial = await sequelize.transaction(async (transaction) => {
    const family = await familyByCode(body.family, transaction);
    const slots: { field: string; kind: PartKind; input: string }[] = [
      { field: 'block', kind: 'block', input: body.block },
      { field: 'crankshaft', kind: 'crankshaft', input: body.crankshaft },
      ...body.heads.map((h, i) => ({ field: `heads.${i}`, kind: 'cylinder_head' as PartKind, input: h })),
    ];
    const problems: Record<string, string> = {};
    const found: { field: string; kind: PartKind; item: Item }[] = [];
    for (const s of slots) {
      try {
        found.push({ ...s, item: await findBySerial(s.input, transaction) });
      } catch (err) {
        problems[s.field] = (err as Error).message;
      }
    }
    // lock in id order, so two builds sharing a part cannot deadlock
    const locked = new Map<number, Item>();
    for (const f of [...found].sort((a, b) => a.item.id - b.item.id)) {
      locked.set(f.item.id, (await Item.findByPk(f.item.id, { transaction, lock: transaction.LOCK.UPDATE }))!);
    }
    if (family.headsPerEngine !== body.heads.length) {
      problems.heads = `A ${family.code} takes ${family.headsPerEngine} cylinder head${family.headsPerEngine > 1 ? 's' : ''}, not ${body.heads.length}.`;
    }
    for (const f of found) {
      const problem = await fitProblem(locked.get(f.item.id)!, f.kind, family, transaction);
      if (problem) problems[f.field] = problem;
    }
    if (family.headsPerEngine === 2) {
      const sides = found.filter((f) => f.kind === 'cylinder_head').map((f) => locked.get(f.item.id)!.positionLabel);
      if (sides.length === 2 && new Set(sides).size !== 2) {
        problems.heads = 'A V engine takes one left and one right head.';
      }
    }

    // the pistons must be made for the bore the block was finished to
    const pistons = body.lots.find((l) => l.kind === 'pistons');
    const block = found.find((f) => f.kind === 'block');
    if (pistons && block && !problems.block) {
      const mismatch = await pistonMismatch(sequelize, block.item, family, pistons.oversizeIn ?? 0, transaction);
      if (mismatch) problems['lots.pistons'] = mismatch;
    }

    // pistons and bearings of the size class the block's bores and the crankshaft's journals were
    // finished to (as each part's current result recorded it)
    const sizes = await matchSizeClasses(
      found.filter((f) => !problems[f.field]).map((f) => ({ item: locked.get(f.item.id)! })),
      body.lots,
      transaction,
    );
    Object.assign(problems, sizes.problems);

    // purchased lots: received first (receiving logs them), then drawn from; a lot waiting for its
    // inspection, on hold, refused, returned, held by an NCR or used up cannot go in. Locked in id
    // order, so two builds drawing from the same lots take turns and never draw past what came in.
    const lots: { lot: PartLot; quantity: number; i: number }[] = [];
    const wanted: { i: number; l: (typeof body.lots)[number]; lot: PartLot; supplier: Supplier }[] = [];
    for (const [i, l] of body.lots.entries()) {
      const supplier = await Supplier.findByPk(l.supplierId, { transaction });
      if (!supplier) {
        problems[`lots.${i}.supplierId`] = 'Unknown supplier.';
        continue;
      }
      const partNumber = l.partNumber.toUpperCase();
      const lotCode = l.lotCode.toUpperCase();
      const lot = await PartLot.findOne({ where: { supplierId: supplier.id, partNumber, lotCode }, transaction });
      if (!lot) {
        const elsewhere = await PartLot.findAll({
          attributes: ['partNumber'],
          where: { supplierId: supplier.id, lotCode },
          transaction,
        });
        problems[`lots.${i}.lotCode`] = elsewhere.length
          ? `Lot ${lotCode} from ${supplier.name} was received for part number ${elsewhere.map((x) => x.partNumber).join(', ')}, not ${partNumber}.`
          : `No lot ${lotCode} of part number ${partNumber} from ${supplier.name} has been received: receiving logs it before it can be built in.`;
        continue;
      }
      if (lot.partKind !== l.kind) {
        problems[`lots.${i}.lotCode`] =
          `Lot ${lot.lotCode} (part number ${lot.partNumber}) from ${supplier.name} is ${lot.partKind.replace(/_/g, ' ')}, not ${LOT_KIND_LABELS[l.kind].toLowerCase()}.`;
        continue;
      }
      wanted.push({ i, l, lot, supplier });
    }
    const lockedLots = new Map<number, PartLot>();
    for (const id of [...new Set(wanted.map((w) => w.lot.id))].sort((a, b) => a - b)) {
      lockedLots.set(id, (await PartLot.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE }))!);
    }
    const held = await holdingNcrs([...lockedLots.keys()], transaction);
    // the same lot named twice draws both quantities
    const drawing = new Map<number, number>();
    for (const w of wanted) drawing.set(w.lot.id, (drawing.get(w.lot.id) ?? 0) + w.l.quantity);
    for (const w of wanted) {
      const lot = lockedLots.get(w.lot.id)!;
      const can = drawableOf(lot, held.get(lot.id) ?? null, drawing.get(lot.id)!);
      if (!can.ok) {
        problems[`lots.${w.i}.lotCode`] = `${can.why} Use another lot.`;
        continue;
      }
      lots.push({ lot, quantity: w.l.quantity, i: w.i });
    }

    const count = Object.keys(problems).length;
    if (count) {
      throw new AppError(
        'build_refused',
        `The long block was not started: ${Object.values(problems).join(' ')}`,
        problems,
      );
    }

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
    for (const f of found) {
      const part = locked.get(f.item.id)!;
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
      await part.update({ status: 'installed', currentStageId: null }, { transaction });
      await recordAudit(ctx, transaction, {
        action: 'item.installed',
        entity: 'item',
        entityId: part.serial,
        before,
        after: { status: 'installed', installedIn: unit.serial },
      });
    }
    for (const { lot, quantity, i } of lots) {
      const size = sizes.matched.get(i);
      await UnitLot.create(
        {
          unitItemId: unit.id,
          partLotId: lot.id,
          quantity,
          sizeClass: size?.sizeClass ?? (body.lots[i]!.sizeClass || null),
          matchedTo: size?.matchedTo ?? null,
          createdById: ctx.actor!.id,
        },
        { transaction },
      );
      const before = { quantityDrawn: lot.quantityDrawn, quantityLeft: lot.quantityReceived - lot.quantityDrawn };
      await lot.increment('quantityDrawn', { by: quantity, transaction });
      await lot.reload({ transaction });
      await recordAudit(ctx, transaction, {
        action: 'lot.drawn',
        entity: 'part_lot',
        entityId: lot.id,
        before,
        after: {
          quantityDrawn: lot.quantityDrawn,
          quantityLeft: lot.quantityReceived - lot.quantityDrawn,
          unit: unit.serial,
          quantity,
        },
      });
    }
    await recordAudit(ctx, transaction, {
      action: 'unit.built',
      entity: 'item',
      entityId: unit.serial,
      after: {
        family: family.code,
        parts: found.map((f) => ({ kind: f.kind, serial: f.item.serial })),
        lots: lots.map(({ lot, quantity, i }) => ({
          kind: lot.partKind,
          partNumber: lot.partNumber,
          lotCode: lot.lotCode,
          quantity,
          ...(sizes.matched.get(i) ?? (body.lots[i]!.sizeClass ? { sizeClass: body.lots[i]!.sizeClass } : {})),
        })),
      },
    });
    return unit.serial;
  });
  return presentItem(await findBySerial(serial));
}

/**
 * Takes a part out of a built unit and fits another in its place (a head found cracked after
 * assembly, say). The ended link keeps the history of what was in the unit and when; the unit goes
 * back to its first stage, so its assembly and run test are recorded again with the new part in.
 */
export async function replacePart(sequelize: Sequelize, ctx: Ctx, serial: string, body: ReplacePartBody) {
  await sequelize.transaction(async (transaction) => {
    const found = await findBySerial(serial, transaction);
    // the lock protocol: the unit first, as the release gate takes it
    await lockUnitsReachedBy(sequelize, { itemId: found.id }, transaction);
    const unit = (await Item.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (unit.kind !== 'long_block') {
      throw invalid(
        `${unit.serial} is a ${PART_KIND_LABELS[unit.kind].toLowerCase()}: parts are replaced in a long block.`,
      );
    }
    if (unit.status === 'shipped') {
      throw conflict(`${unit.serial} has shipped: its parts are replaced when it comes back.`, { reason: 'shipped' });
    }
    const problems: Record<string, string> = {};
    const look = (input: string, field: 'remove' | 'fit') =>
      findBySerial(input, transaction).catch((e: Error) => {
        problems[field] = e.message;
        return null;
      });
    const out = await look(body.remove, 'remove');
    const fit = await look(body.fit, 'fit');
    if (!out || !fit) {
      throw new AppError('replace_refused', `Nothing was changed: ${Object.values(problems).join(' ')}`, problems);
    }
    const link = await ItemLink.findOne({
      where: { parentItemId: unit.id, childItemId: out.id, linkType: 'installed_in', removedAt: null },
      transaction,
    });
    if (!link) problems.remove = `${out.serial} is not in ${unit.serial}.`;
    // both parts locked in id order, as a build locks its parts
    for (const id of [...new Set([out.id, fit.id])].sort((x, y) => x - y)) {
      await Item.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    }
    await out.reload({ transaction });
    await fit.reload({ transaction });
    const family = (await EngineFamily.findByPk(unit.engineFamilyId, { transaction }))!;
    const problem = await fitProblem(fit, out.kind, family, transaction);
    if (problem) problems.fit = problem;
    if (
      !problem &&
      out.kind === 'cylinder_head' &&
      family.headsPerEngine === 2 &&
      fit.positionLabel !== out.positionLabel
    ) {
      problems.fit = `${out.serial} is the ${out.positionLabel} head: fit a ${out.positionLabel} head in its place.`;
    }
    if (!problem && out.kind === 'block') {
      const [pistons] = await sequelize.query<{ attributes: { oversizeIn?: number } }>(
        `SELECT pl.attributes FROM unit_lots ul JOIN part_lots pl ON pl.id = ul.part_lot_id
          WHERE ul.unit_item_id = :unit AND pl.part_kind = 'pistons'`,
        { type: QueryTypes.SELECT, replacements: { unit: unit.id }, transaction },
      );
      const mismatch = pistons
        ? await pistonMismatch(sequelize, fit, family, pistons.attributes.oversizeIn ?? 0, transaction)
        : null;
      if (mismatch) problems.fit = mismatch;
    }
    if (Object.keys(problems).length) {
      throw new AppError('replace_refused', `Nothing was changed: ${Object.values(problems).join(' ')}`, problems);
    }

    const now = new Date();
    await link!.update({ removedAt: now, removedReason: body.reason }, { transaction });
    await ItemLink.create(
      {
        parentItemId: unit.id,
        childItemId: fit.id,
        linkType: 'installed_in',
        createdById: ctx.actor!.id,
        removedAt: null,
        removedReason: null,
      },
      { transaction },
    );
    const outBefore = { status: out.status };
    // a part taken out is a finished part again, unless it is scrapped or held
    if (out.status === 'installed') await out.update({ status: 'finished' }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'item.removed',
      entity: 'item',
      entityId: out.serial,
      before: { ...outBefore, installedIn: unit.serial },
      after: { status: out.status, installedIn: null, reason: body.reason },
    });
    const fitBefore = { status: fit.status, currentStage: fit.currentStageId };
    await fit.update({ status: 'installed', currentStageId: null }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'item.installed',
      entity: 'item',
      entityId: fit.serial,
      before: fitBefore,
      after: { status: 'installed', installedIn: unit.serial },
    });
    const route = await routeOfItem(unit, transaction);
    const unitBefore = { status: unit.status, currentStage: unit.currentStageId };
    await unit.update(
      {
        status: unit.status === 'on_hold' ? 'on_hold' : 'in_process',
        currentStageId: route?.steps[0]?.stageId ?? null,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'unit.part_replaced',
      entity: 'item',
      entityId: unit.serial,
      before: unitBefore,
      after: {
        status: unit.status,
        currentStage: unit.currentStageId,
        removed: out.serial,
        fitted: fit.serial,
        reason: body.reason,
      },
    });
  });
  return presentItem(await findBySerial(serial));
}
