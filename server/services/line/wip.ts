import type { Sequelize } from 'sequelize';
import type { ThroughputRow, WipItem, WipJson, WipQuery, WipStageRow } from '../../../shared/schemas/line.js';
import { readQuery } from '../../read/read-query.js';
import { plantSettings } from '../plant.js';
import { escapeLike } from './search.js';

/**
 * The work-in-process board. A part in process at a stage is *waiting* when it has no result
 * there yet, *in work* when it is back at a stage it already has a result at (sent back by a rework
 * disposition or a supervisor's re-entry: work on it is under way again), and *on hold* while an
 * NCR holds it. Its age runs from when it reached the stage (its last result, or when it was made);
 * a hold's from the oldest open NCR on it.
 *
 * One statement reads every part in process once and gives back what the screens show: the counts
 * and oldest age per stage, the ages of the holds, and the oldest `perStage` parts at each stage.
 * A plant has thousands of parts on its floor; nobody reads them all on one page, and sending them
 * all cost more than reading them (6,437 parts at 50,000 units: 1.3 MB of JSON).
 */
export const BOARD_SQL = `
  WITH w AS MATERIALIZED (
    SELECT i.serial, i.kind, f.code AS family_code, i.current_stage_id AS stage_id,
           CASE WHEN i.status = 'on_hold' THEN 'on_hold' WHEN coalesce(r.here, false) THEN 'in_work' ELSE 'waiting' END AS state,
           round(extract(epoch FROM (now() - CASE WHEN i.status = 'on_hold' AND hold.at IS NOT NULL THEN hold.at
                 ELSE greatest(i.created_at, coalesce(r.at, i.created_at)) END)) / 3600.0, 1)::float AS age_hours,
           hold.number AS ncr
      FROM items i
      JOIN engine_families f ON f.id = i.engine_family_id
      -- one pass over the part's results (an index-only scan): when it last finished one, and whether one is here
      LEFT JOIN LATERAL (SELECT max(x.finished_at) AS at, bool_or(x.stage_id = i.current_stage_id) AS here
                           FROM stage_results x WHERE x.item_id = i.id) r ON true
      -- looked up only for a part on hold
      LEFT JOIN LATERAL (
        SELECT n.number, n.created_at AS at FROM nonconformances n
         WHERE i.status = 'on_hold' AND n.item_id = i.id AND n.state IN ('raised','in_review','decided')
         ORDER BY n.created_at LIMIT 1) hold ON true
     WHERE i.current_stage_id IS NOT NULL AND i.status IN ('in_process','on_hold')
       AND (CAST(:family AS int) IS NULL OR i.engine_family_id = :family)
       AND (CAST(:kind AS text) IS NULL OR i.kind = :kind)
       AND (CAST(:stage AS text) IS NULL OR i.current_stage_id IN (SELECT s.id FROM stages s WHERE s.code = :stage))
       AND (CAST(:station AS text) IS NULL OR i.current_stage_id IN (SELECT st.stage_id FROM stations st WHERE st.code = :station))
       AND (CAST(:serialLike AS text) IS NULL OR i.serial ILIKE :serialLike)
  )
  SELECT
    (SELECT coalesce(json_agg(json_build_object('stageId', c.stage_id, 'stageCode', s.code, 'stageName', s.name,
                                                'partKind', s.part_kind, 'waiting', c.waiting, 'inWork', c.in_work,
                                                'onHold', c.on_hold, 'oldestHours', c.oldest)), '[]')
       FROM (SELECT stage_id, count(*) FILTER (WHERE state = 'waiting') AS waiting,
                    count(*) FILTER (WHERE state = 'in_work') AS in_work,
                    count(*) FILTER (WHERE state = 'on_hold') AS on_hold, max(age_hours) AS oldest
               FROM w GROUP BY stage_id) c
       JOIN stages s ON s.id = c.stage_id) AS counts,
    (SELECT coalesce(array_agg(age_hours), '{}') FROM w WHERE state = 'on_hold') AS hold_ages,
    (SELECT coalesce(json_agg(json_build_object('serial', o.serial, 'kind', o.kind, 'familyCode', o.family_code,
                                                'stageCode', s.code, 'stageName', s.name, 'state', o.state,
                                                'ageHours', o.age_hours, 'ncr', o.ncr)
                              ORDER BY o.age_hours DESC, o.serial), '[]')
       FROM (SELECT w.*, row_number() OVER (PARTITION BY w.stage_id ORDER BY w.age_hours DESC, w.serial) AS rn FROM w) o
       JOIN stages s ON s.id = o.stage_id
      WHERE o.rn <= :perStage) AS items`;

