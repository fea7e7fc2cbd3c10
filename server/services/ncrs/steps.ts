import { type Sequelize, type Transaction } from 'sequelize';
import type { Role } from '../../../shared/roles.js';
import { NCR_STATE_LABELS, type NcrAction, type NcrState } from '../../../shared/schemas/ncr.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, notFound } from '../../errors.js';
import { Item, Nonconformance, NonconformanceTransition } from '../../models/index.js';
import { signWithPassword } from '../signatures.js';
import { lockUnitsReachedBy } from '../unit-locks.js';
import { subjectOf } from './holds.js';
import { ncrActionsOpen, stepOpen } from '../../../shared/domain/ncr-lifecycle.js';

export async function findNcr(number: string, transaction?: Transaction, lock = false) {
  const ncr = await Nonconformance.findOne({
    where: { number },
    transaction,
    ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}),
  });
  if (!ncr) throw notFound(`NCR ${number}`);
  return ncr;
}

// ——— transitions ———

const ACTION_WORDS: Record<NcrAction, string> = {
  review: 'start the review',
  disposition: 'decide it',
  countersign: 'countersign it',
  close: 'close it',
  void: 'void it',
};

export function refuse(ncr: Nonconformance, action: NcrAction, ctx: Ctx): never {
  const allowed = ncrActionsOpen(ncr, ctx.actor!.role as Role, ctx.actor!.id);
  const label = NCR_STATE_LABELS[ncr.state as NcrState].toLowerCase();
  throw conflict(
    `${ncr.number} is ${label}${ncr.awaitingSecondSignature ? ' and waiting for a second signature' : ''}: you cannot ${ACTION_WORDS[action]} now.${
      allowed.length
        ? ` What you can do: ${allowed.map((a) => ACTION_WORDS[a]).join(', ')}.`
        : ' It takes no further steps.'
    }`,
    { reason: 'invalid_transition', state: ncr.state, allowed },
  );
}

/** Refuses the step unless the NCR, as it stands, admits it (NCR_LIFECYCLE). */
export function ensureStep(ncr: Nonconformance, action: NcrAction, ctx: Ctx) {
  if (!stepOpen(ncr, action)) refuse(ncr, action, ctx);
}

export async function transition(
  ctx: Ctx,
  transaction: Transaction,
  ncr: Nonconformance,
  to: NcrState,
  reason: string,
  changes: Partial<Nonconformance> = {},
) {
  const from = ncr.state as NcrState;
  const before = { state: from, disposition: ncr.disposition, assigneeId: ncr.assigneeId };
  await ncr.update(
    { ...changes, state: to, ...(to === 'closed' || to === 'voided' ? { closedAt: new Date() } : {}) },
    { transaction },
  );
  await NonconformanceTransition.create(
    { nonconformanceId: ncr.id, fromState: from, toState: to, actorId: ctx.actor!.id, reason },
    { transaction },
  );
  await recordAudit(ctx, transaction, {
    action: `ncr.${to}`,
    entity: 'nonconformance',
    entityId: ncr.number,
    before,
    after: { state: to, disposition: ncr.disposition, reworkStageId: ncr.reworkStageId, reason },
  });
}

export function sign(
  ctx: Ctx,
  transaction: Transaction,
  ncr: Nonconformance,
  input: { password: string; meaning: string; reason: string },
) {
  return signWithPassword(ctx, transaction, {
    entity: 'nonconformance',
    entityId: ncr.number,
    ...input,
    refused: 'nothing was signed or changed.',
  });
}

/**
 * Every step follows the lock protocol (unit-locks.ts): the units the NCR's subject reaches, then
 * its item, then the NCR itself. A step can scrap a part or return a lot, which the release gate
 * must see, so it takes the same unit locks a release does.
 */
export async function step<T>(
  sequelize: Sequelize,
  number: string,
  fn: (t: Transaction, ncr: Nonconformance, item: Item | null) => Promise<T>,
): Promise<T> {
  return sequelize.transaction(async (transaction) => {
    const peek = await findNcr(number, transaction);
    await lockUnitsReachedBy(sequelize, subjectOf(peek), transaction);
    const item = peek.itemId ? await Item.findByPk(peek.itemId, { transaction, lock: transaction.LOCK.UPDATE }) : null;
    const ncr = await findNcr(number, transaction, true);
    return fn(transaction, ncr, item);
  });
}
