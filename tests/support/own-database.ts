import pg from 'pg';
import { QueryTypes } from 'sequelize';
import { seedDemoIfEmpty } from '../../db/seeders/demo.js';
import { createSequelize } from '../../server/db.js';
import { migrate } from '../../server/migrate.js';
import { makeTestApp, type TestApp } from './app.js';

/**
 * Databases of a suite's own on the test cluster, for drills whose rows and mail must stay out of
 * the shared test database other files read at the same time (race drills), or that make and drop
 * whole databases (backups). Needs ADMIN_DATABASE_URL, as the test cluster gives.
 */
const admin = () => {
  const url = process.env.ADMIN_DATABASE_URL;
  if (!url) throw new Error('ADMIN_DATABASE_URL is not set: run the suites through npm test.');
  return url;
};

/** The URL of database `name` on the test cluster. */
export function databaseUrl(name: string): string {
  const u = new URL(admin());
  u.pathname = `/${name}`;
  return u.toString();
}

/** One statement as the cluster's administrator (CREATE DATABASE cannot run in a transaction). */
export async function adminQuery(sql: string): Promise<void> {
  const c = new pg.Client({ connectionString: admin() });
  await c.connect();
  try {
    await c.query(sql);
  } finally {
    await c.end();
  }
}

/**
 * A new database named `${prefix}_${pid}`, migrated, with the demo plant without its months of
 * history (a drill makes its own), and a test app on it. `drop()` closes the app and drops it.
 */
export async function ownDatabase(prefix: string): Promise<{ t: TestApp; drop: () => Promise<void> }> {
  const name = `${prefix}_${process.pid}`;
  await adminQuery(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
  await adminQuery(`CREATE DATABASE ${name}`);
  const own = createSequelize(databaseUrl(name), { poolMax: 2 });
  try {
    await migrate(own);
    await seedDemoIfEmpty(own, { bcryptCost: 4, history: false });
  } finally {
    await own.close();
  }
  const t = makeTestApp({ DATABASE_URL: databaseUrl(name) });
  return {
    t,
    drop: async () => {
      await t.close();
      await adminQuery(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
    },
  };
}

/**
 * A new database named `${prefix}_${pid}`, migrated and nothing more: what a plant starts from
 * with SEED_DEMO=never (no people, stages, families or parties; the built-in part kinds and the
 * plant's settings row that the migrations make). `drop()` drops it; close any app on it first.
 */
export async function emptyDatabase(prefix: string): Promise<{ url: string; drop: () => Promise<void> }> {
  const name = `${prefix}_${process.pid}`;
  await adminQuery(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`);
  await adminQuery(`CREATE DATABASE ${name}`);
  const own = createSequelize(databaseUrl(name), { poolMax: 2 });
  try {
    await migrate(own);
  } finally {
    await own.close();
  }
  return { url: databaseUrl(name), drop: () => adminQuery(`DROP DATABASE IF EXISTS ${name} WITH (FORCE)`) };
}

/** Race drills judge by commit time: the cluster must keep commit timestamps. */
export async function expectCommitTimestamps(t: TestApp): Promise<void> {
  const [setting] = await t.sequelize.query<{ track_commit_timestamp: string }>('SHOW track_commit_timestamp', {
    type: QueryTypes.SELECT,
  });
  if (setting?.track_commit_timestamp !== 'on') {
    throw new Error('The race drill judges by commit time: start the cluster with track_commit_timestamp=on.');
  }
}
