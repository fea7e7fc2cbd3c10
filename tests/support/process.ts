import { execFileSync, spawn } from 'node:child_process';
import os from 'node:os';
import path from 'node:path';

/** The server as `npm start` runs it: a separate process on the test database (no mail worker). */
export function startServer(port: number, env: Record<string, string> = {}) {
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], {
    env: {
      ...process.env,
      PORT: String(port),
      SEED_DEMO: 'never',
      MAIL_WORKER: 'off',
      JWT_SECRET: 'process-test-'.padEnd(40, 'x'),
      ...env,
    },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let out = '';
  child.stdout.on('data', (d) => (out += d));
  child.stderr.on('data', (d) => (out += d));
  const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
  const ready = new Promise<void>((resolve, reject) => {
    const timer = setInterval(() => {
      if (out.includes('Coretrail is running at')) {
        clearInterval(timer);
        resolve();
      }
    }, 50);
    void exited.then(() => (clearInterval(timer), reject(new Error(out))));
  });
  ready.catch(() => undefined); // a start that fails is read from `exited` instead
  return { child, exited, ready, output: () => out };
}

/**
 * `npm start` itself (scripts/start.mjs) on a cluster folder and ports of the test's own, reusing
 * the client already built in dist. In a process group of its own, as a terminal would start it.
 */
export function startProject({
  clusterDir,
  port,
  pgPort,
  smtpPort,
}: {
  clusterDir: string;
  port: number;
  pgPort: number;
  smtpPort: number;
}) {
  const scratch = path.join(os.tmpdir(), `coretrail-start-${port}`);
  const child = spawn(process.execPath, ['scripts/start.mjs'], {
    env: {
      ...process.env,
      CORETRAIL_CLUSTER_DIR: clusterDir,
      CORETRAIL_PG_PORT: String(pgPort),
      CORETRAIL_SKIP_BUILD: '1',
      PORT: String(port),
      SMTP_PORT: String(smtpPort),
      MAIL_SINK_DIR: path.join(scratch, 'mail'),
      UPLOAD_DIR: path.join(scratch, 'uploads'),
      SEED_DEMO: 'never',
      JWT_SECRET: 'process-test-'.padEnd(40, 'x'),
    },
    stdio: ['ignore', 'pipe', 'pipe'],
    detached: true,
  });
  let out = '';
  child.stdout.on('data', (d) => (out += d));
  child.stderr.on('data', (d) => (out += d));
  const exited = new Promise<number | null>((resolve) => child.on('exit', (code) => resolve(code)));
  return { child, exited, output: () => out };
}

/** The process id of the API that `npm start` runs (its one child process). */
export function apiPidUnder(parent: number): number {
  const pids = execFileSync('ps', ['-o', 'pid=', '--ppid', String(parent)], { encoding: 'utf8' })
    .split('\n')
    .map((l) => Number(l.trim()))
    .filter(Boolean);
  if (pids.length !== 1)
    throw new Error(`expected one API process under ${parent}, found ${pids.join(', ') || 'none'}`);
  return pids[0]!;
}

/** Polls until `ok()` holds; fails with the process output after `ms`. */
export async function waitFor(ok: () => boolean, ms: number, output: () => string) {
  const until = Date.now() + ms;
  while (!ok()) {
    if (Date.now() > until) throw new Error(`timed out; output so far:\n${output()}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}
