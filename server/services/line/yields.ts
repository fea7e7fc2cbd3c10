import type { Sequelize } from 'sequelize';
import { paretoOrder, rty } from '../../../shared/domain/yields.js';
import type { FpyRow, ParetoJson, ParetoQuery, RtyRow, YieldJson, YieldQuery } from '../../../shared/schemas/line.js';
import { readQuery } from '../../read/read-query.js';
import { plantSettings } from '../plant.js';

/**
 * Yields and losses over a period of plant days. A result is an item's first attempt at a stage
 * when no earlier result of the item at that stage exists; a result replaced by a correction does
 * not count, its correction stands in its place. FPY per stage (and station) = first attempts that
 * passed / first attempts; RTY per family = the product of its stages' FPYs.
 *
 * `firstAttemptsSql(fromDay, toDay)`: the first attempts recorded in plant days [fromDay, toDay],
 * both SQL date expressions.
 */
export const firstAttemptsSql = (fromDay: string, toDay: string) => `
  SELECT r.stage_id, r.station_id, i.engine_family_id, r.verdict,
         (r.finished_at AT TIME ZONE :tz)::date AS day
    FROM stage_results r
    JOIN items i ON i.id = r.item_id
   WHERE r.finished_at >= ((${fromDay})::timestamp AT TIME ZONE :tz)
     AND r.finished_at < (((${toDay}) + 1)::timestamp AT TIME ZONE :tz)
     AND (CAST(:family AS int) IS NULL OR i.engine_family_id = :family)
     AND NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = r.id)
     AND NOT EXISTS (
       SELECT 1 FROM stage_results p
        WHERE p.item_id = r.item_id AND p.stage_id = r.stage_id
          AND (p.finished_at, p.id) < (r.finished_at, r.id)
          AND NOT EXISTS (SELECT 1 FROM stage_results y WHERE y.supersedes_id = p.id))`;

/**
 * The first plant day of [:from, :to] not counted in `yield_days` (server/services/line/yield-days.ts)
 * in the plant's time zone, or the day after :to. Days before the first result on record have
 * nothing to count.
 */
export const LIVE_FROM_SQL = `
  SELECT to_char(coalesce(min(d)::date, CAST(:to AS date) + 1), 'YYYY-MM-DD') AS live_from
    FROM generate_series(CAST(:from AS date), CAST(:to AS date), interval '1 day') d
   WHERE d >= (SELECT (min(finished_at) AT TIME ZONE :tz)::date FROM stage_results)
     AND NOT EXISTS (SELECT 1 FROM yield_days_done x WHERE x.day = d::date AND x.time_zone = :tz)`;

/**
 * Counted days before :liveFrom are summed from `yield_days`; from :liveFrom on, results are
 * judged live. :liveFrom is LIVE_FROM_SQL's answer, read first and given as a value so the planner
 * sees how few days are judged live (as a subquery it guessed a third of all results and scanned
 * them). Were a correction to forget a counted day between the two statements, the report is the
 * one of a moment before it.
 */
export const YIELD_SQL = `
  WITH
  f AS (
    SELECT y.stage_id, y.station_id, y.engine_family_id, y.entered, y.first_pass
      FROM yield_days y
     WHERE y.day >= CAST(:from AS date) AND y.day < CAST(:liveFrom AS date)
       AND (CAST(:family AS int) IS NULL OR y.engine_family_id = :family)
    UNION ALL
    SELECT a.stage_id, a.station_id, a.engine_family_id, 1, (a.verdict = 'pass')::int
      FROM (${firstAttemptsSql('CAST(:liveFrom AS date)', 'CAST(:to AS date)')}) a
  )
  SELECT s.code AS stage_code, s.name AS stage_name, st.code AS station, fam.code AS family_code,
         sum(g.entered)::int AS entered, sum(g.first_pass)::int AS first_pass,
         min(rs.position) AS position
    FROM (SELECT f.stage_id, f.station_id, f.engine_family_id, sum(f.entered) AS entered, sum(f.first_pass) AS first_pass
            FROM f GROUP BY f.stage_id, f.station_id, f.engine_family_id) g
    JOIN stages s ON s.id = g.stage_id
    JOIN engine_families fam ON fam.id = g.engine_family_id
    LEFT JOIN stations st ON st.id = g.station_id
    LEFT JOIN routes ro ON ro.engine_family_id = g.engine_family_id AND ro.part_kind = s.part_kind AND ro.active
    LEFT JOIN route_stages rs ON rs.route_id = ro.id AND rs.stage_id = s.id
   GROUP BY s.code, s.name, s.part_kind, st.code, fam.code
   ORDER BY fam.code, s.part_kind, position, s.code, st.code`;

