import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * When a station result was taken on the tablet, as against `finished_at`, when the server stored
 * it (issue 22, item 3): a result queued on a tablet with no network arrives later than it was
 * taken. Null on the results stored before this column, which were stored as they were taken.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`ALTER TABLE stage_results ADD COLUMN taken_at timestamptz;`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`ALTER TABLE stage_results DROP COLUMN taken_at;`);
};

export { up, down };
