import fs from 'node:fs';
import { randomUUID } from 'node:crypto';
import type pg from 'pg';
import { nominalSizeClasses } from '../db/seeders/sample-readings.js';
import type { ReadingInput, StationFormJson } from '../shared/schemas/results.js';
import { httpLoad, type HttpRun } from './load.js';
import { openLoop } from './open-loop.js';
import { pgbench, type SqlRun } from './pgbench.js';
import { lotScript, NCR_FILTERS, ncrScripts, trailScript } from './raw-reads.js';
import { rawWriteScript } from './raw-write.js';

export type Side = { api: HttpRun; raw: SqlRun };
export type Ctx = {
  api: string;
  db: pg.Pool;
  url: string;
  pgBin: string;
  seconds: number;
  cookies: Record<'operator' | 'warranty' | 'quality', string>;
  log: (s: string) => void;
};

// the API's pool holds 10 connections (server/db.ts): the raw side gets as many clients
export const CLIENTS = 10;
const WARMUP_SECONDS = 2;
const brief = (r: HttpRun | SqlRun) =>
  `${r.achieved.toFixed(0)}/s, p50 ${r.latency.p50.toFixed(1)} ms, p99 ${r.latency.p99.toFixed(1)} ms, ${r.errors} errors`;
const pick = <T>(xs: T[]) => xs[Math.floor(Math.random() * xs.length)]!;

/** One read measured both ways at one fixed rate, each after a short warm-up. */
export async function readBoth(
  c: Ctx,
  rate: number,
  api: { cookie: string; path: () => string },
  raw: { scripts: Record<string, string> },
): Promise<Side> {
  const http = (seconds: number) =>
    openLoop({ url: c.api, rate, seconds, cookie: api.cookie, next: () => ({ method: 'GET', path: api.path() }) });
  await http(WARMUP_SECONDS);
  const a = await http(c.seconds);
  const b = await pgbench({
    bin: c.pgBin,
    url: c.url,
    scripts: raw.scripts,
    rate,
    seconds: c.seconds,
    clients: CLIENTS,
  });
  c.log(`  API ${brief(a)}; PostgreSQL alone ${brief(b)}`);
  return { api: a, raw: b };
}

/**
 * The raw trail query and the API answer the same question: for one unit, both must count the
 * same results, readings, NCRs and lots, or the comparison means nothing.
 */
async function sameTrail(c: Ctx, k: number, serial: string) {
  const sql = trailScript(1).split('\n').slice(1).join('\n').replace(/:k\b/g, String(k));
  const {
    rows: [raw],
  } = await c.db.query<{ json_build_object: Record<string, unknown[] | null> }>(sql);
  const api = (await (
    await fetch(`${c.api}/api/trail/${serial}`, { headers: { cookie: c.cookies.warranty } })
  ).json()) as { results: { readings: unknown[] }[]; ncrs: unknown[]; lots: unknown[] };
  const r = raw!.json_build_object;
  const rawResults = (r.results ?? []) as { readings: unknown[] | null }[];
  const counts = {
    results: [api.results.length, rawResults.length],
    readings: [
      api.results.reduce((n, x) => n + x.readings.length, 0),
      rawResults.reduce((n, x) => n + (x.readings?.length ?? 0), 0),
    ],
    ncrs: [api.ncrs.length, (r.ncrs ?? []).length],
    lots: [api.lots.length, (r.lots ?? []).length],
  };
  const differ = Object.entries(counts).filter(([, [a, b]]) => a !== b);
  if (differ.length) throw new Error(`the raw trail and the API differ for ${serial}: ${JSON.stringify(counts)}`);
  return Object.fromEntries(Object.entries(counts).map(([key, [a]]) => [key, a!]));
}

export async function measureTrail(c: Ctx, rate: number) {
  const { rows } = await c.db.query<{ k: number; serial: string }>('SELECT k, serial FROM bench_units ORDER BY k');
  const serials = rows.map((r) => r.serial);
  // a unit with an NCR in its history (every twentieth) and one without
  const checked = await Promise.all(
    [rows.find((r) => r.k % 20 === 7)!, rows[0]!].map((r) => sameTrail(c, r.k, r.serial)),
  );
  c.log(
    `trail: ${serials.length} units, ${rate}/s; the raw query returns the same as the API: ${JSON.stringify(checked)}`,
  );
  return readBoth(
    c,
    rate,
    { cookie: c.cookies.warranty, path: () => `/api/trail/${pick(serials)}` },
    { scripts: { 'trail.sql': trailScript(serials.length) } },
  );
}

