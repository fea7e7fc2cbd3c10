import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Units (issue 16, item 4). A measured or derived characteristic has a unit. A reading may be
 * entered in another unit of the same quantity: it is converted and judged in the
 * characteristic's unit (`value`, `unit`), and keeps what was typed beside it (`entered_value`,
 * `entered_unit`), both or neither. Altered on the partitioned parent, so every month's partition
 * and the default one take the columns. Each person's preferred unit for a characteristic unit is
 * remembered for the station form (`unit_preferences`): a setting, not a record.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE readings
  ADD COLUMN entered_value numeric(14,6),
  ADD COLUMN entered_unit varchar(20),
  ADD CONSTRAINT readings_entered_both CHECK ((entered_value IS NULL) = (entered_unit IS NULL));

ALTER TABLE characteristics
  ADD CONSTRAINT characteristics_measured_have_unit CHECK (kind = 'attribute' OR unit IS NOT NULL);

CREATE TABLE unit_preferences (
  user_id integer NOT NULL REFERENCES users(id),
  unit varchar(20) NOT NULL,
  entered_unit varchar(20) NOT NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  PRIMARY KEY (user_id, unit),
  CHECK (unit <> entered_unit)
);
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP TABLE unit_preferences;
ALTER TABLE characteristics DROP CONSTRAINT characteristics_measured_have_unit;
ALTER TABLE readings DROP CONSTRAINT readings_entered_both, DROP COLUMN entered_unit, DROP COLUMN entered_value;
`);
};

export { up, down };
