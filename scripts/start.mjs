// `npm start`: install what is missing, start the project's PostgreSQL cluster, build the client,
// then serve client and API from one process. Ctrl-C stops the server, then the cluster.
import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { ensureNodeModules, projectDir, run } from './bootstrap.mjs';

ensureNodeModules();
const { ClusterError, ensureDatabase, ensurePostgres, persistentClusterDir, startCluster } =
  await import('../db/cluster.mjs');

const pgPort = Number(process.env.CORETRAIL_PG_PORT ?? 54329);
const appPort = Number(process.env.PORT ?? 4310);
const database = process.env.CORETRAIL_DB ?? 'coretrail';

function secret() {
  const file = path.join(projectDir, '.data', 'jwt-secret');
  fs.mkdirSync(path.dirname(file), { recursive: true });
  if (!fs.existsSync(file)) fs.writeFileSync(file, randomBytes(48).toString('base64url'), { mode: 0o600 });
  return fs.readFileSync(file, 'utf8').trim();
}

let cluster;
try {
  const bin = ensurePostgres();
  cluster = await startCluster({ dir: persistentClusterDir(projectDir), port: pgPort, bin });
  await ensureDatabase(cluster, database);
} catch (err) {
  process.stderr.write(`\n${err instanceof ClusterError ? err.message : (err?.stack ?? err)}\n`);
  cluster?.stop();
  process.exit(1);
}

process.stderr.write('[setup] building the client (vite build)…\n');
if (run('npx', ['vite', 'build', '--logLevel', 'warn']) !== 0) {
  cluster.stop();
  process.exit(1);
}

const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
  cwd: projectDir,
  stdio: 'inherit',
  env: {
    ...process.env,
    DATABASE_URL: cluster.url(database),
    PORT: String(appPort),
    JWT_SECRET: process.env.JWT_SECRET ?? secret(),
    CLIENT_DIR: path.join(projectDir, 'dist'),
    UPLOAD_DIR: process.env.UPLOAD_DIR ?? path.join(projectDir, '.data', 'uploads'),
  },
});

let signalled = false;
for (const sig of ['SIGINT', 'SIGTERM', 'SIGHUP']) {
  process.on(sig, () => {
    signalled = true;
    // a terminal's Ctrl-C reaches the child too; forwarding again is harmless (it stops once)
    child.kill(sig === 'SIGHUP' ? 'SIGTERM' : sig);
  });
}
child.on('exit', (code, signal) => {
  cluster.stop();
  process.exit(signalled ? 0 : (code ?? (signal ? 1 : 0)));
});
