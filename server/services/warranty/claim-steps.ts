import type { Sequelize, Transaction } from 'sequelize';
import type { z } from 'zod';
import {
  CLAIM_DECISION_LABELS,
  CLAIM_STATE_LABELS,
  type ClaimState,
  type closeClaimBody,
  type decideClaimBody,
  type returnUnitBody,
} from '../../../shared/schemas/warranty.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { moveItem } from '../item-moves.js';
import { conflict, notFound } from '../../errors.js';
import { enqueueMail, quoted } from '../../mail/messages.js';
import { Customer, Item, Shipment, WarrantyClaim } from '../../models/index.js';
import { signWithPassword } from '../signatures.js';
import { lockUnitsReachedBy } from '../unit-locks.js';
import { claimDetail } from './claim-detail.js';
import { claimLink } from './common.js';
import { addressesOf } from './people.js';

/**
 * The claim's signed steps after it is logged: receiving takes the unit back (its shipment ends, so
 * the unit no longer counts as shipped), the decision (accepted, rejected with its reason, or
 * goodwill) and the closure. The teardown between them is in teardown.ts. Every step re-checks the
 * signer's password, writes its audit event and queues its mail in one transaction.
 */

/**
 * The claim, locked for a step. A step that changes the unit takes the unit's lock first, as the
 * lock protocol asks (units before any other row), then the claim's.
 */
