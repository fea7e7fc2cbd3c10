import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';

/**
 * The one lock protocol for everything that can stop a unit shipping.
 *
 * The release gate locks its unit's row (`FOR UPDATE`) and checks inside the lock. Every path that
 * can make a unit unreleasable — raising an NCR or a concern, any step of an NCR, putting something
 * on hold, scrapping or returning a part or lot, changing a lot's status, taking a part out of a
 * unit — first locks every unit its subject reaches, in id order, inside its own transaction:
 *
 *   a unit        → itself
 *   a part        → the unit it is installed in now
 *   a core        → the units its parts are installed in now
 *   a lot         → every unit it went into
 *
 * So the release and the change take turns on the same rows: whichever commits first, the other
 * sees it. Units are always locked before any other item or lot, lowest id first, so two writers
 * that reach the same units cannot deadlock.
 */
export type LockSubject = { itemId: number } | { serial: string } | { lotId: number };

const REACH_FROM_ITEM = `
  SELECT i.id FROM items i WHERE i.id = :id AND i.kind = 'long_block'
  UNION
  SELECT l.parent_item_id FROM item_links l
   WHERE l.child_item_id = :id AND l.link_type = 'installed_in' AND l.removed_at IS NULL
  UNION
  SELECT l.parent_item_id FROM item_links h
    JOIN item_links l ON l.child_item_id = h.child_item_id AND l.link_type = 'installed_in' AND l.removed_at IS NULL
   WHERE h.parent_item_id = :id AND h.link_type = 'harvested_from' AND h.removed_at IS NULL`;

const REACH_FROM_LOT = 'SELECT unit_item_id FROM unit_lots WHERE part_lot_id = :id';

export type LockedUnit = { id: number; serial: string; status: string };

/** Locks the units a subject reaches, lowest id first; returns them (with their status) for the caller. */
export async function lockUnitsReachedBy(
  sequelize: Sequelize,
  subject: LockSubject,
  transaction: Transaction,
): Promise<LockedUnit[]> {
  const reach = 'lotId' in subject ? REACH_FROM_LOT : REACH_FROM_ITEM;
  // by serial, the item's id is looked up in the same statement (the station's hot path)
  const id = 'lotId' in subject ? subject.lotId : 'itemId' in subject ? subject.itemId : null;
  const sql = `SELECT u.id, u.serial, u.status FROM items u WHERE u.id IN (${reach}) ORDER BY u.id FOR UPDATE OF u`;
  return sequelize.query<LockedUnit>(
    id === null ? sql.replaceAll(':id', '(SELECT id FROM items WHERE serial = :serial)') : sql,
    {
      type: QueryTypes.SELECT,
      replacements: id === null ? { serial: (subject as { serial: string }).serial } : { id },
      transaction,
    },
  );
}
