import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * The documents a release issues (build record, certificate of conformance, packing slip): the
 * content each was printed from, kept as issued, and the audit event that logged its hash. A PDF
 * is drawn again from this row whenever it is asked for, so it is the same document every time.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE issued_documents (
  id serial PRIMARY KEY,
  kind varchar(20) NOT NULL CHECK (kind IN ('build_record', 'certificate', 'packing_slip')),
  unit_item_id integer NOT NULL REFERENCES items(id),
  shipment_id integer NOT NULL REFERENCES shipments(id),
  document_number varchar(60) NOT NULL UNIQUE,
  content jsonb NOT NULL,
  content_hash char(64) NOT NULL,
  audit_event_id bigint NOT NULL UNIQUE REFERENCES audit_events(id),
  issued_by_id integer REFERENCES users(id),
  created_at timestamptz NOT NULL DEFAULT now(),
  UNIQUE (shipment_id, kind)
);
CREATE INDEX issued_documents_unit_idx ON issued_documents (unit_item_id, kind, id DESC);
CREATE TRIGGER issued_documents_no_update_delete BEFORE UPDATE OR DELETE ON issued_documents
  FOR EACH STATEMENT EXECUTE FUNCTION ledger_append_only();
CREATE TRIGGER issued_documents_no_truncate BEFORE TRUNCATE ON issued_documents
  FOR EACH STATEMENT EXECUTE FUNCTION ledger_append_only();
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`DROP TABLE issued_documents;`);
};

export { up, down };
