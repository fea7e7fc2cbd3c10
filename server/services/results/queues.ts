import { QueryTypes, type Sequelize } from 'sequelize';

export type StationQueueJson = { code: string; waiting: number; rank: number };

/**
 * Each station in service with how many parts wait at its stage now, in route order: the stage's
 * earliest place on any route, then the stage's id (the order the line was set up in).
 */
export async function stationQueues(sequelize: Sequelize): Promise<StationQueueJson[]> {
  const rows = await sequelize.query<{ code: string; waiting: number }>(
    `SELECT s.code, coalesce(q.waiting, 0)::int AS waiting
       FROM stations s
       JOIN stages g ON g.id = s.stage_id
       LEFT JOIN (SELECT stage_id, min(position) AS position FROM route_stages GROUP BY stage_id) r ON r.stage_id = s.stage_id
       LEFT JOIN (SELECT current_stage_id, count(*) AS waiting FROM items
                   WHERE current_stage_id IS NOT NULL AND status = 'in_process' GROUP BY current_stage_id) q
              ON q.current_stage_id = s.stage_id
      WHERE s.active
      ORDER BY coalesce(r.position, 2147483647), g.id, s.code`,
    { type: QueryTypes.SELECT },
  );
  return rows.map((r, i) => ({ code: r.code, waiting: r.waiting, rank: i }));
}
