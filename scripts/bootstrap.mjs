// Shared first steps of `npm start`, `npm test` and `npm run dev`: make sure npm dependencies are
// installed. Plain Node, no dependencies.
import { spawnSync } from 'node:child_process';
import { generateKeyPairSync, randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const projectDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export function ensureNodeModules() {
  const lock = path.join(projectDir, 'package-lock.json');
  const installed = path.join(projectDir, 'node_modules', '.package-lock.json');
  const fresh = fs.existsSync(installed) && fs.statSync(installed).mtimeMs >= fs.statSync(lock).mtimeMs;
  if (fresh) return;
  process.stderr.write('[setup] installing npm dependencies (npm ci)…\n');
  const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], {
    cwd: projectDir,
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  if (r.status !== 0) {
    process.stderr.write('[setup] npm ci failed; see the output above.\n');
    process.exit(1);
  }
}

/** Runs a command in the project folder and resolves with its exit code. */
export function run(cmd, args, opts = {}) {
  const r = spawnSync(cmd, args, { cwd: projectDir, stdio: 'inherit', ...opts });
  return r.status ?? 1;
}

/** Where the project's cluster lives: CORETRAIL_CLUSTER_DIR, else `.data/pg` (or where cluster-location says). */
function clusterDir(persistentClusterDir) {
  const given = process.env.CORETRAIL_CLUSTER_DIR;
  return given ? path.resolve(given) : persistentClusterDir(projectDir);
}

/**
 * CORETRAIL_WAL_ARCHIVE: `on` archives WAL into the cluster folder's wal-archive/, a path archives
 * there, `off` stops archiving; unset keeps what the cluster was last started with.
 */
function walArchiveSetting(dir) {
  const v = process.env.CORETRAIL_WAL_ARCHIVE?.trim();
  if (!v) return undefined;
  if (v === 'off') return 'off';
  return v === 'on' ? path.join(dir, 'wal-archive') : path.resolve(v);
}

/**
 * The project's own cluster and database, as `npm start`, `npm run dev` and the db:* scripts use
 * them: started if needed, the database created if missing. Exits with a plain message on failure.
 */
export async function openProjectDatabase() {
  const { ClusterError, ensureDatabase, ensurePostgres, persistentClusterDir, startCluster } =
    await import('../db/cluster.mjs');
  const database = process.env.CORETRAIL_DB ?? 'coretrail';
  let cluster;
  try {
    const bin = ensurePostgres();
    const dir = clusterDir(persistentClusterDir);
    cluster = await startCluster({
      dir,
      walArchive: walArchiveSetting(dir),
      port: Number(process.env.CORETRAIL_PG_PORT ?? 54329),
      bin,
    });
    await ensureDatabase(cluster, database);
  } catch (err) {
    process.stderr.write(`\n${err instanceof ClusterError ? err.message : (err?.stack ?? err)}\n`);
    if (cluster?.startedHere) cluster.stop();
    process.exit(1);
  }
  return { cluster, database, url: cluster.url(database) };
}

/** The session-signing secret, made once and kept in .data (git-ignored). */
export function projectSecret() {
  const file = path.join(projectDir, '.data', 'jwt-secret');
  fs.mkdirSync(path.dirname(file), { recursive: true });
  if (!fs.existsSync(file)) fs.writeFileSync(file, randomBytes(48).toString('base64url'), { mode: 0o600 });
  return fs.readFileSync(file, 'utf8').trim();
}

/** The plant's Ed25519 key that signs the audit log's heads, made once and kept in .data (git-ignored). */
export function projectSigningKey() {
  const file = path.join(projectDir, '.data', 'audit-signing-key.pem');
  fs.mkdirSync(path.dirname(file), { recursive: true });
  if (!fs.existsSync(file)) {
    const { privateKey } = generateKeyPairSync('ed25519');
    fs.writeFileSync(file, privateKey.export({ format: 'pem', type: 'pkcs8' }), { mode: 0o600 });
  }
  return fs.readFileSync(file, 'utf8');
}

/** Debian's Chromium for the browser suite and the benchmark: installed with apt-get when missing (as root). */
export function ensureChromium(tag = 'test') {
  const exe = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
  if (fs.existsSync(exe)) return exe;
  if (process.getuid?.() !== 0) {
    process.stderr.write(`[${tag}] Chromium not found at ${exe}; install Debian's "chromium" package.\n`);
    return exe;
  }
  process.stderr.write(`[${tag}] installing Debian package "chromium"…\n`);
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
  spawnSync('apt-get', ['update', '-qq'], { stdio: 'inherit', env });
  spawnSync('apt-get', ['install', '-y', '-qq', '--no-install-recommends', 'chromium', 'fonts-dejavu-core'], {
    stdio: 'inherit',
    env,
  });
  return exe;
}
