import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';

/**
 * The stored readings SPC works on, read in one statement each and returned as one JSON document
 * (parsed natively, far cheaper than a row per reading). A result a correction superseded is left
 * out: the correction is what was measured. They are read from `result_values`, one row per result
 * and characteristic with its readings in arrays (db/migrations/…-result-values), found through
 * (characteristic, time); only a chart of one gauge reads `readings` themselves, as a result's
 * readings of one characteristic may come from two gauges. The statements are exported so the
 * benchmark runs exactly these in PostgreSQL alone.
 */

export type ReadingFilter = {
  familyId: number;
  characteristicId: number;
  from: Date;
  to: Date;
  stationId?: number | null;
  gaugeId?: number | null;
};

type Sql = { sql: string; replacements: Record<string, unknown> };

function where(f: ReadingFilter) {
  const replacements: Record<string, unknown> = {
    familyId: f.familyId,
    characteristicId: f.characteristicId,
    from: f.from.toISOString(),
    to: f.to.toISOString(),
  };
  const gauge = f.gaugeId ? 'AND r.gauge_id = :gaugeId' : '';
  const station = f.stationId ? 'AND sr.station_id = :stationId' : '';
  if (f.gaugeId) replacements.gaugeId = f.gaugeId;
  if (f.stationId) replacements.stationId = f.stationId;
  return { replacements, gauge, station };
}

/**
 * One row per part result: [result id, serial, time (ms since epoch), station id, gauge id, values].
 * Time is the reading's stored time, which is the result's transaction time; points are in that order.
 */
export function partReadingsSql(f: ReadingFilter): Sql {
  const w = where(f);
  if (f.gaugeId) return partReadingsByGaugeSql(f);
  return {
    replacements: w.replacements,
    sql: `SELECT coalesce(json_agg(json_build_array(v.stage_result_id, i.serial,
                                   (extract(epoch FROM v.created_at) * 1000)::bigint, v.station_id, v.gauge_id,
                                   array_remove(v.vals, NULL))
                                 ORDER BY v.created_at, v.stage_result_id), '[]') AS parts
  FROM result_values v
  JOIN items i ON i.id = v.item_id
 WHERE v.characteristic_id = :characteristicId AND v.created_at >= :from AND v.created_at < :to
   AND v.engine_family_id = :familyId ${w.station.replace('sr.', 'v.')}
   AND array_remove(v.vals, NULL) <> '{}'
   AND v.stage_result_id NOT IN (SELECT x.supersedes_id FROM stage_results x WHERE x.supersedes_id IS NOT NULL)`,
  };
}

/** The same rows for one gauge's readings, from `readings` (a result may mix gauges). */
function partReadingsByGaugeSql(f: ReadingFilter): Sql {
  const w = where(f);
  return {
    replacements: w.replacements,
    sql: `SELECT coalesce(json_agg(json_build_array(p.result_id, i.serial, p.at, sr.station_id, p.gauge_id, p.vals)
                                 ORDER BY p.at, p.result_id), '[]') AS parts
  FROM (SELECT r.stage_result_id AS result_id, (extract(epoch FROM min(r.created_at)) * 1000)::bigint AS at,
               min(r.gauge_id) AS gauge_id, json_agg(r.value) AS vals
          FROM readings r
         WHERE r.characteristic_id = :characteristicId AND r.created_at >= :from AND r.created_at < :to
           AND r.value IS NOT NULL ${w.gauge}
         GROUP BY r.stage_result_id) p
  JOIN stage_results sr ON sr.id = p.result_id
  JOIN items i ON i.id = sr.item_id
 WHERE i.engine_family_id = :familyId ${w.station}
   AND NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = sr.id)`,
  };
}

export type PartReadings = {
  resultId: number;
  serial: string;
  at: number;
  stationId: number | null;
  gaugeId: number | null;
  values: number[];
};

