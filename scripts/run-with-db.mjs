// Runs a command with DATABASE_URL pointing at the project's cluster (the one `npm start` uses),
// starting the cluster for the command if it is not running and stopping it again afterwards.
import { spawnSync } from 'node:child_process';
import { ensureNodeModules, openProjectDatabase, projectDir } from './bootstrap.mjs';

ensureNodeModules();

const [cmd, ...args] = process.argv.slice(2);
if (!cmd) {
  console.error('usage: node scripts/run-with-db.mjs COMMAND [ARGS…]');
  process.exit(2);
}
const { cluster, url } = await openProjectDatabase();
const r = spawnSync('npx', [cmd, ...args], {
  cwd: projectDir,
  stdio: 'inherit',
  env: { ...process.env, DATABASE_URL: url },
});
if (cluster.startedHere) cluster.stop();
process.exit(r.status ?? 1);
