import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Readings partitioned by month of `created_at` (PostgreSQL declarative partitioning, range), so a
 * year's chart or a month's containment reads one or a few partitions and years of history stay
 * fast. A partitioned table's keys must hold the partition column: the primary key becomes
 * (id, created_at) — `id` stays unique on its own, from its sequence — and one reading per result,
 * characteristic and position becomes (…, created_at). A result's readings are inserted in one
 * transaction with the column's default, the transaction's time, so a repeat within a result still
 * collides.
 *
 * `ensure_reading_partitions(from, to)` makes the months in [from, to) that do not exist yet. The
 * migration makes the last 24 months, this one and the next 3; each API process calls it at start
 * and daily for this month and the next 3 (server/jobs/reading-partitions.ts). `readings_default` catches a reading outside
 * every month (a clock far off, history loaded from long ago); a month whose rows already sit there
 * is left to the default, and the function says so, rather than moving records.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE readings RENAME TO readings_unpartitioned;
ALTER INDEX readings_pkey RENAME TO readings_unpartitioned_pkey;
ALTER INDEX readings_characteristic_idx RENAME TO readings_unpartitioned_characteristic_idx;
ALTER INDEX readings_gauge_idx RENAME TO readings_unpartitioned_gauge_idx;
ALTER INDEX IF EXISTS readings_gauge_time_idx RENAME TO readings_unpartitioned_gauge_time_idx;
ALTER TABLE readings_unpartitioned
  RENAME CONSTRAINT readings_stage_result_id_characteristic_id_position_key TO readings_unpartitioned_one_key;

CREATE TABLE readings (
  id bigint NOT NULL DEFAULT nextval('readings_id_seq'),
  stage_result_id integer NOT NULL REFERENCES stage_results(id),
  characteristic_id integer NOT NULL REFERENCES characteristics(id),
  position varchar(40) NOT NULL DEFAULT '',
  value numeric(14,6),
  passed boolean,
  location_note varchar(200),
  unit varchar(20),
  verdict varchar(10) NOT NULL CHECK (verdict IN ('pass','fail')),
  tolerance_rule_id integer REFERENCES tolerance_rules(id),
  rule_version integer,
  gauge_id integer REFERENCES gauges(id),
  created_at timestamptz NOT NULL DEFAULT now(),
  PRIMARY KEY (id, created_at),
  CONSTRAINT readings_one_per_position UNIQUE (stage_result_id, characteristic_id, position, created_at)
) PARTITION BY RANGE (created_at);
ALTER SEQUENCE readings_id_seq OWNED BY readings.id;
CREATE TABLE readings_default PARTITION OF readings DEFAULT;

CREATE FUNCTION ensure_reading_partitions(from_month date, to_month date) RETURNS text[]
LANGUAGE plpgsql AS $$
DECLARE
  m date := date_trunc('month', from_month)::date;
  name text;
  made text[] := '{}';
BEGIN
  WHILE m < to_month LOOP
    name := format('readings_%s', to_char(m, 'YYYY_MM'));
    IF to_regclass(name) IS NULL THEN
      IF EXISTS (SELECT 1 FROM readings_default WHERE created_at >= m AND created_at < (m + interval '1 month')) THEN
        RAISE NOTICE 'readings of % are in readings_default; that month keeps them there', to_char(m, 'YYYY-MM');
      ELSE
        EXECUTE format('CREATE TABLE %I PARTITION OF readings FOR VALUES FROM (%L) TO (%L)',
          name, m::timestamptz, (m + interval '1 month')::timestamptz);
        made := made || name;
      END IF;
    END IF;
    m := (m + interval '1 month')::date;
  END LOOP;
  RETURN made;
END $$;

SELECT ensure_reading_partitions(
  (date_trunc('month', least(now(), coalesce((SELECT min(created_at) FROM readings_unpartitioned), now())))
    - interval '24 months')::date,
  (date_trunc('month', now()) + interval '4 months')::date);

INSERT INTO readings SELECT * FROM readings_unpartitioned;
DROP TABLE readings_unpartitioned;

CREATE INDEX readings_characteristic_idx ON readings (characteristic_id, created_at);
-- containment: everything measured with a gauge found out of calibration
CREATE INDEX readings_gauge_idx ON readings (gauge_id) WHERE gauge_id IS NOT NULL;
-- the blast radius of a gauge: its readings in time order (20261203150000-measurement)
CREATE INDEX readings_gauge_time_idx ON readings (gauge_id, created_at) WHERE gauge_id IS NOT NULL;
CREATE TRIGGER readings_no_edit BEFORE UPDATE OR DELETE ON readings
  FOR EACH ROW EXECUTE FUNCTION results_are_records();
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE readings_flat (LIKE readings INCLUDING DEFAULTS);
INSERT INTO readings_flat SELECT * FROM readings;
ALTER SEQUENCE readings_id_seq OWNED BY readings_flat.id;
DROP TABLE readings;
DROP FUNCTION ensure_reading_partitions(date, date);
ALTER TABLE readings_flat RENAME TO readings;
ALTER TABLE readings ADD PRIMARY KEY (id);
ALTER TABLE readings ADD UNIQUE (stage_result_id, characteristic_id, position);
ALTER TABLE readings ADD FOREIGN KEY (stage_result_id) REFERENCES stage_results(id);
ALTER TABLE readings ADD FOREIGN KEY (characteristic_id) REFERENCES characteristics(id);
ALTER TABLE readings ADD FOREIGN KEY (tolerance_rule_id) REFERENCES tolerance_rules(id);
ALTER TABLE readings ADD FOREIGN KEY (gauge_id) REFERENCES gauges(id);
ALTER TABLE readings ADD CHECK (verdict IN ('pass','fail'));
CREATE INDEX readings_characteristic_idx ON readings (characteristic_id, created_at);
CREATE INDEX readings_gauge_idx ON readings (gauge_id) WHERE gauge_id IS NOT NULL;
CREATE INDEX readings_gauge_time_idx ON readings (gauge_id, created_at) WHERE gauge_id IS NOT NULL;
CREATE TRIGGER readings_no_edit BEFORE UPDATE OR DELETE ON readings
  FOR EACH ROW EXECUTE FUNCTION results_are_records();
`);
};

export { up, down };