export const LOSSES_SQL = `SELECT count(*) FILTER (WHERE n.disposition = 'scrap')::int AS scrapped,
              count(*) FILTER (WHERE n.disposition IN ('rework','repair'))::int AS reworked,
              count(*) FILTER (WHERE n.disposition = 'use_as_is')::int AS used_as_is,
              count(*) FILTER (WHERE n.disposition = 'return_to_supplier')::int AS returned
         FROM nonconformances n LEFT JOIN items i ON i.id = n.item_id
        WHERE n.state IN ('decided','closed')
          AND n.decided_at >= (CAST(:from AS date)::timestamp AT TIME ZONE :tz)
          AND n.decided_at < ((CAST(:to AS date) + 1)::timestamp AT TIME ZONE :tz)
          AND (CAST(:family AS int) IS NULL OR i.engine_family_id = :family)`;

/**
 * Salvage per core source and casting number: the cores torn down, the parts they gave, and what
 * was scrapped, summed from `core_salvage` (one row per torn-down core, kept by triggers: see
 * db/migrations/…-core-salvage, whose `coreSalvageFromRecordsSql` counts a core from its records;
 * tests/api/line.test.ts holds the two equal).
 */
export const SALVAGE_SQL = `
  SELECT c.source, c.casting_number, count(*)::int AS cores, sum(c.kept)::int AS kept,
         sum(c.scrapped_at_teardown)::int AS scrapped_at_teardown, sum(c.scrapped_later)::int AS scrapped_later
    FROM core_salvage c
   WHERE c.received_on BETWEEN CAST(:from AS date) AND CAST(:to AS date)
     AND (CAST(:family AS int) IS NULL OR c.engine_family_id = :family)
   GROUP BY c.source, c.casting_number
   ORDER BY count(*) DESC, c.source, c.casting_number
   LIMIT 100`;

type Counted = {
  stage_code: string;
  stage_name: string;
  station: string | null;
  family_code: string;
  entered: number;
  first_pass: number;
};

function sumBy(rows: Counted[], key: (r: Counted) => string, withStation = false) {
  const out = new Map<string, FpyRow & { family: string }>();
  for (const r of rows) {
    const k = key(r);
    const row = out.get(k) ?? {
      stageCode: r.stage_code,
      stageName: r.stage_name,
      station: withStation ? r.station : null,
      family: r.family_code,
      entered: 0,
      firstPass: 0,
    };
    row.entered += r.entered;
    row.firstPass += r.first_pass;
    out.set(k, row);
  }
  return [...out.values()];
}

