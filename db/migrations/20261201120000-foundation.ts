import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * The whole domain schema, laid down at once so later work adds behaviour rather than reshaping
 * tables. Plural snake_case names; every table has created_at (and updated_at where rows change).
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE users (
  id serial PRIMARY KEY,
  email varchar(254) NOT NULL UNIQUE,
  name varchar(120) NOT NULL,
  role varchar(20) NOT NULL CHECK (role IN ('admin','receiving','operator','quality','supervisor','shipping','warranty')),
  password_hash varchar(100) NOT NULL,
  token_version integer NOT NULL DEFAULT 0,
  active boolean NOT NULL DEFAULT true,
  last_sign_in_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE sessions (
  id uuid PRIMARY KEY,
  user_id integer NOT NULL REFERENCES users(id),
  token_version integer NOT NULL,
  ip varchar(64),
  user_agent varchar(300),
  expires_at timestamptz NOT NULL,
  revoked_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX sessions_user_id_idx ON sessions (user_id);

CREATE TABLE engine_families (
  id serial PRIMARY KEY,
  code varchar(20) NOT NULL UNIQUE,
  name varchar(80) NOT NULL,
  description varchar(500) NOT NULL DEFAULT '',
  layout varchar(10) NOT NULL CHECK (layout IN ('inline','v')),
  cylinders smallint NOT NULL CHECK (cylinders BETWEEN 1 AND 16),
  bore_mm numeric(7,3) NOT NULL,
  stroke_mm numeric(7,3) NOT NULL,
  heads_per_engine smallint NOT NULL CHECK (heads_per_engine IN (1,2)),
  warranty_months smallint NOT NULL,
  warranty_km integer,
  active boolean NOT NULL DEFAULT true,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE stages (
  id serial PRIMARY KEY,
  code varchar(40) NOT NULL UNIQUE,
  name varchar(80) NOT NULL,
  part_kind varchar(20) NOT NULL CHECK (part_kind IN ('core','block','crankshaft','cylinder_head','camshaft','rod_set','long_block')),
  hazard varchar(300),
  description varchar(500) NOT NULL DEFAULT '',
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE routes (
  id serial PRIMARY KEY,
  engine_family_id integer NOT NULL REFERENCES engine_families(id),
  part_kind varchar(20) NOT NULL CHECK (part_kind IN ('core','block','crankshaft','cylinder_head','camshaft','rod_set','long_block')),
  version integer NOT NULL DEFAULT 1,
  active boolean NOT NULL DEFAULT true,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (engine_family_id, part_kind, version)
);

CREATE TABLE route_stages (
  id serial PRIMARY KEY,
  route_id integer NOT NULL REFERENCES routes(id),
  stage_id integer NOT NULL REFERENCES stages(id),
  position smallint NOT NULL,
  required boolean NOT NULL DEFAULT true,
  created_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (route_id, position),
  UNIQUE (route_id, stage_id)
);

CREATE TABLE stations (
  id serial PRIMARY KEY,
  code varchar(20) NOT NULL UNIQUE,
  name varchar(80) NOT NULL,
  stage_id integer REFERENCES stages(id),
  location varchar(80) NOT NULL DEFAULT '',
  active boolean NOT NULL DEFAULT true,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE characteristics (
  id serial PRIMARY KEY,
  stage_id integer NOT NULL REFERENCES stages(id),
  code varchar(40) NOT NULL,
  name varchar(120) NOT NULL,
  kind varchar(10) NOT NULL CHECK (kind IN ('variable','attribute','derived')),
  unit varchar(20),
  resolution numeric(12,6),
  positions jsonb NOT NULL DEFAULT '[]',
  derivation jsonb,
  critical boolean NOT NULL DEFAULT false,
  sort_order smallint NOT NULL DEFAULT 0,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (stage_id, code)
);

CREATE TABLE tolerance_rules (
  id serial PRIMARY KEY,
  engine_family_id integer NOT NULL REFERENCES engine_families(id),
  characteristic_id integer NOT NULL REFERENCES characteristics(id),
  version integer NOT NULL,
  status varchar(12) NOT NULL CHECK (status IN ('draft','approved','superseded','withdrawn')),
  limit_type varchar(12) NOT NULL CHECK (limit_type IN ('nominal','range','min','max','attribute')),
  nominal numeric(14,6),
  minus_tol numeric(14,6),
  plus_tol numeric(14,6),
  lower_limit numeric(14,6),
  upper_limit numeric(14,6),
  unit varchar(20),
  resolution numeric(12,6),
  source_note varchar(300) NOT NULL DEFAULT '',
  effective_from timestamptz,
  superseded_at timestamptz,
  created_by_id integer NOT NULL REFERENCES users(id),
  approved_by_id integer REFERENCES users(id),
  approved_at timestamptz,
  approval_reason varchar(500),
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (engine_family_id, characteristic_id, version)
);
CREATE INDEX tolerance_rules_characteristic_idx ON tolerance_rules (characteristic_id);
CREATE INDEX tolerance_rules_lookup_idx ON tolerance_rules (engine_family_id, characteristic_id, status, effective_from);

CREATE TABLE customers (
  id serial PRIMARY KEY,
  code varchar(20) NOT NULL UNIQUE,
  name varchar(120) NOT NULL,
  email varchar(254),
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE suppliers (
  id serial PRIMARY KEY,
  code varchar(20) NOT NULL UNIQUE,
  name varchar(120) NOT NULL,
  email varchar(254),
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE items (
  id serial PRIMARY KEY,
  serial varchar(24) NOT NULL UNIQUE,
  kind varchar(20) NOT NULL CHECK (kind IN ('core','block','crankshaft','cylinder_head','camshaft','rod_set','long_block')),
  engine_family_id integer NOT NULL REFERENCES engine_families(id),
  status varchar(20) NOT NULL,
  route_id integer REFERENCES routes(id),
  current_stage_id integer REFERENCES stages(id),
  position_label varchar(20),
  attributes jsonb NOT NULL DEFAULT '{}',
  created_by_id integer REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX items_family_kind_status_idx ON items (engine_family_id, kind, status);
CREATE INDEX items_current_stage_idx ON items (current_stage_id) WHERE current_stage_id IS NOT NULL;

CREATE TABLE core_receipts (
  id serial PRIMARY KEY,
  item_id integer NOT NULL UNIQUE REFERENCES items(id),
  casting_number varchar(40) NOT NULL,
  id_number varchar(40),
  source varchar(20) NOT NULL CHECK (source IN ('customer_return','purchased')),
  customer_id integer REFERENCES customers(id),
  supplier_id integer REFERENCES suppliers(id),
  source_reference varchar(60),
  received_on date NOT NULL,
  received_by_id integer NOT NULL REFERENCES users(id),
  condition jsonb NOT NULL DEFAULT '{}',
  grade varchar(20),
  accepted boolean NOT NULL,
  reject_reason varchar(500),
  credit_decision varchar(10) CHECK (credit_decision IN ('full','partial','none')),
  credit_reason varchar(500),
  notes text NOT NULL DEFAULT '',
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK ((source = 'customer_return' AND customer_id IS NOT NULL) OR (source = 'purchased' AND supplier_id IS NOT NULL)),
  CHECK (accepted OR reject_reason IS NOT NULL)
);
CREATE INDEX core_receipts_casting_idx ON core_receipts (casting_number);
CREATE INDEX core_receipts_received_on_idx ON core_receipts (received_on);

CREATE TABLE item_links (
  id serial PRIMARY KEY,
  parent_item_id integer NOT NULL REFERENCES items(id),
  child_item_id integer NOT NULL REFERENCES items(id),
  link_type varchar(20) NOT NULL CHECK (link_type IN ('harvested_from','installed_in')),
  created_by_id integer REFERENCES users(id),
  removed_at timestamptz,
  removed_reason varchar(300),
  created_at timestamptz NOT NULL DEFAULT now(),
  CHECK (parent_item_id <> child_item_id)
);
-- genealogy is walked both ways: parts of a unit, and the unit a part went into
CREATE INDEX item_links_parent_idx ON item_links (parent_item_id, link_type);
CREATE INDEX item_links_child_idx ON item_links (child_item_id, link_type);
CREATE UNIQUE INDEX item_links_one_live_install_idx ON item_links (child_item_id)
  WHERE link_type = 'installed_in' AND removed_at IS NULL;
-- a part comes from one core
CREATE UNIQUE INDEX item_links_one_origin_idx ON item_links (child_item_id)
  WHERE link_type = 'harvested_from' AND removed_at IS NULL;

CREATE TABLE part_lots (
  id serial PRIMARY KEY,
  supplier_id integer NOT NULL REFERENCES suppliers(id),
  part_kind varchar(40) NOT NULL,
  part_number varchar(60) NOT NULL,
  lot_code varchar(60) NOT NULL,
  description varchar(200) NOT NULL DEFAULT '',
  attributes jsonb NOT NULL DEFAULT '{}',
  status varchar(20) NOT NULL DEFAULT 'usable',
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (supplier_id, part_number, lot_code)
);
CREATE INDEX part_lots_lot_code_idx ON part_lots (lot_code);

CREATE TABLE unit_lots (
  id serial PRIMARY KEY,
  unit_item_id integer NOT NULL REFERENCES items(id),
  part_lot_id integer NOT NULL REFERENCES part_lots(id),
  quantity integer NOT NULL DEFAULT 1 CHECK (quantity > 0),
  created_by_id integer REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX unit_lots_unit_idx ON unit_lots (unit_item_id);
CREATE INDEX unit_lots_lot_idx ON unit_lots (part_lot_id);

CREATE TABLE gauges (
  id serial PRIMARY KEY,
  code varchar(30) NOT NULL UNIQUE,
  description varchar(120) NOT NULL,
  kind varchar(40) NOT NULL,
  resolution numeric(12,6),
  unit varchar(20),
  calibration_due_on date,
  status varchar(20) NOT NULL DEFAULT 'in_service',
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE gauge_calibrations (
  id serial PRIMARY KEY,
  gauge_id integer NOT NULL REFERENCES gauges(id),
  calibrated_on date NOT NULL,
  due_on date NOT NULL,
  result varchar(20) NOT NULL CHECK (result IN ('in_tolerance','out_of_tolerance','adjusted')),
  certificate varchar(60),
  recorded_by_id integer REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX gauge_calibrations_gauge_idx ON gauge_calibrations (gauge_id, calibrated_on);

CREATE TABLE stage_results (
  id serial PRIMARY KEY,
  item_id integer NOT NULL REFERENCES items(id),
  stage_id integer NOT NULL REFERENCES stages(id),
  station_id integer REFERENCES stations(id),
  operator_id integer NOT NULL REFERENCES users(id),
  gauge_id integer REFERENCES gauges(id),
  started_at timestamptz,
  finished_at timestamptz NOT NULL,
  verdict varchar(10) NOT NULL CHECK (verdict IN ('pass','fail')),
  idempotency_key uuid NOT NULL UNIQUE,
  supersedes_id integer REFERENCES stage_results(id),
  correction_reason varchar(500),
  reentry_reason varchar(500),
  reentry_by_id integer REFERENCES users(id),
  notes text NOT NULL DEFAULT '',
  created_at timestamptz NOT NULL DEFAULT now(),
  CHECK (supersedes_id IS NULL OR correction_reason IS NOT NULL)
);
CREATE INDEX stage_results_item_stage_idx ON stage_results (item_id, stage_id, finished_at);
-- a result is corrected at most once: the correction supersedes it, and is itself superseded next
CREATE UNIQUE INDEX stage_results_supersedes_idx ON stage_results (supersedes_id) WHERE supersedes_id IS NOT NULL;
CREATE INDEX stage_results_gauge_idx ON stage_results (gauge_id) WHERE gauge_id IS NOT NULL;

CREATE TABLE readings (
  id bigserial PRIMARY KEY,
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
  UNIQUE (stage_result_id, characteristic_id, position)
);
CREATE INDEX readings_characteristic_idx ON readings (characteristic_id, created_at);
-- containment: everything measured with a gauge found out of calibration
CREATE INDEX readings_gauge_idx ON readings (gauge_id) WHERE gauge_id IS NOT NULL;

CREATE TABLE defect_codes (
  id serial PRIMARY KEY,
  code varchar(20) NOT NULL UNIQUE,
  description varchar(200) NOT NULL,
  active boolean NOT NULL DEFAULT true,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE nonconformances (
  id serial PRIMARY KEY,
  number varchar(20) NOT NULL UNIQUE,
  item_id integer REFERENCES items(id),
  part_lot_id integer REFERENCES part_lots(id),
  stage_result_id integer REFERENCES stage_results(id),
  stage_id integer REFERENCES stages(id),
  defect_code_id integer REFERENCES defect_codes(id),
  severity varchar(10) NOT NULL CHECK (severity IN ('critical','major','minor')),
  state varchar(20) NOT NULL,
  description text NOT NULL,
  failing jsonb NOT NULL DEFAULT '[]',
  containment text NOT NULL DEFAULT '',
  disposition varchar(20) CHECK (disposition IN ('use_as_is','rework','repair','scrap','return_to_supplier')),
  disposition_reason text,
  rework_stage_id integer REFERENCES stages(id),
  raised_by_id integer NOT NULL REFERENCES users(id),
  assignee_id integer REFERENCES users(id),
  closed_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CHECK (item_id IS NOT NULL OR part_lot_id IS NOT NULL)
);
CREATE INDEX nonconformances_item_state_idx ON nonconformances (item_id, state);
CREATE INDEX nonconformances_stage_result_idx ON nonconformances (stage_result_id) WHERE stage_result_id IS NOT NULL;
CREATE INDEX nonconformances_part_lot_idx ON nonconformances (part_lot_id) WHERE part_lot_id IS NOT NULL;
CREATE INDEX nonconformances_state_created_idx ON nonconformances (state, created_at);

CREATE TABLE nonconformance_transitions (
  id serial PRIMARY KEY,
  nonconformance_id integer NOT NULL REFERENCES nonconformances(id),
  from_state varchar(20),
  to_state varchar(20) NOT NULL,
  actor_id integer NOT NULL REFERENCES users(id),
  reason text NOT NULL DEFAULT '',
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX nonconformance_transitions_ncr_idx ON nonconformance_transitions (nonconformance_id, created_at);

CREATE TABLE signatures (
  id serial PRIMARY KEY,
  user_id integer NOT NULL REFERENCES users(id),
  printed_name varchar(120) NOT NULL,
  meaning varchar(120) NOT NULL,
  entity varchar(40) NOT NULL,
  entity_id varchar(40) NOT NULL,
  signed_at timestamptz NOT NULL,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX signatures_entity_idx ON signatures (entity, entity_id);

CREATE TABLE attachments (
  id serial PRIMARY KEY,
  entity varchar(40) NOT NULL,
  entity_id varchar(40) NOT NULL,
  file_name varchar(200) NOT NULL,
  mime_type varchar(100) NOT NULL,
  size_bytes integer NOT NULL,
  sha256 char(64) NOT NULL,
  storage_key varchar(200) NOT NULL UNIQUE,
  uploaded_by_id integer NOT NULL REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX attachments_entity_idx ON attachments (entity, entity_id);

CREATE TABLE label_prints (
  id serial PRIMARY KEY,
  item_id integer NOT NULL REFERENCES items(id),
  printed_by_id integer NOT NULL REFERENCES users(id),
  stock varchar(20) NOT NULL,
  reprint boolean NOT NULL DEFAULT false,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX label_prints_item_idx ON label_prints (item_id);

CREATE TABLE shipments (
  id serial PRIMARY KEY,
  unit_item_id integer NOT NULL REFERENCES items(id),
  customer_id integer REFERENCES customers(id),
  reference varchar(60) NOT NULL,
  carrier varchar(80),
  shipped_at timestamptz NOT NULL,
  released_by_id integer NOT NULL REFERENCES users(id),
  warranty_ends_on date,
  warranty_km integer,
  created_at timestamptz NOT NULL DEFAULT now()
);

-- a unit may ship again after a warranty repair, so shipments are many per unit
CREATE INDEX shipments_unit_idx ON shipments (unit_item_id);

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

CREATE TABLE idempotency_keys (
  key uuid PRIMARY KEY,
  user_id integer NOT NULL REFERENCES users(id),
  method varchar(10) NOT NULL,
  path varchar(200) NOT NULL,
  request_hash char(64) NOT NULL,
  status_code smallint NOT NULL,
  response jsonb NOT NULL,
  created_at timestamptz NOT NULL DEFAULT now()
);

CREATE TABLE mail_outbox (
  id bigserial PRIMARY KEY,
  to_address varchar(254) NOT NULL,
  subject varchar(200) NOT NULL,
  body_text text NOT NULL,
  body_html text,
  status varchar(10) NOT NULL DEFAULT 'pending' CHECK (status IN ('pending','sending','sent','failed')),
  attempts smallint NOT NULL DEFAULT 0,
  next_attempt_at timestamptz NOT NULL DEFAULT now(),
  claimed_by varchar(80),
  claimed_until timestamptz,
  last_error text,
  sent_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX mail_outbox_due_idx ON mail_outbox (next_attempt_at) WHERE status IN ('pending','sending');

CREATE TABLE audit_events (
  id bigserial PRIMARY KEY,
  occurred_at timestamptz NOT NULL,
  actor_id integer REFERENCES users(id),
  actor_role varchar(20),
  action varchar(60) NOT NULL,
  entity varchar(40) NOT NULL,
  entity_id varchar(40) NOT NULL,
  before jsonb,
  after jsonb,
  request_id varchar(64),
  prev_hash char(64) NOT NULL,
  hash char(64) NOT NULL UNIQUE
);
CREATE INDEX audit_events_entity_idx ON audit_events (entity, entity_id, id);
CREATE INDEX audit_events_actor_idx ON audit_events (actor_id, id);

-- The audit trail is append-only: the database itself refuses to change or remove a row.
CREATE FUNCTION audit_events_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION 'audit_events is append-only: % is not allowed', TG_OP
    USING ERRCODE = 'insufficient_privilege';
END;
$$;
CREATE TRIGGER audit_events_no_update_delete
  BEFORE UPDATE OR DELETE ON audit_events
  FOR EACH ROW EXECUTE FUNCTION audit_events_append_only();
CREATE TRIGGER audit_events_no_truncate
  BEFORE TRUNCATE ON audit_events
  FOR EACH STATEMENT EXECUTE FUNCTION audit_events_append_only();
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP TABLE IF EXISTS audit_events, mail_outbox, idempotency_keys, warranty_claims, shipments,
  label_prints, attachments, signatures, nonconformance_transitions, nonconformances, defect_codes,
  readings, stage_results, gauge_calibrations, gauges, unit_lots, part_lots, item_links,
  core_receipts, items, suppliers, customers, tolerance_rules, characteristics, stations,
  route_stages, routes, stages, engine_families, sessions, users CASCADE;
DROP FUNCTION IF EXISTS audit_events_append_only();
`);
};

export { up, down };
