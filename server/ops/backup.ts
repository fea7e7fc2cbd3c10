import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { QueryTypes, type Sequelize } from 'sequelize';
import pg from 'pg';
import { findPgBin } from '../../db/cluster.mjs';

/**
 * Backups are pg_dump's custom-format archives (compressed, restorable table by table with
 * pg_restore). A restore always goes into a fresh database, never over the one in use, so a
 * mistaken restore cannot destroy current records.
 */

function pgTool(name: 'pg_dump' | 'pg_restore') {
  const bin = findPgBin();
  const exe = bin ? path.join(bin, name) : name;
  return exe;
}

export function backupDatabase(url: string, file: string) {
  fs.mkdirSync(path.dirname(file), { recursive: true });
  const r = spawnSync(pgTool('pg_dump'), ['--format=custom', '--no-owner', '--file', file, '--dbname', url], {
    encoding: 'utf8',
  });
  if (r.status !== 0) throw new Error(`pg_dump failed: ${r.stderr || r.error?.message}`);
  return { file, bytes: fs.statSync(file).size };
}

/** Creates `database` (it must not exist) and restores the archive into it. */
export async function restoreDatabase(adminUrl: string, file: string, database: string) {
  if (!/^[a-z_][a-z0-9_]{0,62}$/.test(database)) throw new Error(`"${database}" is not a plain database name`);
  if (!fs.existsSync(file)) throw new Error(`no such backup: ${file}`);
  const admin = new pg.Client({ connectionString: adminUrl });
  await admin.connect();
  try {
    const exists = await admin.query('SELECT 1 FROM pg_database WHERE datname = $1', [database]);
    if (exists.rowCount) throw new Error(`database ${database} already exists: restore into a fresh one`);
    await admin.query(`CREATE DATABASE ${database}`);
  } finally {
    await admin.end();
  }
  const target = new URL(adminUrl);
  target.pathname = `/${database}`;
  const r = spawnSync(
    pgTool('pg_restore'),
    ['--no-owner', '--exit-on-error', '--single-transaction', '--dbname', target.toString(), file],
    { encoding: 'utf8' },
  );
  if (r.status !== 0) throw new Error(`pg_restore failed: ${r.stderr || r.error?.message}`);
  return { database, url: target.toString() };
}

/** Rows in every table of the public schema, for comparing a restore with its source. */
export async function rowCounts(sequelize: Sequelize): Promise<Record<string, number>> {
  const tables = await sequelize.query<{ t: string }>(
    "SELECT tablename AS t FROM pg_tables WHERE schemaname = 'public' ORDER BY tablename",
    { type: QueryTypes.SELECT },
  );
  const out: Record<string, number> = {};
  for (const { t } of tables) {
    const [row] = await sequelize.query<{ n: number }>(`SELECT count(*)::int AS n FROM "${t}"`, {
      type: QueryTypes.SELECT,
    });
    out[t] = row!.n;
  }
  return out;
}
