import { QueryTypes, type Sequelize } from 'sequelize';

/**
 * Every read of the line's screens (homes, work in process, search, yields, Pareto) goes through
 * here: plain SELECTs, never in a transaction, never writing. One place to send them elsewhere
 * (a hot standby) without touching the services.
 */
export function readQuery<T extends object>(
  sequelize: Sequelize,
  sql: string,
  replacements: Record<string, unknown> = {},
): Promise<T[]> {
  return sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });
}
