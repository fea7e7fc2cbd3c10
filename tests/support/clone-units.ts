import { randomInt } from 'node:crypto';
import { QueryTypes, type Sequelize } from 'sequelize';
import { makeSerial } from '../../shared/domain/serial.js';
import type { PartKind } from '../../shared/schemas/reference.js';

/**
 * Copies of a releasable unit made in SQL, for drills that need hundreds of units: the unit, its
 * installed parts, the cores they came from, their current results and receipts, and lots of their
 * own (so an NCR on one copy's lot reaches that copy alone). Each copy passes the release gate
 * exactly as the template does, without the 20-odd station submissions a unit takes through the API.
 */
export type UnitCopy = {
  unit: string;
  parts: { kind: PartKind; serial: string }[];
  cores: string[];
  lots: string[];
};

type ItemRow = {
  id: number;
  kind: PartKind;
  engine_family_id: number;
  status: string;
  route_id: number | null;
  current_stage_id: number | null;
  position_label: string | null;
  created_by_id: number | null;
};

export async function cloneUnits(sequelize: Sequelize, templateSerial: string, copies: number): Promise<UnitCopy[]> {
  const q = <T extends object>(sql: string, replacements: Record<string, unknown>, transaction?: unknown) =>
    sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements, transaction: transaction as never });
  const [unit] = await q<ItemRow>('SELECT * FROM items WHERE serial = :s', { s: templateSerial });
  if (!unit) throw new Error(`no unit ${templateSerial}`);
  const parts = await q<ItemRow>(
    `SELECT i.* FROM item_links l JOIN items i ON i.id = l.child_item_id
      WHERE l.parent_item_id = :u AND l.link_type = 'installed_in' AND l.removed_at IS NULL ORDER BY i.id`,
    { u: unit.id },
  );
  const origins = await q<{ child: number; core: number }>(
    `SELECT child_item_id AS child, parent_item_id AS core FROM item_links
      WHERE child_item_id IN (:ids) AND link_type = 'harvested_from' AND removed_at IS NULL`,
    { ids: parts.map((p) => p.id) },
  );
  const cores = await q<ItemRow>('SELECT * FROM items WHERE id IN (:ids) ORDER BY id', {
    ids: [...new Set(origins.map((o) => o.core))],
  });
  const lots = await q<{ part_lot_id: number; quantity: number }>(
    'SELECT part_lot_id, quantity FROM unit_lots WHERE unit_item_id = :u ORDER BY id',
    { u: unit.id },
  );
  const template = [unit, ...parts, ...cores];

  return sequelize.transaction(async (transaction) => {
    const made: UnitCopy[] = [];
    for (let k = 0; k < copies; k++) {
      const idOf = new Map<number, number>();
      const serialOf = new Map<number, string>();
      for (const item of template) {
        const serial = makeSerial(item.kind, randomInt);
        const [row] = await q<{ id: number }>(
          `INSERT INTO items (serial, kind, engine_family_id, status, route_id, current_stage_id, position_label,
                              attributes, created_by_id)
           SELECT :serial, kind, engine_family_id, status, route_id, current_stage_id, position_label, attributes,
                  created_by_id FROM items WHERE id = :id
           RETURNING id`,
          { serial, id: item.id },
          transaction,
        );
        idOf.set(item.id, row!.id);
        serialOf.set(item.id, serial);
      }
      const map = JSON.stringify([...idOf]);
      await q(
        `WITH m AS (SELECT (e->>0)::int AS old, (e->>1)::int AS new FROM jsonb_array_elements(:map::jsonb) e),
         links AS (
           INSERT INTO item_links (parent_item_id, child_item_id, link_type, created_by_id, created_at)
           SELECT mp.new, mc.new, l.link_type, l.created_by_id, l.created_at
             FROM item_links l JOIN m mp ON mp.old = l.parent_item_id JOIN m mc ON mc.old = l.child_item_id
            WHERE l.removed_at IS NULL RETURNING 1),
         receipts AS (
           INSERT INTO core_receipts (item_id, casting_number, id_number, source, customer_id, supplier_id,
                                      source_reference, received_on, received_by_id, condition, grade, accepted,
                                      reject_reason, credit_decision, credit_reason, notes)
           SELECT m.new, r.casting_number, r.id_number || '-' || m.new, r.source, r.customer_id, r.supplier_id,
                  r.source_reference, r.received_on, r.received_by_id, r.condition, r.grade, r.accepted,
                  r.reject_reason, r.credit_decision, r.credit_reason, r.notes
             FROM core_receipts r JOIN m ON m.old = r.item_id RETURNING 1)
         INSERT INTO stage_results (item_id, stage_id, station_id, operator_id, gauge_id, started_at, finished_at,
                                    verdict, idempotency_key, notes)
         SELECT m.new, r.stage_id, r.station_id, r.operator_id, r.gauge_id, r.started_at, r.finished_at, r.verdict,
                gen_random_uuid(), r.notes
           FROM stage_results r JOIN m ON m.old = r.item_id
          WHERE NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = r.id)
         RETURNING 1`,
        { map },
        transaction,
      );
      const lotCodes: string[] = [];
      for (const l of lots) {
        const [lot] = await q<{ id: number; lot_code: string }>(
          `INSERT INTO part_lots (supplier_id, part_kind, part_number, lot_code, description, attributes, status)
           SELECT supplier_id, part_kind, part_number, lot_code || '-C' || :suffix, description, attributes, status
             FROM part_lots WHERE id = :id RETURNING id, lot_code`,
          { id: l.part_lot_id, suffix: `${idOf.get(unit.id)}` },
          transaction,
        );
        await q(
          'INSERT INTO unit_lots (unit_item_id, part_lot_id, quantity) VALUES (:u, :l, :n) RETURNING 1',
          { u: idOf.get(unit.id), l: lot!.id, n: l.quantity },
          transaction,
        );
        lotCodes.push(lot!.lot_code);
      }
      made.push({
        unit: serialOf.get(unit.id)!,
        parts: parts.map((p) => ({ kind: p.kind, serial: serialOf.get(p.id)! })),
        cores: cores.map((c) => serialOf.get(c.id)!),
        lots: lotCodes,
      });
    }
    return made;
  });
}
