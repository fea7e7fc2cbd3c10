import type { Sequelize } from 'sequelize';
import type { ThroughputRow, WipItem, WipJson, WipQuery, WipStageRow } from '../../../shared/schemas/line.js';
import { readQuery } from '../../read/read-query.js';
import { plantSettings } from '../plant.js';

/**
 * The work-in-process board. A part in process at a stage is *waiting* when it has no result
 * there yet, *in work* when it is back at a stage it already has a result at (sent back by a rework
 * disposition or a supervisor's re-entry: work on it is under way again), and *on hold* while an
 * NCR holds it. Its age runs from when it reached the stage (its last result, or when it was made);
 * a hold's from the oldest open NCR on it.
 */
export const ITEMS_SQL = `
  SELECT i.serial, i.kind, f.code AS family_code, s.code AS stage_code, s.name AS stage_name,
         CASE WHEN i.status = 'on_hold' THEN 'on_hold'
              WHEN EXISTS (SELECT 1 FROM stage_results r WHERE r.item_id = i.id AND r.stage_id = i.current_stage_id)
                THEN 'in_work' ELSE 'waiting' END AS state,
         round(extract(epoch FROM (now() - CASE WHEN i.status = 'on_hold' AND hold.at IS NOT NULL THEN hold.at
               ELSE greatest(i.created_at, coalesce(last.at, i.created_at)) END)) / 3600.0, 1)::float AS age_hours,
         hold.number AS ncr
    FROM items i
    JOIN stages s ON s.id = i.current_stage_id
    JOIN engine_families f ON f.id = i.engine_family_id
    LEFT JOIN LATERAL (SELECT max(r.finished_at) AS at FROM stage_results r WHERE r.item_id = i.id) last ON true
    LEFT JOIN LATERAL (
      SELECT n.number, n.created_at AS at FROM nonconformances n
       WHERE n.item_id = i.id AND n.state IN ('raised','in_review','decided')
       ORDER BY n.created_at LIMIT 1) hold ON true
   WHERE i.current_stage_id IS NOT NULL AND i.status IN ('in_process','on_hold')
     AND (CAST(:family AS int) IS NULL OR i.engine_family_id = :family)
     AND (CAST(:kind AS text) IS NULL OR i.kind = :kind)
     AND (CAST(:stage AS text) IS NULL OR s.code = :stage)
     AND (CAST(:station AS text) IS NULL OR EXISTS (SELECT 1 FROM stations st WHERE st.stage_id = s.id AND st.code = :station))
   ORDER BY age_hours DESC, i.serial`;

// every stage of the families' routes, so an empty stage still shows as empty
export const STAGES_SQL = `
  SELECT s.code AS stage_code, s.name AS stage_name, s.part_kind,
         coalesce(array_agg(DISTINCT st.code) FILTER (WHERE st.code IS NOT NULL AND st.active), '{}') AS stations,
         min(rs.position) AS position
    FROM stages s
    JOIN route_stages rs ON rs.stage_id = s.id
    JOIN routes ro ON ro.id = rs.route_id AND ro.active
    LEFT JOIN stations st ON st.stage_id = s.id
   WHERE (CAST(:family AS int) IS NULL OR ro.engine_family_id = :family)
     AND (CAST(:kind AS text) IS NULL OR s.part_kind = :kind)
     AND (CAST(:stage AS text) IS NULL OR s.code = :stage)
   GROUP BY s.id
   ORDER BY array_position(ARRAY['core','block','crankshaft','cylinder_head','camshaft','rod_set','long_block']::text[], s.part_kind::text),
            min(rs.position), s.code`;

