import { Op, type Transaction } from 'sequelize';
import { OPEN_NCR_STATES } from '../../../shared/schemas/ncr.js';
import type { HoldJson } from '../../../shared/schemas/results.js';
import { ItemLink, Nonconformance } from '../../models/index.js';
import { type LockSubject } from '../unit-locks.js';

/** Open NCRs that stop an item being recorded at `stageId` (all open ones when no stage is given). */
export async function blockingNcrsOf(itemId: number, stageId?: number, transaction?: Transaction): Promise<HoldJson[]> {
  const rows = await Nonconformance.findAll({
    where: { itemId, state: { [Op.in]: OPEN_NCR_STATES } },
    order: [['id', 'ASC']],
    transaction,
  });
  return rows
    .filter(
      (n) =>
        !(
          stageId !== undefined &&
          n.state === 'decided' &&
          (n.disposition === 'rework' || n.disposition === 'repair') &&
          n.reworkStageId === stageId
        ),
    )
    .map((n) => ({ number: n.number, state: n.state, description: n.description }));
}

export const openNcrsOf = (itemId: number, transaction?: Transaction) => blockingNcrsOf(itemId, undefined, transaction);

/** What an NCR is about, for the lock protocol: its part (or core, or unit), or its lot. */
export function subjectOf(ncr: Pick<Nonconformance, 'itemId' | 'partLotId'>): LockSubject {
  if (ncr.itemId) return { itemId: ncr.itemId };
  if (ncr.partLotId) return { lotId: ncr.partLotId };
  throw new Error('An NCR is about an item or a lot.');
}

export async function installedIn(itemId: number, transaction: Transaction) {
  const link = await ItemLink.findOne({
    where: { childItemId: itemId, linkType: 'installed_in', removedAt: null },
    transaction,
  });
  return link?.parentItemId ?? null;
}
