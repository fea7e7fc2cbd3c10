import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/** A label printed again says why (a tag lost in the washer, a smudged print). */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`ALTER TABLE label_prints ADD COLUMN reprint_reason varchar(300);`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`ALTER TABLE label_prints DROP COLUMN reprint_reason;`);
};

export { up, down };
