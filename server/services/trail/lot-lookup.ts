import { QueryTypes } from 'sequelize';
import type { LotLookupJson } from '../../../shared/schemas/trail.js';
import { freshnessOf, type ReadSide } from '../../read-side.js';

/** The lot lookup's one statement (`:lotCode` however it was typed); the benchmark runs it too. */
export const LOT_LOOKUP_SQL = `SELECT pl.id AS lot_id, pl.part_kind AS kind, s.name AS supplier, pl.part_number, pl.lot_code, pl.status,
       i.serial, f.code AS family, i.status AS unit_status, ul.created_at AS installed_at,
       to_char(sh.ship_date, 'YYYY-MM-DD') AS ship_date, c.name AS customer
  FROM part_lots pl
  JOIN suppliers s ON s.id = pl.supplier_id
  LEFT JOIN unit_lots ul ON ul.part_lot_id = pl.id
  LEFT JOIN items i ON i.id = ul.unit_item_id
  LEFT JOIN engine_families f ON f.id = i.engine_family_id
  LEFT JOIN shipments sh ON sh.unit_item_id = i.id AND sh.returned_at IS NULL
  LEFT JOIN customers c ON c.id = sh.customer_id
 WHERE upper(pl.lot_code) = upper(:lotCode)
 ORDER BY pl.id, ul.created_at`;

/** Every unit a lot code went into, with its ship date and customer (one query). */
export async function lotLookup(read: ReadSide, lotCode: string): Promise<LotLookupJson> {
  const readFrom = await freshnessOf(read);
  const rows = await read.db.query<{
    lot_id: number;
    kind: string;
    supplier: string;
    part_number: string;
    lot_code: string;
    status: string;
    serial: string | null;
    family: string | null;
    unit_status: string | null;
    installed_at: Date | null;
    ship_date: string | null;
    customer: string | null;
  }>(LOT_LOOKUP_SQL, { type: QueryTypes.SELECT, replacements: { lotCode } });
  const lots = new Map<number, LotLookupJson['lots'][number]>();
  for (const r of rows) {
    let lot = lots.get(r.lot_id);
    if (!lot) {
      lot = {
        kind: r.kind,
        supplier: r.supplier,
        partNumber: r.part_number,
        lotCode: r.lot_code,
        status: r.status,
        units: [],
      };
      lots.set(r.lot_id, lot);
    }
    if (r.serial) {
      lot.units.push({
        serial: r.serial,
        family: r.family ?? '',
        status: r.unit_status ?? '',
        installedAt: new Date(r.installed_at!).toISOString(),
        shipDate: r.ship_date,
        customer: r.customer,
      });
    }
  }
  return { lotCode: lotCode.toUpperCase(), lots: [...lots.values()], readFrom };
}
