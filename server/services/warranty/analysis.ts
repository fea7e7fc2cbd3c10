import { QueryTypes, type Sequelize } from 'sequelize';
import {
  DAYS_PER_MONTH,
  RATE_DIMENSIONS,
  type AnalysisJson,
  type AnalysisQuery,
  type RateDimension,
  type RateRow,
} from '../../../shared/schemas/warranty.js';
import { EngineFamily } from '../../models/index.js';
import { plantSettings } from '../plant.js';
import { dateIn } from '../../../shared/domain/warranty.js';

/**
 * Claim rates. The fleet is every unit that shipped (its first shipment), filtered by family and
 * ship dates. A claim counts as a failure when its teardown named at least one cause that counts
 * as a failure of the product (not "no trouble found", not "installation"); a claim not yet torn
 * down is a claim and not (yet) a failure.
 *
 * - Family, build month, lot, core source and core grade belong to the unit: units shipped in the
 *   group, and the claims on them.
 * - Station, gauge and operator belong to the parts concerned: units shipped that had a part (or
 *   the unit itself) recorded at that station, with that gauge or by that person, and the claims
 *   whose teardown findings name such a part. A claim without findings yet counts in none of them.
 */

/** Every CTE the analysis reads: the fleet, its claims, and who/what touched each unit's parts. */
export const FLEET_SQL = `
  fleet AS (
    SELECT DISTINCT ON (s.unit_item_id) s.unit_item_id AS unit_id, s.id AS shipment_id, s.shipped_at,
           coalesce(s.ship_date, (s.shipped_at AT TIME ZONE :tz)::date) AS ship_date,
           u.engine_family_id AS family_id, u.created_at AS built_at, u.serial
      FROM shipments s JOIN items u ON u.id = s.unit_item_id
     ORDER BY s.unit_item_id, s.id),
  f AS (SELECT * FROM fleet
         WHERE (CAST(:family AS int) IS NULL OR family_id = :family)
           AND (CAST(:from AS date) IS NULL OR ship_date >= CAST(:from AS date))
           AND (CAST(:to AS date) IS NULL OR ship_date <= CAST(:to AS date))),
  claims AS (
    SELECT c.id, c.unit_item_id AS unit_id, c.failed_on,
           EXISTS (SELECT 1 FROM warranty_findings w JOIN cause_codes cc ON cc.id = w.cause_code_id
                    WHERE w.claim_id = c.id AND cc.counts_as_failure) AS failure
      FROM warranty_claims c JOIN f ON f.unit_id = c.unit_item_id)`;

const RATES_SQL = `
WITH ${FLEET_SQL},
  unit_items AS (
    SELECT f.unit_id, f.unit_id AS item_id FROM f
    UNION ALL
    SELECT f.unit_id, l.child_item_id FROM f
      JOIN item_links l ON l.parent_item_id = f.unit_id AND l.link_type = 'installed_in'
       AND l.created_at <= f.shipped_at AND (l.removed_at IS NULL OR l.removed_at > f.shipped_at)),
  members AS (
    SELECT 'family' AS dim, f.unit_id, ef.code AS key, ef.code || ' — ' || ef.name AS label
      FROM f JOIN engine_families ef ON ef.id = f.family_id
    UNION ALL
    SELECT 'buildMonth', f.unit_id, to_char(f.built_at AT TIME ZONE :tz, 'YYYY-MM'),
           to_char(f.built_at AT TIME ZONE :tz, 'YYYY-MM') FROM f
    UNION ALL
    SELECT 'lot', f.unit_id, pl.id::text,
           replace(pl.part_kind, '_', ' ') || ' · ' || pl.lot_code || ' (' || su.name || ')'
      FROM f JOIN unit_lots ul ON ul.unit_item_id = f.unit_id JOIN part_lots pl ON pl.id = ul.part_lot_id
      JOIN suppliers su ON su.id = pl.supplier_id
    UNION
    SELECT 'coreSource', ui.unit_id, r.source, r.source
      FROM unit_items ui JOIN item_links h ON h.child_item_id = ui.item_id AND h.link_type = 'harvested_from'
      JOIN core_receipts r ON r.item_id = h.parent_item_id
    UNION
    SELECT 'coreGrade', ui.unit_id, coalesce(r.grade, 'none'), coalesce(r.grade, 'none')
      FROM unit_items ui JOIN item_links h ON h.child_item_id = ui.item_id AND h.link_type = 'harvested_from'
      JOIN core_receipts r ON r.item_id = h.parent_item_id),
  item_results AS (
    SELECT ui.unit_id, ui.item_id, r.id AS result_id, r.station_id, r.operator_id, r.gauge_id
      FROM unit_items ui JOIN stage_results r ON r.item_id = ui.item_id
     WHERE NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = r.id)),
  item_gauges AS (
    SELECT unit_id, item_id, gauge_id FROM item_results WHERE gauge_id IS NOT NULL
    UNION
    SELECT ir.unit_id, ir.item_id, rd.gauge_id FROM item_results ir
      JOIN readings rd ON rd.stage_result_id = ir.result_id WHERE rd.gauge_id IS NOT NULL),
  part_members AS (
    SELECT DISTINCT 'station' AS dim, ir.unit_id, ir.item_id, st.code AS key, st.code || ' — ' || st.name AS label
      FROM item_results ir JOIN stations st ON st.id = ir.station_id
    UNION
    SELECT 'operator', ir.unit_id, ir.item_id, ir.operator_id::text, us.name
      FROM item_results ir JOIN users us ON us.id = ir.operator_id
    UNION
    SELECT 'gauge', ig.unit_id, ig.item_id, g.code, g.code || ' — ' || g.description
      FROM item_gauges ig JOIN gauges g ON g.id = ig.gauge_id),
  concerned AS (
    SELECT c.id AS claim_id, c.unit_id, coalesce(w.item_id, c.unit_id) AS item_id, bool_or(cc.counts_as_failure) AS failure
      FROM claims c JOIN warranty_findings w ON w.claim_id = c.id JOIN cause_codes cc ON cc.id = w.cause_code_id
     GROUP BY 1, 2, 3),
  denominators AS (
    SELECT dim, key, max(label) AS label, count(DISTINCT unit_id)::int AS units
      FROM (SELECT dim, unit_id, key, label FROM members UNION ALL SELECT dim, unit_id, key, label FROM part_members) x
     GROUP BY dim, key),
  numerators AS (
    SELECT m.dim, m.key, count(DISTINCT c.id)::int AS claims, (count(DISTINCT c.id) FILTER (WHERE c.failure))::int AS failures
      FROM members m JOIN claims c ON c.unit_id = m.unit_id GROUP BY 1, 2
    UNION ALL
    SELECT pm.dim, pm.key, count(DISTINCT k.claim_id)::int, (count(DISTINCT k.claim_id) FILTER (WHERE k.failure))::int
      FROM part_members pm JOIN concerned k ON k.unit_id = pm.unit_id AND k.item_id = pm.item_id GROUP BY 1, 2)
SELECT d.dim, d.key, d.label, d.units, coalesce(n.claims, 0) AS claims, coalesce(n.failures, 0) AS failures
  FROM denominators d LEFT JOIN numerators n ON n.dim = d.dim AND n.key = d.key
 ORDER BY d.dim, d.key`;

