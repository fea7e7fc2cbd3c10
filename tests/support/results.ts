import { randomUUID } from 'node:crypto';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { unique } from './app.js';

/**
 * Results written straight into the tables, at any time, for the line's counts (yields, the board):
 * a family, station and items of the test's own, so its counts are its alone.
 */
export function resultFixtures(sequelize: Sequelize) {
  const q = <T extends object = Record<string, unknown>>(
    sql: string,
    replacements: Record<string, unknown> = {},
    transaction?: Transaction,
  ) => sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements, transaction });

  async function freshFamily() {
    const code = unique('F').slice(0, 12).toUpperCase();
    const [row] = await q<{ id: number }>(
      `INSERT INTO engine_families (code, name, layout, cylinders, bore_mm, stroke_mm, heads_per_engine, warranty_months)
       VALUES (:code, :code, 'inline', 4, 90, 90, 1, 12) RETURNING id`,
      { code },
    );
    return { id: row!.id, code };
  }

  async function item(familyId: number, kind = 'block') {
    const serial = unique('Y').toUpperCase();
    const [row] = await q<{ id: number }>(
      `INSERT INTO items (serial, kind, engine_family_id, status) VALUES (:serial, :kind, :familyId, 'in_process') RETURNING id`,
      { serial, kind, familyId },
    );
    return row!.id;
  }

  async function result(
    itemId: number,
    stageCode: string,
    stationId: number | null,
    verdict: 'pass' | 'fail',
    at: string,
    supersedes: number | null = null,
    transaction?: Transaction,
  ) {
    const [row] = await q<{ id: number }>(
      `INSERT INTO stage_results (item_id, stage_id, station_id, operator_id, finished_at, verdict, idempotency_key, supersedes_id, correction_reason)
       SELECT :itemId, s.id, :stationId, (SELECT min(id) FROM users), :at, :verdict, :key, :supersedes,
              CASE WHEN CAST(:supersedes AS int) IS NULL THEN NULL ELSE 'typing slip' END
         FROM stages s WHERE s.code = :stageCode RETURNING id`,
      { itemId, stageCode, stationId, verdict, at, key: randomUUID(), supersedes },
      transaction,
    );
    return row!.id;
  }

  async function station(stageCode: string) {
    const code = unique('S').slice(0, 10).toUpperCase();
    const [row] = await q<{ id: number }>(
      `INSERT INTO stations (code, name, stage_id) SELECT :code, :code, id FROM stages WHERE code = :stageCode RETURNING id`,
      { code, stageCode },
    );
    return { id: row!.id, code };
  }

  return { q, freshFamily, item, result, station };
}
