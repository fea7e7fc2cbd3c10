import type { Scope } from './scope.js';

/**
 * The statements of the blast radius. Set-based: the readings are judged, counted and grouped in the
 * database; only the parts and the first readings come back.
 */

/** Readings in scope, each with its limits and whether the guard band could turn its verdict. */
export const judgedSql = (s: Scope) => `
  SELECT r.id, r.stage_result_id, r.characteristic_id, r.position, r.value, r.unit, r.verdict, r.gauge_id,
         r.created_at, lim.lower, lim.upper,
         CASE WHEN r.value IS NULL OR e.err IS NULL OR e.err <= 0 THEN false
              WHEN r.verdict = 'pass' THEN (lim.lower IS NOT NULL AND abs(r.value - lim.lower) <= e.err)
                                        OR (lim.upper IS NOT NULL AND abs(r.value - lim.upper) <= e.err)
              ELSE (lim.lower IS NULL OR r.value + e.err >= lim.lower) AND (lim.upper IS NULL OR r.value - e.err <= lim.upper)
         END AS could_change
    FROM readings r
    ${/\bsr\./.test(s.where ?? '') ? 'JOIN stage_results sr ON sr.id = r.stage_result_id' : ''}
    LEFT JOIN tolerance_rules tr ON tr.id = r.tolerance_rule_id
    CROSS JOIN LATERAL (SELECT
      CASE tr.limit_type WHEN 'nominal' THEN tr.nominal - coalesce(tr.minus_tol, 0)
                         WHEN 'range' THEN tr.lower_limit WHEN 'min' THEN tr.lower_limit END AS lower,
      CASE tr.limit_type WHEN 'nominal' THEN tr.nominal + coalesce(tr.plus_tol, 0)
                         WHEN 'range' THEN tr.upper_limit WHEN 'max' THEN tr.upper_limit END AS upper) lim
    CROSS JOIN LATERAL (SELECT (CAST(:errors AS jsonb) ->> r.unit)::numeric AS err) e
   WHERE ${s.where}`;

/** The parts in scope (a CTE `parts`: item_id, readings, could_change) and where each is now: its unit (if built into one), that unit's shipment. */
const PARTS_SELECT = `
  SELECT i.id, i.serial, i.kind, i.status, p.readings, p.could_change, u.id AS unit_id, u.serial AS unit_serial,
         u.status AS unit_status, sh.reference, sh.ship_date, c.name AS customer, c.email AS customer_email
    FROM parts p
    JOIN items i ON i.id = p.item_id
    LEFT JOIN LATERAL (SELECT l.parent_item_id FROM item_links l
                        WHERE l.child_item_id = i.id AND l.link_type = 'installed_in' AND l.removed_at IS NULL
                        LIMIT 1) li ON true
    LEFT JOIN items u ON u.id = coalesce(li.parent_item_id, CASE WHEN i.kind = 'long_block' THEN i.id END)
    LEFT JOIN LATERAL (SELECT s.reference, s.customer_id,
                              to_char(coalesce(s.ship_date, (s.shipped_at AT TIME ZONE :tz)::date), 'YYYY-MM-DD') AS ship_date
                         FROM shipments s WHERE s.unit_item_id = u.id AND s.returned_at IS NULL
                        ORDER BY s.id DESC LIMIT 1) sh ON true
    LEFT JOIN customers c ON c.id = sh.customer_id
   ORDER BY p.could_change DESC, i.serial`;

// readings counted by result first, so only the results (not every reading) look up their part
const PARTS_OF_READINGS = `parts AS (
    SELECT sr.item_id, sum(g.readings)::int AS readings, sum(g.could_change)::int AS could_change
      FROM (SELECT stage_result_id, count(*) AS readings, count(*) FILTER (WHERE could_change) AS could_change
              FROM j GROUP BY stage_result_id) g
      JOIN stage_results sr ON sr.id = g.stage_result_id
     GROUP BY sr.item_id)`;

/** The parts in scope and where each is now: its unit (if built into one), that unit's shipment. */
export const partsSql = (s: Scope) => `
  WITH ${
    s.lotId
      ? `parts AS (SELECT ul.unit_item_id AS item_id, 0 AS readings, 0 AS could_change FROM unit_lots ul
                    WHERE ul.part_lot_id = :lotId GROUP BY ul.unit_item_id)`
      : `j AS (${judgedSql(s)}), ${PARTS_OF_READINGS}`
  }
  ${PARTS_SELECT}`;