type Row = { dim: RateDimension; key: string; label: string; units: number; claims: number; failures: number };

const SOURCE_WORDS: Record<string, string> = { customer_return: 'Customer return', purchased: 'Purchased' };
const per100 = (n: number, d: number) => (d ? Math.round((10000 * n) / d) / 100 : 0);

export type AnalysisScope = { tz: string; family: number | null; from: string | null; to: string | null };

export async function analysisScope(
  q: AnalysisQuery,
): Promise<AnalysisScope & { today: string; familyCode: string | null }> {
  const plant = await plantSettings();
  const family = q.family ? await EngineFamily.findByPk(q.family) : null;
  return {
    tz: plant.timeZone,
    family: q.family ?? null,
    from: q.from ?? null,
    to: q.to ?? null,
    today: dateIn(plant.timeZone, new Date()),
    familyCode: family?.code ?? null,
  };
}

export async function warrantyAnalysis(sequelize: Sequelize, q: AnalysisQuery): Promise<AnalysisJson> {
  const scope = await analysisScope(q);
  const replacements = { tz: scope.tz, family: scope.family, from: scope.from, to: scope.to, today: scope.today };
  const [rows, ages, failures, [totals]] = await Promise.all([
    sequelize.query<Row>(RATES_SQL, { type: QueryTypes.SELECT, replacements }),
    sequelize.query<{ days: number; n: number }>(
      `WITH ${FLEET_SQL} SELECT (CAST(:today AS date) - ship_date) AS days, count(*)::int AS n FROM f GROUP BY 1`,
      { type: QueryTypes.SELECT, replacements },
    ),
    sequelize.query<{ days: number; failure: boolean }>(
      `WITH ${FLEET_SQL} SELECT c.failed_on - f.ship_date AS days, c.failure FROM claims c JOIN f USING (unit_id)`,
      { type: QueryTypes.SELECT, replacements },
    ),
    sequelize.query<{ units: number; claims: number; failures: number }>(
      `WITH ${FLEET_SQL} SELECT (SELECT count(*) FROM f)::int AS units, (SELECT count(*) FROM claims)::int AS claims,
              (SELECT count(*) FROM claims WHERE failure)::int AS failures`,
      { type: QueryTypes.SELECT, replacements },
    ),
  ]);
  const rates = Object.fromEntries(RATE_DIMENSIONS.map((d) => [d, [] as RateRow[]])) as Record<
    RateDimension,
    RateRow[]
  >;
  for (const r of rows) {
    rates[r.dim].push({
      key: r.key,
      label: r.dim === 'coreSource' ? (SOURCE_WORDS[r.label] ?? r.label) : r.label,
      units: r.units,
      claims: r.claims,
      failures: r.failures,
      claimRate: per100(r.claims, r.units),
      failureRate: per100(r.failures, r.units),
    });
  }
  // the worst first, except build months, which read best in calendar order
  for (const d of RATE_DIMENSIONS) {
    if (d !== 'buildMonth') rates[d].sort((a, b) => b.failureRate - a.failureRate || b.claimRate - a.claimRate);
  }
  return {
    asOf: scope.today,
    family: scope.familyCode,
    fleet: totals ?? { units: 0, claims: 0, failures: 0 },
    rates,
    monthsInService: monthsInService(ages, failures),
  };
}

/**
 * For each whole month in service m (0 = the first): the units that reached it (at risk), and the
 * claims and failures whose failure date fell in it.
 */
export function monthsInService(ages: { days: number; n: number }[], claims: { days: number; failure: boolean }[]) {
  const monthOf = (days: number) => Math.floor(days / DAYS_PER_MONTH);
  const last = Math.max(-1, ...ages.map((a) => monthOf(a.days)), ...claims.map((c) => monthOf(c.days)));
  return Array.from({ length: last + 1 }, (_, month) => ({
    month,
    atRisk: ages.filter((a) => a.days >= month * DAYS_PER_MONTH).reduce((s, a) => s + a.n, 0),
    claims: claims.filter((c) => monthOf(c.days) === month).length,
    failures: claims.filter((c) => c.failure && monthOf(c.days) === month).length,
  }));
}
