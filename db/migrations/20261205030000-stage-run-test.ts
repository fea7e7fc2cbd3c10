import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * A stage says whether it is a unit's run test, the one the release gate requires passed, rather
 * than the gate knowing it by the demo's code: a plant names its own stages. The stage the product
 * knew by code `run-test` is marked so.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE stages ADD COLUMN run_test boolean NOT NULL DEFAULT false;
UPDATE stages SET run_test = true WHERE code = 'run-test';
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`ALTER TABLE stages DROP COLUMN run_test;`);
};

export { up, down };
