import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * The language a person's floor screens speak and the unit system their readings start in
 * (issue 22, item 4): kept on the person, so a shared screen follows whoever signs in.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE users
  ADD COLUMN language varchar(5) NOT NULL DEFAULT 'en' CHECK (language IN ('en', 'es')),
  ADD COLUMN unit_system varchar(6) NOT NULL DEFAULT 'inch' CHECK (unit_system IN ('inch', 'metric'));
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`ALTER TABLE users DROP COLUMN language, DROP COLUMN unit_system;`);
};

export { up, down };
