import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Measurement the plant can trust. The gauge register gains what suitability needs (range,
 * serial, where it lives, who owns it, its calibration interval) and the state a station reads from
 * the reference data (calibrated or not, the last study's verdict). A calibration keeps each check
 * point as found and as left, who calibrated it and the certificate. A containment is one signed
 * step that held what a bad gauge, lot, rule, person, station or spell touched; a gauge study keeps
 * its grid and what it gave.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
UPDATE gauges SET status = 'in_use' WHERE status = 'in_service';
ALTER TABLE gauges
  ALTER COLUMN status SET DEFAULT 'in_use',
  ADD COLUMN serial varchar(60) NOT NULL DEFAULT '',
  ADD COLUMN range_low numeric(14,6),
  ADD COLUMN range_high numeric(14,6),
  ADD COLUMN location varchar(80) NOT NULL DEFAULT '',
  ADD COLUMN owner varchar(80) NOT NULL DEFAULT '',
  ADD COLUMN interval_days integer CHECK (interval_days BETWEEN 1 AND 3660),
  ADD COLUMN last_calibrated_on date,
  ADD COLUMN calibrated boolean NOT NULL DEFAULT false,
  ADD COLUMN study_verdict varchar(14) CHECK (study_verdict IN ('acceptable','conditional','unacceptable')),
  ADD CONSTRAINT gauges_status_check
    CHECK (status IN ('in_use','out_for_calibration','out_of_tolerance','retired')),
  ADD CONSTRAINT gauges_range_check CHECK (range_low IS NULL OR range_high IS NULL OR range_low < range_high);

ALTER TABLE gauge_calibrations
  ADD COLUMN as_found_in_tolerance boolean NOT NULL DEFAULT true,
  ADD COLUMN as_left_in_tolerance boolean NOT NULL DEFAULT true,
  ADD COLUMN as_found_error numeric(14,6) NOT NULL DEFAULT 0,
  ADD COLUMN points jsonb NOT NULL DEFAULT '[]',
  ADD COLUMN performed_by varchar(10) NOT NULL DEFAULT 'in_house' CHECK (performed_by IN ('in_house','lab')),
  ADD COLUMN performer varchar(120) NOT NULL DEFAULT '',
  ADD COLUMN certificate_attachment_id integer REFERENCES attachments(id),
  ADD COLUMN notes varchar(500) NOT NULL DEFAULT '';

ALTER TABLE characteristics
  ADD COLUMN gauge_ratio numeric(6,2) CHECK (gauge_ratio > 0 AND gauge_ratio <= 100),
  ADD COLUMN gauge_ratio_reason varchar(500),
  ADD CONSTRAINT characteristics_gauge_ratio_reason CHECK ((gauge_ratio IS NULL) = (gauge_ratio_reason IS NULL));

CREATE SEQUENCE containment_number_seq;
CREATE TABLE containments (
  id serial PRIMARY KEY,
  number varchar(20) NOT NULL UNIQUE,
  trigger_kind varchar(12) NOT NULL CHECK (trigger_kind IN ('gauge','lot','rule','operator','station','window')),
  trigger jsonb NOT NULL,
  reason varchar(500) NOT NULL,
  defect_code varchar(20) NOT NULL,
  notices integer NOT NULL DEFAULT 0,
  created_by_id integer NOT NULL REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE TABLE containment_items (
  id serial PRIMARY KEY,
  containment_id integer NOT NULL REFERENCES containments(id),
  item_id integer NOT NULL REFERENCES items(id),
  nonconformance_id integer REFERENCES nonconformances(id),
  outcome varchar(14) NOT NULL CHECK (outcome IN ('held','already_held','field_action','scrapped')),
  UNIQUE (containment_id, item_id)
);

CREATE TABLE gauge_studies (
  id serial PRIMARY KEY,
  gauge_id integer NOT NULL REFERENCES gauges(id),
  method varchar(10) NOT NULL CHECK (method IN ('range','anova','attribute')),
  characteristic varchar(120) NOT NULL,
  tolerance numeric(14,6),
  data jsonb NOT NULL,
  result jsonb NOT NULL,
  verdict varchar(14) NOT NULL CHECK (verdict IN ('acceptable','conditional','unacceptable')),
  recorded_by_id integer NOT NULL REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX gauge_studies_gauge_idx ON gauge_studies (gauge_id, created_at);
-- the plant's time zone is reference data too: a station reads today's date in it
CREATE TRIGGER plant_settings_bump_reference AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON plant_settings
  FOR EACH STATEMENT EXECUTE FUNCTION bump_reference_version();
-- the blast radius of a gauge: its readings in time order
CREATE INDEX readings_gauge_time_idx ON readings (gauge_id, created_at) WHERE gauge_id IS NOT NULL;
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP INDEX IF EXISTS readings_gauge_time_idx;
DROP TRIGGER IF EXISTS plant_settings_bump_reference ON plant_settings;
DROP TABLE IF EXISTS gauge_studies;
DROP TABLE IF EXISTS containment_items;
DROP TABLE IF EXISTS containments;
DROP SEQUENCE IF EXISTS containment_number_seq;
ALTER TABLE characteristics DROP CONSTRAINT IF EXISTS characteristics_gauge_ratio_reason,
  DROP COLUMN IF EXISTS gauge_ratio, DROP COLUMN IF EXISTS gauge_ratio_reason;
ALTER TABLE gauge_calibrations DROP COLUMN IF EXISTS as_found_in_tolerance, DROP COLUMN IF EXISTS as_left_in_tolerance,
  DROP COLUMN IF EXISTS as_found_error, DROP COLUMN IF EXISTS points, DROP COLUMN IF EXISTS performed_by,
  DROP COLUMN IF EXISTS performer, DROP COLUMN IF EXISTS certificate_attachment_id, DROP COLUMN IF EXISTS notes;
ALTER TABLE gauges DROP CONSTRAINT IF EXISTS gauges_status_check, DROP CONSTRAINT IF EXISTS gauges_range_check,
  DROP COLUMN IF EXISTS serial, DROP COLUMN IF EXISTS range_low, DROP COLUMN IF EXISTS range_high,
  DROP COLUMN IF EXISTS location, DROP COLUMN IF EXISTS owner, DROP COLUMN IF EXISTS interval_days,
  DROP COLUMN IF EXISTS last_calibrated_on, DROP COLUMN IF EXISTS calibrated, DROP COLUMN IF EXISTS study_verdict,
  ALTER COLUMN status SET DEFAULT 'in_service';
UPDATE gauges SET status = 'in_service' WHERE status = 'in_use';
`);
};

export { up, down };
