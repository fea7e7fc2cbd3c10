import type { Model, Transaction } from 'sequelize';
import { mayMove, type ItemStatus } from '../../shared/domain/item-lifecycle.js';
import { recordAudit, type Ctx } from '../audit.js';
import type { Item } from '../models/index.js';

/** What an audited change records besides the fields it changed. */
export type AuditNote = { action: string; entity: string; entityId: string | number; extra?: Record<string, unknown> };

/**
 * Writes a change to a record and its audit event in the caller's transaction. The event's before
 * holds the changed fields as they were, its after the same fields as they are now plus `extra`;
 * a field can be shown under another name (`currentStageId` as `currentStage`) through `names`.
 */
export async function auditedUpdate<M extends Model>(
  ctx: Ctx,
  transaction: Transaction,
  record: M,
  change: Partial<M['_attributes']>,
  note: AuditNote,
  names: Record<string, string> = {},
): Promise<void> {
  const before: Record<string, unknown> = {};
  const after: Record<string, unknown> = {};
  for (const [field, value] of Object.entries(change)) {
    const shown = names[field] ?? field;
    before[shown] = record.get(field);
    after[shown] = value;
  }
  await record.update(change, { transaction });
  await recordAudit(ctx, transaction, {
    action: note.action,
    entity: note.entity,
    entityId: note.entityId,
    before,
    after: { ...after, ...note.extra },
  });
}

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
