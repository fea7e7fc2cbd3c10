import { DataTypes, Sequelize } from 'sequelize';
import pg from 'pg';
import { initModels } from './models/index.js';

// Readings and limits are numeric(14,6): well inside a double's 15–17 significant digits, so they
// are plain numbers here. Sequelize installs its own NUMERIC parser (text) over pg's, hence both.
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v: string) => Number(v));
pg.types.setTypeParser(pg.types.builtins.INT8, (v: string) => Number(v));
(DataTypes as unknown as { postgres: { DECIMAL: { parse: (v: string) => number } } }).postgres.DECIMAL.parse = Number;

/**
 * `poolMin`: connections kept open while idle. The server keeps a couple, so the first scan after a
 * quiet spell does not pay for new connections (each starts with empty catalog caches).
 */
export function createSequelize(
  url: string,
  { poolMax = 10, poolMin = 0 }: { poolMax?: number; poolMin?: number } = {},
): Sequelize {
  const sequelize = new Sequelize(url, {
    dialect: 'postgres',
    logging: false,
    pool: { max: poolMax, min: poolMin, acquire: 10_000, idle: 10_000 },
    define: { underscored: true },
    // JIT compiles a query that the planner thinks is big: 100 ms and more on the trail's queries
    // at a plant's size, to save microseconds. Short transactional queries never gain from it.
    dialectOptions: { connectionTimeoutMillis: 5_000, options: '-c jit=off' },
  });
  initModels(sequelize);
  return sequelize;
}
