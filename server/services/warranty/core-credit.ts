import type { Sequelize } from 'sequelize';
import type { z } from 'zod';
import type { CreditRevisionJson, creditRevisionBody } from '../../../shared/schemas/warranty.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, invalid, notFound } from '../../errors.js';
import { Attachment, CoreCreditRevision, CoreReceipt, Item } from '../../models/index.js';
import { claimUploads, presentAttachment } from '../attachments.js';
import { findBySerial } from '../items.js';
import { groupBy } from '../group-by.js';
import { namesOf } from './people.js';

type Revision = z.output<typeof creditRevisionBody>;

/**
 * Core credit settled: the dock decides a customer's core credit on what it can see; once the core
 * is torn down the evidence may say otherwise (a cracked block, a crank past its last undersize).
 * A revision is a new record with its reason, who and when; the dock's decision is never changed,
 * and the intake log shows both.
 */

async function receiptOf(serialInput: string, transaction?: Parameters<typeof findBySerial>[1]) {
  const item = await findBySerial(serialInput, transaction);
  if (item.kind !== 'core') throw notFound(`Core ${item.serial}`);
  const receipt = (await CoreReceipt.findOne({ where: { itemId: item.id }, transaction }))!;
  return { item, receipt };
}

export async function creditRevisions(serialInput: string): Promise<CreditRevisionJson[]> {
  const { item } = await receiptOf(serialInput);
  const rows = await CoreCreditRevision.findAll({ where: { coreItemId: item.id }, order: [['id', 'ASC']] });
  const [name, photos] = await Promise.all([
    namesOf(rows.map((r) => r.revisedById)),
    rows.length
      ? Attachment.findAll({
          where: { entity: 'core_credit_revision', entityId: rows.map((r) => String(r.id)) },
          order: [['id', 'ASC']],
        })
      : [],
  ]);
  const photosOf = groupBy(photos, (p) => p.entityId);
  return rows.map((r) => ({
    creditDecision: r.creditDecision,
    reason: r.reason,
    revisedBy: name(r.revisedById) ?? '',
    revisedAt: r.createdAt.toISOString(),
    photos: (photosOf.get(String(r.id)) ?? []).map(presentAttachment),
  }));
}

export async function reviseCoreCredit(sequelize: Sequelize, ctx: Ctx, serialInput: string, body: Revision) {
  const serial = await sequelize.transaction(async (transaction) => {
    const found = await receiptOf(serialInput, transaction);
    const item = (await Item.findByPk(found.item.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const { receipt } = found;
    if (receipt.source !== 'customer_return') {
      throw conflict(`${item.serial} was bought, not returned by a customer: it carries no core credit.`);
    }
    if (item.status !== 'torn_down') {
      throw conflict(`${item.serial} has not been torn down: the credit is settled on the teardown's evidence.`, {
        reason: 'not_torn_down',
      });
    }
    const last = await CoreCreditRevision.findOne({
      where: { coreItemId: item.id },
      order: [['id', 'DESC']],
      transaction,
    });
    const current = last?.creditDecision ?? receipt.creditDecision;
    if (current === body.creditDecision) {
      throw invalid(`The credit on ${item.serial} is already ${current}.`, {
        creditDecision: 'That is the credit as it stands.',
      });
    }
    const revision = await CoreCreditRevision.create(
      { coreItemId: item.id, creditDecision: body.creditDecision, reason: body.reason, revisedById: ctx.actor!.id },
      { transaction },
    );
    await claimUploads(ctx, transaction, body.photoIds, 'core_credit_revision', revision.id);
    await recordAudit(ctx, transaction, {
      action: 'core.credit_revised',
      entity: 'item',
      entityId: item.serial,
      before: { creditDecision: current, atDock: receipt.creditDecision },
      after: { creditDecision: body.creditDecision, reason: body.reason, photoIds: body.photoIds },
    });
    return item.serial;
  });
  return creditRevisions(serial);
}