/** Readings (`from`: judged rows) with their names, most doubtful first (`:limit` of them unless `limit` is null). */
const readingsSelect = (from: string, limit: number | null) => `
  SELECT i.serial, st.name AS stage, c.name AS characteristic, j.position, j.value, j.unit, j.verdict,
         j.lower, j.upper, j.could_change, j.created_at, u.name AS operator, g.code AS gauge, j.id
    FROM ${from} j
    JOIN stage_results sr ON sr.id = j.stage_result_id
    JOIN items i ON i.id = sr.item_id
    JOIN stages st ON st.id = sr.stage_id
    JOIN characteristics c ON c.id = j.characteristic_id
    JOIN users u ON u.id = sr.operator_id
    LEFT JOIN gauges g ON g.id = j.gauge_id
   ORDER BY j.could_change DESC, j.created_at DESC, j.id DESC
   ${limit === null ? '' : 'LIMIT :limit'}`;

/** The readings in scope with their names, most doubtful first (`:limit` of them unless `limit` is null). */
export const readingsSql = (s: Scope, limit: number | null) =>
  readingsSelect(limit === null ? `(${judgedSql(s)})` : firstJudged(`(${judgedSql(s)})`), limit);

// the most doubtful `:limit` judged readings before their names are looked up
const firstJudged = (from: string) =>
  `(SELECT * FROM ${from} jj ORDER BY jj.could_change DESC, jj.created_at DESC, jj.id DESC LIMIT :limit)`;

/** Where a placed part is now, as whereNow() says it, for counting in SQL. */
const WHERE_NOW_SQL = `CASE WHEN x.status = 'scrapped' OR x.unit_status = 'scrapped' THEN 'scrapped'
  WHEN x.reference IS NOT NULL OR x.status = 'shipped' OR x.unit_status = 'shipped' THEN 'shipped'
  WHEN x.status = 'on_hold' OR x.unit_status = 'on_hold' THEN 'on_hold' ELSE 'in_plant' END`;

/**
 * The whole summary of readings in scope in one statement: the readings are judged once (a
 * materialized CTE), the parts placed once; then counted, the parts counted by where they are now,
 * the shipped units grouped by customer, and the first `:partLimit` parts and `:limit` readings
 * named, each as JSON. A gauge used on 5 % of six months' readings touches thousands of parts: the
 * screen shows the most doubtful few hundred and the counts of all; the files have every one.
 */
export const summarySql = (s: Scope) => `
  WITH j AS MATERIALIZED (${judgedSql(s)}), ${PARTS_OF_READINGS},
  placed AS MATERIALIZED (${PARTS_SELECT})
  SELECT (SELECT count(*)::int FROM j) AS readings,
         (SELECT (count(*) FILTER (WHERE could_change))::int FROM j) AS could_change,
         (SELECT json_build_object('parts', count(*), 'units', count(DISTINCT x.unit_id),
                   'inPlant', count(*) FILTER (WHERE ${WHERE_NOW_SQL} = 'in_plant'),
                   'onHold', count(*) FILTER (WHERE ${WHERE_NOW_SQL} = 'on_hold'),
                   'shipped', count(*) FILTER (WHERE ${WHERE_NOW_SQL} = 'shipped'))
            FROM placed x) AS counts,
         (SELECT coalesce(json_agg(x ORDER BY x.could_change DESC, x.serial), '[]')
            FROM (SELECT * FROM placed ORDER BY could_change DESC, serial LIMIT :partLimit) x) AS parts,
         (SELECT coalesce(json_agg(json_build_object('name', c.name, 'email', c.email, 'units', c.units) ORDER BY c.first), '[]')
            FROM (SELECT u.name, min(u.email) AS email, min(u.rank) AS first,
                         json_agg(json_build_object('serial', u.unit_serial, 'shipDate', u.ship_date, 'order', u.reference)
                                  ORDER BY u.rank) AS units
                    FROM (SELECT coalesce(p.customer, '(no customer on file)') AS name, p.customer_email AS email,
                                 p.unit_serial, p.ship_date, p.reference,
                                 min(p.rank) AS rank
                            FROM (SELECT placed.*, row_number() OVER (ORDER BY could_change DESC, serial) AS rank FROM placed) p
                           WHERE p.reference IS NOT NULL AND p.unit_serial IS NOT NULL
                           GROUP BY 1, 2, 3, 4, 5) u
                   GROUP BY u.name) c) AS customers,
         (SELECT coalesce(json_agg(y ORDER BY y.could_change DESC, y.created_at DESC, y.id DESC), '[]')
            FROM (${readingsSelect(firstJudged('j'), 0)}) y) AS named`;