// results recorded in the last seven plant days, per day and shift (06–14, 14–22, 22–06 local):
// counted by hour first, then the hours put in their day and shift. Corrections are few, so the
// results they replaced are left out through one hashed list rather than a lookup per result.
export const THROUGHPUT_SQL = `
  SELECT to_char((g.lt - interval '6 hours')::date, 'YYYY-MM-DD') AS day,
         CASE WHEN extract(hour FROM g.lt) >= 6 AND extract(hour FROM g.lt) < 14 THEN 1
              WHEN extract(hour FROM g.lt) >= 14 AND extract(hour FROM g.lt) < 22 THEN 2
              ELSE 3 END AS shift,
         s.code AS stage_code, sum(g.passed)::int AS passed, sum(g.failed)::int AS failed
    FROM (SELECT date_trunc('hour', r.finished_at AT TIME ZONE :tz) AS lt, r.stage_id,
                 count(*) FILTER (WHERE r.verdict = 'pass') AS passed,
                 count(*) FILTER (WHERE r.verdict = 'fail') AS failed
            FROM stage_results r
           WHERE r.finished_at >= now() - interval '7 days'
             AND r.id NOT IN (SELECT x.supersedes_id FROM stage_results x WHERE x.supersedes_id IS NOT NULL)
             -- the items are read only when a filter needs them (with none, the planner drops the test)
             AND ((CAST(:family AS int) IS NULL AND CAST(:kind AS text) IS NULL)
                  OR EXISTS (SELECT 1 FROM items i WHERE i.id = r.item_id
                                AND (CAST(:family AS int) IS NULL OR i.engine_family_id = :family)
                                AND (CAST(:kind AS text) IS NULL OR i.kind = :kind)))
           GROUP BY 1, 2) g
    JOIN stages s ON s.id = g.stage_id
   GROUP BY 1, 2, 3
   ORDER BY 1, 2, 3`;

type ItemRow = {
  serial: string;
  kind: string;
  family_code: string;
  stage_code: string;
  stage_name: string;
  state: WipItem['state'];
  age_hours: number;
  ncr: string | null;
};

export const HOLD_BUCKETS = [
  { label: 'Under a day', below: 24 },
  { label: '1–3 days', below: 72 },
  { label: '3–7 days', below: 168 },
  { label: 'Over a week', below: Infinity },
];

export async function wipItems(sequelize: Sequelize, q: WipQuery): Promise<WipItem[]> {
  const rows = await readQuery<ItemRow>(sequelize, ITEMS_SQL, filters(q));
  return rows.map((r) => ({
    serial: r.serial,
    kind: r.kind,
    familyCode: r.family_code,
    stageCode: r.stage_code,
    stageName: r.stage_name,
    state: r.state,
    ageHours: Number(r.age_hours),
    ncr: r.ncr,
  }));
}

const filters = (q: WipQuery) => ({
  family: q.family ?? null,
  kind: q.kind ?? null,
  stage: q.stage ?? null,
  station: q.station ?? null,
});

export async function wipBoard(sequelize: Sequelize, q: WipQuery): Promise<Omit<WipJson, 'readFrom'>> {
  const tz = (await plantSettings()).timeZone;
  const [items, stages, throughput] = await Promise.all([
    wipItems(sequelize, q),
    readQuery<{ stage_code: string; stage_name: string; part_kind: string; stations: string[] }>(
      sequelize,
      STAGES_SQL,
      filters(q),
    ),
    readQuery<{ day: string; shift: number; stage_code: string; passed: number; failed: number }>(
      sequelize,
      THROUGHPUT_SQL,
      { ...filters(q), tz },
    ),
  ]);
  const board: WipStageRow[] = stages
    .filter((s) => !q.station || s.stations.includes(q.station))
    .map((s) => {
      const here = items.filter((i) => i.stageCode === s.stage_code);
      return {
        stageCode: s.stage_code,
        stageName: s.stage_name,
        partKind: s.part_kind,
        stations: s.stations,
        waiting: here.filter((i) => i.state === 'waiting').length,
        inWork: here.filter((i) => i.state === 'in_work').length,
        onHold: here.filter((i) => i.state === 'on_hold').length,
        oldestHours: here.length ? Math.max(...here.map((i) => i.ageHours)) : null,
      };
    });
  const holds = items.filter((i) => i.state === 'on_hold');
  let floor = 0;
  const holdAges = HOLD_BUCKETS.map((b) => {
    const count = holds.filter((h) => h.ageHours >= floor && h.ageHours < b.below).length;
    floor = b.below;
    return { label: b.label, count };
  });
  return {
    asOf: new Date().toISOString(),
    stages: board,
    items,
    holdAges,
    throughput: throughput.map((t): ThroughputRow => ({
      day: t.day,
      shift: Number(t.shift),
      stageCode: t.stage_code,
      passed: t.passed,
      failed: t.failed,
    })),
  };
}