export async function measureLots(c: Ctx, rate: number) {
  const { rows } = await c.db.query<{ lot_code: string }>('SELECT lot_code FROM bench_lot_codes ORDER BY k');
  const codes = rows.map((r) => r.lot_code);
  c.log(`lot lookup: ${codes.length} lot codes, ${rate}/s`);
  return readBoth(
    c,
    rate,
    { cookie: c.cookies.warranty, path: () => `/api/lots/${encodeURIComponent(pick(codes))}` },
    { scripts: { 'lot.sql': lotScript(codes.length) } },
  );
}

export async function measureNcrList(c: Ctx, rate: number) {
  c.log(`NCR list: ${NCR_FILTERS.length} filters in turn, ${rate}/s`);
  let i = 0;
  return readBoth(
    c,
    rate,
    { cookie: c.cookies.quality, path: () => `/api/ncrs?${NCR_FILTERS[i++ % NCR_FILTERS.length]!}` },
    { scripts: ncrScripts() },
  );
}

export type WriteStep = { rate: number | null; api: HttpRun | null; raw: SqlRun };
export type WritePath = {
  station: string;
  /** how many of the waiting parts the runs used (the CPU profile takes the next ones) */
  partsUsed: number;
  readingsSent: number;
  readingsStored: number;
  statementsApi: number;
  statementsRaw: number;
  steps: WriteStep[];
  profile: Awaited<ReturnType<typeof topStatements>>;
};

/**
 * Station results at a ladder of fixed rates, then flat out: the API with autocannon (each request
 * a new part waiting at bore and hone, a new idempotency key, readings scattered inside their
 * limits), and pgbench running the same transaction. The ladder stops climbing for the API once it
 * falls behind its rate; pgbench still runs every step.
 */
export type WriteOpts = {
  station: string;
  rates: number[];
  serials: string[];
  form: StationFormJson;
  readings: ReadingInput[];
  gauge: string | null;
  gauges: Record<string, string>;
};

/** Submissions of station results, each for the next part of `serials` from `from` on, with a new key. */
export function submissions(opts: Omit<WriteOpts, 'rates'>, from = 0) {
  let used = from;
  const sizeClasses = nominalSizeClasses(opts.form);
  const scatter = (r: ReadingInput): ReadingInput => {
    const rule = opts.form.characteristics.find((x) => x.code === r.characteristic)?.rule;
    if (r.value === undefined || rule?.limitType !== 'nominal' || !rule.minusTol) return r;
    const step = rule.resolution ?? 0.0001;
    const k = Math.floor(Math.random() * 5) - 2;
    return { ...r, value: Number((Math.round(r.value / step + k) * step).toFixed(6)) };
  };
  return {
    next: () => {
      const serial = opts.serials[used++ % opts.serials.length]!;
      return {
        method: 'POST' as const,
        path: '/api/results',
        body: JSON.stringify({
          idempotencyKey: randomUUID(),
          serial,
          station: opts.station,
          gauge: opts.gauge,
          gauges: opts.gauges,
          readings: opts.readings.map(scatter),
          sizeClasses,
        }),
      };
    },
    used: () => used,
  };
}

