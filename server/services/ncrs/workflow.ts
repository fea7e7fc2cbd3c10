import { Op, type Sequelize, type Transaction } from 'sequelize';
import { NCR_LIFECYCLE, personMayTake } from '../../../shared/domain/ncr-lifecycle.js';
import { can } from '../../../shared/permissions.js';
import {
  DISPOSITION_LABELS,
  OPEN_NCR_STATES,
  type DispositionBody,
  type NcrState,
} from '../../../shared/schemas/ncr.js';
import { auditedUpdate, recordAudit, type Ctx } from '../../audit.js';
import { conflict, invalid } from '../../errors.js';
import { enqueueMail } from '../../mail/messages.js';
import { Item, Nonconformance, Stage, StageResult, User } from '../../models/index.js';
import { routeOfItem } from '../items.js';
import { countersignMails } from './mail.js';
import { carryOut, releaseIfClear, reworkProof } from './outcome.js';
import { ncrDetail } from './present.js';
import { ensureStep, refuse, sign, step, transition } from './steps.js';
import { comesAfter, stepIndex } from '../../../shared/domain/route.js';

/**
 * The NCR workflow's steps (the table: shared/domain/ncr-lifecycle.ts). Each
 * step records who, when and why (a transition row and an audit event, in one transaction);
 * dispositions are signed with the decider's password, and a use-as-is on a critical NCR needs a
 * second quality signer. While an NCR is open its item is held — except that a rework or repair
 * lets the item through the one stage it was sent back to.
 */
export async function startReview(sequelize: Sequelize, ctx: Ctx, number: string, note: string) {
  await step(sequelize, number, async (t, ncr) => {
    ensureStep(ncr, 'review', ctx);
    await transition(ctx, t, ncr, NCR_LIFECYCLE.review.to, note || 'Review started', {
      assigneeId: ncr.assigneeId ?? ctx.actor!.id,
    });
  });
  return ncrDetail(number, ctx);
}

export async function assignNcr(sequelize: Sequelize, ctx: Ctx, number: string, assigneeId: number | null) {
  await step(sequelize, number, async (t, ncr) => {
    if (!OPEN_NCR_STATES.includes(ncr.state as NcrState)) refuse(ncr, 'review', ctx);
    if (assigneeId) {
      const u = await User.findByPk(assigneeId, { transaction: t });
      if (!u || !u.active || !can(u.role, 'ncr.disposition')) {
        throw invalid('Assign the NCR to an active quality engineer.', { assigneeId: 'Not a quality engineer.' });
      }
    }
    await auditedUpdate(
      ctx,
      t,
      ncr,
      { assigneeId },
      { action: 'ncr.assigned', entity: 'nonconformance', entityId: ncr.number },
    );
  });
  return ncrDetail(number, ctx);
}

export async function updateContainment(sequelize: Sequelize, ctx: Ctx, number: string, containment: string) {
  await step(sequelize, number, async (t, ncr) => {
    if (!OPEN_NCR_STATES.includes(ncr.state as NcrState)) {
      throw conflict(`${ncr.number} is ${ncr.state}: its containment note is part of the closed record.`);
    }
    await auditedUpdate(
      ctx,
      t,
      ncr,
      { containment },
      { action: 'ncr.containment', entity: 'nonconformance', entityId: ncr.number },
    );
  });
  return ncrDetail(number, ctx);
}

export async function disposition(sequelize: Sequelize, ctx: Ctx, number: string, body: DispositionBody) {
  await step(sequelize, number, async (t, ncr, item) => {
    ensureStep(ncr, 'disposition', ctx);
    if (body.disposition === 'return_to_supplier' && !ncr.partLotId) {
      throw invalid('Return to supplier is for purchased lots; this NCR is on a part the plant remanufactures.', {
        disposition: 'Only for a purchased lot.',
      });
    }
    if (!item && (body.disposition === 'rework' || body.disposition === 'repair')) {
      throw invalid('A purchased lot has no route to send it back through: return it, scrap it or use it as is.', {
        disposition: 'Not for a lot.',
      });
    }
    let reworkStageId: number | null = null;
    if (body.reworkStage && item) {
      const stage = await Stage.findOne({ where: { code: body.reworkStage }, transaction: t });
      const route = await routeOfItem(item, t);
      const steps = route?.steps ?? [];
      if (!stage || stepIndex(steps, stage.id) < 0) {
        throw invalid(`Choose a stage on the route of ${item.serial}.`, { reworkStage: 'Not on this part’s route.' });
      }
      // back to the stage where it was found, or an earlier one: never past stages it has not passed
      const foundAt = ncr.stageId ?? item.currentStageId;
      if (comesAfter(steps, stage.id, foundAt)) {
        const where = steps[stepIndex(steps, foundAt)]!.stage.name;
        throw invalid(`A rework goes back to ${where}, where the problem was found, or to an earlier stage.`, {
          reworkStage: `${where} or earlier.`,
        });
      }
      reworkStageId = stage.id;
    }
    const critical = ncr.severity === 'critical' && body.disposition === 'use_as_is';
    const { user } = await sign(ctx, t, ncr, {
      password: body.password,
      meaning: `${critical ? 'First signature: ' : ''}${DISPOSITION_LABELS[body.disposition]} on ${ncr.number}`,
      reason: body.reason,
    });
    await ncr.update(
      {
        disposition: body.disposition,
        dispositionReason: body.reason,
        reworkStageId,
        decidedById: user.id,
        awaitingSecondSignature: critical,
      },
      { transaction: t },
    );
    if (critical) {
      await recordAudit(ctx, t, {
        action: 'ncr.first_signature',
        entity: 'nonconformance',
        entityId: ncr.number,
        after: { disposition: body.disposition, reason: body.reason, signedBy: user.name },
      });
      await enqueueMail(t, await countersignMails(t, ncr, item?.serial ?? '', user));
      return;
    }
    await carryOut(ctx, t, ncr, item, user.name, `${DISPOSITION_LABELS[body.disposition]}: ${body.reason}`);
  });
  return ncrDetail(number, ctx);
}

