import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Sessions that end when idle, and a second factor: when each session was last used and whether it
 * may only enrol a second factor (an admin who has none yet); a person's time-based one-time
 * password secret (encrypted), the last time step used (a code is accepted once) and hashed recovery
 * codes. And the two indexes the upload quota and the sweep of unclaimed uploads read.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE sessions
  ADD COLUMN last_seen_at timestamptz NOT NULL DEFAULT now(),
  ADD COLUMN enrol_only boolean NOT NULL DEFAULT false;
ALTER TABLE users
  ADD COLUMN totp_secret varchar(200),
  ADD COLUMN totp_pending_secret varchar(200),
  ADD COLUMN totp_enrolled_at timestamptz,
  ADD COLUMN totp_last_step bigint;
CREATE TABLE recovery_codes (
  id serial PRIMARY KEY,
  user_id integer NOT NULL REFERENCES users(id),
  code_hash char(64) NOT NULL,
  used_at timestamptz,
  created_at timestamptz NOT NULL DEFAULT now()
);
CREATE INDEX recovery_codes_user_id_idx ON recovery_codes (user_id);
CREATE INDEX attachments_uploader_time_idx ON attachments (uploaded_by_id, created_at);
CREATE INDEX attachments_pending_time_idx ON attachments (created_at) WHERE entity = 'pending';
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP INDEX IF EXISTS attachments_pending_time_idx;
DROP INDEX IF EXISTS attachments_uploader_time_idx;
DROP TABLE IF EXISTS recovery_codes;
ALTER TABLE users DROP COLUMN totp_last_step, DROP COLUMN totp_enrolled_at, DROP COLUMN totp_pending_secret,
  DROP COLUMN totp_secret;
ALTER TABLE sessions DROP COLUMN enrol_only, DROP COLUMN last_seen_at;
`);
};

export { up, down };
