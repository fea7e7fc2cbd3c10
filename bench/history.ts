import { fillResultValuesSql } from '../db/migrations/20261203220000-result-values.js';
import { fillCoreSalvageSql } from '../db/migrations/20261204183500-core-salvage.js';
import { Faker, en } from '@faker-js/faker';
import type pg from 'pg';
import { makeSerial } from '../shared/domain/serial.js';
import type { PartKind } from '../shared/schemas/reference.js';

/**
 * A plant's years of history, written straight into PostgreSQL in set-based statements (not through
 * the API, which would take hours). Each shipped unit is a copy of a unit the product itself made
 * through its services — same items, genealogy links, receipts, results, readings with their rule
 * versions, lots and shipment — with new ids, valid serials, its own lots and shifted times. So the
 * history has exactly the shape the product writes. One copy in twenty also carries a bore-and-hone
 * failure, its NCR (raised, reviewed, reworked, closed, signed) and the failing readings.
 *
 * The copies do not get audit events: each would be a leaf of the Merkle log, hashed from its
 * canonical JSON row by row. The write path's audit step reads no earlier event, so the log's size
 * changes nothing it measures.
 */

// the template's own minutes are stretched into hours of shop time
const STRETCH = 4000;
export const UNITS_PER_LOT = 25;
const FAKER_SEED = 20261203;

/** Seconds spent per statement kind, for BENCH_DEBUG=1. */
export const seedTimes = new Map<string, number>();
function timed(client: pg.PoolClient): pg.PoolClient {
  if (process.env.BENCH_DEBUG !== '1') return client;
  const query = client.query.bind(client) as (...a: unknown[]) => Promise<unknown>;
  return new Proxy(client, {
    get(target, prop, receiver) {
      if (prop !== 'query') return Reflect.get(target, prop, receiver);
      return async (...args: unknown[]) => {
        const t = performance.now();
        try {
          return await query(...args);
        } finally {
          const label = String(args[0]).replace(/\s+/g, ' ').trim().slice(0, 60);
          seedTimes.set(label, (seedTimes.get(label) ?? 0) + (performance.now() - t) / 1000);
        }
      };
    },
  });
}

export type Template = { unitId: number; familyCode: string; items: { id: number; kind: PartKind }[] };

/** The shipped units the demo made through the services: the patterns every copy follows. */
export async function loadTemplates(db: pg.Pool): Promise<Template[]> {
  const { rows } = await db.query<{ unit_id: number; family: string; id: number; kind: PartKind }>(
    `WITH u AS (SELECT i.id, f.code FROM items i JOIN engine_families f ON f.id = i.engine_family_id
                 WHERE i.kind = 'long_block' AND i.status = 'shipped' AND i.attributes->>'demoHistory' IS NULL),
          parts AS (SELECT l.parent_item_id AS unit_id, l.child_item_id AS id FROM item_links l
                     WHERE l.parent_item_id IN (SELECT id FROM u) AND l.link_type = 'installed_in' AND l.removed_at IS NULL),
          cores AS (SELECT DISTINCT p.unit_id, l.parent_item_id AS id FROM parts p
                      JOIN item_links l ON l.child_item_id = p.id AND l.link_type = 'harvested_from')
     SELECT g.unit_id, u.code AS family, i.id, i.kind
       FROM (SELECT id AS unit_id, id FROM u UNION ALL SELECT * FROM parts UNION ALL SELECT * FROM cores) g
       JOIN items i ON i.id = g.id JOIN u ON u.id = g.unit_id
      ORDER BY g.unit_id, i.id`,
  );
  const byUnit = new Map<number, Template>();
  for (const r of rows) {
    const t = byUnit.get(r.unit_id) ?? { unitId: r.unit_id, familyCode: r.family, items: [] };
    t.items.push({ id: r.id, kind: r.kind });
    byUnit.set(r.unit_id, t);
  }
  return [...byUnit.values()];
}

