import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Closing the loop from the field: warranty claims by serial with their coverage as it was said
 * when logged, the returned unit's teardown findings (each against the part or lot it concerns,
 * with a cause code of the plant's own), a core's credit settled after its teardown (a new record;
 * the dock's decision is kept), and corrective actions opened from NCRs and claims, with their
 * team, containment links, actions with owners and due dates, and one reminder per action per day.
 *
 * `warranty_claims` was laid down by the foundation and never written; it is rebuilt here, and the
 * migration refuses to run if anything was ever put in it.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DO $$ BEGIN
  IF EXISTS (SELECT 1 FROM warranty_claims) THEN
    RAISE EXCEPTION 'warranty_claims has rows: move them aside before this migration rebuilds the table';
  END IF;
END $$;
DROP TABLE warranty_claims;

-- a record kept as written: corrections are new rows
CREATE FUNCTION rows_are_records() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% rows are records: add a new one instead', TG_TABLE_NAME
    USING ERRCODE = 'insufficient_privilege';
END $$;

CREATE TABLE cause_codes (
  id serial PRIMARY KEY,
  code varchar(20) NOT NULL UNIQUE,
  description varchar(200) NOT NULL,
  -- "no trouble found" and "installation" are claims, not failures of what the plant made
  counts_as_failure boolean NOT NULL DEFAULT true,
  active boolean NOT NULL DEFAULT true,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
INSERT INTO cause_codes (code, description, counts_as_failure) VALUES
  ('NTF', 'No trouble found', false),
  ('INSTALL', 'Installation or use outside the instructions', false);

CREATE SEQUENCE warranty_claim_number_seq;
CREATE TABLE warranty_claims (
  id serial PRIMARY KEY,
  number varchar(20) NOT NULL UNIQUE,
  unit_item_id integer NOT NULL REFERENCES items(id),
  shipment_id integer NOT NULL REFERENCES shipments(id),
  customer_id integer NOT NULL REFERENCES customers(id),
  customer_reference varchar(60) NOT NULL DEFAULT '',
  failed_on date NOT NULL,
  distance_km integer CHECK (distance_km >= 0),
  hours numeric(8,1) CHECK (hours >= 0),
  symptom text NOT NULL,
  installer varchar(160) NOT NULL,
  covered boolean NOT NULL,
  coverage_reason varchar(400) NOT NULL,
  warranty_ends_on date NOT NULL,
  state varchar(12) NOT NULL DEFAULT 'received' CHECK (state IN ('received','torn_down','decided','closed')),
  unit_returned_at timestamptz,
  returned_by_id integer REFERENCES users(id),
  torn_down_at timestamptz,
  torn_down_by_id integer REFERENCES users(id),
  teardown_notes text NOT NULL DEFAULT '',
  decision varchar(10) CHECK (decision IN ('accepted','rejected','goodwill')),
  decision_reason text,
  decided_by_id integer REFERENCES users(id),
  decided_at timestamptz,
  closed_by_id integer REFERENCES users(id),
  closed_at timestamptz,
  opened_by_id integer NOT NULL REFERENCES users(id),
  -- invented history the demo plant starts with, so its analysis has something to show
  demo boolean NOT NULL DEFAULT false,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK (distance_km IS NOT NULL OR hours IS NOT NULL),
  CHECK ((decision IS NULL) = (state IN ('received','torn_down'))),
  CHECK (decision IS NULL OR decision_reason IS NOT NULL),
  CHECK ((state = 'closed') = (closed_at IS NOT NULL)),
  CHECK (state <> 'torn_down' OR torn_down_at IS NOT NULL),
  CHECK (torn_down_at IS NULL OR unit_returned_at IS NOT NULL)
);
-- one claim at a time per unit: a second waits until the first is closed
CREATE UNIQUE INDEX warranty_claims_one_open_idx ON warranty_claims (unit_item_id) WHERE state <> 'closed';
CREATE INDEX warranty_claims_unit_idx ON warranty_claims (unit_item_id);
CREATE INDEX warranty_claims_state_idx ON warranty_claims (state, created_at);

CREATE TABLE warranty_findings (
  id serial PRIMARY KEY,
  claim_id integer NOT NULL REFERENCES warranty_claims(id),
  -- the part (or the unit itself) the finding concerns, or the purchased lot
  item_id integer REFERENCES items(id),
  part_lot_id integer REFERENCES part_lots(id),
  cause_code_id integer NOT NULL REFERENCES cause_codes(id),
  description text NOT NULL,
  -- what teardown measured: [{ characteristic, position, value, unit }]
  measurements jsonb NOT NULL DEFAULT '[]',
  recorded_by_id integer NOT NULL REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now(),
  CHECK (num_nonnulls(item_id, part_lot_id) = 1)
);
CREATE INDEX warranty_findings_claim_idx ON warranty_findings (claim_id);
CREATE INDEX warranty_findings_item_idx ON warranty_findings (item_id) WHERE item_id IS NOT NULL;
CREATE TRIGGER warranty_findings_kept BEFORE UPDATE OR DELETE ON warranty_findings
  FOR EACH ROW EXECUTE FUNCTION rows_are_records();

CREATE TABLE core_credit_revisions (
  id serial PRIMARY KEY,
  core_item_id integer NOT NULL REFERENCES items(id),
  credit_decision varchar(10) NOT NULL CHECK (credit_decision IN ('full','partial','none')),
  reason varchar(500) NOT NULL,
  revised_by_id integer NOT NULL REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX core_credit_revisions_core_idx ON core_credit_revisions (core_item_id, id);
CREATE TRIGGER core_credit_revisions_kept BEFORE UPDATE OR DELETE ON core_credit_revisions
  FOR EACH ROW EXECUTE FUNCTION rows_are_records();

CREATE SEQUENCE corrective_action_number_seq;
CREATE TABLE corrective_actions (
  id serial PRIMARY KEY,
  number varchar(20) NOT NULL UNIQUE,
  title varchar(160) NOT NULL,
  state varchar(10) NOT NULL DEFAULT 'open' CHECK (state IN ('open','closed')),
  problem text NOT NULL DEFAULT '',
  containment text NOT NULL DEFAULT '',
  root_cause text NOT NULL DEFAULT '',
  verification_due_on date,
  verification_note text,
  verified_effective boolean,
  verified_by_id integer REFERENCES users(id),
  verified_at timestamptz,
  opened_by_id integer NOT NULL REFERENCES users(id),
  closed_by_id integer REFERENCES users(id),
  closed_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK ((state = 'closed') = (closed_at IS NOT NULL)),
  CHECK (state = 'open' OR verified_effective)
);
CREATE INDEX corrective_actions_state_idx ON corrective_actions (state, created_at);

-- the NCRs and claims a corrective action answers
CREATE TABLE corrective_action_sources (
  id serial PRIMARY KEY,
  corrective_action_id integer NOT NULL REFERENCES corrective_actions(id),
  nonconformance_id integer REFERENCES nonconformances(id),
  warranty_claim_id integer REFERENCES warranty_claims(id),
  added_by_id integer NOT NULL REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now(),
  CHECK (num_nonnulls(nonconformance_id, warranty_claim_id) = 1),
  UNIQUE (corrective_action_id, nonconformance_id),
  UNIQUE (corrective_action_id, warranty_claim_id)
);
CREATE INDEX corrective_action_sources_ncr_idx ON corrective_action_sources (nonconformance_id);
CREATE INDEX corrective_action_sources_claim_idx ON corrective_action_sources (warranty_claim_id);

-- the team; someone who leaves it keeps their row, ended
CREATE TABLE corrective_action_members (
  id serial PRIMARY KEY,
  corrective_action_id integer NOT NULL REFERENCES corrective_actions(id),
  user_id integer NOT NULL REFERENCES users(id),
  team_role varchar(80) NOT NULL DEFAULT '',
  added_by_id integer NOT NULL REFERENCES users(id),
  removed_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE UNIQUE INDEX corrective_action_members_one_idx ON corrective_action_members (corrective_action_id, user_id)
  WHERE removed_at IS NULL;

-- containment: the holds (NCRs holding parts or lots) and field actions that keep the problem in
CREATE TABLE corrective_action_containment (
  id serial PRIMARY KEY,
  corrective_action_id integer NOT NULL REFERENCES corrective_actions(id),
  nonconformance_id integer REFERENCES nonconformances(id),
  field_action_id integer REFERENCES field_actions(id),
  note varchar(500) NOT NULL DEFAULT '',
  added_by_id integer NOT NULL REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now(),
  CHECK (num_nonnulls(nonconformance_id, field_action_id) = 1),
  UNIQUE (corrective_action_id, nonconformance_id),
  UNIQUE (corrective_action_id, field_action_id)
);

CREATE TABLE corrective_action_tasks (
  id serial PRIMARY KEY,
  corrective_action_id integer NOT NULL REFERENCES corrective_actions(id),
  kind varchar(12) NOT NULL CHECK (kind IN ('corrective','preventive')),
  description text NOT NULL,
  owner_id integer NOT NULL REFERENCES users(id),
  due_on date NOT NULL,
  done_at timestamptz,
  done_by_id integer REFERENCES users(id),
  done_note text,
  created_by_id integer NOT NULL REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK ((done_at IS NULL) = (done_by_id IS NULL))
);
CREATE INDEX corrective_action_tasks_ca_idx ON corrective_action_tasks (corrective_action_id, id);
-- the reminder job and the homes look for open actions past their due date
CREATE INDEX corrective_action_tasks_due_idx ON corrective_action_tasks (due_on) WHERE done_at IS NULL;
CREATE INDEX corrective_action_tasks_owner_idx ON corrective_action_tasks (owner_id) WHERE done_at IS NULL;

-- one reminder per overdue action per plant day, whichever process gets there first
CREATE TABLE corrective_action_reminders (
  task_id integer NOT NULL REFERENCES corrective_action_tasks(id),
  reminded_on date NOT NULL,
  created_at timestamptz NOT NULL DEFAULT now(),
  PRIMARY KEY (task_id, reminded_on)
);
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP TABLE corrective_action_reminders, corrective_action_tasks, corrective_action_containment,
  corrective_action_members, corrective_action_sources, corrective_actions;
DROP SEQUENCE corrective_action_number_seq;
DROP TABLE core_credit_revisions, warranty_findings, warranty_claims, cause_codes;
DROP SEQUENCE warranty_claim_number_seq;
DROP FUNCTION rows_are_records();
CREATE TABLE warranty_claims (
  id serial PRIMARY KEY,
  unit_item_id integer NOT NULL REFERENCES items(id),
  opened_by_id integer NOT NULL REFERENCES users(id),
  complaint text NOT NULL,
  distance_km integer,
  status varchar(20) NOT NULL,
  findings text NOT NULL DEFAULT '',
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX warranty_claims_unit_idx ON warranty_claims (unit_item_id);
`);
};

export { up, down };
