import { PLANT } from '../db/seeders/plant.js';
import { createSequelize } from '../server/db.js';
import { scopeOf } from '../server/services/blast-radius/scope.js';
import { summarySql } from '../server/services/blast-radius/sql.js';
import { todayIn } from '../shared/domain/warranty.js';
import type { BlastRadiusJson } from '../shared/schemas/gauges.js';
import { readBoth, type Ctx, type Side } from './measure.js';
import { sqlText } from './pgbench.js';

/**
 * The blast radius of a bad gauge at a plant's size: a bore gauge that took about 5 % of the last
 * six months' readings (whole results, length readings only, spread over the months), found out
 * of tolerance as found today after a good calibration six months ago. The API's answer (parts,
 * the first 200 readings, the totals) is measured beside PostgreSQL alone running the API's own
 * three statements (server/services/blast-radius.ts) with the same values.
 */

export const BLAST_GAUGE = 'BG-BENCH';
const SHARE = 0.05;
const DAYS = 182;

export type BlastFigures = Side & {
  gauge: string;
  share: number;
  readings: number;
  parts: number;
  units: number;
  shipped: number;
  since: string;
};

/** A statement with its `:name` replacements written in as literals (dates as ISO text), for pgbench. */
function inline(sql: string, replacements: Record<string, unknown>): string {
  return `${sql.replace(/(?<!:):([A-Za-z]+)\b/g, (m, name: string) => {
    if (!(name in replacements)) return m;
    const v = replacements[name];
    if (v === null || v === undefined) return 'NULL';
    if (v instanceof Date) return sqlText(v.toISOString());
    return typeof v === 'number' ? String(v) : sqlText(v);
  })};\n`;
}

const addDays = (day: string, n: number) =>
  new Date(Date.parse(`${day}T00:00:00Z`) + n * 86_400_000).toISOString().slice(0, 10);

async function call(c: Ctx, path: string, body: object) {
  const res = await fetch(`${c.api}${path}`, {
    method: 'POST',
    headers: { cookie: c.cookies.quality, 'content-type': 'application/json' },
    body: JSON.stringify(body),
  });
  if (res.status !== 201) throw new Error(`${path} refused: ${await res.text()}`);
}

export async function measureBlast(c: Ctx, rate: number): Promise<BlastFigures> {
  const today = todayIn(PLANT.timeZone);
  const since = addDays(today, -DAYS);
  await call(c, '/api/gauges', {
    code: BLAST_GAUGE,
    description: 'Dial bore gauge 3–6 in (benchmark)',
    kind: 'bore gauge',
    unit: 'in',
    resolution: 0.0001,
    rangeLow: 3,
    rangeHigh: 6,
    intervalDays: 365,
  });
  const point = { reference: 4, asLeft: 4, tolerance: 0.0001 };
  await call(c, `/api/gauges/${BLAST_GAUGE}/calibrations`, {
    calibratedOn: since,
    performedBy: 'in_house',
    performer: 'Benchmark gauge room',
    points: [{ ...point, asFound: 4 }],
  });

  // whole results drawn by a hash of their id, so the gauge's readings are spread over the months
  const {
    rows: [counts],
  } = await c.db.query<{ all: string; length: string }>(
    `SELECT count(*) AS all, count(*) FILTER (WHERE unit IN ('in', 'mm') AND value IS NOT NULL) AS length
       FROM readings WHERE created_at >= $1::date`,
    [since],
  );
  const cut = Math.min(
    10_000,
    Math.round((10_000 * SHARE * Number(counts!.all)) / Math.max(1, Number(counts!.length))),
  );
  // part of the seeded history, so written as history.ts writes it: readings are append-only records
  // for the product (a trigger refuses changes), not for the seeder of a throwaway database
  const client = await c.db.connect();
  let updated: number;
  try {
    await client.query('BEGIN');
    await client.query("SET LOCAL session_replication_role = 'replica'");
    const res = await client.query(
      `UPDATE readings r SET gauge_id = (SELECT id FROM gauges WHERE code = $1)
        WHERE r.created_at >= $2::date AND r.unit IN ('in', 'mm') AND r.value IS NOT NULL
          AND abs(hashint4(r.stage_result_id)) % 10000 < $3`,
      [BLAST_GAUGE, since, cut],
    );
    await client.query('COMMIT');
    updated = res.rowCount ?? 0;
  } catch (err) {
    await client.query('ROLLBACK');
    throw err;
  } finally {
    client.release();
  }
  await c.db.query('VACUUM (ANALYZE) readings');
  const share = updated / Math.max(1, Number(counts!.all));

  // found 0.0004 in high as found today: every reading since the good calibration is in doubt
  await call(c, `/api/gauges/${BLAST_GAUGE}/calibrations`, {
    calibratedOn: today,
    performedBy: 'in_house',
    performer: 'Benchmark gauge room',
    points: [{ ...point, asFound: 4.0004 }],
  });

  // the API's own statements, with the values its scope works out
  const sequelize = createSequelize(c.url, { poolMax: 1 });
  let script: string;
  try {
    const scope = await scopeOf({ gauge: BLAST_GAUGE });
    script = inline(summarySql(scope), { ...scope.replacements, limit: 200, partLimit: 300 });
  } finally {
    await sequelize.close();
  }

  const path = `/api/blast-radius?gauge=${BLAST_GAUGE}`;
  const probe = (await (
    await fetch(`${c.api}${path}`, { headers: { cookie: c.cookies.quality } })
  ).json()) as BlastRadiusJson;
  // both sides must answer the same question, or the comparison means nothing
  const {
    rows: [raw],
  } = await c.db.query<{ readings: number }>(script);
  if (raw!.readings !== probe.totals.readings) {
    throw new Error(`blast radius: the API counts ${probe.totals.readings} readings, SQL alone ${raw!.readings}`);
  }
  c.log(
    `blast radius of ${BLAST_GAUGE}: ${probe.totals.readings} readings (${(100 * share).toFixed(1)} % of six months'), ${probe.totals.parts} parts, ${probe.totals.units} units, ${probe.totals.shipped} shipped; ${rate}/s`,
  );
  const side = await readBoth(
    c,
    rate,
    { cookie: c.cookies.quality, path: () => path },
    { scripts: { 'blast.sql': script } },
  );
  return {
    ...side,
    gauge: BLAST_GAUGE,
    share,
    readings: probe.totals.readings,
    parts: probe.totals.parts,
    units: probe.totals.units,
    shipped: probe.totals.shipped,
    since,
  };
}
