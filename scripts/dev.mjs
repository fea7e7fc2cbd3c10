// `npm run dev`: the project's cluster, the API under `tsx watch`, and Vite's dev server with HMR
// proxying /api to it. Ctrl-C stops all three.
import { spawn } from 'node:child_process';
import path from 'node:path';
import { ensureNodeModules, openProjectDatabase, projectDir, projectSecret, projectSigningKey } from './bootstrap.mjs';

ensureNodeModules();
const apiPort = Number(process.env.PORT ?? 4310);
const { cluster, url } = await openProjectDatabase();

const env = {
  ...process.env,
  DATABASE_URL: url,
  PORT: String(apiPort),
  API_PORT: String(apiPort),
  JWT_SECRET: process.env.JWT_SECRET ?? projectSecret(),
  AUDIT_SIGNING_KEY: process.env.AUDIT_SIGNING_KEY ?? projectSigningKey(),
  MAIL_SINK: process.env.MAIL_SINK ?? 'on',
  // links in e-mail open the Vite dev server, which serves the client during development
  APP_URL: process.env.APP_URL ?? `http://127.0.0.1:${process.env.VITE_PORT ?? 5173}`,
  MAIL_SINK_DIR: process.env.MAIL_SINK_DIR ?? path.join(projectDir, '.data', 'mail-sink'),
};
// the tools' own entry points under this Node, not `npx`: a signal to an npx wrapper does not
// always reach the process it started, which then outlives Ctrl-C holding its port
const bin = (rel) => path.join(projectDir, 'node_modules', rel);
const children = [
  spawn(process.execPath, [bin('tsx/dist/cli.mjs'), 'watch', '--clear-screen=false', 'server/index.ts'], {
    cwd: projectDir,
    stdio: 'inherit',
    env,
  }),
  spawn(process.execPath, [bin('vite/bin/vite.js')], { cwd: projectDir, stdio: 'inherit', env }),
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
