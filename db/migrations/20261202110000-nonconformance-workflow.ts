import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * The NCR workflow: what the item was doing before the hold (so closing an NCR raised by hand puts
 * it back), a use-as-is on a critical NCR waiting for its second signer, the decision's time and
 * signer, the indexes the NCR list filters by, and a stable Message-ID per outbox row so a resent
 * message can be recognised.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE nonconformances
  ADD COLUMN item_status_before varchar(20),
  ADD COLUMN awaiting_second_signature boolean NOT NULL DEFAULT false,
  ADD COLUMN decided_by_id integer REFERENCES users(id),
  ADD COLUMN decided_at timestamptz,
  ADD CONSTRAINT nonconformances_state_check
    CHECK (state IN ('raised','in_review','decided','closed','voided'));
CREATE INDEX nonconformances_severity_idx ON nonconformances (severity, created_at);
CREATE INDEX nonconformances_defect_idx ON nonconformances (defect_code_id, created_at);
CREATE INDEX nonconformances_stage_idx ON nonconformances (stage_id, created_at);
CREATE INDEX nonconformances_assignee_idx ON nonconformances (assignee_id) WHERE assignee_id IS NOT NULL;
-- the release gate and the station ask "does this item have an open NCR": served by (item_id, state)

ALTER TABLE mail_outbox
  ADD COLUMN message_id varchar(200),
  ADD COLUMN reason varchar(60) NOT NULL DEFAULT '';
CREATE UNIQUE INDEX mail_outbox_message_id_idx ON mail_outbox (message_id) WHERE message_id IS NOT NULL;
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP INDEX IF EXISTS mail_outbox_message_id_idx;
ALTER TABLE mail_outbox DROP COLUMN message_id, DROP COLUMN reason;
DROP INDEX IF EXISTS nonconformances_assignee_idx, nonconformances_stage_idx, nonconformances_defect_idx,
  nonconformances_severity_idx;
ALTER TABLE nonconformances DROP CONSTRAINT nonconformances_state_check,
  DROP COLUMN item_status_before, DROP COLUMN awaiting_second_signature, DROP COLUMN decided_by_id,
  DROP COLUMN decided_at;
`);
};

export { up, down };
