import { QueryTypes, type Sequelize } from 'sequelize';

/** Months ahead that always have their own partition of `readings` (db/migrations/…-readings-by-month). */
export const MONTHS_AHEAD = 3;

/**
 * Makes the partitions of `readings` for this month and the next MONTHS_AHEAD, where missing, and
 * returns their names. Safe to run from every API process at once: a partition made by another
 * process meanwhile is a duplicate-table error, and the next run finds it there.
 */
export async function ensureReadingPartitions(sequelize: Sequelize, now = new Date()): Promise<string[]> {
  const [row] = await sequelize.query<{ made: string[] }>(
    `SELECT ensure_reading_partitions(date_trunc('month', $1::timestamptz)::date,
       (date_trunc('month', $1::timestamptz) + make_interval(months => $2))::date) AS made`,
    { bind: [now.toISOString(), MONTHS_AHEAD + 1], type: QueryTypes.SELECT },
  );
  return row?.made ?? [];
}

/** Runs ensureReadingPartitions at start and then daily. */
export class PartitionKeeper {
  private timer: NodeJS.Timeout | null = null;
  private running: Promise<unknown> | null = null;
  constructor(
    private readonly sequelize: Sequelize,
    private readonly everyMs = 24 * 3600_000,
  ) {}

  start() {
    const tick = () => {
      this.running = ensureReadingPartitions(this.sequelize)
        .then((made) => made.length && console.log(`[readings] made partitions ${made.join(', ')}`))
        .catch((err: unknown) => console.error('[readings] making next months’ partitions failed:', err))
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
