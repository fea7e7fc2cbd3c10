import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * The line in view: the plant's alert thresholds, trigram indexes for the one search box (partial
 * serials, lot codes, references, NCR and casting numbers match anywhere in the text, in any case),
 * and the time indexes the yield report and the Pareto read a year through.
 */
const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    ALTER TABLE plant_settings
      ADD COLUMN ncr_overdue_days smallint NOT NULL DEFAULT 7 CHECK (ncr_overdue_days BETWEEN 1 AND 365),
      ADD COLUMN hold_alert_hours smallint NOT NULL DEFAULT 48 CHECK (hold_alert_hours BETWEEN 1 AND 8760);
    CREATE EXTENSION IF NOT EXISTS pg_trgm;
    CREATE INDEX items_serial_trgm_idx ON items USING gin (serial gin_trgm_ops);
    CREATE INDEX part_lots_lot_code_trgm_idx ON part_lots USING gin (lot_code gin_trgm_ops);
    CREATE INDEX nonconformances_number_trgm_idx ON nonconformances USING gin (number gin_trgm_ops);
    CREATE INDEX shipments_reference_trgm_idx ON shipments USING gin (reference gin_trgm_ops);
    CREATE INDEX core_receipts_casting_trgm_idx ON core_receipts USING gin (casting_number gin_trgm_ops);
    CREATE INDEX core_receipts_reference_trgm_idx ON core_receipts USING gin (source_reference gin_trgm_ops);
    CREATE INDEX stage_results_finished_idx ON stage_results (finished_at);
    CREATE INDEX nonconformances_created_idx ON nonconformances (created_at);
  `);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
    DROP INDEX nonconformances_created_idx;
    DROP INDEX stage_results_finished_idx;
    DROP INDEX core_receipts_reference_trgm_idx;
    DROP INDEX core_receipts_casting_trgm_idx;
    DROP INDEX shipments_reference_trgm_idx;
    DROP INDEX nonconformances_number_trgm_idx;
    DROP INDEX part_lots_lot_code_trgm_idx;
    DROP INDEX items_serial_trgm_idx;
    ALTER TABLE plant_settings DROP COLUMN hold_alert_hours, DROP COLUMN ncr_overdue_days;
  `);
};

export { up, down };
