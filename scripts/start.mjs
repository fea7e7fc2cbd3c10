// `npm start`: install what is missing, start the project's PostgreSQL cluster, build the client,
// then serve client and API from one process, and keep it running: an API process that dies is
// started again after a pause (1 s, doubling to 30 s while it keeps dying), with the cluster left
// running. Ctrl-C stops the server, then the cluster. docs/operations.md has the same behaviour as
// a systemd unit.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import {
  ensureNodeModules,
  openProjectDatabase,
  projectDir,
  projectSecret,
  projectSigningKey,
  run,
} from './bootstrap.mjs';

ensureNodeModules();
const appPort = Number(process.env.PORT ?? 4310);
const { cluster, url } = await openProjectDatabase();

if (process.env.CORETRAIL_SKIP_BUILD === '1' && fs.existsSync(path.join(projectDir, 'dist', 'index.html'))) {
  process.stderr.write('[setup] CORETRAIL_SKIP_BUILD=1: serving the client already built in dist\n');
} else {
  process.stderr.write('[setup] building the client (vite build)…\n');
  if (run('npx', ['vite', 'build', '--logLevel', 'warn']) !== 0) {
    cluster.stop();
    process.exit(1);
  }
}

const env = {
  ...process.env,
  DATABASE_URL: url,
  PORT: String(appPort),
  JWT_SECRET: process.env.JWT_SECRET ?? projectSecret(),
  AUDIT_SIGNING_KEY: process.env.AUDIT_SIGNING_KEY ?? projectSigningKey(),
  CLIENT_DIR: path.join(projectDir, 'dist'),
  UPLOAD_DIR: process.env.UPLOAD_DIR ?? path.join(projectDir, '.data', 'uploads'),
  // e-mail goes to a sink on loopback that keeps what it receives (the admin's Mail page)
  MAIL_SINK: process.env.MAIL_SINK ?? 'on',
  MAIL_SINK_DIR: process.env.MAIL_SINK_DIR ?? path.join(projectDir, '.data', 'mail-sink'),
  APP_URL: process.env.APP_URL ?? `http://127.0.0.1:${appPort}`,
};

const log = (msg) => process.stderr.write(`[start] ${msg}\n`);
const seconds = (ms) => (ms < 120_000 ? `${Math.round(ms / 1000)} s` : `${Math.round(ms / 60_000)} min`);
/** A run this long counts as healthy: the next crash starts the back-off again from 1 s. */
const STEADY_MS = 60_000;
const MAX_DELAY_MS = 30_000;

let child = null;
let restartTimer = null;
let stopping = false;
let listenedOnce = false;
let quickDeaths = 0;

function finish(code) {
  cluster.stop();
  process.exit(code);
}

function startApi() {
  restartTimer = null;
  const startedAt = Date.now();
  // the IPC channel carries one message, "listening", so a start that never got that far is told
  // apart from a crash later on
  const api = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    cwd: projectDir,
    stdio: ['inherit', 'inherit', 'inherit', 'ipc'],
    env,
  });
  child = api;
  api.on('message', (m) => {
    if (m === 'listening') listenedOnce = true;
  });
  api.on('exit', (code, signal) => {
    child = null;
    if (stopping) return finish(0);
    const why = signal ? `ended by ${signal}` : `exited with code ${code}`;
    if (!listenedOnce) {
      // never served at all (a port in use, a bad setting): starting it again would not help
      log(`the API ${why} before it was listening; stopping.`);
      return finish(code || 1);
    }
    const ran = Date.now() - startedAt;
    quickDeaths = ran >= STEADY_MS ? 1 : quickDeaths + 1;
    const delay = Math.min(1000 * 2 ** (quickDeaths - 1), MAX_DELAY_MS);
    log(
      `API process ${api.pid} ${why} after ${seconds(ran)}; starting it again in ${seconds(delay)}. PostgreSQL keeps running.`,
    );
    restartTimer = setTimeout(startApi, delay);
  });
}

for (const sig of ['SIGINT', 'SIGTERM', 'SIGHUP']) {
  process.on(sig, () => {
    if (stopping) return;
    stopping = true;
    if (restartTimer) {
      clearTimeout(restartTimer);
      return finish(0);
    }
    // a terminal's Ctrl-C reaches the child too; sending it again is harmless (it stops once)
    child?.kill(sig === 'SIGHUP' ? 'SIGTERM' : sig);
  });
}

startApi();
