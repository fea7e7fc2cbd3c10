import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * What station results need beyond the foundation: a characteristic's physical range (a reading
 * outside it is a typing slip, refused before judging), the defect code its failure raises, a
 * supervisor's sanctioned re-entry of a stage, NCR numbers, one draft per rule, and the database
 * refusing to edit recorded results or an approved rule's limits.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE characteristics
  ADD COLUMN physical_min numeric(14,6),
  ADD COLUMN physical_max numeric(14,6),
  ADD COLUMN defect_code varchar(20),
  ADD COLUMN help varchar(300) NOT NULL DEFAULT '';

CREATE TABLE stage_reentries (
  id serial PRIMARY KEY,
  item_id integer NOT NULL REFERENCES items(id),
  stage_id integer NOT NULL REFERENCES stages(id),
  from_stage_id integer REFERENCES stages(id),
  from_status varchar(20) NOT NULL,
  reason varchar(500) NOT NULL,
  allowed_by_id integer NOT NULL REFERENCES users(id),
  used_by_result_id integer REFERENCES stage_results(id),
  created_at timestamptz NOT NULL DEFAULT now()
);
-- an item has at most one re-entry waiting to be used
CREATE UNIQUE INDEX stage_reentries_open_idx ON stage_reentries (item_id) WHERE used_by_result_id IS NULL;

CREATE SEQUENCE nonconformance_number_seq;

-- one draft at a time per family and characteristic
CREATE UNIQUE INDEX tolerance_rules_one_draft_idx ON tolerance_rules (engine_family_id, characteristic_id)
  WHERE status = 'draft';

-- a recorded result and its readings are never edited or deleted: corrections are new rows
CREATE FUNCTION results_are_records() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% rows are records: add a correcting result instead', TG_TABLE_NAME
    USING ERRCODE = 'insufficient_privilege';
END $$;
CREATE TRIGGER stage_results_no_edit BEFORE UPDATE OR DELETE ON stage_results
  FOR EACH ROW EXECUTE FUNCTION results_are_records();
CREATE TRIGGER readings_no_edit BEFORE UPDATE OR DELETE ON readings
  FOR EACH ROW EXECUTE FUNCTION results_are_records();

-- once a rule leaves draft its limits are fixed; only its status and supersession may change
CREATE FUNCTION tolerance_rules_fixed_once_approved() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_OP = 'DELETE' THEN
    IF OLD.status <> 'draft' THEN
      RAISE EXCEPTION 'an approved tolerance rule cannot be deleted' USING ERRCODE = 'insufficient_privilege';
    END IF;
    RETURN OLD;
  END IF;
  IF OLD.status <> 'draft' AND (
    NEW.limit_type IS DISTINCT FROM OLD.limit_type OR NEW.nominal IS DISTINCT FROM OLD.nominal OR
    NEW.minus_tol IS DISTINCT FROM OLD.minus_tol OR NEW.plus_tol IS DISTINCT FROM OLD.plus_tol OR
    NEW.lower_limit IS DISTINCT FROM OLD.lower_limit OR NEW.upper_limit IS DISTINCT FROM OLD.upper_limit OR
    NEW.unit IS DISTINCT FROM OLD.unit OR NEW.resolution IS DISTINCT FROM OLD.resolution OR
    NEW.version IS DISTINCT FROM OLD.version OR NEW.characteristic_id IS DISTINCT FROM OLD.characteristic_id OR
    NEW.engine_family_id IS DISTINCT FROM OLD.engine_family_id OR NEW.effective_from IS DISTINCT FROM OLD.effective_from OR
    NEW.approved_by_id IS DISTINCT FROM OLD.approved_by_id OR NEW.approved_at IS DISTINCT FROM OLD.approved_at
  ) THEN
    RAISE EXCEPTION 'an approved tolerance rule cannot be edited: draft a new version' USING ERRCODE = 'insufficient_privilege';
  END IF;
  RETURN NEW;
END $$;
CREATE TRIGGER tolerance_rules_fixed BEFORE UPDATE OR DELETE ON tolerance_rules
  FOR EACH ROW EXECUTE FUNCTION tolerance_rules_fixed_once_approved();
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP TRIGGER IF EXISTS tolerance_rules_fixed ON tolerance_rules;
DROP FUNCTION IF EXISTS tolerance_rules_fixed_once_approved();
DROP TRIGGER IF EXISTS readings_no_edit ON readings;
DROP TRIGGER IF EXISTS stage_results_no_edit ON stage_results;
DROP FUNCTION IF EXISTS results_are_records();
DROP INDEX IF EXISTS tolerance_rules_one_draft_idx;
DROP SEQUENCE IF EXISTS nonconformance_number_seq;
DROP TABLE IF EXISTS stage_reentries;
ALTER TABLE characteristics DROP COLUMN physical_min, DROP COLUMN physical_max, DROP COLUMN defect_code, DROP COLUMN help;
`);
};

export { up, down };
