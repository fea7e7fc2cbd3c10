import type { Transaction } from 'sequelize';
import { mayMove, type ItemStatus } from '../../shared/domain/item-lifecycle.js';
import { auditedUpdate, type Ctx } from '../audit.js';
import type { Item } from '../models/index.js';

/** Where an item goes: its new status, and its stage where that changes too. */
export type ItemMove = { status: ItemStatus; currentStageId?: number | null };

/** A move the item lifecycle does not hold: a fault in the code, not in the request. */
export class ItemMoveRefused extends Error {}

function checkMove(item: Item, to: ItemMove) {
  if (!mayMove(item.status, to.status)) {
    throw new ItemMoveRefused(`${item.serial} cannot move from ${item.status} to ${to.status}.`);
  }
}

/**
 * Moves an item to a new status (and stage), with its audit event (`item.<verb>`, before and after
 * derived from the move). `extra` says why: the NCR, the unit, the result.
 */
export async function moveItem(
  ctx: Ctx,
  transaction: Transaction,
  item: Item,
  to: ItemMove,
  action: string,
  extra: Record<string, unknown> = {},
): Promise<void> {
  checkMove(item, to);
  await auditedUpdate(
    ctx,
    transaction,
    item,
    to,
    { action, entity: 'item', entityId: item.serial, extra },
    {
      currentStageId: 'currentStage',
    },
  );
}

/**
 * The same move where the event is written elsewhere (a result's own event carries the item's
 * new place): checked against the lifecycle, not audited here.
 */
export async function moveItemQuietly(transaction: Transaction, item: Item, to: ItemMove): Promise<void> {
  checkMove(item, to);
  await item.update(to, { transaction });
}
