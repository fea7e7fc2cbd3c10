import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * The gate and the records: a signature keeps its own reason; the plant's identity and time zone
 * (the calendar a ship date and a warranty are counted in); field actions, opened when a problem is
 * found in something that has already shipped and closed with a signed decision.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE signatures ADD COLUMN reason varchar(500) NOT NULL DEFAULT '';

CREATE TABLE plant_settings (
  id smallint PRIMARY KEY DEFAULT 1 CHECK (id = 1),
  name varchar(120) NOT NULL DEFAULT 'Remanufacturing plant',
  address varchar(300) NOT NULL DEFAULT '',
  time_zone varchar(60) NOT NULL DEFAULT 'UTC',
  updated_at timestamptz NOT NULL DEFAULT now()
);
INSERT INTO plant_settings (id) VALUES (1);

CREATE SEQUENCE field_action_number_seq;
CREATE TABLE field_actions (
  id serial PRIMARY KEY,
  number varchar(20) NOT NULL UNIQUE,
  shipment_id integer NOT NULL REFERENCES shipments(id),
  unit_item_id integer NOT NULL REFERENCES items(id),
  nonconformance_id integer NOT NULL REFERENCES nonconformances(id),
  state varchar(10) NOT NULL DEFAULT 'open' CHECK (state IN ('open','closed')),
  decision varchar(20) CHECK (decision IN ('no_action','notify_customer','recall')),
  decision_reason varchar(1000),
  decided_by_id integer REFERENCES users(id),
  decided_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (shipment_id, nonconformance_id),
  CHECK ((state = 'open') = (decision IS NULL))
);
CREATE INDEX field_actions_state_idx ON field_actions (state, created_at);
CREATE INDEX field_actions_unit_idx ON field_actions (unit_item_id);
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP TABLE field_actions;
DROP SEQUENCE field_action_number_seq;
DROP TABLE plant_settings;
ALTER TABLE signatures DROP COLUMN reason;
`);
};

export { up, down };
