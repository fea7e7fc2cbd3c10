import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Purchased lots are received, not invented at build (issue 16, item 5). Receiving logs a lot with
 * its quantity, date, certificate of conformance and inspection state; a build draws from it and
 * the lot counts what it has given (`quantity_drawn`, never above `quantity_received`: the CHECK
 * is the last word when two builds draw its last parts at once). Only an accepted lot can be drawn.
 *
 * Lots made at build before this migration are kept as they were: received what they gave, on the
 * day they were first used, accepted, so none has anything left to draw.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE part_lots
  ADD COLUMN quantity_received integer NOT NULL DEFAULT 0 CHECK (quantity_received >= 0),
  ADD COLUMN quantity_drawn integer NOT NULL DEFAULT 0 CHECK (quantity_drawn >= 0),
  ADD COLUMN received_on date,
  ADD COLUMN received_by_id integer REFERENCES users(id),
  ADD COLUMN inspection varchar(12) NOT NULL DEFAULT 'pending'
    CHECK (inspection IN ('pending','accepted','on_hold','refused')),
  ADD COLUMN inspection_reason varchar(500),
  ADD COLUMN certificate_attachment_id integer REFERENCES attachments(id);

UPDATE part_lots pl
   SET quantity_received = d.n, quantity_drawn = d.n
  FROM (SELECT part_lot_id, sum(quantity)::int AS n FROM unit_lots GROUP BY part_lot_id) d
 WHERE d.part_lot_id = pl.id;
UPDATE part_lots SET received_on = created_at::date, inspection = 'accepted';

ALTER TABLE part_lots
  ALTER COLUMN received_on SET NOT NULL,
  ALTER COLUMN received_on SET DEFAULT CURRENT_DATE,
  ADD CONSTRAINT part_lots_not_overdrawn CHECK (quantity_drawn <= quantity_received),
  ADD CONSTRAINT part_lots_held_with_reason CHECK (inspection IN ('pending','accepted') OR inspection_reason IS NOT NULL);
-- the receiving list: newest first, and by supplier
CREATE INDEX part_lots_received_idx ON part_lots (received_on DESC, id DESC);
CREATE INDEX part_lots_supplier_idx ON part_lots (supplier_id, received_on DESC);
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP INDEX part_lots_received_idx;
DROP INDEX part_lots_supplier_idx;
ALTER TABLE part_lots
  DROP CONSTRAINT part_lots_not_overdrawn,
  DROP CONSTRAINT part_lots_held_with_reason,
  DROP COLUMN certificate_attachment_id,
  DROP COLUMN inspection_reason,
  DROP COLUMN inspection,
  DROP COLUMN received_by_id,
  DROP COLUMN received_on,
  DROP COLUMN quantity_drawn,
  DROP COLUMN quantity_received;
`);
};

export { up, down };
