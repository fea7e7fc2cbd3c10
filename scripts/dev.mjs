// `npm run dev`: the project's cluster, the API under `tsx watch`, and Vite's dev server with HMR
// proxying /api to it. Ctrl-C stops all three.
import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { ensureNodeModules, projectDir } from './bootstrap.mjs';

ensureNodeModules();
const { ClusterError, ensureDatabase, persistentClusterDir, startCluster } = await import('../db/cluster.mjs');

const apiPort = Number(process.env.PORT ?? 4310);
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
const secretFile = path.join(projectDir, '.data', 'jwt-secret');
if (!fs.existsSync(secretFile)) fs.writeFileSync(secretFile, randomBytes(48).toString('base64url'), { mode: 0o600 });

const env = {
  ...process.env,
  DATABASE_URL: cluster.url(database),
  PORT: String(apiPort),
  API_PORT: String(apiPort),
  JWT_SECRET: process.env.JWT_SECRET ?? fs.readFileSync(secretFile, 'utf8').trim(),
};
const children = [
  spawn('npx', ['tsx', 'watch', '--clear-screen=false', 'server/index.ts'], { cwd: projectDir, stdio: 'inherit', env }),
  spawn('npx', ['vite'], { cwd: projectDir, stdio: 'inherit', env }),
];
let stopping = false;
const stopAll = () => {
  if (stopping) return;
  stopping = true;
  for (const c of children) c.kill('SIGTERM');
};
for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, stopAll);
let alive = children.length;
for (const c of children) {
  c.on('exit', () => {
    stopAll();
    if (--alive === 0) {
      // leave a cluster that `npm start` (or anyone) was already running alone
      if (cluster.startedHere) cluster.stop();
      process.exit(0);
    }
  });
}