/** Copies of the templates' rows, kept in unlogged tables so each phase joins small tables. */
export async function prepareTemplates(db: pg.Pool, templates: Template[]) {
  const ids = templates.flatMap((t) => t.items.map((i) => i.id));
  const units = templates.map((t) => t.unitId);
  await db.query(`
    DROP TABLE IF EXISTS bench_tpl_results, bench_tpl_readings, bench_tpl_lots, bench_copy, bench_item_map,
      bench_result_map, bench_lot_map;
    CREATE UNLOGGED TABLE bench_copy (k int PRIMARY KEY, unit_id int NOT NULL, ship_at timestamptz NOT NULL,
      tpl_ship_at timestamptz NOT NULL, customer_id int NOT NULL, lot_group int NOT NULL, pool boolean NOT NULL);
    CREATE UNLOGGED TABLE bench_item_map (k int NOT NULL, old_id int NOT NULL, new_id int PRIMARY KEY, serial varchar(24) NOT NULL);
    CREATE INDEX ON bench_item_map (k, old_id);
    CREATE UNLOGGED TABLE bench_result_map (k int NOT NULL, old_id int NOT NULL, new_id int NOT NULL,
      new_item_id int NOT NULL, at timestamptz NOT NULL);
    CREATE UNLOGGED TABLE bench_lot_map (lot_group int NOT NULL, old_id int NOT NULL, new_id int NOT NULL,
      PRIMARY KEY (lot_group, old_id));`);
  await db.query(
    `CREATE UNLOGGED TABLE bench_tpl_results AS
      SELECT r.*, rs.position AS route_position, i.kind AS item_kind FROM stage_results r
        JOIN items i ON i.id = r.item_id LEFT JOIN route_stages rs ON rs.route_id = i.route_id AND rs.stage_id = r.stage_id
       WHERE r.item_id = ANY($1)`,
    [ids],
  );
  await db.query(
    'CREATE UNLOGGED TABLE bench_tpl_readings AS SELECT * FROM readings WHERE stage_result_id IN (SELECT id FROM bench_tpl_results)',
  );
  await db.query('CREATE INDEX ON bench_tpl_readings (stage_result_id)');
  await db.query(
    `CREATE UNLOGGED TABLE bench_tpl_lots AS SELECT ul.unit_item_id, ul.quantity, pl.*
       FROM unit_lots ul JOIN part_lots pl ON pl.id = ul.part_lot_id WHERE ul.unit_item_id = ANY($1)`,
    [units],
  );
}

type Copy = { k: number; template: Template; shipAt: Date; customerId: number; pool: boolean };

/**
 * Writes copies k ∈ [from, to] in one transaction. `pool` copies are blocks (with their cores) that
 * have reached bore and hone and wait there: the parts the write-path benchmark records.
 */
