import { Umzug, SequelizeStorage } from 'umzug';
import type { Sequelize } from 'sequelize';
import { MIGRATIONS } from '../db/migrations/index.js';

// an arbitrary constant that names "migrations" among this database's advisory locks
const MIGRATION_LOCK = 72_410_001;

type RawClient = { query: (sql: string, params?: unknown[]) => Promise<unknown> };

export function migrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: MIGRATIONS.map((m) => ({ name: m.name, up: m.up, down: m.down })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}

/**
 * Runs pending migrations behind an advisory lock held on a connection of its own, so several
 * processes starting at once apply each migration exactly once.
 */
export async function migrate(sequelize: Sequelize): Promise<string[]> {
  const cm = sequelize.connectionManager as unknown as {
    getConnection(o: { type: 'write' }): Promise<RawClient>;
    releaseConnection(c: RawClient): Promise<void>;
  };
  const conn = await cm.getConnection({ type: 'write' });
  try {
    await conn.query('SELECT pg_advisory_lock($1)', [MIGRATION_LOCK]);
    try {
      const done = await migrator(sequelize).up();
      return done.map((m) => m.name);
    } finally {
      await conn.query('SELECT pg_advisory_unlock($1)', [MIGRATION_LOCK]);
    }
  } finally {
    await cm.releaseConnection(conn);
  }
}
