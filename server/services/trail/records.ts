import { QueryTypes } from 'sequelize';
import type { NcrState } from '../../../shared/schemas/ncr.js';
import { Signature } from '../../models/index.js';
import { selectModels, type ReadSide } from '../../read-side.js';

export type NcrRow = {
  id: number;
  number: string;
  item_id: number | null;
  lot_code: string | null;
  state: string;
  severity: string;
  description: string;
  disposition: string | null;
  disposition_reason: string | null;
  created_at: Date;
};

export type TransitionRow = {
  nonconformance_id: number;
  created_at: Date;
  from_state: NcrState | null;
  to_state: NcrState;
  actor: string;
  reason: string;
};

export type LotRow = {
  kind: string;
  supplier: string;
  part_number: string;
  lot_code: string;
  quantity: number;
  attributes: Record<string, unknown>;
  size_class: string | null;
  matched_to: string | null;
};

/**
 * The NCRs of the items in `scope` and of the lots in unit `top`, then their transitions and
 * signatures at once (nonconformances_item_state_idx).
 */
export async function ncrsOfTree(read: ReadSide, scope: number[], top: number) {
  const ncrs = await read.db.query<NcrRow>(
    `SELECT n.id, n.number, n.item_id, pl.lot_code, n.state, n.severity, n.description, n.disposition,
            n.disposition_reason, n.created_at
       FROM nonconformances n LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
      WHERE n.item_id IN (:scope)
         OR n.part_lot_id IN (SELECT part_lot_id FROM unit_lots WHERE unit_item_id = :top)
      ORDER BY n.created_at, n.id`,
    { type: QueryTypes.SELECT, replacements: { scope, top } },
  );
  const ncrIds = ncrs.map((n) => n.id);
  if (!ncrIds.length) return { ncrs, transitions: [] as TransitionRow[], signatures: [] as Signature[] };
  const [transitions, signatures] = await Promise.all([
    read.db.query<TransitionRow>(
      `SELECT t.nonconformance_id, t.created_at, t.from_state, t.to_state, u.name AS actor, t.reason
         FROM nonconformance_transitions t JOIN users u ON u.id = t.actor_id
        WHERE t.nonconformance_id IN (:ncrIds) ORDER BY t.id`,
      { type: QueryTypes.SELECT, replacements: { ncrIds } },
    ),
    selectModels(
      read,
      Signature,
      "entity = 'nonconformance' AND entity_id IN (:numbers)",
      { numbers: ncrs.map((n) => n.number) },
      'id',
    ),
  ]);
  return { ncrs, transitions, signatures };
}

/** The purchased lots in unit `top`, with the size class each was matched to. */
export function lotsOfUnit(read: ReadSide, top: number) {
  return read.db.query<LotRow>(
    `SELECT pl.part_kind AS kind, s.name AS supplier, pl.part_number, pl.lot_code, ul.quantity, pl.attributes,
            ul.size_class, ul.matched_to
       FROM unit_lots ul JOIN part_lots pl ON pl.id = ul.part_lot_id JOIN suppliers s ON s.id = pl.supplier_id
      WHERE ul.unit_item_id = :top ORDER BY ul.id`,
    { type: QueryTypes.SELECT, replacements: { top } },
  );
}
