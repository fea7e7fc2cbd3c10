import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Changes to a characteristic under change control (issue 16, item 2): each is a version of its
 * definition (name, critical, optional, help, gauge kinds, defect code, physical range, mating
 * part), drafted by one person, approved with another's signature, in force from a time, when it is
 * applied to the characteristic. Every version is kept, to compare side by side. Version 1 is the
 * definition as it stood before its first change.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE characteristic_versions (
  id serial PRIMARY KEY,
  characteristic_id integer NOT NULL REFERENCES characteristics(id),
  version integer NOT NULL CHECK (version > 0),
  status varchar(12) NOT NULL DEFAULT 'draft' CHECK (status IN ('draft','approved','superseded','discarded')),
  definition jsonb NOT NULL CHECK (jsonb_typeof(definition) = 'object'),
  note varchar(500) NOT NULL DEFAULT '',
  created_by_id integer REFERENCES users(id),
  approved_by_id integer REFERENCES users(id),
  approved_at timestamptz,
  approval_reason varchar(500),
  effective_from timestamptz,
  applied_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CONSTRAINT characteristic_versions_approver_not_author CHECK (approved_by_id IS NULL OR approved_by_id IS DISTINCT FROM created_by_id)
);
CREATE UNIQUE INDEX characteristic_versions_once ON characteristic_versions (characteristic_id, version);
CREATE UNIQUE INDEX characteristic_versions_one_draft ON characteristic_versions (characteristic_id) WHERE status = 'draft';
CREATE INDEX characteristic_versions_due ON characteristic_versions (effective_from) WHERE status = 'approved' AND applied_at IS NULL;
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TABLE IF EXISTS characteristic_versions;');
};

export { up, down };