export async function partReadings(
  sequelize: Sequelize,
  f: ReadingFilter,
  transaction?: Transaction,
): Promise<PartReadings[]> {
  const { sql, replacements } = partReadingsSql(f);
  const [row] = await sequelize.query<{ parts: [number, string, number, number | null, number | null, number[]][] }>(
    sql,
    { type: QueryTypes.SELECT, replacements, transaction },
  );
  return (row?.parts ?? []).map(([resultId, serial, at, stationId, gaugeId, values]) => ({
    resultId,
    serial,
    at: Number(at),
    stationId,
    gaugeId,
    values,
  }));
}

/**
 * For a rehearsal: each part's newest current result in the period (the part as it left the stage),
 * with every reading's position, value and stored verdict. The positions' layout is the same for
 * nearly every part, so each distinct layout is sent once and a part names it by index; verdicts
 * are one letter each (p, f). A year of a V8 bore is then about 1.6 MB of JSON instead of 7.7 MB
 * (the positions alone were 4.5 MB). One document:
 * `{ layouts: [[position, …], …], parts: [[item id, serial, result id, time (ms), layout, [value, …], 'pf…'], …] }`.
 */
const rehearsalDocumentSql = (x: string) => `
  WITH x AS (${x}),
  l AS (SELECT d.positions, (row_number() OVER ()) - 1 AS k FROM (SELECT DISTINCT positions FROM x) d)
  SELECT json_build_object(
           'layouts', coalesce((SELECT json_agg(l.positions ORDER BY l.k) FROM l), '[]'),
           'parts', coalesce(json_agg(json_build_array(x.item_id, x.serial, x.result_id, x.at, l.k, x.vals, x.verdicts)
                                      ORDER BY x.at, x.result_id), '[]')) AS doc
    FROM x JOIN l ON l.positions = x.positions`;

export function rehearsalReadingsSql(f: ReadingFilter): Sql {
  const w = where(f);
  if (f.gaugeId) return rehearsalReadingsByGaugeSql(f);
  return {
    replacements: w.replacements,
    sql: rehearsalDocumentSql(`
      SELECT DISTINCT ON (v.item_id) v.item_id, i.serial, v.stage_result_id AS result_id,
             (extract(epoch FROM v.created_at) * 1000)::bigint AS at, v.positions, v.vals,
             replace(replace(array_to_string(v.verdicts, ''), 'pass', 'p'), 'fail', 'f') AS verdicts
        FROM result_values v
        JOIN items i ON i.id = v.item_id
       WHERE v.characteristic_id = :characteristicId AND v.created_at >= :from AND v.created_at < :to
         AND v.engine_family_id = :familyId ${w.station.replace('sr.', 'v.')}
         AND v.stage_result_id NOT IN (SELECT s.supersedes_id FROM stage_results s WHERE s.supersedes_id IS NOT NULL)
       ORDER BY v.item_id, v.created_at DESC, v.stage_result_id DESC`),
  };
}

/** The same document for one gauge's readings, from `readings`. */
function rehearsalReadingsByGaugeSql(f: ReadingFilter): Sql {
  const w = where(f);
  return {
    replacements: w.replacements,
    sql: rehearsalDocumentSql(`
      SELECT DISTINCT ON (sr.item_id) sr.item_id, i.serial, p.result_id, p.at, p.positions, p.vals, p.verdicts
        FROM (SELECT r.stage_result_id AS result_id, (extract(epoch FROM min(r.created_at)) * 1000)::bigint AS at,
                     array_agg(r.position ORDER BY r.id) AS positions, json_agg(r.value ORDER BY r.id) AS vals,
                     string_agg(left(r.verdict, 1), '' ORDER BY r.id) AS verdicts
                FROM readings r
               WHERE r.characteristic_id = :characteristicId AND r.created_at >= :from AND r.created_at < :to ${w.gauge}
               GROUP BY r.stage_result_id) p
        JOIN stage_results sr ON sr.id = p.result_id
        JOIN items i ON i.id = sr.item_id
       WHERE i.engine_family_id = :familyId ${w.station}
         AND NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = sr.id)
       ORDER BY sr.item_id, p.at DESC, p.result_id DESC`),
  };
}