// every stage of the families' routes, so an empty stage still shows as empty
export const STAGES_SQL = `
  SELECT s.id AS stage_id, s.code AS stage_code, s.name AS stage_name, s.part_kind,
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

export const HOLD_BUCKETS = [
  { label: 'Under a day', below: 24 },
  { label: '1–3 days', below: 72 },
  { label: '3–7 days', below: 168 },
  { label: 'Over a week', below: Infinity },
];

/** The oldest parts sent per stage, unless the query asks for more (up to 500). */
export const PER_STAGE = 20;

export const boardValues = (q: WipQuery) => ({
  family: q.family ?? null,
  kind: q.kind ?? null,
  stage: q.stage ?? null,
  station: q.station ?? null,
  serialLike: q.serial ? escapeLike(q.serial) : null,
  perStage: q.perStage ?? PER_STAGE,
});

type StageCount = {
  stageId: number;
  stageCode: string;
  stageName: string;
  partKind: string;
  waiting: number;
  inWork: number;
  onHold: number;
  oldestHours: number | null;
};
type BoardRow = { counts: StageCount[]; hold_ages: number[]; items: WipItem[] };

export async function wipBoard(sequelize: Sequelize, q: WipQuery): Promise<Omit<WipJson, 'readFrom'>> {
  const tz = (await plantSettings()).timeZone;
  const values = boardValues(q);
  const [[board], stages, throughput] = await Promise.all([
    readQuery<BoardRow>(sequelize, BOARD_SQL, values),
    readQuery<{ stage_id: number; stage_code: string; stage_name: string; part_kind: string; stations: string[] }>(
      sequelize,
      STAGES_SQL,
      values,
    ),
    readQuery<{ day: string; shift: number; stage_code: string; passed: number; failed: number }>(
      sequelize,
      THROUGHPUT_SQL,
      { ...values, tz },
    ),
  ]);
  const counts = new Map((board?.counts ?? []).map((c) => [Number(c.stageId), c]));
  const rows: WipStageRow[] = stages
    .filter((s) => !q.station || s.stations.includes(q.station))
    .map((s) => {
      const c = counts.get(Number(s.stage_id));
      return {
        stageCode: s.stage_code,
        stageName: s.stage_name,
        partKind: s.part_kind,
        stations: s.stations,
        waiting: c?.waiting ?? 0,
        inWork: c?.inWork ?? 0,
        onHold: c?.onHold ?? 0,
        oldestHours: c ? Number(c.oldestHours) : null,
      };
    });
  // parts at a stage no active route of theirs lists (a route changed under them) still count
  const listed = new Set(stages.map((s) => Number(s.stage_id)));
  for (const c of counts.values()) {
    if (listed.has(Number(c.stageId))) continue;
    rows.push({
      stageCode: c.stageCode,
      stageName: c.stageName,
      partKind: c.partKind,
      stations: [],
      waiting: c.waiting,
      inWork: c.inWork,
      onHold: c.onHold,
      oldestHours: Number(c.oldestHours),
    });
  }
  const holds = (board?.hold_ages ?? []).map(Number);
  let floor = 0;
  const holdAges = HOLD_BUCKETS.map((b) => {
    const count = holds.filter((h) => h >= floor && h < b.below).length;
    floor = b.below;
    return { label: b.label, count };
  });
  return {
    asOf: new Date().toISOString(),
    stages: rows,
    items: board?.items ?? [],
    itemCount: [...counts.values()].reduce((n, c) => n + Number(c.waiting) + Number(c.inWork) + Number(c.onHold), 0),
    perStage: values.perStage,
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