export async function writeCopies(
  db: pg.Pool,
  copies: Copy[],
  opts: { serials: Set<string>; faker: Faker; boreHoneStageId: number; holdEvery?: number },
) {
  if (!copies.length) return;
  const raw = await db.connect();
  const client = timed(raw);
  try {
    await client.query('BEGIN');
    // the rows are consistent by construction: skip the per-row foreign-key triggers, as a restore does
    await client.query("SET LOCAL session_replication_role = 'replica'");
    const kept = (c: Copy) => c.template.items.filter((i) => !c.pool || i.kind === 'block' || i.kind === 'core');
    const n = copies.reduce((s, c) => s + kept(c).length, 0);
    const { rows: reserved } = await client.query<{ first: string }>(
      "SELECT setval('items_id_seq', nextval('items_id_seq') + $1 - 1) - $1 + 1 AS first",
      [n],
    );
    const first = reserved[0]!.first;
    const random = (m: number) => opts.faker.number.int({ min: 0, max: m - 1 });
    const mapK: number[] = [];
    const mapOld: number[] = [];
    const mapNew: number[] = [];
    const mapSerial: string[] = [];
    let next = Number(first);
    for (const c of copies) {
      for (const i of kept(c)) {
        let serial: string;
        do serial = makeSerial(i.kind, random);
        while (opts.serials.has(serial));
        opts.serials.add(serial);
        mapK.push(c.k);
        mapOld.push(i.id);
        mapNew.push(next++);
        mapSerial.push(serial);
      }
    }
    await client.query(
      `INSERT INTO bench_copy (k, unit_id, ship_at, tpl_ship_at, customer_id, lot_group, pool)
       SELECT x.k, x.unit_id, x.ship_at, s.shipped_at, x.customer_id, (x.k - 1) / ${UNITS_PER_LOT}, x.pool
         FROM unnest($1::int[], $2::int[], $3::timestamptz[], $4::int[], $5::boolean[]) AS x(k, unit_id, ship_at, customer_id, pool)
         JOIN shipments s ON s.unit_item_id = x.unit_id AND s.returned_at IS NULL`,
      [
        copies.map((c) => c.k),
        copies.map((c) => c.template.unitId),
        copies.map((c) => c.shipAt),
        copies.map((c) => c.customerId),
        copies.map((c) => c.pool),
      ],
    );
    await client.query(
      'INSERT INTO bench_item_map SELECT * FROM unnest($1::int[], $2::int[], $3::int[], $4::varchar[])',
      [mapK, mapOld, mapNew, mapSerial],
    );
    const k2 = [copies[0]!.k, copies.at(-1)!.k];
    const range = [...k2, opts.boreHoneStageId];
    const at = (col: string) => `c.ship_at - (c.tpl_ship_at - ${col}) * ${STRETCH}`;
    const inRange = 'm.k BETWEEN $1 AND $2';
    await client.query(
      `INSERT INTO items (id, serial, kind, engine_family_id, status, route_id, current_stage_id, position_label,
                          attributes, created_by_id, created_at, updated_at)
       SELECT m.new_id, m.serial, i.kind, i.engine_family_id,
              CASE WHEN c.pool AND i.kind = 'block' THEN 'in_process' ELSE i.status END, i.route_id,
              CASE WHEN c.pool AND i.kind = 'block' THEN $3 ELSE i.current_stage_id END, i.position_label,
              i.attributes, i.created_by_id, ${at('i.created_at')}, ${at('i.updated_at')}
         FROM bench_item_map m JOIN bench_copy c USING (k) JOIN items i ON i.id = m.old_id WHERE ${inRange}`,
      range,
    );
    await client.query(
      `INSERT INTO core_receipts (item_id, casting_number, id_number, source, customer_id, supplier_id, source_reference,
                                  received_on, received_by_id, condition, grade, accepted, credit_decision, notes,
                                  created_at, updated_at)
       SELECT m.new_id, r.casting_number, 'N' || m.new_id, r.source,
              CASE WHEN r.source = 'customer_return' THEN c.customer_id END, r.supplier_id,
              CASE WHEN r.source = 'customer_return' THEN 'RMA-' ELSE 'PO-' END || m.new_id,
              (${at('r.created_at')})::date, r.received_by_id, r.condition, r.grade, r.accepted, r.credit_decision,
              r.notes, ${at('r.created_at')}, ${at('r.created_at')}
         FROM bench_item_map m JOIN bench_copy c USING (k) JOIN core_receipts r ON r.item_id = m.old_id
        WHERE ${inRange} `,
      k2,
    );
    await client.query(
      `INSERT INTO item_links (parent_item_id, child_item_id, link_type, created_by_id, created_at)
       SELECT p.new_id, m.new_id, l.link_type, l.created_by_id, ${at('l.created_at')}
         FROM bench_item_map m JOIN bench_copy c USING (k)
         JOIN item_links l ON l.child_item_id = m.old_id AND l.removed_at IS NULL
         JOIN bench_item_map p ON p.k = m.k AND p.old_id = l.parent_item_id
        WHERE ${inRange} `,
      k2,
    );
    // core_salvage too, as its triggers would have kept it
    await client.query(fillCoreSalvageSql(`i.id IN (SELECT m.new_id FROM bench_item_map m WHERE ${inRange})`), k2);
    // results: all of a shipped copy's; a pool block's up to (not including) bore and hone
    await client.query(
      `INSERT INTO bench_result_map (k, old_id, new_id, new_item_id, at)
       SELECT m.k, r.id, nextval('stage_results_id_seq'), m.new_id, ${at('r.finished_at')}
         FROM bench_item_map m JOIN bench_copy c USING (k) JOIN bench_tpl_results r ON r.item_id = m.old_id
        WHERE ${inRange} AND (NOT c.pool OR r.item_kind = 'core'
              OR r.route_position < (SELECT rs.position FROM route_stages rs JOIN items b ON b.route_id = rs.route_id
                                      WHERE b.id = r.item_id AND rs.stage_id = $3))`,
      range,
    );
    await client.query(
      `INSERT INTO stage_results (id, item_id, stage_id, station_id, operator_id, gauge_id, started_at, finished_at,
                                  verdict, idempotency_key, notes, created_at)
       SELECT m.new_id, m.new_item_id, r.stage_id, r.station_id, r.operator_id, r.gauge_id, NULL, m.at, r.verdict,
              gen_random_uuid(), r.notes, m.at
         FROM bench_result_map m JOIN bench_tpl_results r ON r.id = m.old_id WHERE ${inRange} `,
      k2,
    );
    await client.query(
      `INSERT INTO readings (stage_result_id, characteristic_id, position, value, passed, location_note, unit, verdict,
                             tolerance_rule_id, rule_version, gauge_id, created_at)
       SELECT m.new_id, t.characteristic_id, t.position,
              -- each copy's bores scattered by a step either way (all still in tolerance), so control
              -- charts of the history have variation to chart; derived readings stay as copied
              CASE WHEN t.characteristic_id = b.id AND t.value IS NOT NULL
                   THEN t.value + 0.0001 * (abs(hashtext(t.position || m.new_id::text)) % 3 - 1) ELSE t.value END,
              t.passed, t.location_note, t.unit, t.verdict, t.tolerance_rule_id, t.rule_version, t.gauge_id, m.at
         FROM bench_result_map m JOIN bench_tpl_readings t ON t.stage_result_id = m.old_id
        CROSS JOIN (SELECT c.id FROM characteristics c JOIN stages s ON s.id = c.stage_id
                     WHERE s.code = 'bore-hone' AND c.code = 'bore') b
        WHERE ${inRange} `,
      k2,
    );
    // triggers are off for the load (session_replication_role): result_values is filled as its
    // trigger would have, from the readings just written
    await client.query(
      fillResultValuesSql(`(SELECT r.* FROM bench_result_map m JOIN readings r ON r.stage_result_id = m.new_id
                             WHERE ${inRange}) copied`),
      k2,
    );
    await writeLots(client, copies, opts.faker);
    await client.query(
      `INSERT INTO unit_lots (unit_item_id, part_lot_id, quantity, created_by_id, created_at)
       SELECT m.new_id, lm.new_id, t.quantity, NULL, c.ship_at - interval '2 days'
         FROM bench_copy c JOIN bench_item_map m ON m.k = c.k AND m.old_id = c.unit_id
         JOIN bench_tpl_lots t ON t.unit_item_id = c.unit_id
         JOIN bench_lot_map lm ON lm.lot_group = c.lot_group AND lm.old_id = t.id
        WHERE ${inRange} AND NOT c.pool `,
      k2,
    );
    await client.query(
      `INSERT INTO shipments (unit_item_id, customer_id, reference, carrier, shipped_at, released_by_id, warranty_ends_on,
                              warranty_km, ship_date, warranty_months, created_at)
       SELECT m.new_id, c.customer_id, 'SO-' || lpad(c.k::text, 6, '0'), s.carrier, c.ship_at, s.released_by_id,
              (c.ship_at + make_interval(months => s.warranty_months))::date, s.warranty_km, c.ship_at::date,
              s.warranty_months, c.ship_at
         FROM bench_copy c JOIN bench_item_map m ON m.k = c.k AND m.old_id = c.unit_id
         JOIN shipments s ON s.unit_item_id = c.unit_id AND s.returned_at IS NULL
        WHERE ${inRange} AND NOT c.pool `,
      k2,
    );
    await writeNcrs(client, range as [number, number, number], opts.holdEvery ?? 20);
    await client.query('COMMIT');
  } catch (err) {
    await client.query('ROLLBACK');
    throw err;
  } finally {
    raw.release();
  }
}

