import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { chownToServer, ClusterError, startCluster, type Cluster } from '../../db/cluster.mjs';
import { pgTool, privateFolder, withoutPassword } from './backup.js';

/**
 * Point-in-time recovery with PostgreSQL's own continuous archiving (manual, chapter "Continuous
 * Archiving and Point-in-Time Recovery"): a base backup from pg_basebackup, the WAL archive that
 * db/cluster.mjs keeps when CORETRAIL_WAL_ARCHIVE is on, and a restore that lays the base backup
 * out as a fresh cluster and replays the archive up to a chosen time. Nothing here writes to the
 * cluster in use.
 */

/** What a base backup folder says about itself, beside pg_basebackup's base.tar.gz and pg_wal.tar.gz. */
export type BaseBackupInfo = {
  label: string;
  startedAt: string;
  finishedAt: string;
  /** The first WAL segment this backup needs: the archive's older segments serve only older backups. */
  startWal: string | null;
};
const INFO = 'coretrail-base.json';

function run(cmd: string, args: string[], env: NodeJS.ProcessEnv = process.env) {
  return new Promise<void>((resolve, reject) => {
    const child = spawn(cmd, args, { env, stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (d) => (stderr += d));
    child.once('error', reject);
    child.once('close', (code) =>
      code === 0 ? resolve() : reject(new Error(`${path.basename(cmd)} failed (${code}): ${stderr.trim()}`)),
    );
  });
}

function closeToOthers(dir: string) {
  fs.chmodSync(dir, 0o700);
  for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
    const p = path.join(dir, e.name);
    if (e.isDirectory()) closeToOthers(p);
    else fs.chmodSync(p, 0o600);
  }
}

/**
 * A base backup of the whole cluster behind `url` into a new folder under `parent`: compressed tar
 * files with the WAL needed to make them consistent (-X stream), after an immediate checkpoint.
 */
export async function takeBaseBackup(url: string, parent: string) {
  privateFolder(parent);
  const startedAt = new Date();
  const label = `coretrail-${startedAt.toISOString().replace(/\D/g, '').slice(0, 14)}`;
  const dir = path.join(parent, label);
  const { url: bare, env } = withoutPassword(url);
  await run(
    pgTool('pg_basebackup'),
    [
      '--dbname',
      bare,
      '-D',
      dir,
      '--format=tar',
      '--gzip',
      '--wal-method=stream',
      '--checkpoint=fast',
      '--label',
      label,
    ],
    env,
  );
  const finishedAt = new Date().toISOString();
  // backup_label says where the backup starts in the WAL: "START WAL LOCATION: 0/4000028 (file 0000…04)"
  const labelText = spawnSync('tar', ['-xzOf', path.join(dir, 'base.tar.gz'), 'backup_label'], { encoding: 'utf8' });
  const startWal = /\(file ([0-9A-F]{24})\)/.exec(labelText.stdout ?? '')?.[1] ?? null;
  const info: BaseBackupInfo = { label, startedAt: startedAt.toISOString(), finishedAt, startWal };
  fs.writeFileSync(path.join(dir, INFO), `${JSON.stringify(info, null, 2)}\n`, { mode: 0o600 });
  closeToOthers(dir);
  const bytes = fs.readdirSync(dir).reduce((n, f) => n + fs.statSync(path.join(dir, f)).size, 0);
  return { dir, bytes, ...info };
}

export function readBaseBackup(dir: string): BaseBackupInfo {
  for (const f of ['base.tar.gz', 'pg_wal.tar.gz', INFO]) {
    if (!fs.existsSync(path.join(dir, f)))
      throw new Error(`${dir} is not a base backup made by db:basebackup (no ${f})`);
  }
  return JSON.parse(fs.readFileSync(path.join(dir, INFO), 'utf8')) as BaseBackupInfo;
}

/** Whether the cluster behind `url` archives its WAL, and where the newest archived segment stands. */
export async function archiveStatus(url: string) {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    const { rows } = await c.query<{ mode: string; last: string | null; at: Date | null; failed: number }>(
      `SELECT current_setting('archive_mode') AS mode, last_archived_wal AS last, last_archived_time AS at,
              failed_count::int AS failed FROM pg_stat_archiver`,
    );
    return rows[0]!;
  } finally {
    await c.end();
  }
}

/**
 * Closes the current WAL segment and waits until the archive has it, so that everything committed
 * so far can be recovered (what archive_timeout does once a minute by itself).
 */
