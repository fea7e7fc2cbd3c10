import { ncrListQuery } from '../shared/schemas/ncr.js';
import { ncrListSql } from '../server/services/ncrs/index.js';
import { LOT_LOOKUP_SQL } from '../server/services/trail/index.js';

/**
 * The reads the warranty desk and quality make, as PostgreSQL alone answers them. The trail is one
 * statement that returns the same data as `GET /api/trail/:serial` — genealogy, items, every result
 * with its readings and the limits of the rule version each was judged by, NCRs with their timelines
 * and signatures, lots, shipment — built as JSON inside the database: the best a hand-written query
 * can do. The lot lookup and the NCR list are the API's own statements.
 *
 * Inputs come from small lookup tables the benchmark fills (`bench_units`, `bench_lot_codes`), one
 * primary-key read per transaction; the API's load driver draws the same inputs on its side.
 */

export const trailScript = (units: number) => `\\set k random(1, ${units})
WITH RECURSIVE start AS (SELECT id FROM items WHERE serial = (SELECT serial FROM bench_units WHERE k = :k)),
g(id, depth, parent_item_id, child_item_id, link_type) AS (
  SELECT id, 0, NULL::int, NULL::int, NULL::varchar FROM start
  UNION
  SELECT CASE WHEN l.parent_item_id = g.id THEN l.child_item_id ELSE l.parent_item_id END, g.depth + 1,
         l.parent_item_id, l.child_item_id, l.link_type
    FROM item_links l JOIN g ON (l.parent_item_id = g.id OR l.child_item_id = g.id)
   WHERE l.removed_at IS NULL AND g.depth < 2),
ids AS (SELECT DISTINCT id FROM g),
unit AS (SELECT i.id FROM items i WHERE i.id IN (SELECT id FROM ids) AND i.kind = 'long_block' LIMIT 1)
SELECT json_build_object(
  'items', (SELECT json_agg(json_build_object('serial', i.serial, 'kind', i.kind, 'status', i.status,
              'positionLabel', i.position_label, 'family', f.code, 'attributes', i.attributes))
              FROM items i JOIN engine_families f ON f.id = i.engine_family_id WHERE i.id IN (SELECT id FROM ids)),
  'links', (SELECT json_agg(DISTINCT jsonb_build_object('parent', parent_item_id, 'child', child_item_id, 'type', link_type))
              FROM g WHERE link_type IS NOT NULL),
  'route', (SELECT json_agg(json_build_object('code', s.code, 'name', s.name, 'required', rs.required) ORDER BY rs.position)
              FROM start JOIN items i ON i.id = start.id JOIN route_stages rs ON rs.route_id = i.route_id
              JOIN stages s ON s.id = rs.stage_id),
  'results', (SELECT json_agg(json_build_object('id', r.id, 'serial', i.serial, 'stage', s.code, 'stageName', s.name,
              'station', st.code, 'operator', u.name, 'gauge', gg.code, 'verdict', r.verdict, 'finishedAt', r.finished_at,
              'supersedes', r.supersedes_id, 'supersededBy', (SELECT x.id FROM stage_results x WHERE x.supersedes_id = r.id),
              'correctionReason', r.correction_reason, 'reentryReason', r.reentry_reason,
              'photos', (SELECT json_agg(json_build_object('id', a.id, 'name', a.file_name)) FROM attachments a
                          WHERE a.entity = 'stage_result' AND a.entity_id = r.id::text),
              'readings', (SELECT json_agg(json_build_object('characteristic', c.code, 'name', c.name, 'position', rd.position,
                            'value', rd.value, 'passed', rd.passed, 'unit', rd.unit, 'verdict', rd.verdict,
                            'ruleVersion', rd.rule_version, 'location', rd.location_note,
                            'lower', coalesce(tr.lower_limit, tr.nominal - tr.minus_tol),
                            'upper', coalesce(tr.upper_limit, tr.nominal + tr.plus_tol)) ORDER BY rd.id)
                            FROM readings rd JOIN characteristics c ON c.id = rd.characteristic_id
                            LEFT JOIN tolerance_rules tr ON tr.id = rd.tolerance_rule_id
                           WHERE rd.stage_result_id = r.id)) ORDER BY r.finished_at, r.id)
              FROM stage_results r JOIN items i ON i.id = r.item_id JOIN stages s ON s.id = r.stage_id
              LEFT JOIN stations st ON st.id = r.station_id JOIN users u ON u.id = r.operator_id
              LEFT JOIN gauges gg ON gg.id = r.gauge_id
             WHERE r.item_id IN (SELECT id FROM ids)),
  'ncrs', (SELECT json_agg(json_build_object('number', n.number, 'item', n.item_id, 'lot', pl.lot_code, 'state', n.state,
              'severity', n.severity, 'description', n.description, 'disposition', n.disposition,
              'dispositionReason', n.disposition_reason, 'raisedAt', n.created_at,
              'timeline', (SELECT json_agg(json_build_object('at', t.created_at, 'from', t.from_state, 'to', t.to_state,
                            'actor', a.name, 'reason', t.reason) ORDER BY t.id)
                            FROM nonconformance_transitions t JOIN users a ON a.id = t.actor_id WHERE t.nonconformance_id = n.id),
              'signatures', (SELECT json_agg(json_build_object('printedName', sg.printed_name, 'meaning', sg.meaning,
                            'signedAt', sg.signed_at) ORDER BY sg.id)
                            FROM signatures sg WHERE sg.entity = 'nonconformance' AND sg.entity_id = n.number))
              ORDER BY n.created_at, n.id)
              FROM nonconformances n LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
             WHERE n.item_id IN (SELECT id FROM ids)
                OR n.part_lot_id IN (SELECT part_lot_id FROM unit_lots WHERE unit_item_id IN (SELECT id FROM unit))),
  'lots', (SELECT json_agg(json_build_object('kind', pl.part_kind, 'supplier', sp.name, 'partNumber', pl.part_number,
              'lotCode', pl.lot_code, 'quantity', ul.quantity, 'attributes', pl.attributes) ORDER BY ul.id)
              FROM unit_lots ul JOIN part_lots pl ON pl.id = ul.part_lot_id JOIN suppliers sp ON sp.id = pl.supplier_id
             WHERE ul.unit_item_id IN (SELECT id FROM unit)),
  'shipment', (SELECT json_build_object('reference', sh.reference, 'carrier', sh.carrier, 'shipDate', sh.ship_date,
              'customer', cu.name, 'warrantyEndsOn', sh.warranty_ends_on, 'warrantyKm', sh.warranty_km)
              FROM shipments sh LEFT JOIN customers cu ON cu.id = sh.customer_id
             WHERE sh.unit_item_id IN (SELECT id FROM unit) ORDER BY sh.id DESC LIMIT 1));
`;