export async function measureWritePath(c: Ctx, opts: WriteOpts): Promise<WritePath> {
  const { next, used } = submissions(opts);
  const http = (rate: number | null, seconds: number) =>
    rate
      ? openLoop({ url: c.api, rate, seconds, cookie: c.cookies.operator, next })
      : httpLoad({ url: c.api, seconds, connections: CLIENTS, cookie: c.cookies.operator, next });

  // one submission first: the statement count, and the sample the raw script repeats
  await c.db.query('SELECT pg_stat_statements_reset()');
  const probe = 20;
  const warm = await http(null, 1);
  if (warm.errors) throw new Error(`the write path refused submissions: ${JSON.stringify(warm.statuses)}`);
  await c.db.query('SELECT pg_stat_statements_reset()');
  for (let i = 0; i < probe; i++) {
    const r = next();
    const res = await fetch(`${c.api}${r.path}`, {
      method: 'POST',
      headers: { cookie: c.cookies.operator, 'content-type': 'application/json' },
      body: r.body,
    });
    if (res.status !== 201) throw new Error(`probe submission: ${res.status} ${await res.text()}`);
  }
  const {
    rows: [count],
  } = await c.db.query<{ calls: string }>(
    `SELECT sum(calls) AS calls FROM pg_stat_statements s JOIN pg_database d ON d.oid = s.dbid
      WHERE d.datname = current_database() AND query NOT ILIKE '%pg_stat_statements%'`,
  );
  const {
    rows: [sample],
  } = await c.db.query<{ id: number; stored: string }>(
    `SELECT r.id, (SELECT count(*) FROM readings WHERE stage_result_id = r.id) AS stored FROM stage_results r
      JOIN stations s ON s.id = r.station_id WHERE s.code = $1 ORDER BY r.id DESC LIMIT 1`,
    [opts.station],
  );
  const raw = await rawWriteScript(c.db, sample!.id);
  if (process.env.BENCH_KEEP === '1') fs.writeFileSync('.bench/write.sql', raw.script);
  const { rows: who } = await c.db.query<{ sid: string; uid: number; family: number }>(
    `SELECT s.id AS sid, s.user_id AS uid, (SELECT engine_family_id FROM items WHERE id = (SELECT item_id FROM bench_raw_parts LIMIT 1)) AS family
       FROM sessions s JOIN users u ON u.id = s.user_id WHERE u.role = 'operator' ORDER BY s.created_at DESC LIMIT 1`,
  );
  const {
    rows: [rawPool],
  } = await c.db.query<{ n: number }>('SELECT count(*)::int AS n FROM bench_raw_parts');
  const vars = { ...who[0]!, pool: rawPool!.n };
  const sql = (rate: number | null, seconds: number) =>
    pgbench({ bin: c.pgBin, url: c.url, scripts: { 'write.sql': raw.script }, rate, seconds, clients: CLIENTS, vars });

  // the API's whole ladder first, so the database's own statistics describe the API alone
  await c.db.query('SELECT pg_stat_statements_reset()');
  const apiRuns: (HttpRun | null)[] = [];
  let apiBehind = false;
  for (const rate of [...opts.rates, null]) {
    if (apiBehind && rate !== null) {
      apiRuns.push(null);
      continue;
    }
    c.log(`write path, API: ${rate ? `${rate}/s` : 'flat out'}`);
    const run = await http(rate, c.seconds);
    c.log(`  ${brief(run)} ${JSON.stringify(run.statuses)}`);
    // behind: requests left unanswered, or answers so late the rate is no longer a rate
    if (rate && (run.ok < run.sent * 0.95 || run.latency.p99 > 1000)) apiBehind = true;
    apiRuns.push(run);
  }
  const profile = await topStatements(c.db);
  const steps: WriteStep[] = [];
  for (const [i, rate] of [...opts.rates, null].entries()) {
    c.log(`write path, PostgreSQL alone: ${rate ? `${rate}/s` : 'flat out'}`);
    const raw = await sql(rate, c.seconds);
    c.log(`  ${brief(raw)}`);
    steps.push({ rate, api: apiRuns[i] ?? null, raw });
  }
  return {
    station: opts.station,
    partsUsed: used(),
    readingsSent: opts.readings.length,
    readingsStored: Number(sample!.stored),
    statementsApi: Number(count!.calls) / probe,
    statementsRaw: raw.statements,
    steps,
    profile,
  };
}

/** The statements that took the database's time during the API's write runs (pg_stat_statements). */
export async function topStatements(db: pg.Pool, n = 8) {
  const { rows } = await db.query<{ query: string; calls: string; total_ms: number; mean_ms: number }>(
    `SELECT left(regexp_replace(query, '\\s+', ' ', 'g'), 140) AS query, calls, round(total_exec_time::numeric, 1)::float AS total_ms,
            round(mean_exec_time::numeric, 3)::float AS mean_ms
       FROM pg_stat_statements s JOIN pg_database d ON d.oid = s.dbid
      WHERE d.datname = current_database() ORDER BY total_exec_time DESC LIMIT $1`,
    [n],
  );
  return rows.map((r) => ({ ...r, calls: Number(r.calls) }));
}
