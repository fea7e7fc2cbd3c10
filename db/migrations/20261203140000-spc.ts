import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Statistical process control: control limits frozen from a baseline (never edited; a new freeze
 * supersedes), the run-rule signals a station result raised against them, and the rehearsals of
 * draft rules kept with their approval. Frozen limits bump the reference version, so each API
 * process keeps the current ones in memory beside the reference data and the station's hot path
 * asks the database nothing more for a characteristic without limits.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE spc_limits (
  id serial PRIMARY KEY,
  engine_family_id integer NOT NULL REFERENCES engine_families(id),
  characteristic_id integer NOT NULL REFERENCES characteristics(id),
  station_id integer REFERENCES stations(id),
  method varchar(12) NOT NULL CHECK (method IN ('part-means','xbar-r','xbar-s','i-mr')),
  limits jsonb NOT NULL,
  baseline_from timestamptz NOT NULL,
  baseline_to timestamptz NOT NULL,
  baseline_points integer NOT NULL CHECK (baseline_points >= 2),
  reason varchar(500) NOT NULL,
  hold_on_signal boolean NOT NULL DEFAULT false,
  frozen_by_id integer NOT NULL REFERENCES users(id),
  frozen_at timestamptz NOT NULL DEFAULT now(),
  superseded_at timestamptz,
  -- deferred: the superseding row is written after the old one is marked (one current row at a time)
  superseded_by_id integer REFERENCES spc_limits(id) DEFERRABLE INITIALLY DEFERRED,
  created_at timestamptz NOT NULL DEFAULT now(),
  CHECK (baseline_from < baseline_to),
  CHECK ((superseded_at IS NULL) = (superseded_by_id IS NULL))
);
-- one set of limits in force per family, characteristic and station (0: every station)
CREATE UNIQUE INDEX spc_limits_current_idx ON spc_limits (engine_family_id, characteristic_id, coalesce(station_id, 0))
  WHERE superseded_at IS NULL;
CREATE INDEX spc_limits_history_idx ON spc_limits (characteristic_id, engine_family_id, frozen_at);

CREATE TABLE spc_signals (
  id serial PRIMARY KEY,
  spc_limits_id integer NOT NULL REFERENCES spc_limits(id),
  stage_result_id integer NOT NULL REFERENCES stage_results(id),
  item_id integer NOT NULL REFERENCES items(id),
  chart varchar(20) NOT NULL CHECK (chart IN ('xbar','range','s','individuals','moving-range','part-mean',
    'part-moving-range','within-range','within-s')),
  rule smallint NOT NULL CHECK (rule BETWEEN 1 AND 4),
  value double precision NOT NULL,
  centre double precision NOT NULL,
  lower_limit double precision NOT NULL,
  upper_limit double precision NOT NULL,
  nonconformance_id integer REFERENCES nonconformances(id),
  held_by_id integer REFERENCES users(id),
  held_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (stage_result_id, spc_limits_id, chart, rule),
  CHECK ((nonconformance_id IS NULL) = (held_at IS NULL))
);
CREATE INDEX spc_signals_limits_idx ON spc_signals (spc_limits_id, created_at);
CREATE INDEX spc_signals_item_idx ON spc_signals (item_id);

CREATE TABLE rule_rehearsals (
  id serial PRIMARY KEY,
  tolerance_rule_id integer NOT NULL REFERENCES tolerance_rules(id),
  rule_limits jsonb NOT NULL,
  period_from timestamptz NOT NULL,
  period_to timestamptz NOT NULL,
  station_id integer REFERENCES stations(id),
  gauge_id integer REFERENCES gauges(id),
  summary jsonb NOT NULL,
  run_by_id integer NOT NULL REFERENCES users(id),
  kept_with_approval_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  CHECK (period_from < period_to)
);
CREATE INDEX rule_rehearsals_rule_idx ON rule_rehearsals (tolerance_rule_id, created_at);

-- records: never deleted; limits only superseded, a signal only linked to its hold, a rehearsal
-- only marked as kept with the approval, each once
CREATE FUNCTION spc_records_fixed() RETURNS trigger LANGUAGE plpgsql AS $$
DECLARE
  -- the one column set once per table; every other column stays as it was
  settable text[] := CASE TG_TABLE_NAME
    WHEN 'spc_limits' THEN ARRAY['superseded_at', 'superseded_by_id']
    WHEN 'spc_signals' THEN ARRAY['nonconformance_id', 'held_by_id', 'held_at']
    ELSE ARRAY['kept_with_approval_at'] END;
BEGIN
  IF TG_OP = 'DELETE' THEN
    RAISE EXCEPTION '% rows are records: they are never deleted', TG_TABLE_NAME USING ERRCODE = 'insufficient_privilege';
  END IF;
  IF to_jsonb(OLD) ->> settable[1] IS NULL AND (to_jsonb(NEW) - settable) = (to_jsonb(OLD) - settable) THEN
    RETURN NEW;
  END IF;
  RAISE EXCEPTION '% rows are records: they are never edited', TG_TABLE_NAME USING ERRCODE = 'insufficient_privilege';
END $$;
CREATE TRIGGER spc_limits_fixed BEFORE UPDATE OR DELETE ON spc_limits FOR EACH ROW EXECUTE FUNCTION spc_records_fixed();
CREATE TRIGGER spc_signals_fixed BEFORE UPDATE OR DELETE ON spc_signals FOR EACH ROW EXECUTE FUNCTION spc_records_fixed();
CREATE TRIGGER rule_rehearsals_fixed BEFORE UPDATE OR DELETE ON rule_rehearsals
  FOR EACH ROW EXECUTE FUNCTION spc_records_fixed();

CREATE TRIGGER spc_limits_bump_reference AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON spc_limits
  FOR EACH STATEMENT EXECUTE FUNCTION bump_reference_version();
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP TABLE rule_rehearsals;
DROP TABLE spc_signals;
DROP TABLE spc_limits;
DROP FUNCTION spc_records_fixed();
`);
};

export { up, down };