export async function countersign(
  sequelize: Sequelize,
  ctx: Ctx,
  number: string,
  body: { reason: string; password: string },
) {
  await step(sequelize, number, async (t, ncr, item) => {
    ensureStep(ncr, 'countersign', ctx);
    if (!personMayTake(ncr, 'countersign', ctx.actor!.id)) {
      throw conflict('A critical use-as-is needs a second quality engineer: the first signer cannot sign again.', {
        reason: 'same_signer',
      });
    }
    const { user } = await sign(ctx, t, ncr, {
      password: body.password,
      meaning: `Second signature: use as is on ${ncr.number}`,
      reason: body.reason,
    });
    await recordAudit(ctx, t, {
      action: 'ncr.second_signature',
      entity: 'nonconformance',
      entityId: ncr.number,
      after: { signedBy: user.name, reason: body.reason },
    });
    await carryOut(ctx, t, ncr, item, user.name, `Use as is, countersigned: ${body.reason}`);
  });
  return ncrDetail(number, ctx);
}

/** A rework or repair closes only after a new passing result at the stage it went back to. */
export async function closeNcr(sequelize: Sequelize, ctx: Ctx, number: string, note: string) {
  await step(sequelize, number, async (t, ncr, item) => {
    ensureStep(ncr, 'close', ctx);
    const proof = await reworkProof(ncr, t);
    if (!proof) {
      const stage = ncr.reworkStageId ? await Stage.findByPk(ncr.reworkStageId, { transaction: t }) : null;
      throw conflict(
        `${ncr.number} can close only after a new passing result at ${stage?.name ?? 'the rework stage'}.`,
        {
          reason: 'rework_not_passed',
        },
      );
    }
    const at = (await Stage.findByPk(proof.stageId, { transaction: t }))?.name ?? 'the rework stage';
    await transition(ctx, t, ncr, NCR_LIFECYCLE.close.to, note || `Rework passed at ${at}`);
    if (item) await releaseIfClear(ctx, t, item, ncr);
  });
  return ncrDetail(number, ctx);
}

/**
 * Called inside a station result's transaction: a result at the stage a rework sent the part back to
 * closes that NCR when it passes; when it fails, the new failure raises its own NCR, and the old one
 * closes pointing at it.
 */
export async function settleRework(
  ctx: Ctx,
  transaction: Transaction,
  item: Item,
  stageId: number,
  result: StageResult,
  newNcr: Nonconformance | null,
  stageName: string,
) {
  const waiting = await Nonconformance.findAll({
    where: {
      itemId: item.id,
      state: 'decided',
      reworkStageId: stageId,
      disposition: { [Op.in]: ['rework', 'repair'] },
    },
    transaction,
    lock: transaction.LOCK.UPDATE,
  });
  for (const ncr of waiting) {
    await transition(
      ctx,
      transaction,
      ncr,
      'closed',
      result.verdict === 'pass'
        ? `Rework passed at ${stageName}`
        : `Rework failed again at ${stageName}; carried on as ${newNcr?.number ?? 'a new NCR'}`,
    );
  }
  return waiting.map((n) => n.number);
}

export async function voidNcr(sequelize: Sequelize, ctx: Ctx, number: string, reason: string) {
  await step(sequelize, number, async (t, ncr, item) => {
    ensureStep(ncr, 'void', ctx);
    if (ncr.stageResultId) {
      const superseded = await StageResult.findOne({
        where: { supersedesId: ncr.stageResultId, verdict: 'pass' },
        transaction: t,
      });
      if (!superseded) {
        throw conflict(
          `${ncr.number} was raised by a failing result: a recorded failure is a fact. Disposition it, or correct the result first if the reading was wrong.`,
          { reason: 'raised_by_result' },
        );
      }
    }
    await transition(ctx, t, ncr, NCR_LIFECYCLE.void.to, reason, { awaitingSecondSignature: false });
    if (item) await releaseIfClear(ctx, t, item, ncr);
  });
  return ncrDetail(number, ctx);
}
