import { Op, type Sequelize, type Transaction } from 'sequelize';
import { DISPOSITION_LABELS, OPEN_NCR_STATES } from '../../../shared/schemas/ncr.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { enqueueMail } from '../../mail/messages.js';
import { Item, Nonconformance, PartLot, StageResult } from '../../models/index.js';
import { routeOfItem } from '../items.js';
import { notifyIfReleasable } from '../release/index.js';
import { blockingNcrsOf, installedIn } from './holds.js';
import { NCR_LIFECYCLE } from '../../../shared/domain/ncr-lifecycle.js';
import { decidedMail } from './mail.js';
import { transition } from './steps.js';
import { nextStep } from '../../../shared/domain/route.js';
import type { ItemStatus } from '../../../shared/domain/item-lifecycle.js';
import { moveItem, moveItemQuietly, type ItemMove } from '../item-moves.js';

/**
 * Lets the item go when no open NCR holds it any more. After a use-as-is on a failing result the
 * part carries on past the stage it failed; a concern raised by hand puts it back as it was.
 */
export async function releaseIfClear(ctx: Ctx, transaction: Transaction, item: Item, ncr: Nonconformance) {
  if (item.status === 'scrapped') return;
  const open = await Nonconformance.findAll({
    where: { itemId: item.id, state: { [Op.in]: OPEN_NCR_STATES } },
    transaction,
  });
  const reworks = open.filter(
    (n) => n.state === 'decided' && (n.disposition === 'rework' || n.disposition === 'repair'),
  );
  if (open.length && open.length === reworks.length) {
    // only a decided rework is left: the part may now go through the stage it was sent back to
    const stageId = reworks[0]!.reworkStageId;
    if (item.status !== 'in_process' || item.currentStageId !== stageId) {
      await moveItem(
        ctx,
        transaction,
        item,
        { status: 'in_process', currentStageId: stageId },
        'item.released_for_rework',
        {
          byNcr: ncr.number,
          rework: reworks[0]!.number,
        },
      );
    }
    return;
  }
  if (open.length) return;
  let next: ItemMove;
  const result = ncr.stageResultId ? await StageResult.findByPk(ncr.stageResultId, { transaction }) : null;
  // a use-as-is accepts the failure; a void after a passing correction means the stage was passed
  const corrected = result
    ? await StageResult.findOne({ where: { supersedesId: result.id, verdict: 'pass' }, transaction })
    : null;
  if (result && (ncr.disposition === 'use_as_is' || corrected)) {
    const route = await routeOfItem(item, transaction);
    const steps = route?.steps ?? [];
    const following = nextStep(steps, result.stageId);
    next = following
      ? { status: 'in_process', currentStageId: following.stageId }
      : { status: 'finished', currentStageId: null };
  } else {
    let back = ncr.itemStatusBefore && ncr.itemStatusBefore !== 'on_hold' ? ncr.itemStatusBefore : 'in_process';
    // held while it was in a unit, taken out since: it is a finished part again, not installed
    if (back === 'installed' && !(await installedIn(item.id, transaction))) back = 'finished';
    next = { status: back as ItemStatus };
  }
  if (next.status === item.status && (next.currentStageId ?? item.currentStageId) === item.currentStageId) return;
  await moveItem(ctx, transaction, item, { currentStageId: item.currentStageId, ...next }, 'item.released_from_hold', {
    byNcr: ncr.number,
  });
  await notifyIfReleasable(item.sequelize as Sequelize, item.id, transaction);
}

/**
 * Carries out a decision once it is fully signed: rework sends the part back, scrap ends it. The
 * step is recorded under the person who completed the decision, with their own words.
 */
export async function carryOut(
  ctx: Ctx,
  t: Transaction,
  ncr: Nonconformance,
  item: Item | null,
  signer: string,
  words: string,
) {
  await transition(ctx, t, ncr, NCR_LIFECYCLE.disposition.to, words, {
    awaitingSecondSignature: false,
    decidedAt: new Date(),
  });
  const lot = ncr.partLotId ? await PartLot.findByPk(ncr.partLotId, { transaction: t, lock: t.LOCK.UPDATE }) : null;
  const serial = item?.serial ?? (lot ? `lot ${lot.lotCode}` : '');
  await enqueueMail(t, await decidedMail(t, ncr, serial, signer));
  if (!item) {
    if (lot) {
      const status =
        ncr.disposition === 'return_to_supplier' ? 'returned' : ncr.disposition === 'scrap' ? 'scrapped' : lot.status;
      if (status !== lot.status) {
        const before = { status: lot.status };
        await lot.update({ status }, { transaction: t });
        await recordAudit(ctx, t, {
          action: `lot.${status}`,
          entity: 'part_lot',
          entityId: lot.id,
          before,
          after: { status, byNcr: ncr.number },
        });
      }
    }
    await transition(ctx, t, ncr, 'closed', `${DISPOSITION_LABELS[ncr.disposition!]}: closed on decision`);
    return;
  }
  switch (ncr.disposition) {
    case 'rework':
    case 'repair': {
      await moveItem(ctx, t, item, { status: 'on_hold', currentStageId: ncr.reworkStageId }, 'item.sent_back', {
        byNcr: ncr.number,
        disposition: ncr.disposition,
      });
      // with no other NCR holding it, the part may now be recorded at the rework stage
      if (!(await blockingNcrsOf(item.id, ncr.reworkStageId!, t)).length) {
        await moveItemQuietly(t, item, { status: 'in_process' });
      }
      return;
    }
    case 'scrap': {
      await moveItem(ctx, t, item, { status: 'scrapped', currentStageId: null }, 'item.scrapped', {
        byNcr: ncr.number,
      });
      await transition(ctx, t, ncr, 'closed', 'Scrapped: nothing further to do');
      return;
    }
    case 'use_as_is':
    case 'return_to_supplier': {
      await transition(ctx, t, ncr, 'closed', `${DISPOSITION_LABELS[ncr.disposition]}: closed on decision`);
      await releaseIfClear(ctx, t, item, ncr);
      return;
    }
  }
}

export async function reworkProof(ncr: Nonconformance, transaction: Transaction) {
  if (!ncr.itemId || !ncr.reworkStageId || !ncr.decidedAt) return null;
  return StageResult.findOne({
    where: { itemId: ncr.itemId, stageId: ncr.reworkStageId, verdict: 'pass', createdAt: { [Op.gt]: ncr.decidedAt } },
    order: [['id', 'DESC']],
    transaction,
  });
}
