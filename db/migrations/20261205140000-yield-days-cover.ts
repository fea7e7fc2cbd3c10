import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * The yield report sums a period's counted days from `yield_days` (a year at 50,000 units is some
 * 15,000 rows). Through the unique index alone each row was a visit to the heap for its counts;
 * this index leads with the day and carries everything the report reads, so the counted part of a
 * year is an index-only scan (server/services/line/yields.ts, YIELD_SQL).
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE INDEX yield_days_report_idx ON yield_days (day)
  INCLUDE (stage_id, station_id, engine_family_id, entered, first_pass);
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`DROP INDEX yield_days_report_idx;`);
};

export { up, down };
