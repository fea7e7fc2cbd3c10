// `npm test`: the same bootstrap as `npm start`, with a throwaway cluster, then lint, typecheck,
// client build, unit, API and browser suites. The last line is `tests: N passed, N failed`.
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ensureChromium, ensureNodeModules, projectDir } from './bootstrap.mjs';

ensureNodeModules();
const { ClusterError, ensureDatabase, ensurePostgres, freePort, startCluster, throwawayClusterDir } =
  await import('../db/cluster.mjs');

const results = []; // { name, passed, failed }
const step = (name, passed, failed) => {
  results.push({ name, passed, failed });
  process.stderr.write(`[test] ${name}: ${passed} passed, ${failed} failed\n`);
};

/**
 * Runs checks one after another under `nice`, each with its output in a file (printed when it
 * ends), so they go on while this process waits on the suites; resolves when all have ended.
 */
function runChecksBeside(checks) {
  return (async () => {
    for (const [name, cmd, args] of checks) {
      const out = path.join(scratch, `${name}.log`);
      const fd = fs.openSync(out, 'w');
      const code = await new Promise((resolve) => {
        const child = spawn('nice', ['-n', '15', cmd, ...args], { cwd: projectDir, stdio: ['ignore', fd, fd] });
        child.on('exit', (c) => resolve(c ?? 1));
        child.on('error', () => resolve(1));
      });
      fs.closeSync(fd);
      process.stderr.write(fs.readFileSync(out, 'utf8'));
      step(name, code === 0 ? 1 : 0, code === 0 ? 0 : 1);
    }
  })();
}

function runCheck(name, cmd, args, env = process.env) {
  const r = spawnSync(cmd, args, { cwd: projectDir, stdio: 'inherit', env });
  const ok = r.status === 0;
  step(name, ok ? 1 : 0, ok ? 0 : 1);
  return ok;
}

let cluster;
let exitCode = 0;
const dir = throwawayClusterDir();
// The suites' own temporary files (uploads, mail sinks, photos, drill clusters, browser profiles)
// go here and go with it. Traversable by others, as a drill's cluster runs as another user.
const scratch = fs.mkdtempSync(path.join(os.tmpdir(), 'coretrail-run-'));
fs.chmodSync(scratch, 0o711);
try {
  const bin = ensurePostgres();
  const chromium = ensureChromium();
  process.env.CORETRAIL_PG_FSYNC = 'off'; // a throwaway cluster need not survive a power cut
  cluster = await startCluster({ dir, port: await freePort(), bin });
  await ensureDatabase(cluster, 'coretrail_test');

  runCheck('client build', 'npx', ['vite', 'build', '--logLevel', 'warn']);
  // lint, format and typecheck need nothing the suites make: they run beside them at low priority,
  // on the cycles the browser suite (one file at a time, mostly waiting on pages) leaves idle
  const checks = runChecksBeside([
    ['lint', 'npx', ['eslint', '.', '--max-warnings', '0']],
    ['format', 'npx', ['prettier', '--check', '.']],
    ['typecheck', 'npx', ['tsc', '-p', 'tsconfig.json', '--noEmit']],
  ]);

  const report = path.join(os.tmpdir(), `coretrail-vitest-${process.pid}.json`);
  const env = {
    ...process.env,
    DATABASE_URL: cluster.url('coretrail_test'),
    ADMIN_DATABASE_URL: cluster.url('postgres'),
    CHROMIUM_PATH: chromium,
    CLIENT_DIR: path.join(projectDir, 'dist'),
    TMPDIR: scratch,
  };
  const r = await new Promise((resolve) => {
    const child = spawn(
      'npx',
      [
        'vitest',
        'run',
        '--reporter=default',
        '--reporter=json',
        `--outputFile.json=${report}`,
        ...process.argv.slice(2),
      ],
      { cwd: projectDir, stdio: 'inherit', env },
    );
    child.on('exit', (status) => resolve({ status }));
    child.on('error', () => resolve({ status: 1 }));
  });
  if (fs.existsSync(report)) {
    const json = JSON.parse(fs.readFileSync(report, 'utf8'));
    // a file that fails to load counts as a failure even though none of its tests ran
    const brokenFiles = (json.testResults ?? []).filter(
      (f) => f.status === 'failed' && !f.assertionResults?.length,
    ).length;
    step('vitest', json.numPassedTests, json.numFailedTests + brokenFiles);
    fs.rmSync(report, { force: true });
  } else {
    step('vitest', 0, 1);
  }
  if (r.status !== 0 && results.every((x) => x.failed === 0)) step('vitest exit status', 0, 1);
  await checks;
} catch (err) {
  process.stderr.write(`\n${err instanceof ClusterError ? err.message : (err?.stack ?? err)}\n`);
  step('setup', 0, 1);
} finally {
  cluster?.stop();
  fs.rmSync(dir, { recursive: true, force: true });
  fs.rmSync(scratch, { recursive: true, force: true });
}

const passed = results.reduce((n, x) => n + x.passed, 0);
const failed = results.reduce((n, x) => n + x.failed, 0);
if (failed > 0) exitCode = 1;
process.stdout.write(`tests: ${passed} passed, ${failed} failed\n`);
process.exit(exitCode);
