import type { MigrationFn } from 'umzug';
import type { QueryInterface } from 'sequelize';

/**
 * What each torn-down core gave, one row per core, so the yield report's salvage table sums a
 * year of cores (some 18,000 at 50,000 units) instead of walking every core's harvested parts and
 * looking each part up (server/services/line/yields.ts). Derived data, never a record: kept by
 * triggers in the same transaction as the change, and rebuilt from the records at any time by
 * `fillCoreSalvageSql` (the benchmark loads its history with triggers off and calls it).
 *
 * - A core's row is written, counted from its records, when its status becomes `torn_down` (the
 *   teardown has inserted its parts' links by then, in the same transaction), and goes when the
 *   status leaves `torn_down`.
 * - A harvested part that becomes scrapped, or stops being scrapped, moves its core's
 *   `scrapped_later` by one; a part harvested after the teardown adds to `kept`. These are
 *   increments under the row's lock, so two parts of one core scrapped at once both count.
 * - A correction of the receipt (date, source, casting number), of the core's family or of what
 *   its teardown scrapped is copied; the counts of parts are never recounted by a trigger (a
 *   recount could miss a part scrapped in a transaction not yet committed).
 */
/** Each torn-down core's row counted from the records, for the cores `where` names (on `i`, the core). */
export const coreSalvageFromRecordsSql = (where = 'TRUE') => `
  SELECT i.id AS item_id, cr.received_on, cr.source, cr.casting_number, i.engine_family_id,
         (SELECT count(*) FROM item_links l WHERE l.parent_item_id = i.id AND l.link_type = 'harvested_from')::int AS kept,
         jsonb_array_length(coalesce(i.attributes->'teardown'->'scrapped', '[]'::jsonb)) AS scrapped_at_teardown,
         (SELECT count(*) FROM item_links l JOIN items p ON p.id = l.child_item_id
           WHERE l.parent_item_id = i.id AND l.link_type = 'harvested_from' AND p.status = 'scrapped')::int AS scrapped_later
    FROM core_receipts cr JOIN items i ON i.id = cr.item_id
   WHERE i.status = 'torn_down' AND (${where})`;

export const fillCoreSalvageSql = (where = 'TRUE') => `
  INSERT INTO core_salvage (item_id, received_on, source, casting_number, engine_family_id, kept,
                            scrapped_at_teardown, scrapped_later)
  ${coreSalvageFromRecordsSql(where)}
  ON CONFLICT (item_id) DO UPDATE
     SET received_on = EXCLUDED.received_on, source = EXCLUDED.source, casting_number = EXCLUDED.casting_number,
         engine_family_id = EXCLUDED.engine_family_id, kept = EXCLUDED.kept,
         scrapped_at_teardown = EXCLUDED.scrapped_at_teardown, scrapped_later = EXCLUDED.scrapped_later`;

const up: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
CREATE TABLE core_salvage (
  item_id integer PRIMARY KEY REFERENCES items(id),
  received_on date NOT NULL,
  source varchar(20) NOT NULL,
  casting_number varchar(40) NOT NULL,
  engine_family_id integer NOT NULL,
  kept integer NOT NULL CHECK (kept >= 0),
  scrapped_at_teardown integer NOT NULL CHECK (scrapped_at_teardown >= 0),
  scrapped_later integer NOT NULL CHECK (scrapped_later BETWEEN 0 AND kept)
);
CREATE INDEX core_salvage_received_on_idx ON core_salvage (received_on);

CREATE FUNCTION items_touch_core_salvage() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF NEW.status = 'torn_down' AND OLD.status <> 'torn_down' THEN
    ${fillCoreSalvageSql('i.id = NEW.id')};
  ELSIF NEW.status = 'torn_down' THEN
    -- the counts of parts stay increments: a recount here could miss a part scrapped meanwhile
    UPDATE core_salvage
       SET engine_family_id = NEW.engine_family_id,
           scrapped_at_teardown = jsonb_array_length(coalesce(NEW.attributes->'teardown'->'scrapped', '[]'::jsonb))
     WHERE item_id = NEW.id;
  ELSIF OLD.status = 'torn_down' THEN
    DELETE FROM core_salvage WHERE item_id = NEW.id;
  END IF;
  IF (OLD.status = 'scrapped') IS DISTINCT FROM (NEW.status = 'scrapped') THEN
    UPDATE core_salvage c
       SET scrapped_later = c.scrapped_later + CASE WHEN NEW.status = 'scrapped' THEN 1 ELSE -1 END
      FROM item_links l
     WHERE l.child_item_id = NEW.id AND l.link_type = 'harvested_from' AND c.item_id = l.parent_item_id;
  END IF;
  RETURN NULL;
END $$;
-- only the changes that move a count fire it: a part's every other update costs nothing
CREATE TRIGGER items_touch_core_salvage AFTER UPDATE ON items FOR EACH ROW
  WHEN ((OLD.status = 'torn_down') IS DISTINCT FROM (NEW.status = 'torn_down')
        OR (OLD.status = 'scrapped') IS DISTINCT FROM (NEW.status = 'scrapped')
        OR (NEW.status = 'torn_down' AND (OLD.engine_family_id <> NEW.engine_family_id
                                         OR OLD.attributes->'teardown' IS DISTINCT FROM NEW.attributes->'teardown')))
  EXECUTE FUNCTION items_touch_core_salvage();

CREATE FUNCTION item_links_touch_core_salvage() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE core_salvage c
     SET kept = c.kept + 1,
         scrapped_later = c.scrapped_later + (SELECT count(*) FROM items p WHERE p.id = NEW.child_item_id AND p.status = 'scrapped')
   WHERE c.item_id = NEW.parent_item_id;
  RETURN NULL;
END $$;
CREATE TRIGGER item_links_touch_core_salvage AFTER INSERT ON item_links FOR EACH ROW
  WHEN (NEW.link_type = 'harvested_from')
  EXECUTE FUNCTION item_links_touch_core_salvage();

CREATE FUNCTION core_receipts_touch_core_salvage() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  UPDATE core_salvage
     SET received_on = NEW.received_on, source = NEW.source, casting_number = NEW.casting_number
   WHERE item_id = NEW.item_id;
  RETURN NULL;
END $$;
CREATE TRIGGER core_receipts_touch_core_salvage AFTER UPDATE ON core_receipts FOR EACH ROW
  WHEN (OLD.received_on <> NEW.received_on OR OLD.source <> NEW.source OR OLD.casting_number <> NEW.casting_number)
  EXECUTE FUNCTION core_receipts_touch_core_salvage();

${fillCoreSalvageSql()};
ANALYZE core_salvage;
`);
};

const down: MigrationFn<QueryInterface> = async ({ context: qi }) => {
  await qi.sequelize.query(`
DROP TRIGGER core_receipts_touch_core_salvage ON core_receipts;
DROP FUNCTION core_receipts_touch_core_salvage();
DROP TRIGGER item_links_touch_core_salvage ON item_links;
DROP FUNCTION item_links_touch_core_salvage();
DROP TRIGGER items_touch_core_salvage ON items;
DROP FUNCTION items_touch_core_salvage();
DROP TABLE core_salvage;
`);
};

export { up, down };
