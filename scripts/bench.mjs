// `npm run bench`: a benchmark, not a test. The same bootstrap as `npm test` (npm ci, PostgreSQL,
// Chromium), a throwaway cluster set up as a plant's server would be, then bench/run.ts, which
// seeds a plant's history and measures the API beside PostgreSQL alone. Figures go to .bench/.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import { ensureChromium, ensureNodeModules, projectDir } from './bootstrap.mjs';

ensureNodeModules();
const { ClusterError, ensureDatabase, ensurePostgres, freePort, startCluster, throwawayClusterDir } =
  await import('../db/cluster.mjs');

// set up as a plant's database server would be (docs/operations.md): memory (a quarter of RAM for
// the buffers is the usual rule, capped here so the API and Chromium have room), SSD costs for the
// planner, no JIT (it compiles for 100 ms to save microseconds on short queries), statement
// statistics on, durability left as shipped
const settings = {
  shared_buffers: '2GB',
  random_page_cost: '1.1',
  effective_io_concurrency: '200',
  jit: 'off',
  effective_cache_size: '8GB',
  work_mem: '16MB',
  maintenance_work_mem: '512MB',
  max_wal_size: '8GB',
  checkpoint_timeout: '30min',
  shared_preload_libraries: 'pg_stat_statements',
};

let cluster;
let status = 1;
const dir = throwawayClusterDir();
try {
  const bin = ensurePostgres();
  const chromium = ensureChromium('bench');
  cluster = await startCluster({ dir, port: await freePort(), bin, settings });
  await ensureDatabase(cluster, 'coretrail_bench');
  const r = spawnSync('npx', ['tsx', 'bench/run.ts', ...process.argv.slice(2)], {
    cwd: projectDir,
    stdio: 'inherit',
    env: {
      ...process.env,
      DATABASE_URL: cluster.url('coretrail_bench'),
      PG_BIN: bin,
      CHROMIUM_PATH: chromium,
      BENCH_PG_SETTINGS: JSON.stringify(settings),
    },
  });
  status = r.status ?? 1;
} catch (err) {
  process.stderr.write(`\n${err instanceof ClusterError ? err.message : (err?.stack ?? err)}\n`);
} finally {
  // BENCH_KEEP=1 leaves the cluster running, to look into the seeded plant afterwards
  if (process.env.BENCH_KEEP === '1' && cluster) {
    process.stderr.write(`[bench] kept: ${cluster.url('coretrail_bench')} (stop: pg_ctl -D ${cluster.pgdata} stop)\n`);
  } else {
    cluster?.stop();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}
process.exit(status);
