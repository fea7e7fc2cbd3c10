import { spawn } from 'node:child_process';

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
