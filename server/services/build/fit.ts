import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { OVERSIZE_MATCH_IN } from '../../../shared/schemas/build.js';
import { PART_KIND_LABELS, type PartKind } from '../../../shared/schemas/reference.js';
import { convert, mmToIn } from '../../../shared/domain/units.js';
import { restOptional } from '../../../shared/domain/route.js';
import { EngineFamily, Item, ItemLink, Stage } from '../../models/index.js';
import { routeOfItem } from '../items.js';
import { blockingNcrsOf } from '../ncrs/index.js';
import { currentResultSql } from '../results/current.js';

/** Why a part cannot go into a unit of this family in this slot, in words; null when it can. */
export async function fitProblem(item: Item, kind: PartKind, family: EngineFamily, transaction: Transaction) {
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
export async function pistonMismatch(
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

/**
 * The mean finished bore of a block in inches: the readings of the block's characteristic that
 * pistons are matched to (`mates_with = 'pistons'`, whatever the plant calls it and its stage), in
 * the current result at that stage, converted from the characteristic's unit.
 */
export async function finishedBore(sequelize: Sequelize, blockId: number, transaction?: Transaction) {
  const [row] = await sequelize.query<{ mean: string | null; unit: string | null }>(
    `SELECT avg(rd.value)::text AS mean, c.unit
       FROM characteristics c
       JOIN stages s ON s.id = c.stage_id AND s.part_kind = 'block'
       JOIN readings rd ON rd.characteristic_id = c.id
        AND rd.stage_result_id = (${currentResultSql({ columns: 'r.id', itemId: ':blockId', stageId: 's.id' })})
      WHERE c.mates_with = 'pistons'
      GROUP BY c.id, c.unit
      ORDER BY c.id
      LIMIT 1`,
    { type: QueryTypes.SELECT, replacements: { blockId }, transaction },
  );
  if (!row?.mean) return null;
  return convert(Number(row.mean), row.unit, 'in');
}