/** New lots for each lot group the copies reach: the templates' part numbers, new lot codes. */
async function writeLots(client: pg.PoolClient, copies: Copy[], faker: Faker) {
  const groups = [...new Set(copies.filter((c) => !c.pool).map((c) => Math.floor((c.k - 1) / UNITS_PER_LOT)))];
  if (!groups.length) return;
  const { rows: tpl } = await client.query<{ id: number }>('SELECT DISTINCT id FROM bench_tpl_lots ORDER BY id');
  const g: number[] = [];
  const old: number[] = [];
  const codes: string[] = [];
  for (const group of groups) {
    for (const t of tpl) {
      g.push(group);
      old.push(t.id);
      // lot codes as a supplier might print them; the group and the template lot keep them unique
      codes.push(
        `L${faker.string.alpha({ length: 2, casing: 'upper' })}${String(group).padStart(5, '0')}-${(old.length % tpl.length) + 1}`,
      );
    }
  }
  await client.query(
    `WITH x AS (SELECT * FROM unnest($1::int[], $2::int[], $3::varchar[]) AS x(lot_group, old_id, lot_code)),
          ins AS (INSERT INTO part_lots (supplier_id, part_kind, part_number, lot_code, description, attributes, status)
                  SELECT t.supplier_id, t.part_kind, t.part_number, x.lot_code, t.description, t.attributes, 'usable'
                    FROM x JOIN (SELECT DISTINCT ON (id) * FROM bench_tpl_lots) t ON t.id = x.old_id
                  RETURNING id, lot_code)
     INSERT INTO bench_lot_map (lot_group, old_id, new_id)
     SELECT x.lot_group, x.old_id, ins.id FROM x JOIN ins ON ins.lot_code = x.lot_code`,
    [g, old, codes],
  );
}

