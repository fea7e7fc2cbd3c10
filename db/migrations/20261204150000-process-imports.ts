import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * A process document imported as a draft (issue 16, item 6): kept as checked, with what it would
 * add, until someone other than its author approves it with a signature; then applied in one
 * transaction. Discarded drafts stay on record. One draft at a time.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE process_imports (
  id serial PRIMARY KEY,
  status varchar(12) NOT NULL DEFAULT 'draft' CHECK (status IN ('draft','approved','discarded')),
  document jsonb NOT NULL,
  plan jsonb NOT NULL,
  note varchar(500) NOT NULL DEFAULT '',
  created_by_id integer NOT NULL REFERENCES users(id),
  approved_by_id integer REFERENCES users(id),
  approved_at timestamptz,
  approval_reason varchar(500),
  effective_from timestamptz,
  created_at timestamptz NOT NULL DEFAULT now(),
  updated_at timestamptz NOT NULL DEFAULT now(),
  CONSTRAINT process_imports_approver_not_author CHECK (approved_by_id IS NULL OR approved_by_id <> created_by_id),
  CONSTRAINT process_imports_approved_signed CHECK (status <> 'approved' OR (approved_by_id IS NOT NULL AND approved_at IS NOT NULL))
);
CREATE UNIQUE INDEX process_imports_one_draft ON process_imports ((true)) WHERE status = 'draft';
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TABLE IF EXISTS process_imports;');
};

export { up, down };
