import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * A version number for the plant's reference data — families, stages, routes, stations,
 * characteristics, tolerance rules, gauges — bumped by a statement trigger on any change to them, so
 * each API process can keep that data in memory and reread it only when the number moves (one tiny
 * read per request instead of six). And the index the lot lookup needs: it matches lot codes
 * however they were typed, which a plain index on lot_code cannot serve.
 */
const TABLES = [
  'engine_families',
  'stages',
  'routes',
  'route_stages',
  'stations',
  'characteristics',
  'tolerance_rules',
  'gauges',
];

const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE reference_version (
  only_row boolean PRIMARY KEY DEFAULT true CHECK (only_row),
  version bigint NOT NULL DEFAULT 1,
  changed_at timestamptz NOT NULL DEFAULT now()
);
INSERT INTO reference_version DEFAULT VALUES;
CREATE FUNCTION bump_reference_version() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE reference_version SET version = version + 1, changed_at = now();
  RETURN NULL;
END $$;
${TABLES.map(
  (t) => `CREATE TRIGGER ${t}_bump_reference AFTER INSERT OR UPDATE OR DELETE OR TRUNCATE ON ${t}
  FOR EACH STATEMENT EXECUTE FUNCTION bump_reference_version();`,
).join('\n')}
CREATE INDEX part_lots_lot_code_upper_idx ON part_lots (upper(lot_code));
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP INDEX IF EXISTS part_lots_lot_code_upper_idx;
${TABLES.map((t) => `DROP TRIGGER IF EXISTS ${t}_bump_reference ON ${t};`).join('\n')}
DROP FUNCTION IF EXISTS bump_reference_version();
DROP TABLE IF EXISTS reference_version;
`);
};

export { up, down };
