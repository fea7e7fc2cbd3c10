import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * The plant defines its own process (issue 16, item 1 and the change control of item 2):
 *
 * - `part_kinds`: the kinds of part a route is for, the seven the product knows plus any the plant
 *   adds (serialized or not). Stages and routes name their kind through a foreign key now rather
 *   than a CHECK of seven words; items keep the CHECK, as only the seven can be built today.
 * - stages carry a hazard flag beside their caution text, and are retired, never deleted.
 * - routes are versions under change control: a draft, approved with a signature by someone other
 *   than its author, in force from a time; earlier versions are superseded, kept, and still serve
 *   the parts that started on them (`items.route_id`). `active` stays the "in force" flag the line
 *   reads use. A route step may send a part that fails it back to an earlier stage (a rework loop).
 * - characteristics are retired, never deleted, and say which gauge kinds can measure them.
 * - `family_casting_numbers`: the casting numbers a family accepts; intake warns on any other.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE part_kinds (
  code varchar(20) PRIMARY KEY CHECK (code ~ '^[a-z][a-z0-9_]{1,19}$'),
  name varchar(80) NOT NULL,
  serialized boolean NOT NULL DEFAULT true,
  built_in boolean NOT NULL DEFAULT false,
  sort_order smallint NOT NULL DEFAULT 100,
  retired_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
INSERT INTO part_kinds (code, name, serialized, built_in, sort_order) VALUES
  ('core', 'Core', true, true, 1),
  ('block', 'Block', true, true, 2),
  ('crankshaft', 'Crankshaft', true, true, 3),
  ('cylinder_head', 'Cylinder head', true, true, 4),
  ('camshaft', 'Camshaft', true, true, 5),
  ('rod_set', 'Connecting-rod set', true, true, 6),
  ('long_block', 'Long block', true, true, 7);

ALTER TABLE stages DROP CONSTRAINT stages_part_kind_check;
ALTER TABLE stages ADD CONSTRAINT stages_part_kind_fkey FOREIGN KEY (part_kind) REFERENCES part_kinds(code),
  ADD COLUMN hazardous boolean NOT NULL DEFAULT false,
  ADD COLUMN retired_at timestamptz;
UPDATE stages SET hazardous = hazard IS NOT NULL;
ALTER TABLE stages ADD CONSTRAINT stages_hazard_caution CHECK (NOT hazardous OR hazard IS NOT NULL);

ALTER TABLE routes DROP CONSTRAINT routes_part_kind_check;
ALTER TABLE routes ADD CONSTRAINT routes_part_kind_fkey FOREIGN KEY (part_kind) REFERENCES part_kinds(code),
  ADD COLUMN status varchar(12) NOT NULL DEFAULT 'approved'
    CHECK (status IN ('draft','approved','superseded','discarded','retired')),
  ADD COLUMN note varchar(500) NOT NULL DEFAULT '',
  ADD COLUMN created_by_id integer REFERENCES users(id),
  ADD COLUMN approved_by_id integer REFERENCES users(id),
  ADD COLUMN approved_at timestamptz,
  ADD COLUMN approval_reason varchar(500),
  ADD COLUMN effective_from timestamptz,
  ADD COLUMN superseded_at timestamptz;
UPDATE routes SET effective_from = created_at, status = CASE WHEN active THEN 'approved' ELSE 'superseded' END;
ALTER TABLE routes ADD CONSTRAINT routes_approver_not_author CHECK (approved_by_id IS NULL OR approved_by_id IS DISTINCT FROM created_by_id),
  ADD CONSTRAINT routes_in_force_is_approved CHECK (NOT active OR status = 'approved');
-- one draft at a time per family and part kind
CREATE UNIQUE INDEX routes_one_draft ON routes (engine_family_id, part_kind) WHERE status = 'draft';

ALTER TABLE route_stages ADD COLUMN rework_to_stage_id integer REFERENCES stages(id),
  ADD CONSTRAINT route_stages_rework_elsewhere CHECK (rework_to_stage_id IS DISTINCT FROM stage_id);

ALTER TABLE characteristics ADD COLUMN retired_at timestamptz,
  ADD COLUMN gauge_kinds varchar(40)[] NOT NULL DEFAULT '{}';

CREATE TABLE family_casting_numbers (
  id serial PRIMARY KEY,
  engine_family_id integer NOT NULL REFERENCES engine_families(id),
  casting_number varchar(40) NOT NULL CHECK (casting_number ~ '^[A-Z0-9][A-Z0-9./-]{0,39}$'),
  part_kind varchar(20) NOT NULL DEFAULT 'block' REFERENCES part_kinds(code),
  note varchar(200) NOT NULL DEFAULT '',
  retired_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE UNIQUE INDEX family_casting_numbers_once ON family_casting_numbers (engine_family_id, casting_number);
CREATE INDEX family_casting_numbers_number ON family_casting_numbers (casting_number);

CREATE TRIGGER part_kinds_bump_reference AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON part_kinds
  FOR EACH STATEMENT EXECUTE FUNCTION bump_reference_version();
CREATE TRIGGER family_casting_numbers_bump_reference AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON family_casting_numbers
  FOR EACH STATEMENT EXECUTE FUNCTION bump_reference_version();
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP TABLE IF EXISTS family_casting_numbers;
ALTER TABLE characteristics DROP COLUMN IF EXISTS gauge_kinds, DROP COLUMN IF EXISTS retired_at;
ALTER TABLE route_stages DROP COLUMN IF EXISTS rework_to_stage_id;
DROP INDEX IF EXISTS routes_one_draft;
DELETE FROM route_stages WHERE route_id IN (SELECT id FROM routes WHERE status IN ('draft','discarded'));
DELETE FROM routes WHERE status IN ('draft','discarded');
ALTER TABLE routes DROP CONSTRAINT IF EXISTS routes_in_force_is_approved, DROP CONSTRAINT IF EXISTS routes_approver_not_author,
  DROP COLUMN status, DROP COLUMN note, DROP COLUMN created_by_id, DROP COLUMN approved_by_id, DROP COLUMN approved_at,
  DROP COLUMN approval_reason, DROP COLUMN effective_from, DROP COLUMN superseded_at,
  DROP CONSTRAINT routes_part_kind_fkey;
ALTER TABLE routes ADD CONSTRAINT routes_part_kind_check CHECK (part_kind IN ('core','block','crankshaft','cylinder_head','camshaft','rod_set','long_block'));
ALTER TABLE stages DROP CONSTRAINT IF EXISTS stages_hazard_caution, DROP COLUMN hazardous, DROP COLUMN retired_at,
  DROP CONSTRAINT stages_part_kind_fkey;
ALTER TABLE stages ADD CONSTRAINT stages_part_kind_check CHECK (part_kind IN ('core','block','crankshaft','cylinder_head','camshaft','rod_set','long_block'));
DROP TABLE IF EXISTS part_kinds;
`);
};

export { up, down };
