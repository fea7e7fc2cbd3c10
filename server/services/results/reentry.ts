import type { Sequelize } from 'sequelize';
import type { Ctx } from '../../audit.js';
import { conflict, invalid } from '../../errors.js';
import { Item, Stage, StageReentry } from '../../models/index.js';
import { findBySerial, presentItem, routeOfItem } from '../items.js';
import { moveItem } from '../item-moves.js';
import { openNcrsOf } from '../ncrs/index.js';
import { openReentry } from './common.js';

/**
 * A supervisor's sanctioned re-entry: the item goes back to a stage it has passed (or finished),
 * and the next result there carries the reason.
 */
export async function allowReentry(
  sequelize: Sequelize,
  ctx: Ctx,
  serial: string,
  input: { stage: string; reason: string },
) {
  await sequelize.transaction(async (transaction) => {
    const found = await findBySerial(serial, transaction);
    const item = (await Item.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const stage = await Stage.findOne({ where: { code: input.stage }, transaction });
    if (!stage) throw invalid('Choose a stage of this part’s route.', { stage: `No stage ${input.stage}.` });
    const route = await routeOfItem(item, transaction);
    if (!route?.steps.some((s) => s.stageId === stage.id)) {
      throw invalid(`${stage.name} is not on the route of ${item.serial}.`, { stage: 'Not on this route.' });
    }
    if (['scrapped', 'installed', 'released', 'shipped'].includes(item.status)) {
      throw conflict(`${item.serial} is ${item.status}: it cannot go back through a stage.`);
    }
    const holds = await openNcrsOf(item.id, transaction);
    if (holds.length) {
      throw conflict(
        `${item.serial} is on hold with ${holds.map((h) => h.number).join(', ')}: quality sends it back through a stage by disposition (rework).`,
      );
    }
    if (item.currentStageId === stage.id && item.status === 'in_process') {
      throw conflict(`${item.serial} is already due at ${stage.name}: no re-entry is needed.`);
    }
    const waiting = await openReentry(item.id, transaction);
    if (waiting) {
      throw conflict(`A re-entry of ${item.serial} is already waiting to be used: record that stage first.`);
    }
    await StageReentry.create(
      {
        itemId: item.id,
        stageId: stage.id,
        fromStageId: item.currentStageId,
        fromStatus: item.status,
        reason: input.reason,
        allowedById: ctx.actor!.id,
        usedByResultId: null,
      },
      { transaction },
    );
    await moveItem(ctx, transaction, item, { status: 'in_process', currentStageId: stage.id }, 'item.reentry_allowed', {
      stage: stage.code,
      reason: input.reason,
    });
  });
  return presentItem(await findBySerial(serial));
}
