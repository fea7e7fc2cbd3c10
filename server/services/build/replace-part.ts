import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { ReplacePartBody } from '../../../shared/schemas/build.js';
import { PART_KIND_LABELS } from '../../../shared/schemas/reference.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { AppError, conflict, invalid } from '../../errors.js';
import { EngineFamily, Item, ItemLink } from '../../models/index.js';
import { findBySerial, presentItem, routeOfItem } from '../items.js';
import { moveItemQuietly } from '../item-moves.js';
import { lockUnitsReachedBy } from '../unit-locks.js';
import { fitIn } from './build-unit.js';
import { fitProblem, pistonMismatch } from './fit.js';

const refused = (problems: Record<string, string>) =>
  new AppError('replace_refused', `Nothing was changed: ${Object.values(problems).join(' ')}`, problems);

/**
 * Takes a part out of a built unit and fits another in its place (a head found cracked after
 * assembly, say). The ended link keeps the history of what was in the unit and when; the unit goes
 * back to its first stage, so its assembly and run test are recorded again with the new part in.
 */
export async function replacePart(sequelize: Sequelize, ctx: Ctx, serial: string, body: ReplacePartBody) {
  await sequelize.transaction(async (transaction) => {
    const unit = await lockUnit(sequelize, serial, transaction);
    const { out, fit, link } = await checkReplacement(sequelize, unit, body, transaction);
    await swap(ctx, transaction, { unit, out, fit, link, reason: body.reason });
  });
  return presentItem(await findBySerial(serial));
}

/** The unit locked as the release gate takes it (the lock protocol: the unit first); a long block not shipped. */
async function lockUnit(sequelize: Sequelize, serial: string, transaction: Transaction) {
  const found = await findBySerial(serial, transaction);
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
  return unit;
}

/**
 * The part taken out must be in the unit; the one fitted must fit as a build would take it, on
 * the same side for a V's head, with pistons that match a new block's bores. All problems at once.
 */
async function checkReplacement(sequelize: Sequelize, unit: Item, body: ReplacePartBody, transaction: Transaction) {
  const problems: Record<string, string> = {};
  const look = (input: string, field: 'remove' | 'fit') =>
    findBySerial(input, transaction).catch((e: Error) => {
      problems[field] = e.message;
      return null;
    });
  const out = await look(body.remove, 'remove');
  const fit = await look(body.fit, 'fit');
  if (!out || !fit) throw refused(problems);
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
    const mismatch = await pistonsAgainst(sequelize, unit, fit, family, transaction);
    if (mismatch) problems.fit = mismatch;
  }
  if (Object.keys(problems).length) throw refused(problems);
  return { out, fit, link: link! };
}

/** Whether the unit's pistons fit a new block's finished bores. */
async function pistonsAgainst(
  sequelize: Sequelize,
  unit: Item,
  block: Item,
  family: EngineFamily,
  transaction: Transaction,
) {
  const [pistons] = await sequelize.query<{ attributes: { oversizeIn?: number } }>(
    `SELECT pl.attributes FROM unit_lots ul JOIN part_lots pl ON pl.id = ul.part_lot_id
      WHERE ul.unit_item_id = :unit AND pl.part_kind = 'pistons'`,
    { type: QueryTypes.SELECT, replacements: { unit: unit.id }, transaction },
  );
  return pistons ? pistonMismatch(sequelize, block, family, pistons.attributes.oversizeIn ?? 0, transaction) : null;
}

/** The old part's link ended, the new one fitted, the unit back to its first stage: each with its event. */
async function swap(
  ctx: Ctx,
  transaction: Transaction,
  { unit, out, fit, link, reason }: { unit: Item; out: Item; fit: Item; link: ItemLink; reason: string },
) {
  await link.update({ removedAt: new Date(), removedReason: reason }, { transaction });
  const outBefore = { status: out.status };
  // a part taken out is a finished part again, unless it is scrapped or held; its event says
  // which unit it left, so the move itself is quiet
  if (out.status === 'installed') await moveItemQuietly(transaction, out, { status: 'finished' });
  await recordAudit(ctx, transaction, {
    action: 'item.removed',
    entity: 'item',
    entityId: out.serial,
    before: { ...outBefore, installedIn: unit.serial },
    after: { status: out.status, installedIn: null, reason },
  });
  await fitIn(ctx, transaction, unit, fit);
  // The unit goes back to its first stage. Not through moveItem: a unit back under a warranty claim
  // (returned) has its part replaced too and goes back on its route from there, a move the item
  // lifecycle does not list; the change and its event are written here as they always were.
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
    after: { status: unit.status, currentStage: unit.currentStageId, removed: out.serial, fitted: fit.serial, reason },
  });
}
