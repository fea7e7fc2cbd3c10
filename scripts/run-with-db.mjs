// Runs a command with DATABASE_URL pointing at the project's cluster (the one `npm start` uses),
// starting the cluster for the command if it is not running and stopping it again afterwards.
import { spawnSync } from 'node:child_process';
import { ensureNodeModules, projectDir } from './bootstrap.mjs';

ensureNodeModules();
const { ClusterError, ensureDatabase, persistentClusterDir, startCluster } = await import('../db/cluster.mjs');

const [cmd, ...args] = process.argv.slice(2);
if (!cmd) {
  console.error('usage: node scripts/run-with-db.mjs COMMAND [ARGS…]');
  process.exit(2);
}
const database = process.env.CORETRAIL_DB ?? 'coretrail';
let cluster;
try {
  cluster = await startCluster({
    dir: persistentClusterDir(projectDir),
    port: Number(process.env.CORETRAIL_PG_PORT ?? 54329),
  });
  await ensureDatabase(cluster, database);
} catch (err) {
  console.error(err instanceof ClusterError ? err.message : err);
  process.exit(1);
}
const r = spawnSync('npx', [cmd, ...args], {
  cwd: projectDir,
  stdio: 'inherit',
  env: { ...process.env, DATABASE_URL: cluster.url(database) },
});
if (cluster.startedHere) cluster.stop();
process.exit(r.status ?? 1);
