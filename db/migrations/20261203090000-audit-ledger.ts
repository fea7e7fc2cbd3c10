import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * The audit trail becomes an append-only Merkle tree log (RFC 6962 / RFC 9162). New events are
 * written without a position and without a hash chain; a trigger queues each one in
 * audit_pending, and one sequencer per database integrates committed events into the tree.
 * Events written before this migration keep their chain (prev_hash, hash) and are queued first,
 * in id order, so they become the log's first leaves in the order the chain gives them.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
-- events from now on carry no chain; the chained history keeps both hashes
ALTER TABLE audit_events ALTER COLUMN prev_hash DROP NOT NULL, ALTER COLUMN hash DROP NOT NULL;
ALTER TABLE audit_events ADD CONSTRAINT audit_events_chain_pair CHECK ((prev_hash IS NULL) = (hash IS NULL));

CREATE FUNCTION ledger_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  RAISE EXCEPTION '% is append-only: % is not allowed', TG_TABLE_NAME, TG_OP
    USING ERRCODE = 'insufficient_privilege';
END;
$$;

-- Committed events waiting for a place in the tree. xid orders one sequencer pass (a transaction's
-- events stay together); it is the inserting transaction's top-level id. No foreign key: the
-- check would cost every audited write a lookup, and verify finds an orphan either way.
CREATE TABLE audit_pending (
  event_id bigint PRIMARY KEY,
  xid xid8 DEFAULT pg_current_xact_id(),
  queued_at timestamptz NOT NULL DEFAULT now()
);
CREATE FUNCTION audit_events_queue() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  INSERT INTO audit_pending (event_id) VALUES (NEW.id);
  RETURN NULL;
END;
$$;
CREATE TRIGGER audit_events_queue AFTER INSERT ON audit_events
  FOR EACH ROW EXECUTE FUNCTION audit_events_queue();
-- the chained history goes first, in chain order (xid NULL sorts first)
INSERT INTO audit_pending (event_id, xid, queued_at) SELECT id, NULL, now() FROM audit_events;

-- One leaf per event, in log order: leaf_hash = SHA-256(0x00 ‖ canonical JSON of the event).
CREATE TABLE audit_leaves (
  leaf_index bigint PRIMARY KEY CHECK (leaf_index >= 0),
  event_id bigint NOT NULL UNIQUE REFERENCES audit_events(id),
  leaf_hash bytea NOT NULL CHECK (octet_length(leaf_hash) = 32),
  integrated_at timestamptz NOT NULL DEFAULT now()
);
-- Complete subtrees of 2^level leaves (level ≥ 1), written once when their last leaf arrives.
CREATE TABLE audit_tree_nodes (
  level smallint NOT NULL CHECK (level BETWEEN 1 AND 62),
  node_index bigint NOT NULL CHECK (node_index >= 0),
  hash bytea NOT NULL CHECK (octet_length(hash) = 32),
  PRIMARY KEY (level, node_index)
);
-- Signed log heads: RFC 6962 §3.5 TreeHeadSignature bytes, signed with the plant's Ed25519 key.
CREATE TABLE audit_log_heads (
  tree_size bigint PRIMARY KEY CHECK (tree_size >= 0),
  root_hash bytea NOT NULL CHECK (octet_length(root_hash) = 32),
  signed_at timestamptz NOT NULL,
  signed_ms bigint NOT NULL,
  key_id char(64) NOT NULL,
  public_key bytea NOT NULL CHECK (octet_length(public_key) = 32),
  signature bytea NOT NULL CHECK (octet_length(signature) = 64),
  created_at timestamptz NOT NULL DEFAULT now()
);
-- (statement triggers: they refuse even a statement that matches no row)
-- The sequencer's own row: where the tree stands. Derived (verify recomputes it); never shrinks.
CREATE TABLE audit_log_state (
  only_row boolean PRIMARY KEY DEFAULT true CHECK (only_row),
  tree_size bigint NOT NULL DEFAULT 0 CHECK (tree_size >= 0),
  root_hash bytea NOT NULL,
  frontier bytea NOT NULL DEFAULT ''::bytea,
  integrated_at timestamptz
);
INSERT INTO audit_log_state (root_hash) VALUES (sha256(''::bytea));
CREATE FUNCTION audit_log_state_grows() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF NEW.tree_size < OLD.tree_size THEN
    RAISE EXCEPTION 'the audit log never shrinks (% to %)', OLD.tree_size, NEW.tree_size
      USING ERRCODE = 'insufficient_privilege';
  END IF;
  RETURN NEW;
END;
$$;
CREATE TRIGGER audit_log_state_grows BEFORE UPDATE ON audit_log_state
  FOR EACH ROW EXECUTE FUNCTION audit_log_state_grows();
CREATE TRIGGER audit_log_state_kept BEFORE DELETE ON audit_log_state
  FOR EACH STATEMENT EXECUTE FUNCTION ledger_append_only();
CREATE TRIGGER audit_log_state_no_truncate BEFORE TRUNCATE ON audit_log_state
  FOR EACH STATEMENT EXECUTE FUNCTION ledger_append_only();

CREATE TRIGGER audit_leaves_no_update_delete BEFORE UPDATE OR DELETE ON audit_leaves
  FOR EACH STATEMENT EXECUTE FUNCTION ledger_append_only();
CREATE TRIGGER audit_leaves_no_truncate BEFORE TRUNCATE ON audit_leaves
  FOR EACH STATEMENT EXECUTE FUNCTION ledger_append_only();
CREATE TRIGGER audit_tree_nodes_no_update_delete BEFORE UPDATE OR DELETE ON audit_tree_nodes
  FOR EACH STATEMENT EXECUTE FUNCTION ledger_append_only();
CREATE TRIGGER audit_tree_nodes_no_truncate BEFORE TRUNCATE ON audit_tree_nodes
  FOR EACH STATEMENT EXECUTE FUNCTION ledger_append_only();
CREATE TRIGGER audit_log_heads_no_update_delete BEFORE UPDATE OR DELETE ON audit_log_heads
  FOR EACH STATEMENT EXECUTE FUNCTION ledger_append_only();
CREATE TRIGGER audit_log_heads_no_truncate BEFORE TRUNCATE ON audit_log_heads
  FOR EACH STATEMENT EXECUTE FUNCTION ledger_append_only();
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP TRIGGER IF EXISTS audit_events_queue ON audit_events;
DROP TABLE IF EXISTS audit_log_state, audit_log_heads, audit_tree_nodes, audit_leaves, audit_pending;
DROP FUNCTION IF EXISTS audit_events_queue(), audit_log_state_grows(), ledger_append_only();
ALTER TABLE audit_events DROP CONSTRAINT IF EXISTS audit_events_chain_pair;
`);
};

export { up, down };
