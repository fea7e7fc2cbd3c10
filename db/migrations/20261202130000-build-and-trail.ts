import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * Build, run test and release: characteristics a stage may record but need not (torque and speed
 * on a stand that has no dynamometer), one row per lot per unit, and the shipment's order details.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
ALTER TABLE characteristics ADD COLUMN optional boolean NOT NULL DEFAULT false;
CREATE UNIQUE INDEX unit_lots_unit_lot_idx ON unit_lots (unit_item_id, part_lot_id);
ALTER TABLE shipments ADD COLUMN ship_date date, ADD COLUMN warranty_months smallint;
-- a unit ships once until it comes back: one shipment per unit that is not ended by a return
ALTER TABLE shipments ADD COLUMN returned_at timestamptz;
CREATE UNIQUE INDEX shipments_one_live_idx ON shipments (unit_item_id) WHERE returned_at IS NULL;
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP INDEX IF EXISTS shipments_one_live_idx;
ALTER TABLE shipments DROP COLUMN returned_at, DROP COLUMN ship_date, DROP COLUMN warranty_months;
DROP INDEX IF EXISTS unit_lots_unit_lot_idx;
ALTER TABLE characteristics DROP COLUMN optional;
`);
};

export { up, down };
