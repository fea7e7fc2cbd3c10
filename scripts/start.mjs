// `npm start`: install what is missing, start the project's PostgreSQL cluster, build the client,
// then serve client and API from one process. Ctrl-C stops the server, then the cluster.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { ensureNodeModules, openProjectDatabase, projectDir, projectSecret, run } from './bootstrap.mjs';

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

const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
  cwd: projectDir,
  stdio: 'inherit',
  env: {
    ...process.env,
    DATABASE_URL: url,
    PORT: String(appPort),
    JWT_SECRET: process.env.JWT_SECRET ?? projectSecret(),
    CLIENT_DIR: path.join(projectDir, 'dist'),
    UPLOAD_DIR: process.env.UPLOAD_DIR ?? path.join(projectDir, '.data', 'uploads'),
    // e-mail goes to a sink on loopback that keeps what it receives (the admin's Mail page)
    MAIL_SINK: process.env.MAIL_SINK ?? 'on',
    MAIL_SINK_DIR: process.env.MAIL_SINK_DIR ?? path.join(projectDir, '.data', 'mail-sink'),
    APP_URL: process.env.APP_URL ?? `http://127.0.0.1:${appPort}`,
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
