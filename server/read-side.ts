import { QueryTypes, type Model, type ModelStatic, type Sequelize } from 'sequelize';
import type { Freshness } from '../shared/schemas/trail.js';

/**
 * Where read-only pages read: a PostgreSQL hot standby of the primary when DATABASE_READ_URL is
 * set, else the primary itself. Only statements run here: the models stay bound to the primary,
 * so a read through them would go there; read-side code fetches model rows with `selectModels`.
 */
export type ReadSide = { db: Sequelize; standby: boolean };

export const primaryOnly = (sequelize: Sequelize): ReadSide => ({ db: sequelize, standby: false });

/**
 * How old the read side's data may be. On a standby: 0 when it has replayed all the WAL it has
 * received and is still receiving; otherwise the time since the last transaction it replayed
 * committed on the primary (the manual's "Hot Standby" chapter; pg_last_xact_replay_timestamp).
 */
export async function freshnessOf(read: ReadSide): Promise<Freshness> {
  if (!read.standby) return { source: 'primary', lagSeconds: 0, asOf: new Date().toISOString() };
  const [row] = await read.db.query<{ lag: number | null; now: Date }>(
    `SELECT CASE
              WHEN NOT pg_is_in_recovery() THEN 0
              WHEN pg_last_wal_receive_lsn() = pg_last_wal_replay_lsn()
                   AND EXISTS (SELECT 1 FROM pg_stat_wal_receiver WHERE status = 'streaming') THEN 0
              ELSE EXTRACT(EPOCH FROM clock_timestamp() - pg_last_xact_replay_timestamp())
            END::float8 AS lag,
            clock_timestamp() AS now`,
    { type: QueryTypes.SELECT },
  );
  const lag = Math.max(0, row?.lag ?? 0);
  const now = row ? new Date(row.now) : new Date();
  return {
    source: 'standby',
    lagSeconds: Math.round(lag * 10) / 10,
    asOf: new Date(now.getTime() - lag * 1000).toISOString(),
  };
}

/** Model rows read through the read side's connection (`SELECT *` of the model's table). */
export function selectModels<M extends Model>(
  read: ReadSide,
  model: ModelStatic<M>,
  where: string,
  replacements: Record<string, unknown>,
  orderBy?: string,
): Promise<M[]> {
  return read.db.query(
    `SELECT * FROM ${model.getTableName() as string} WHERE ${where}${orderBy ? ` ORDER BY ${orderBy}` : ''}`,
    {
      model,
      mapToModel: true,
      replacements,
    },
  );
}