/**
 * A failed first attempt at bore and hone with its NCR: closed after a passing rework for shipped
 * copies (every `every`-th), still open — the part on hold — for pool copies.
 */
async function writeNcrs(client: pg.PoolClient, range: [number, number, number], every: number) {
  await client.query(
    `CREATE TEMP TABLE ncr_pick ON COMMIT DROP AS
     SELECT m.k, c.pool, m.new_id AS item_id, m.serial, r.id AS tpl_result_id, r.stage_id, r.station_id, r.operator_id,
            r.gauge_id, c.ship_at - (c.tpl_ship_at - r.finished_at) * ${STRETCH} - interval '3 hours' AS at,
            nextval('stage_results_id_seq') AS fail_id, nextval('nonconformances_id_seq') AS ncr_id,
            nextval('nonconformance_number_seq') AS num
       FROM bench_item_map m JOIN bench_copy c USING (k)
       JOIN bench_tpl_results r ON r.item_id = m.old_id AND r.stage_id = $3
      WHERE m.k BETWEEN $1 AND $2 AND m.k % ${every} = 7 % ${every}`,
    range,
  );
  await client.query(
    `INSERT INTO stage_results (id, item_id, stage_id, station_id, operator_id, gauge_id, finished_at, verdict,
                                idempotency_key, notes, created_at)
     SELECT fail_id, item_id, stage_id, station_id, operator_id, gauge_id, at, 'fail', gen_random_uuid(), '', at
       FROM ncr_pick`,
  );
  // the first bore diameter reads two steps above its upper limit; everything else as in the template
  await client.query(
    `CREATE TEMP TABLE ncr_failing ON COMMIT DROP AS
     SELECT DISTINCT ON (t.stage_result_id) t.id, t.stage_result_id, ch.id AS characteristic_id, ch.code, ch.name,
            ch.defect_code, t.position, t.unit,
            coalesce(tr.upper_limit, tr.nominal + tr.plus_tol) AS upper, coalesce(tr.lower_limit, tr.nominal - tr.minus_tol) AS lower,
            coalesce(tr.upper_limit, tr.nominal + tr.plus_tol) + 2 * tr.resolution AS value, t.rule_version
       FROM bench_tpl_readings t JOIN characteristics ch ON ch.id = t.characteristic_id
       JOIN tolerance_rules tr ON tr.id = t.tolerance_rule_id
      WHERE ch.kind = 'variable' AND tr.limit_type IN ('nominal', 'range')
      ORDER BY t.stage_result_id, t.id`,
  );
  await client.query(
    `INSERT INTO readings (stage_result_id, characteristic_id, position, value, passed, location_note, unit, verdict,
                           tolerance_rule_id, rule_version, gauge_id, created_at)
     SELECT p.fail_id, t.characteristic_id, t.position, CASE WHEN f.id IS NULL THEN t.value ELSE f.value END, t.passed,
            t.location_note, t.unit, CASE WHEN f.id IS NULL THEN t.verdict ELSE 'fail' END, t.tolerance_rule_id,
            t.rule_version, t.gauge_id, p.at
       FROM ncr_pick p JOIN bench_tpl_readings t ON t.stage_result_id = p.tpl_result_id
       LEFT JOIN ncr_failing f ON f.id = t.id`,
  );
  await client.query(
    `INSERT INTO nonconformances (id, number, item_id, stage_result_id, stage_id, defect_code_id, severity, state,
                                  description, failing, disposition, disposition_reason, rework_stage_id, raised_by_id,
                                  closed_at, created_at, updated_at, item_status_before, decided_by_id, decided_at)
     SELECT p.ncr_id, 'NC-' || extract(year FROM p.at) || '-' || lpad(p.num::text, greatest(5, length(p.num::text)), '0'),
            p.item_id, p.fail_id, p.stage_id, d.id, 'major',
            CASE WHEN NOT p.pool THEN 'closed' WHEN (p.k / ${every}) % 2 = 0 THEN 'raised' ELSE 'in_review' END,
            s.name || ' failed on ' || p.serial || ': ' || f.name || ' at ' || f.position || ': ' || f.value || ' ' || f.unit
              || ' is above the upper limit ' || f.upper || ' ' || f.unit || '.',
            jsonb_build_array(jsonb_build_object('characteristic', f.code, 'name', f.name, 'position', f.position,
              'positionLabel', f.position, 'value', f.value, 'passed', NULL, 'unit', f.unit, 'lower', f.lower,
              'upper', f.upper, 'reason', f.value || ' ' || f.unit || ' is above the upper limit ' || f.upper || ' ' || f.unit,
              'ruleVersion', f.rule_version, 'location', NULL)),
            CASE WHEN p.pool THEN NULL ELSE 'rework' END, CASE WHEN p.pool THEN NULL ELSE 'Re-hone to the next size.' END,
            CASE WHEN p.pool THEN NULL ELSE p.stage_id END, p.operator_id,
            CASE WHEN p.pool THEN NULL ELSE p.at + interval '2 hours 50 minutes' END, p.at, p.at + interval '1 hour',
            'in_process', CASE WHEN p.pool THEN NULL ELSE q.id END,
            CASE WHEN p.pool THEN NULL ELSE p.at + interval '1 hour' END
       FROM ncr_pick p JOIN ncr_failing f ON f.stage_result_id = p.tpl_result_id
       JOIN stages s ON s.id = p.stage_id
       LEFT JOIN defect_codes d ON d.code = f.defect_code
       CROSS JOIN (SELECT id FROM users WHERE role = 'quality' ORDER BY id LIMIT 1) q`,
  );
  await client.query(
    `INSERT INTO nonconformance_transitions (nonconformance_id, from_state, to_state, actor_id, reason, created_at)
     SELECT n.id, x.from_state, x.to_state, CASE WHEN x.quality THEN q.id ELSE n.raised_by_id END, x.reason, n.created_at + x.after
       FROM nonconformances n JOIN ncr_pick p ON p.ncr_id = n.id
       CROSS JOIN (SELECT id FROM users WHERE role = 'quality' ORDER BY id LIMIT 1) q
       CROSS JOIN LATERAL (VALUES
         (NULL, 'raised', false, 'Raised by failing result ' || p.fail_id, interval '0'),
         ('raised', 'in_review', true, '', interval '40 minutes'),
         ('in_review', 'decided', true, 'Re-hone to the next size.', interval '1 hour'),
         ('decided', 'closed', false, 'Rework passed', interval '2 hours 50 minutes')
       ) AS x(from_state, to_state, quality, reason, after)
      WHERE x.to_state = 'raised' OR NOT p.pool OR (n.state = 'in_review' AND x.to_state = 'in_review')`,
  );
  await client.query(
    `INSERT INTO signatures (user_id, printed_name, meaning, entity, entity_id, signed_at, created_at)
     SELECT q.id, q.name, 'Rework on ' || n.number, 'nonconformance', n.number, n.decided_at, n.decided_at
       FROM nonconformances n JOIN ncr_pick p ON p.ncr_id = n.id AND NOT p.pool
       JOIN users q ON q.id = n.decided_by_id`,
  );
  await client.query("UPDATE items SET status = 'on_hold' WHERE id IN (SELECT item_id FROM ncr_pick WHERE pool)");
}

export function historyFaker() {
  const faker = new Faker({ locale: [en] });
  faker.seed(FAKER_SEED);
  return faker;
}
