import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Size classes (issue 16, item 3): a block is bored to the smallest oversize that cleans up, a
 * crankshaft ground to an undersize step.
 *
 * - `tolerance_rules.size_classes`: the classes of one rule version, each with its own nominal and
 *   tolerances ([{code, name, nominal, minusTol, plusTol}]). They are part of the version, so they
 *   are drafted, approved and then fixed with its limits (the trigger below now covers them).
 * - `stage_results.size_classes`: the class the station chose per characteristic, with the rule
 *   version it came from ({"bore": {"code": "+0.030", "name": "…", "ruleId": 12}}).
 * - `characteristics.mates_with`: the purchased part whose size must match this characteristic's
 *   class at build (pistons for the bore, main bearings for the main journals).
 * - `unit_lots.size_class`, `unit_lots.matched_to`: the class of the lot built in, and the part and
 *   class it was matched to, printed on the build record.
 */
const LOT_KINDS =
  "'pistons','rings','main_bearings','rod_bearings','gasket_set','camshaft','lifters','oil_pump','timing_set'";

const trigger = (withClasses: boolean) => `
CREATE OR REPLACE FUNCTION tolerance_rules_fixed_once_approved() RETURNS trigger LANGUAGE plpgsql AS $$
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
    NEW.approved_by_id IS DISTINCT FROM OLD.approved_by_id OR NEW.approved_at IS DISTINCT FROM OLD.approved_at${
      withClasses ? ' OR\n    NEW.size_classes IS DISTINCT FROM OLD.size_classes' : ''
    }
  ) THEN
    RAISE EXCEPTION 'an approved tolerance rule cannot be edited: draft a new version' USING ERRCODE = 'insufficient_privilege';
  END IF;
  RETURN NEW;
END $$;`;

const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE tolerance_rules ADD COLUMN size_classes jsonb NOT NULL DEFAULT '[]'
  CONSTRAINT tolerance_rules_size_classes_list CHECK (jsonb_typeof(size_classes) = 'array');
${trigger(true)}
ALTER TABLE stage_results ADD COLUMN size_classes jsonb NOT NULL DEFAULT '{}'
  CONSTRAINT stage_results_size_classes_map CHECK (jsonb_typeof(size_classes) = 'object');
ALTER TABLE characteristics ADD COLUMN mates_with varchar(20)
  CONSTRAINT characteristics_mates_with_lot_kind CHECK (mates_with IN (${LOT_KINDS}));
ALTER TABLE unit_lots ADD COLUMN size_class varchar(20), ADD COLUMN matched_to varchar(200);
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE unit_lots DROP COLUMN IF EXISTS matched_to, DROP COLUMN IF EXISTS size_class;
ALTER TABLE characteristics DROP COLUMN IF EXISTS mates_with;
ALTER TABLE stage_results DROP COLUMN IF EXISTS size_classes;
${trigger(false)}
ALTER TABLE tolerance_rules DROP COLUMN IF EXISTS size_classes;
`);
};

export { up, down };
