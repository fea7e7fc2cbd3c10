import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Shared station tablets (issue 22, item 1). An admin enrols a tablet to a station; its own
 * sign-in (a device cookie naming the row) reads that station's forms and records nothing by
 * itself. Each result is identified by a badge and a short PIN (bcrypt-hashed, as passwords are),
 * and keeps the tablet it came from beside the person who identified. Retiring a tablet ends its
 * sign-in at once.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE station_tablets (
  id serial PRIMARY KEY,
  station_id integer NOT NULL REFERENCES stations(id),
  label varchar(80) NOT NULL,
  enrolled_by_id integer NOT NULL REFERENCES users(id),
  retired_at timestamptz,
  retired_by_id integer REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK ((retired_at IS NULL) = (retired_by_id IS NULL))
);

ALTER TABLE users
  ADD COLUMN badge varchar(40) UNIQUE,
  ADD COLUMN pin_hash varchar(100),
  ADD COLUMN pin_set_at timestamptz;

ALTER TABLE stage_results ADD COLUMN tablet_id integer REFERENCES station_tablets(id);
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE stage_results DROP COLUMN tablet_id;
ALTER TABLE users DROP COLUMN pin_set_at, DROP COLUMN pin_hash, DROP COLUMN badge;
DROP TABLE station_tablets;
`);
};

export { up, down };
