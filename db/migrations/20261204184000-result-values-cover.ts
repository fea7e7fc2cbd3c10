import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * A control chart reads a year of one family's characteristic from `result_values`. Found through
 * (characteristic, time) alone, each row was a visit to its own heap page (the rows of one
 * characteristic lie among every other's, in time order): some 9,000 pages for a year of a V8 bore
 * at 50,000 units, half of them another family's. This index leads with the family too and carries
 * what the chart reads, so the chart is an index-only scan of a few hundred contiguous pages
 * (server/services/spc/readings.ts). The rehearsal still reads the rows, for positions and verdicts.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE INDEX result_values_chart_idx ON result_values (characteristic_id, engine_family_id, created_at)
  INCLUDE (stage_result_id, item_id, station_id, gauge_id, vals);
DROP INDEX result_values_characteristic_idx;
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE INDEX result_values_characteristic_idx ON result_values (characteristic_id, created_at);
DROP INDEX result_values_chart_idx;
`);
};

export { up, down };
