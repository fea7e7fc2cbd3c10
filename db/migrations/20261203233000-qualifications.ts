import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Operator qualification (issue 22, item 2). A person is qualified to record a stage from the day
 * they were trained until an expiry day, signed off by a supervisor or admin (a `signatures` row:
 * signer, meaning, reason, time). A renewal is a new row; the newest row of a person and stage is
 * the one in force, and a withdrawal marks that row with who, when and why. Rows are never deleted.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE qualifications (
  id serial PRIMARY KEY,
  user_id integer NOT NULL REFERENCES users(id),
  stage_id integer NOT NULL REFERENCES stages(id),
  trained_on date NOT NULL,
  expires_on date NOT NULL,
  signed_by_id integer NOT NULL REFERENCES users(id),
  signature_id integer NOT NULL REFERENCES signatures(id),
  withdrawn_at timestamptz,
  withdrawn_by_id integer REFERENCES users(id),
  withdrawn_reason varchar(500),
  created_at timestamptz NOT NULL DEFAULT now(),
  CHECK (expires_on > trained_on),
  CHECK ((withdrawn_at IS NULL) = (withdrawn_by_id IS NULL) AND (withdrawn_at IS NULL) = (withdrawn_reason IS NULL))
);
CREATE INDEX qualifications_person_stage_idx ON qualifications (user_id, stage_id, id DESC);
CREATE INDEX qualifications_expiry_idx ON qualifications (expires_on) WHERE withdrawn_at IS NULL;
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query('DROP TABLE qualifications;');
};

export { up, down };
