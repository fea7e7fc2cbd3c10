import { Sequelize } from 'sequelize';
import pg from 'pg';
import { initModels } from './models/index.js';

// numeric columns come back as strings by default; readings and limits are plain numbers here
pg.types.setTypeParser(pg.types.builtins.NUMERIC, (v: string) => Number(v));
pg.types.setTypeParser(pg.types.builtins.INT8, (v: string) => Number(v));

export function createSequelize(url: string, { poolMax = 10 }: { poolMax?: number } = {}): Sequelize {
  const sequelize = new Sequelize(url, {
    dialect: 'postgres',
    logging: false,
    pool: { max: poolMax, min: 0, acquire: 10_000, idle: 10_000 },
    define: { underscored: true },
    dialectOptions: { connectionTimeoutMillis: 5_000 },
  });
  initModels(sequelize);
  return sequelize;
}
