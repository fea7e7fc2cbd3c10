import fs from 'node:fs';
import path from 'node:path';
import { summarizeNewestProfile, type CpuSummary } from './cpu-profile.js';
import { httpLoad, type HttpRun } from './load.js';
import { CLIENTS, submissions, topStatements, type Ctx, type WriteOpts } from './measure.js';
import { startApi } from './server.js';

export type WriteProfile = {
  run: HttpRun;
  cpu: CpuSummary;
  /** per stored submission: the API process's CPU, PostgreSQL's execution time; the median latency */
  perSubmission: { apiCpuMs: number; dbExecMs: number; p50Ms: number };
  statements: Awaited<ReturnType<typeof topStatements>>;
};

/**
 * The write path flat out once more, with the API under `node --cpu-prof`: where its CPU goes (by
 * package and by our own folders), beside the time PostgreSQL spent executing its statements
 * (pg_stat_statements), per stored submission. The profiler costs the API some speed, so the rate
 * here is not the figure of the runs before; the shares are what it is for.
 */
export async function profileWritePath(
  c: Ctx,
  dist: string,
  opts: Omit<WriteOpts, 'rates'>,
  from: number,
): Promise<WriteProfile> {
  const dir = path.join('.bench', 'profile');
  fs.rmSync(dir, { recursive: true, force: true });
  fs.mkdirSync(dir, { recursive: true });
  const api = await startApi(c.url, dist, ['--cpu-prof', `--cpu-prof-dir=${dir}`]);
  let run: HttpRun;
  let statements: WriteProfile['statements'];
  let dbExecMs: number;
  let loadEnded = 0;
  try {
    const cookie = await api.signIn('operator');
    const { next } = submissions(opts, from);
    await c.db.query('SELECT pg_stat_statements_reset()');
    run = await httpLoad({ url: api.url, seconds: c.seconds, connections: CLIENTS, cookie, next });
    loadEnded = performance.now();
    const {
      rows: [db],
    } = await c.db.query<{ ms: number }>(
      `SELECT coalesce(sum(total_exec_time), 0)::float AS ms FROM pg_stat_statements s JOIN pg_database d ON d.oid = s.dbid
        WHERE d.datname = current_database() AND query NOT ILIKE '%pg_stat_statements%'`,
    );
    dbExecMs = db!.ms;
    statements = await topStatements(c.db);
  } finally {
    await api.stop();
  }
  // the load's seconds only, counted back from the process's end (what came after the load, the
  // statistics read and the shutdown, is a few milliseconds)
  const cpu = summarizeNewestProfile(dir, (c.seconds * 1000 + (performance.now() - loadEnded)) * 1000);
  const n = Math.max(1, run.ok);
  return {
    run,
    cpu,
    perSubmission: {
      apiCpuMs: Math.round((100 * cpu.busyMs) / n) / 100,
      dbExecMs: Math.round((100 * dbExecMs) / n) / 100,
      p50Ms: Math.round(100 * run.latency.p50) / 100,
    },
    statements,
  };
}