export type PartVerdicts = {
  itemId: number;
  serial: string;
  resultId: number;
  at: number;
  readings: [string, number | null, 'pass' | 'fail'][];
};

/** A part's newest result in the period with its readings side by side, as stored. */
export type PartColumnsRow = {
  itemId: number;
  serial: string;
  resultId: number;
  at: number;
  positions: string[];
  vals: (number | null)[];
  verdicts: ('pass' | 'fail')[];
};

/** rehearsalReadingsSql's document. */
export type RehearsalDocument = { layouts: string[][]; parts: RehearsalRow[] };
/** One part of it: [item id, serial, result id, time (ms), layout index, values, verdicts as p/f letters]. */
export type RehearsalRow = [number, string, number, number, number, (number | null)[], string];

const verdictsOf = (letters: string): ('pass' | 'fail')[] => {
  const out = new Array<'pass' | 'fail'>(letters.length);
  for (let k = 0; k < letters.length; k++) out[k] = letters.charCodeAt(k) === 102 /* f */ ? 'fail' : 'pass';
  return out;
};

/** The document's parts with their positions and verdicts written out (a layout's array is shared, not copied). */
export function rehearsalColumns(doc: RehearsalDocument | null | undefined): PartColumnsRow[] {
  if (!doc) return [];
  return doc.parts.map(([itemId, serial, resultId, at, layout, vals, verdicts]) => ({
    itemId,
    serial,
    resultId,
    at: Number(at),
    positions: doc.layouts[layout]!,
    vals,
    verdicts: verdictsOf(verdicts),
  }));
}

export async function rehearsalReadings(
  sequelize: Sequelize,
  f: ReadingFilter,
  transaction?: Transaction,
): Promise<PartColumnsRow[]> {
  const { sql, replacements } = rehearsalReadingsSql(f);
  const [row] = await sequelize.query<{ doc: RehearsalDocument }>(sql, {
    type: QueryTypes.SELECT,
    replacements,
    transaction,
  });
  return rehearsalColumns(row?.doc);
}

/** A part's readings as one tuple each, for a reader that wants them so (the benchmark's check). */
export function rehearsalRow(p: PartColumnsRow): PartVerdicts {
  return {
    itemId: p.itemId,
    serial: p.serial,
    resultId: p.resultId,
    at: p.at,
    readings: p.positions.map((pos, k) => [pos, p.vals[k] ?? null, p.verdicts[k]!]),
  };
}

/** Shipped units (a live shipment) that hold one of these parts now, or are these items themselves. */
export const SHIPPED_UNITS_SQL = `SELECT p.id AS part_id, p.serial AS part, u.serial AS unit, s.ship_date, s.reference, c.name AS customer
  FROM items p
  JOIN item_links l ON l.child_item_id = p.id AND l.link_type = 'installed_in' AND l.removed_at IS NULL
  JOIN items u ON u.id = l.parent_item_id
  JOIN shipments s ON s.unit_item_id = u.id AND s.returned_at IS NULL
  LEFT JOIN customers c ON c.id = s.customer_id
 WHERE p.id IN (:ids)
UNION ALL
SELECT u.id, u.serial, u.serial, s.ship_date, s.reference, c.name
  FROM items u
  JOIN shipments s ON s.unit_item_id = u.id AND s.returned_at IS NULL
  LEFT JOIN customers c ON c.id = s.customer_id
 WHERE u.id IN (:ids) AND u.kind = 'long_block'
 ORDER BY 4, 3`;

export type ShippedRow = {
  part_id: number;
  part: string;
  unit: string;
  ship_date: string | null;
  reference: string;
  customer: string | null;
};

export async function shippedUnitsHolding(sequelize: Sequelize, itemIds: number[], transaction?: Transaction) {
  if (!itemIds.length) return [];
  return sequelize.query<ShippedRow>(SHIPPED_UNITS_SQL, {
    type: QueryTypes.SELECT,
    replacements: { ids: itemIds },
    transaction,
  });
}