export async function flushArchive(url: string, timeoutMs = 60_000) {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    const { rows } = await c.query<{ wal: string }>('SELECT pg_walfile_name(pg_switch_wal()) AS wal');
    const wanted = rows[0]!.wal;
    const until = Date.now() + timeoutMs;
    for (;;) {
      const s = await c.query<{ last: string | null }>('SELECT last_archived_wal AS last FROM pg_stat_archiver');
      const last = s.rows[0]!.last;
      // segment names of one timeline sort in WAL order
      if (last && last.slice(0, 24) >= wanted) return wanted;
      if (Date.now() > until) throw new Error(`WAL segment ${wanted} was not archived within ${timeoutMs / 1000} s`);
      await new Promise((r) => setTimeout(r, 100));
    }
  } finally {
    await c.end();
  }
}

/**
 * Restores `base` into a fresh cluster folder `dir` and replays the WAL archive up to `targetTime`
 * (recovery_target_time: the last transaction that committed at or before it is the last one kept),
 * then promotes it. `credentialsFile` is the source cluster's credentials.json (the restored cluster
 * has the same users and passwords). Returns the running cluster.
 */
export async function restoreToTime({
  base,
  archiveDir,
  targetTime,
  dir,
  port,
  credentialsFile,
  timeoutMs = 3_600_000,
}: {
  base: string;
  archiveDir: string;
  targetTime: Date;
  dir: string;
  port: number;
  credentialsFile: string;
  timeoutMs?: number;
}): Promise<{ cluster: Cluster; lastReplayed: Date | null }> {
  const info = readBaseBackup(base);
  if (targetTime.getTime() <= Date.parse(info.finishedAt)) {
    throw new Error(`${base} ends at ${info.finishedAt}: choose a time after it, or an older base backup`);
  }
  if (!fs.existsSync(archiveDir)) throw new Error(`no WAL archive at ${archiveDir}`);
  const pgdata = path.join(dir, 'pgdata');
  if (fs.existsSync(pgdata)) throw new Error(`${pgdata} already exists: restore into a fresh folder`);
  privateFolder(dir);
  fs.mkdirSync(pgdata, { mode: 0o700 });
  await run('tar', ['-xzf', path.join(base, 'base.tar.gz'), '-C', pgdata]);
  await run('tar', ['-xzf', path.join(base, 'pg_wal.tar.gz'), '-C', path.join(pgdata, 'pg_wal')]);
  fs.copyFileSync(credentialsFile, path.join(dir, 'credentials.json'));
  fs.chmodSync(path.join(dir, 'credentials.json'), 0o600);
  chownToServer(dir);

  // recovery_target_time takes PostgreSQL's own timestamp form, not ISO 8601's "T…Z"
  const target = targetTime.toISOString().replace('T', ' ').replace('Z', '+00');
  const cluster = await startCluster({ dir, port, recovery: { archiveDir, targetTime: target } });
  // pg_ctl returns once connections are accepted, which a hot standby does before it has replayed
  // up to the target: wait for the promotion that ends recovery
  const until = Date.now() + timeoutMs;
  let lastReplayed: Date | null = null;
  for (;;) {
    try {
      const c = new pg.Client({ connectionString: cluster.url('postgres') });
      await c.connect();
      try {
        const { rows } = await c.query<{ recovering: boolean; replayed: Date | null }>(
          'SELECT pg_is_in_recovery() AS recovering, pg_last_xact_replay_timestamp() AS replayed',
        );
        lastReplayed = rows[0]!.replayed ?? lastReplayed;
        if (!rows[0]!.recovering) return { cluster, lastReplayed };
      } finally {
        await c.end();
      }
    } catch (err) {
      if (!fs.existsSync(path.join(pgdata, 'postmaster.pid'))) {
        const log = path.join(dir, 'postgres.log');
        const tail = fs.existsSync(log) ? fs.readFileSync(log, 'utf8').split('\n').slice(-12).join('\n') : '';
        throw new ClusterError(`the recovery stopped without reaching ${targetTime.toISOString()}:\n${tail}`);
      }
      if (!(err instanceof Error) || !/starting up|not yet accepting|ECONNREFUSED/.test(err.message)) throw err;
    }
    if (Date.now() > until) {
      cluster.stop();
      throw new Error(`recovery did not finish within ${timeoutMs / 1000} s; see ${path.join(dir, 'postgres.log')}`);
    }
    await new Promise((r) => setTimeout(r, 200));
  }
}

/** Size of a folder's files, for reports. */
export function folderBytes(dir: string): number {
  const r = spawnSync('du', ['-sb', dir], { encoding: 'utf8' });
  return Number(r.stdout.split('\t')[0]) || 0;
}
