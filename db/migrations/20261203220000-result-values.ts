import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * The readings of one characteristic in one result, side by side in arrays: what SPC charts,
 * capability and rule rehearsals read (server/services/spc/readings.ts). A year of a V8 bore is
 * some 450,000 readings but 11,000 of these rows, so a chart reads a few megabytes instead of
 * grouping half a million rows each time. Derived data, never a record: filled by a trigger from
 * every statement that inserts readings (readings are never changed or deleted), in the same
 * transaction, and it can be rebuilt from `readings` at any time with the statement below.
 *
 * The arrays keep the readings' order of insertion (their ids); values are float8, as SPC
 * computes in doubles. The family, item and station of the result are copied in, so a chart of one
 * family reads one table.
 */
export const fillResultValuesSql = (source: string) => `
  INSERT INTO result_values (stage_result_id, characteristic_id, created_at, item_id, engine_family_id, station_id,
                             gauge_id, positions, vals, verdicts)
  SELECT g.stage_result_id, g.characteristic_id, g.created_at, sr.item_id, i.engine_family_id, sr.station_id,
         g.gauge_id, g.positions, g.vals, g.verdicts
    FROM (SELECT stage_result_id, characteristic_id, min(created_at) AS created_at, min(gauge_id) AS gauge_id,
                 array_agg(position ORDER BY id) AS positions, array_agg(value::float8 ORDER BY id) AS vals,
                 array_agg(verdict ORDER BY id) AS verdicts
            FROM ${source} GROUP BY stage_result_id, characteristic_id) g
    JOIN stage_results sr ON sr.id = g.stage_result_id
    JOIN items i ON i.id = sr.item_id
  ON CONFLICT (stage_result_id, characteristic_id) DO UPDATE
     SET positions = result_values.positions || EXCLUDED.positions,
         vals = result_values.vals || EXCLUDED.vals,
         verdicts = result_values.verdicts || EXCLUDED.verdicts`;

const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE result_values (
  stage_result_id integer NOT NULL REFERENCES stage_results(id),
  characteristic_id integer NOT NULL REFERENCES characteristics(id),
  created_at timestamptz NOT NULL,
  item_id integer NOT NULL,
  engine_family_id integer,
  station_id integer,
  gauge_id integer,
  positions varchar(40)[] NOT NULL,
  vals float8[] NOT NULL,
  verdicts varchar(10)[] NOT NULL,
  PRIMARY KEY (stage_result_id, characteristic_id)
);
CREATE INDEX result_values_characteristic_idx ON result_values (characteristic_id, created_at);

CREATE FUNCTION readings_fill_result_values() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  ${fillResultValuesSql('new_readings')};
  RETURN NULL;
END $$;
CREATE TRIGGER readings_fill_result_values AFTER INSERT ON readings
  REFERENCING NEW TABLE AS new_readings
  FOR EACH STATEMENT EXECUTE FUNCTION readings_fill_result_values();

${fillResultValuesSql('readings')};
ANALYZE result_values;
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP TRIGGER readings_fill_result_values ON readings;
DROP FUNCTION readings_fill_result_values();
DROP TABLE result_values;
`);
};

export { up, down };
