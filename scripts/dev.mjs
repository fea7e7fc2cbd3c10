// `npm run dev`: the project's cluster, the API under `tsx watch`, and Vite's dev server with HMR
// proxying /api to it. Ctrl-C stops all three.
import { spawn } from 'node:child_process';
import { ensureNodeModules, openProjectDatabase, projectDir, projectSecret } from './bootstrap.mjs';

ensureNodeModules();
const apiPort = Number(process.env.PORT ?? 4310);
const { cluster, url } = await openProjectDatabase();

const env = {
  ...process.env,
  DATABASE_URL: url,
  PORT: String(apiPort),
  API_PORT: String(apiPort),
  JWT_SECRET: process.env.JWT_SECRET ?? projectSecret(),
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