/** The lot lookup's own statement (server/services/trail/lot-lookup.ts), the lot code drawn at random. */
export const lotScript = (lots: number) => `\\set k random(1, ${lots})
${LOT_LOOKUP_SQL.replace(':lotCode', '(SELECT lot_code FROM bench_lot_codes WHERE k = :k)')};
`;

/** The NCR list's filters the benchmark exercises, as the API's query strings. */
export const NCR_FILTERS = [
  'state=open',
  'state=closed&severity=major',
  'stage=bore-hone&olderThanDays=365',
  'family=2&sort=number&dir=asc',
];

/** A replacement as a SQL literal (the filters above use numbers and plain words only). */
const literal = (v: unknown) => (typeof v === 'number' ? String(v) : `'${String(v).replace(/'/g, "''")}'`);

/** The NCR list's two statements (server/services/ncrs/list.ts ncrListSql), one script per filter. */
export function ncrScripts(): Record<string, string> {
  const out: Record<string, string> = {};
  NCR_FILTERS.forEach((query, i) => {
    const sql = ncrListSql(ncrListQuery.parse(Object.fromEntries(new URLSearchParams(query))));
    const inline = (text: string) =>
      text.replace(/:([a-z]+)\b/g, (m, name: string) =>
        name in sql.replacements ? literal(sql.replacements[name as keyof typeof sql.replacements]) : m,
      );
    out[`ncr-${i + 1}.sql@1`] = `${inline(sql.rows)};\n${inline(sql.count)};\n`;
  });
  return out;
}