export async function lockClaim(
  sequelize: Sequelize,
  number: string,
  transaction: Transaction,
  { unit = false }: { unit?: boolean } = {},
) {
  const found = await WarrantyClaim.findOne({ where: { number }, attributes: ['id', 'unitItemId'], transaction });
  if (!found) throw notFound(`Claim ${number}`);
  if (unit) await lockUnitsReachedBy(sequelize, { itemId: found.unitItemId }, transaction);
  return (await WarrantyClaim.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
}

export function refuseStep(claim: WarrantyClaim, step: string, allowed: ClaimState[]): never {
  throw conflict(
    `${claim.number} is ${CLAIM_STATE_LABELS[claim.state as ClaimState].toLowerCase()}: it cannot be ${step} now.`,
    { reason: 'invalid_transition', state: claim.state, allowed },
  );
}

type ReturnUnit = z.output<typeof returnUnitBody>;
type DecideClaim = z.output<typeof decideClaimBody>;
type CloseClaim = z.output<typeof closeClaimBody>;

/** Receiving takes the unit back against its claim: the shipment is ended and the unit is no longer shipped. */
export async function returnUnit(sequelize: Sequelize, ctx: Ctx, number: string, body: ReturnUnit) {
  await sequelize.transaction(async (transaction) => {
    const claim = await lockClaim(sequelize, number, transaction, { unit: true });
    if (claim.unitReturnedAt) throw conflict(`The unit of ${number} was already taken back.`, { reason: 'returned' });
    if (claim.state !== 'received') refuseStep(claim, 'taken back against', ['received']);
    const unit = (await Item.findByPk(claim.unitItemId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const shipment = (await Shipment.findByPk(claim.shipmentId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    if (shipment.returnedAt) throw conflict(`${unit.serial} is already back from order ${shipment.reference}.`);
    const { user } = await signWithPassword(ctx, transaction, {
      entity: 'warranty_claim',
      entityId: number,
      meaning: `Received ${unit.serial} back under claim ${number}`,
      reason: body.note || `Returned from order ${shipment.reference}`,
      password: body.password,
      refused: 'the unit was not taken back.',
    });
    const now = new Date();
    await shipment.update({ returnedAt: now }, { transaction });
    await claim.update({ unitReturnedAt: now, returnedById: user.id }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'warranty_claim.unit_returned',
      entity: 'warranty_claim',
      entityId: number,
      after: { unit: unit.serial, shipment: shipment.reference, returnedAt: now, note: body.note, signedBy: user.name },
    });
    await moveItem(ctx, transaction, unit, { status: 'returned', currentStageId: null }, 'item.returned', {
      claim: number,
      shipment: shipment.reference,
    });
    const to = await addressesOf(['warranty', 'supervisor'], transaction);
    await enqueueMail(
      transaction,
      to.map((address) => ({
        to: address,
        subject: `Claim ${number}: ${unit.serial} is back at the plant, ready for teardown`,
        text: [
          `${user.name} took ${unit.serial} back from order ${shipment.reference} against claim ${number}.`,
          ...(body.note ? ['', quoted(body.note)] : []),
          '',
          `It waits for its teardown; record each finding against the part it concerns: ${claimLink(number)}`,
          '',
          '— Coretrail',
        ].join('\n'),
        reason: 'warranty_claim.unit_returned',
      })),
    );
  });
  return claimDetail(sequelize, number);
}

/** The desk's signed decision. A rejection may come before any teardown (outside the terms, say). */
export async function decideClaim(sequelize: Sequelize, ctx: Ctx, number: string, body: DecideClaim) {
  await sequelize.transaction(async (transaction) => {
    const claim = await lockClaim(sequelize, number, transaction);
    const allowed: ClaimState[] = body.decision === 'rejected' ? ['received', 'torn_down'] : ['torn_down'];
    if (!allowed.includes(claim.state as ClaimState)) {
      if (claim.state === 'received') {
        throw conflict(`${number} waits for its teardown: only a rejection can be decided before it.`, {
          reason: 'invalid_transition',
          state: claim.state,
          allowed: ['torn_down'],
        });
      }
      refuseStep(claim, 'decided', allowed);
    }
    const label = CLAIM_DECISION_LABELS[body.decision];
    const { user } = await signWithPassword(ctx, transaction, {
      entity: 'warranty_claim',
      entityId: number,
      meaning: `Decided claim ${number}: ${label.toLowerCase()}`,
      reason: body.reason,
      password: body.password,
      refused: 'the claim was not decided.',
    });
    const before = { state: claim.state };
    await claim.update(
      {
        state: 'decided',
        decision: body.decision,
        decisionReason: body.reason,
        decidedById: user.id,
        decidedAt: new Date(),
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'warranty_claim.decided',
      entity: 'warranty_claim',
      entityId: number,
      before,
      after: { state: 'decided', decision: body.decision, reason: body.reason, signedBy: user.name },
    });
    const customer = await Customer.findByPk(claim.customerId, { transaction });
    const unit = (await Item.findByPk(claim.unitItemId, { transaction }))!;
    const quality = await addressesOf(['quality'], transaction);
    await enqueueMail(transaction, [
      ...(customer?.email
        ? [
            {
              to: customer.email,
              subject: `Your warranty claim ${number} on engine ${unit.serial}: ${label.toLowerCase()}`,
              text: [
                `Dear ${customer.name},`,
                '',
                `We have decided your claim ${number} on the remanufactured engine ${unit.serial}${claim.customerReference ? ` (your reference ${claim.customerReference})` : ''}: ${label.toLowerCase()}.`,
                '',
                'Why:',
                quoted(body.reason),
                '',
                `Signed: ${user.name}`,
              ].join('\n'),
              reason: `warranty_claim.${body.decision}`,
            },
          ]
        : []),
      ...quality.map((to) => ({
        to,
        subject: `Claim ${number} on ${unit.serial} decided: ${label.toLowerCase()}`,
        text: [
          `${user.name} decided claim ${number}: ${label.toLowerCase()}.`,
          '',
          quoted(body.reason),
          '',
          `The findings beside the build records, and any corrective action: ${claimLink(number)}`,
          '',
          '— Coretrail',
        ].join('\n'),
        reason: 'warranty_claim.decided',
      })),
    ]);
  });
  return claimDetail(sequelize, number);
}

export async function closeClaim(sequelize: Sequelize, ctx: Ctx, number: string, body: CloseClaim) {
  await sequelize.transaction(async (transaction) => {
    const claim = await lockClaim(sequelize, number, transaction);
    if (claim.state !== 'decided') refuseStep(claim, 'closed', ['decided']);
    const { user } = await signWithPassword(ctx, transaction, {
      entity: 'warranty_claim',
      entityId: number,
      meaning: `Closed claim ${number}`,
      reason: body.note || CLAIM_DECISION_LABELS[claim.decision!],
      password: body.password,
      refused: 'the claim was not closed.',
    });
    await claim.update({ state: 'closed', closedAt: new Date(), closedById: user.id }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'warranty_claim.closed',
      entity: 'warranty_claim',
      entityId: number,
      before: { state: 'decided' },
      after: { state: 'closed', note: body.note, signedBy: user.name },
    });
    const customer = await Customer.findByPk(claim.customerId, { transaction });
    const unit = (await Item.findByPk(claim.unitItemId, { transaction }))!;
    if (customer?.email) {
      await enqueueMail(transaction, [
        {
          to: customer.email,
          subject: `Your warranty claim ${number} on engine ${unit.serial} is closed`,
          text: [
            `Dear ${customer.name},`,
            '',
            `Claim ${number} on engine ${unit.serial} is closed: ${CLAIM_DECISION_LABELS[claim.decision!].toLowerCase()}.`,
            ...(body.note ? ['', quoted(body.note)] : []),
            '',
            `Signed: ${user.name}`,
          ].join('\n'),
          reason: 'warranty_claim.closed',
        },
      ]);
    }
  });
  return claimDetail(sequelize, number);
}