export async function yieldReport(sequelize: Sequelize, q: YieldQuery): Promise<Omit<YieldJson, 'readFrom'>> {
  const tz = (await plantSettings()).timeZone;
  const params = { from: q.from, to: q.to, tz, family: q.family ?? null };
  const [live] = await readQuery<{ live_from: string }>(sequelize, LIVE_FROM_SQL, params);
  const [counted, losses, salvage] = await Promise.all([
    readQuery<Counted>(sequelize, YIELD_SQL, { ...params, liveFrom: live!.live_from }),
    readQuery<{ scrapped: number; reworked: number; used_as_is: number; returned: number }>(
      sequelize,
      LOSSES_SQL,
      params,
    ),
    readQuery<{
      source: string;
      casting_number: string;
      cores: number;
      kept: number;
      scrapped_at_teardown: number;
      scrapped_later: number;
    }>(sequelize, SALVAGE_SQL, params),
  ]);

  const byStation = sumBy(counted, (r) => `${r.stage_code}|${r.station ?? ''}`, true);
  const families = new Map<string, RtyRow>();
  for (const r of sumBy(counted, (c) => `${c.family_code}|${c.stage_code}`)) {
    const fam = families.get(r.family) ?? { familyCode: r.family, stages: [], rty: null };
    fam.stages.push({ stageCode: r.stageCode, entered: r.entered, firstPass: r.firstPass });
    families.set(r.family, fam);
  }
  for (const fam of families.values()) fam.rty = rty(fam.stages);
  const l = losses[0] ?? { scrapped: 0, reworked: 0, used_as_is: 0, returned: 0 };
  return {
    from: q.from,
    to: q.to,
    byStage: sumBy(counted, (r) => r.stage_code).map(strip),
    byStation: byStation.map(strip),
    byFamily: [...families.values()],
    losses: { scrapped: l.scrapped, reworked: l.reworked, usedAsIs: l.used_as_is, returned: l.returned },
    salvage: salvage.map((s) => ({
      source: s.source,
      castingNumber: s.casting_number,
      cores: s.cores,
      kept: s.kept,
      scrappedAtTeardown: s.scrapped_at_teardown,
      scrappedLater: s.scrapped_later,
      salvageRate:
        s.kept + s.scrapped_at_teardown === 0 ? null : (s.kept - s.scrapped_later) / (s.kept + s.scrapped_at_teardown),
    })),
  };
}

const strip = ({ family: _family, ...row }: FpyRow & { family: string }): FpyRow => row;

const PARETO_KEY = {
  defect: `coalesce(dc.code, 'none')`,
  stage: `coalesce(s.code, 'none')`,
  family: `coalesce(fam.code, 'lot')`,
};
const PARETO_LABEL = {
  defect: `coalesce(max(dc.description), 'No defect code')`,
  stage: `coalesce(max(s.name), 'No stage')`,
  family: `coalesce(max(fam.name), 'Purchased lots')`,
};

/** The NCR Pareto's one statement: NCRs raised in the period (voided ones were raised in error). */
export const paretoSql = (by: ParetoQuery['by']) => `
  SELECT ${PARETO_KEY[by]} AS key, ${PARETO_LABEL[by]} AS label,
         to_char(date_trunc(:grain, n.created_at AT TIME ZONE :tz), 'YYYY-MM-DD') AS period,
         count(*)::int AS count
    FROM nonconformances n
    LEFT JOIN defect_codes dc ON dc.id = n.defect_code_id
    LEFT JOIN stages s ON s.id = n.stage_id
    LEFT JOIN items i ON i.id = n.item_id
    LEFT JOIN engine_families fam ON fam.id = i.engine_family_id
   WHERE n.created_at >= (CAST(:from AS date)::timestamp AT TIME ZONE :tz)
     AND n.created_at < ((CAST(:to AS date) + 1)::timestamp AT TIME ZONE :tz)
     AND n.state <> 'voided'
     AND (CAST(:family AS int) IS NULL OR i.engine_family_id = :family)
   GROUP BY 1, 3
   ORDER BY 3, 1`;

export async function ncrPareto(sequelize: Sequelize, q: ParetoQuery): Promise<Omit<ParetoJson, 'readFrom'>> {
  const tz = (await plantSettings()).timeZone;
  const rows = await readQuery<{ key: string; label: string; period: string; count: number }>(
    sequelize,
    paretoSql(q.by),
    { from: q.from, to: q.to, tz, family: q.family ?? null, grain: q.grain },
  );
  const totals = new Map<string, { key: string; label: string; count: number }>();
  for (const r of rows) {
    const t = totals.get(r.key) ?? { key: r.key, label: r.label, count: 0 };
    t.count += r.count;
    totals.set(r.key, t);
  }
  return {
    from: q.from,
    to: q.to,
    by: q.by,
    grain: q.grain,
    rows: paretoOrder([...totals.values()]),
    periods: rows.map((r) => ({ period: r.period, key: r.key, count: r.count })),
    total: rows.reduce((s, r) => s + r.count, 0),
  };
}
