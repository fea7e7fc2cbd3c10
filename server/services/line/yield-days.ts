import { QueryTypes, type Sequelize } from 'sequelize';
import { plantSettings } from '../plant.js';
import { firstAttemptsSql } from './yields.js';

/**
 * Counts closed plant days into `yield_days` (db/migrations/…-yield-days), so the yield report
 * sums counted days and judges only the last few live. A day is closed two days after it ends in
 * the plant's time zone: nothing recorded now can land on it, and a result recorded with an earlier
 * time or a correction forgets the counted days it touches (the table's trigger). Each batch of days
 * is counted under the advisory lock that trigger takes, in one transaction with its markers.
 */

export const YIELD_DAYS_LOCK = `SELECT pg_advisory_xact_lock(hashtext('yield_days'))`;

/** The plant days up to two days ago, from the first result on, that are not counted in this time zone. */
const UNCOUNTED_SQL = `
  SELECT to_char(d, 'YYYY-MM-DD') AS day
    FROM generate_series(
           greatest(CAST(:from AS date), (SELECT (min(finished_at) AT TIME ZONE :tz)::date FROM stage_results)),
           least(CAST(:to AS date), (now() AT TIME ZONE :tz)::date - 2), interval '1 day') d
   WHERE NOT EXISTS (SELECT 1 FROM yield_days_done x WHERE x.day = d::date AND x.time_zone = :tz)
   ORDER BY d
   LIMIT :limit`;

const FORGET_SQL = `DELETE FROM yield_days WHERE day BETWEEN CAST(:from AS date) AND CAST(:to AS date)`;

const COUNT_SQL = `
  INSERT INTO yield_days (day, stage_id, station_id, engine_family_id, entered, first_pass)
  SELECT a.day, a.stage_id, a.station_id, a.engine_family_id, count(*), count(*) FILTER (WHERE a.verdict = 'pass')
    FROM (${firstAttemptsSql('CAST(:from AS date)', 'CAST(:to AS date)')}) a
   GROUP BY a.day, a.stage_id, a.station_id, a.engine_family_id`;

const DONE_SQL = `
  INSERT INTO yield_days_done (day, time_zone)
  SELECT d::date, :tz FROM generate_series(CAST(:from AS date), CAST(:to AS date), interval '1 day') d
  ON CONFLICT (day) DO UPDATE SET time_zone = EXCLUDED.time_zone, counted_at = now()`;

export type CountedDays = { days: number; first: string | null; last: string | null };

/**
 * Counts up to `limit` uncounted closed days in [from, to] (default: all history), a week to a
 * transaction, oldest first. Safe from several processes at once: the lock makes them take turns,
 * and a day counted twice is counted the same.
 */
export async function countYieldDays(
  sequelize: Sequelize,
  opts: { from?: string; to?: string; limit?: number } = {},
): Promise<CountedDays> {
  const tz = (await plantSettings()).timeZone;
  const days = (
    await sequelize.query<{ day: string }>(UNCOUNTED_SQL, {
      type: QueryTypes.SELECT,
      replacements: { tz, from: opts.from ?? '0001-01-01', to: opts.to ?? '9999-12-31', limit: opts.limit ?? 400 },
    })
  ).map((r) => r.day);
  // consecutive days go together, up to seven at a time
  const runs: [string, string][] = [];
  for (const day of days) {
    const run = runs.at(-1);
    if (run && nextDay(run[1]) === day && daysBetween(run[0], day) < 7) run[1] = day;
    else runs.push([day, day]);
  }
  for (const [from, to] of runs) {
    await sequelize.transaction(async (transaction) => {
      await sequelize.query(YIELD_DAYS_LOCK, { transaction });
      const replacements = { from, to, tz, family: null };
      for (const sql of [FORGET_SQL, COUNT_SQL, DONE_SQL]) await sequelize.query(sql, { transaction, replacements });
    });
  }
  return { days: days.length, first: days[0] ?? null, last: days.at(-1) ?? null };
}

const nextDay = (d: string) => new Date(Date.parse(`${d}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);
const daysBetween = (a: string, b: string) =>
  (Date.parse(`${b}T00:00:00Z`) - Date.parse(`${a}T00:00:00Z`)) / 86_400_000;

/** Counts closed days at start and then every `everyMs` (ten minutes), in the API process. */
export class YieldDayCounter {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<unknown> | null = null;
  constructor(
    private readonly sequelize: Sequelize,
    private readonly everyMs = 10 * 60_000,
  ) {}

  start() {
    const tick = () => {
      if (this.running) return;
      this.running = countYieldDays(this.sequelize)
        .then((c) => c.days && console.log(`[yields] counted ${c.days} plant days, ${c.first} to ${c.last}`))
        .catch((err: unknown) => console.error('[yields] counting closed days failed:', err))
        .finally(() => (this.running = null));
    };
    tick();
    this.timer = setInterval(tick, this.everyMs);
    this.timer.unref();
  }

  async stop() {
    if (this.timer) clearInterval(this.timer);
    await this.running;
  }
}
