// Shared first steps of `npm start`, `npm test` and `npm run dev`: make sure npm dependencies are
// installed. Plain Node, no dependencies.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const projectDir = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export function ensureNodeModules() {
  const lock = path.join(projectDir, 'package-lock.json');
  const installed = path.join(projectDir, 'node_modules', '.package-lock.json');
  const fresh = fs.existsSync(installed) && fs.statSync(installed).mtimeMs >= fs.statSync(lock).mtimeMs;
  if (fresh) return;
  process.stderr.write('[setup] installing npm dependencies (npm ci)…\n');
  const r = spawnSync('npm', ['ci', '--no-audit', '--no-fund'], {
    cwd: projectDir,
    stdio: ['ignore', 'inherit', 'inherit'],
  });
  if (r.status !== 0) {
    process.stderr.write('[setup] npm ci failed; see the output above.\n');
    process.exit(1);
  }
}

/** Runs a command in the project folder and resolves with its exit code. */
export function run(cmd, args, opts = {}) {
  const r = spawnSync(cmd, args, { cwd: projectDir, stdio: 'inherit', ...opts });
  return r.status ?? 1;
}
