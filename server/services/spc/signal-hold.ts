import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { RUN_RULE_TEXT, type RunRule } from '../../../shared/domain/spc/index.js';
import type { StoredSignalJson } from '../../../shared/schemas/spc.js';
import { mayMove } from '../../../shared/domain/item-lifecycle.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { moveItem } from '../item-moves.js';
import { conflict, notFound } from '../../errors.js';
import { Item, Nonconformance, SpcSignal } from '../../models/index.js';
import { raiseNonconformance } from '../ncrs/index.js';
import { lockUnitsReachedBy } from '../unit-locks.js';
import { SIGNALS_SQL, presentSignal, type SignalRow } from './signal-list.js';

/** Holding a part for a control chart signal: an NCR, and the part on hold. */

/**
 * Puts a part on hold for a signal, through the NCR path. The caller has already locked the units
 * the part reaches and then the part's row (the lock protocol, server/services/unit-locks.ts).
 */
export async function holdForSignal(
  sequelize: Sequelize,
  ctx: Ctx,
  transaction: Transaction,
  item: Item,
  description: string,
  origin: string,
): Promise<Nonconformance> {
  const ncr = await raiseNonconformance(sequelize, ctx, transaction, {
    itemId: item.id,
    itemSerial: item.serial,
    itemStatusBefore: item.status,
    stageId: item.currentStageId,
    stageResultId: null,
    severity: 'minor',
    defectCode: null,
    description,
    failing: [],
    origin,
  });
  // a shipped unit is not held in the plant (as for a concern): the NCR stands, containment is in the field
  if (item.status !== 'on_hold' && mayMove(item.status, 'on_hold')) {
    await moveItem(ctx, transaction, item, { status: 'on_hold' }, 'item.held', { byNcr: ncr.number });
  }
  return ncr;
}

/** Quality or a supervisor puts a signal's part on hold after looking at the chart: an NCR, as a concern is. */
export async function holdSignalPart(
  sequelize: Sequelize,
  ctx: Ctx,
  id: number,
  reason: string,
): Promise<StoredSignalJson> {
  await sequelize.transaction(async (transaction) => {
    const signal = await SpcSignal.findByPk(id, { transaction });
    if (!signal) throw notFound('That signal');
    // the lock protocol: the units the part reaches, then the part, then the signal rows
    await lockUnitsReachedBy(sequelize, { itemId: signal.itemId }, transaction);
    const item = (await Item.findByPk(signal.itemId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const siblings = await SpcSignal.findAll({
      where: { stageResultId: signal.stageResultId, spcLimitsId: signal.spcLimitsId },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    const held = siblings.find((x) => x.nonconformanceId !== null);
    if (held) {
      const ncr = await Nonconformance.findByPk(held.nonconformanceId!, { transaction });
      throw conflict(`${item.serial} is already held for this signal under ${ncr?.number ?? 'an NCR'}.`, {
        ncr: ncr?.number,
      });
    }
    if (item.status === 'scrapped') throw conflict(`${item.serial} has been scrapped: there is nothing left to hold.`);
    const ref = (await resolveScopeForSignal(sequelize, signal, transaction)) ?? null;
    const ncr = await holdForSignal(
      sequelize,
      ctx,
      transaction,
      item,
      `Control chart signal on ${item.serial}${ref ? `, ${ref}` : ''}: ${RUN_RULE_TEXT[signal.rule as RunRule]}. ${reason}`,
      'Raised from a control chart signal',
    );
    const now = new Date();
    for (const s of siblings) {
      await s.update({ nonconformanceId: ncr.id, heldById: ctx.actor!.id, heldAt: now }, { transaction });
    }
    await recordAudit(ctx, transaction, {
      action: 'spc.signal_held',
      entity: 'spc_signal',
      entityId: signal.id,
      before: { nonconformance: null },
      after: { nonconformance: ncr.number, item: item.serial, reason },
    });
  });
  const [row] = await sequelize.query<SignalRow>(`${SIGNALS_SQL} WHERE g.id = :id`, {
    type: QueryTypes.SELECT,
    replacements: { id },
  });
  return presentSignal(row!);
}

async function resolveScopeForSignal(sequelize: Sequelize, signal: SpcSignal, transaction: Transaction) {
  const [row] = await sequelize.query<{ name: string }>(
    'SELECT c.name FROM spc_limits l JOIN characteristics c ON c.id = l.characteristic_id WHERE l.id = :id',
    { type: QueryTypes.SELECT, replacements: { id: signal.spcLimitsId }, transaction },
  );
  return row?.name ?? null;
}
