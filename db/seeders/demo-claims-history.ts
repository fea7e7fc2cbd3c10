import { Faker, en } from '@faker-js/faker';
import { addDays, format } from 'date-fns';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { recordAudit, systemCtx } from '../../server/audit.js';
import { dateIn, warrantyCover } from '../../shared/domain/warranty.js';
import { makeSerial } from '../../shared/domain/serial.js';
import type { PartKind } from '../../shared/schemas/reference.js';
import { CLAIM_DECISION_LABELS, type ClaimDecision } from '../../shared/schemas/warranty.js';
import { PLANT } from './plant.js';

/**
 * A year of shipped units for the demo, so the warranty analysis shows something real on first
 * start. Each is a copy of the unit the demo itself built and shipped through the services (its
 * core, parts, results, readings with their rule versions and gauges, lots and shipment), written
 * in set-based statements with new serials and times shifted back, as bench/history.ts writes a
 * plant's history at scale. Every copy is marked `demoHistory` on its items, and the claims on
 * them `demo`.
 *
 * So that the rates and the Weibull plot have a story: units ship evenly over the last year; one
 * core in four was bought rather than returned, grades vary; a quarter of the results were
 * recorded by the supervisor and a third of the bores read with the second bore gauge; every 25
 * units share their purchased lots. Times to failure are drawn from a Weibull distribution (shape
 * 1.6, scale 90 months: invented), except for units built with one batch of pistons (scale 20
 * months), and a unit whose time comes before its age today has a claim — torn down, decided and
 * closed, or still open when recent. A few claims found no trouble or an installation fault.
 */

const UNITS = 300;
const UNITS_PER_LOT = 25;
const BAD_LOT_GROUP = 4;
const FAKER_SEED = 20261204;
const DAYS_PER_MONTH = 365.25 / 12;

export const DEMO_CAUSE_CODES = [
  { code: 'BORE', description: 'Bore scuffed or worn past its limit', countsAsFailure: true },
  { code: 'PISTON', description: 'Piston or ring failure (purchased part)', countsAsFailure: true },
  { code: 'GASKET', description: 'Head gasket or sealing face leak', countsAsFailure: true },
  { code: 'BEARING', description: 'Main or rod bearing distress', countsAsFailure: true },
];

const SYMPTOMS: Record<string, string[]> = {
  BORE: ['Blue smoke and oil use over a litre per 1,000 km', 'Low compression on one cylinder, oil in the plugs'],
  PISTON: ['Knock from the bottom end under load, oil consumption rising', 'Misfire and blow-by at the breather'],
  GASKET: [
    'Coolant loss with no visible leak, white smoke at start',
    'Overheats under load, bubbles in the header tank',
  ],
  BEARING: ['Low oil pressure warning when hot, rumble at idle'],
  NTF: ['Customer reports a tick at idle; could not reproduce', 'Oil light came on once, pressure normal since'],
  INSTALL: [
    'Overheated after fitting; radiator found half blocked',
    'Oil starvation: sump filled with the wrong grade',
  ],
};
const INSTALLERS = [
  'Harrow Lane Motors',
  'Ostrander Diesel Service',
  'Coldwater Fleet Workshop',
  'Tillery & Sons Garage',
  'Marsh End Truck Repair',
];

type Claim = {
  k: number;
  cause: string;
  counts: boolean;
  concerns: 'block' | 'cylinder_head' | 'unit' | 'lot';
  failedOn: string;
  km: number;
  state: 'received' | 'torn_down' | 'closed';
};

const q = <T extends object>(s: Sequelize, t: Transaction, sql: string, replacements: Record<string, unknown> = {}) =>
  s.query<T>(sql, { type: QueryTypes.SELECT, replacements, transaction: t });

export async function seedDemoClaimsHistory(
  sequelize: Sequelize,
  transaction: Transaction,
): Promise<Record<string, number>> {
  const faker = new Faker({ locale: [en] });
  faker.seed(FAKER_SEED);
  const random = (n: number) => faker.number.int({ min: 0, max: n - 1 });
  const [template] = await q<{ id: number; shipment_id: number; shipped_at: Date; months: number; km: number | null }>(
    sequelize,
    transaction,
    `SELECT u.id, s.id AS shipment_id, s.shipped_at, s.warranty_months AS months, s.warranty_km AS km
       FROM items u JOIN shipments s ON s.unit_item_id = u.id AND s.returned_at IS NULL
      WHERE u.kind = 'long_block' AND u.status = 'shipped' ORDER BY u.id LIMIT 1`,
  );
  if (!template) return {};
  const items = await q<{ id: number; kind: PartKind }>(
    sequelize,
    transaction,
    `SELECT i.id, i.kind FROM items i WHERE i.id = :u
     UNION SELECT c.id, c.kind FROM item_links l JOIN items c ON c.id = l.child_item_id
      WHERE l.parent_item_id = :u AND l.link_type = 'installed_in' AND l.removed_at IS NULL
     UNION SELECT o.id, o.kind FROM item_links l JOIN item_links h ON h.child_item_id = l.child_item_id
       AND h.link_type = 'harvested_from' JOIN items o ON o.id = h.parent_item_id
      WHERE l.parent_item_id = :u AND l.link_type = 'installed_in' AND l.removed_at IS NULL`,
    { u: template.id },
  );
  const people = await q<{ id: number; role: string; name: string }>(
    sequelize,
    transaction,
    `SELECT DISTINCT ON (role) id, role, name FROM users WHERE role IN ('supervisor','receiving','operator','warranty')
      ORDER BY role, id`,
  );
  const who = (role: string) => people.find((p) => p.role === role)!;
  const customers = (await q<{ id: number }>(sequelize, transaction, 'SELECT id FROM customers ORDER BY id')).map(
    (c) => c.id,
  );
  const [supplier] = await q<{ id: number }>(
    sequelize,
    transaction,
    'SELECT id FROM suppliers ORDER BY id OFFSET 3 LIMIT 1',
  );
  const gauges = await q<{ id: number; code: string }>(
    sequelize,
    transaction,
    "SELECT id, code FROM gauges WHERE code IN ('BG-014','BG-009')",
  );
  const serials = new Set(
    (await q<{ serial: string }>(sequelize, transaction, 'SELECT serial FROM items')).map((r) => r.serial),
  );

  // the copies: ship times spread evenly over the last year, oldest first
  const now = Date.now();
  const copies = Array.from({ length: UNITS }, (_, i) => {
    const k = i + 1;
    const shipAt = new Date(now - (UNITS - i) * (365 / UNITS) * 86_400_000);
    const purchased = random(4) === 0;
    return {
      k,
      shipAt,
      shift: (shipAt.getTime() - new Date(template.shipped_at).getTime()) / 1000,
      customer: customers[random(customers.length)]!,
      group: Math.floor(i / UNITS_PER_LOT),
      source: purchased ? 'purchased' : 'customer_return',
      grade: ['sound', 'sound', 'sound', 'workable', 'workable', 'doubtful'][random(6)]!,
      supervisor: random(4) === 0,
      altGauge: random(3) === 0,
    };
  });
  const [reserved] = await q<{ first: string }>(
    sequelize,
    transaction,
    "SELECT setval('items_id_seq', nextval('items_id_seq') + :n - 1) - :n + 1 AS first",
    { n: UNITS * items.length },
  );
  let nextId = Number(reserved!.first);
  const map: [number, number, number, string][] = [];
  for (const c of copies) {
    for (const it of items) {
      let serial: string;
      do serial = makeSerial(it.kind, random);
      while (serials.has(serial));
      serials.add(serial);
      map.push([c.k, it.id, nextId++, serial]);
    }
  }
  await sequelize.query(
    `CREATE TEMP TABLE hist_copy ON COMMIT DROP AS
       SELECT * FROM jsonb_to_recordset(CAST(:copies AS jsonb)) AS x(k int, "shipAt" timestamptz, shift float8,
              customer int, "group" int, source text, grade text, supervisor boolean, "altGauge" boolean);
     CREATE TEMP TABLE hist_map ON COMMIT DROP AS
       SELECT (e->>0)::int AS k, (e->>1)::int AS old_id, (e->>2)::int AS new_id, e->>3 AS serial
         FROM jsonb_array_elements(CAST(:map AS jsonb)) e;
     CREATE INDEX ON hist_map (old_id, k);`,
    { replacements: { copies: JSON.stringify(copies), map: JSON.stringify(map) }, transaction },
  );
  const at = (col: string) => `(${col} + make_interval(secs => c.shift))`;
  const run = (sql: string, replacements: Record<string, unknown> = {}) =>
    sequelize.query(sql, { replacements, transaction });
  await run(
    `INSERT INTO items (id, serial, kind, engine_family_id, status, route_id, current_stage_id, position_label, attributes,
                        created_by_id, created_at, updated_at)
     SELECT m.new_id, m.serial, i.kind, i.engine_family_id, i.status, i.route_id, i.current_stage_id, i.position_label,
            i.attributes || '{"demoHistory": true}', i.created_by_id, ${at('i.created_at')}, ${at('i.updated_at')}
       FROM hist_map m JOIN hist_copy c USING (k) JOIN items i ON i.id = m.old_id`,
  );
  await run(
    `INSERT INTO core_receipts (item_id, casting_number, id_number, source, customer_id, supplier_id, source_reference,
                                received_on, received_by_id, condition, grade, accepted, credit_decision, notes,
                                created_at, updated_at)
     SELECT m.new_id, r.casting_number, 'H' || m.new_id, c.source,
            CASE WHEN c.source = 'customer_return' THEN c.customer END,
            CASE WHEN c.source = 'purchased' THEN :supplier END,
            CASE WHEN c.source = 'customer_return' THEN 'RMA-' ELSE 'PO-' END || m.new_id,
            (${at('r.created_at')} AT TIME ZONE :tz)::date, r.received_by_id, r.condition, c.grade, true,
            CASE WHEN c.source = 'customer_return' THEN 'full' END, '', ${at('r.created_at')}, ${at('r.created_at')}
       FROM hist_map m JOIN hist_copy c USING (k) JOIN core_receipts r ON r.item_id = m.old_id`,
    { supplier: supplier?.id ?? null, tz: PLANT.timeZone },
  );
  await run(
    `INSERT INTO item_links (parent_item_id, child_item_id, link_type, created_by_id, created_at)
     SELECT p.new_id, m.new_id, l.link_type, l.created_by_id, ${at('l.created_at')}
       FROM hist_map m JOIN hist_copy c USING (k)
       JOIN item_links l ON l.child_item_id = m.old_id AND l.removed_at IS NULL
       JOIN hist_map p ON p.k = m.k AND p.old_id = l.parent_item_id`,
  );
  await run(
    `CREATE TEMP TABLE hist_results ON COMMIT DROP AS
     SELECT m.k, r.id AS old_id, nextval('stage_results_id_seq')::int AS new_id, m.new_id AS item_id,
            ${at('r.finished_at')} AS at
       FROM hist_map m JOIN hist_copy c USING (k) JOIN stage_results r ON r.item_id = m.old_id
      WHERE NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = r.id)`,
  );
  await run(
    `INSERT INTO stage_results (id, item_id, stage_id, station_id, operator_id, gauge_id, finished_at, verdict,
                                idempotency_key, notes, created_at)
     SELECT h.new_id, h.item_id, r.stage_id, r.station_id,
            CASE WHEN c.supervisor AND r.operator_id = :operator THEN :supervisorId ELSE r.operator_id END,
            CASE WHEN c."altGauge" AND r.gauge_id = :bg14 THEN :bg9 ELSE r.gauge_id END,
            h.at, r.verdict, gen_random_uuid(), r.notes, h.at
       FROM hist_results h JOIN hist_copy c USING (k) JOIN stage_results r ON r.id = h.old_id`,
    {
      operator: who('operator').id,
      supervisorId: who('supervisor').id,
      bg14: gauges.find((g) => g.code === 'BG-014')?.id ?? 0,
      bg9: gauges.find((g) => g.code === 'BG-009')?.id ?? 0,
    },
  );
  await run(
    `INSERT INTO readings (stage_result_id, characteristic_id, position, value, passed, location_note, unit, verdict,
                           tolerance_rule_id, rule_version, gauge_id, created_at)
     SELECT h.new_id, rd.characteristic_id, rd.position, rd.value, rd.passed, rd.location_note, rd.unit, rd.verdict,
            rd.tolerance_rule_id, rd.rule_version,
            CASE WHEN c."altGauge" AND rd.gauge_id = :bg14 THEN :bg9 ELSE rd.gauge_id END, h.at
       FROM hist_results h JOIN hist_copy c USING (k) JOIN readings rd ON rd.stage_result_id = h.old_id`,
    {
      bg14: gauges.find((g) => g.code === 'BG-014')?.id ?? 0,
      bg9: gauges.find((g) => g.code === 'BG-009')?.id ?? 0,
    },
  );
  // lots: every 25 units share a set, with lot codes of their own
  await run(
    `CREATE TEMP TABLE hist_lots ON COMMIT DROP AS
     SELECT g."group", pl.id AS old_id, pl.part_kind,
            'H' || lpad(g."group"::text, 2, '0') || '-' || upper(substr(pl.part_kind, 1, 3)) || lpad((pl.id % 97)::text, 2, '0') AS lot_code
       FROM (SELECT DISTINCT "group" FROM hist_copy) g
       CROSS JOIN unit_lots ul JOIN part_lots pl ON pl.id = ul.part_lot_id
      WHERE ul.unit_item_id = :u;
     INSERT INTO part_lots (supplier_id, part_kind, part_number, lot_code, description, attributes, status)
     SELECT pl.supplier_id, pl.part_kind, pl.part_number, h.lot_code, pl.description, pl.attributes, 'usable'
       FROM hist_lots h JOIN part_lots pl ON pl.id = h.old_id;
     INSERT INTO unit_lots (unit_item_id, part_lot_id, quantity, created_by_id, created_at)
     SELECT m.new_id, npl.id, ul.quantity, ul.created_by_id, ${at('ul.created_at')}
       FROM hist_copy c JOIN hist_map m ON m.k = c.k AND m.old_id = :u
       JOIN unit_lots ul ON ul.unit_item_id = :u
       JOIN hist_lots h ON h."group" = c."group" AND h.old_id = ul.part_lot_id
       JOIN part_lots pl ON pl.id = ul.part_lot_id
       JOIN part_lots npl ON npl.supplier_id = pl.supplier_id AND npl.part_number = pl.part_number AND npl.lot_code = h.lot_code;`,
    { u: template.id },
  );
  await run(
    `INSERT INTO shipments (unit_item_id, customer_id, reference, carrier, shipped_at, released_by_id, warranty_ends_on,
                            warranty_km, ship_date, warranty_months, created_at)
     SELECT m.new_id, c.customer, 'SO-H' || lpad(c.k::text, 4, '0'), s.carrier, c."shipAt", s.released_by_id,
            (((c."shipAt" AT TIME ZONE :tz)::date) + make_interval(months => s.warranty_months))::date,
            s.warranty_km, (c."shipAt" AT TIME ZONE :tz)::date, s.warranty_months, c."shipAt"
       FROM hist_copy c JOIN hist_map m ON m.k = c.k AND m.old_id = :u JOIN shipments s ON s.id = :s`,
    { u: template.id, s: template.shipment_id, tz: PLANT.timeZone },
  );

  const claims = drawClaims(faker, copies);
  await insertClaims(sequelize, transaction, claims, {
    template: template.id,
    months: template.months,
    km: template.km,
    who,
  });
  const counts = {
    units: UNITS,
    claims: claims.length,
    failures: claims.filter((c) => c.counts).length,
    open: claims.filter((c) => c.state !== 'closed').length,
  };
  // fresh statistics, so the analysis's first run is not planned for empty tables
  await run(`ANALYZE items, item_links, core_receipts, stage_results, readings, part_lots, unit_lots, shipments,
               warranty_claims, warranty_findings, signatures`);
  await recordAudit(systemCtx('seed'), transaction, {
    action: 'demo.history_seeded',
    entity: 'plant',
    entityId: 'demo-history',
    after: { ...counts, fakerSeed: FAKER_SEED, note: 'Invented history: copies of the demo unit, marked demoHistory' },
  });
  return counts;
}

/** Who fails when: a Weibull draw per unit (inverse of F), and a few claims that found no failure. */
function drawClaims(faker: Faker, copies: { k: number; shipAt: Date; group: number }[]): Claim[] {
  const today = dateIn(PLANT.timeZone, new Date());
  const out: Claim[] = [];
  for (const c of copies) {
    const ageDays = (Date.now() - c.shipAt.getTime()) / 86_400_000;
    const bad = c.group === BAD_LOT_GROUP;
    const u = faker.number.float({ min: 0, max: 1 });
    const t = (bad ? 20 : 90) * (-Math.log1p(-u)) ** (1 / 1.6) * DAYS_PER_MONTH;
    const noFault = faker.number.int({ min: 0, max: 80 }) === 0;
    const days = noFault ? faker.number.float({ min: 0.2, max: 0.9 }) * ageDays : t;
    if (days >= ageDays - 3) continue;
    const failedOn = format(addDays(c.shipAt, Math.floor(days)), 'yyyy-MM-dd');
    if (failedOn > today) continue;
    const cause = noFault
      ? faker.helpers.arrayElement(['NTF', 'INSTALL'])
      : bad
        ? 'PISTON'
        : faker.helpers.arrayElement(['BORE', 'BORE', 'GASKET', 'BEARING']);
    out.push({
      k: c.k,
      cause,
      counts: !noFault,
      concerns:
        cause === 'PISTON'
          ? 'lot'
          : cause === 'BORE' || cause === 'BEARING'
            ? 'block'
            : cause === 'GASKET'
              ? 'cylinder_head'
              : 'unit',
      failedOn,
      km: Math.round((days / DAYS_PER_MONTH) * faker.number.int({ min: 1800, max: 4200 })),
      // the last few weeks' claims are still being worked
      state: ageDays - days < 12 ? 'received' : ageDays - days < 25 ? 'torn_down' : 'closed',
    });
  }
  return out;
}

async function insertClaims(
  sequelize: Sequelize,
  transaction: Transaction,
  claims: Claim[],
  ctx: { template: number; months: number; km: number | null; who: (role: string) => { id: number; name: string } },
) {
  const faker = new Faker({ locale: [en] });
  faker.seed(FAKER_SEED + 1);
  for (const cause of DEMO_CAUSE_CODES) {
    await sequelize.query(
      `INSERT INTO cause_codes (code, description, counts_as_failure) VALUES (:code, :description, :countsAsFailure)
       ON CONFLICT (code) DO NOTHING`,
      { replacements: cause, transaction },
    );
  }
  const desk = ctx.who('warranty');
  const dock = ctx.who('receiving');
  const floor = ctx.who('operator');
  for (const c of claims) {
    const [unit] = await q<{ id: number; serial: string; shipment_id: number; ship_date: string; customer_id: number }>(
      sequelize,
      transaction,
      `SELECT m.new_id AS id, m.serial, s.id AS shipment_id, to_char(s.ship_date, 'YYYY-MM-DD') AS ship_date, s.customer_id
         FROM hist_map m JOIN shipments s ON s.unit_item_id = m.new_id WHERE m.k = :k AND m.old_id = :u`,
      { k: c.k, u: ctx.template },
    );
    const cover = warrantyCover({ startsOn: unit!.ship_date, months: ctx.months, km: ctx.km }, c.failedOn, {
      km: c.km,
    });
    const [seq] = await q<{ n: string }>(
      sequelize,
      transaction,
      "SELECT nextval('warranty_claim_number_seq')::text AS n",
    );
    const number = `WC-${c.failedOn.slice(0, 4)}-${seq!.n.padStart(5, '0')}`;
    const logged = new Date(`${c.failedOn}T15:00:00Z`);
    const step = (days: number) => new Date(logged.getTime() + days * 86_400_000);
    const returned = c.state !== 'received' || (faker.datatype.boolean() && step(4).getTime() < Date.now());
    const torn = c.state !== 'received';
    const closed = c.state === 'closed';
    const decision: ClaimDecision | null = !closed
      ? null
      : c.counts
        ? cover.covered
          ? 'accepted'
          : 'goodwill'
        : 'rejected';
    const reason =
      decision === 'accepted'
        ? 'Teardown found a fault in our work or parts; covered by the warranty.'
        : decision === 'goodwill'
          ? 'Our fault, though outside the terms: parts at our cost.'
          : decision === 'rejected'
            ? c.cause === 'NTF'
              ? 'No trouble found on teardown or on the stand.'
              : 'The damage came from the installation, not the unit.'
            : null;
    const [claim] = await q<{ id: number }>(
      sequelize,
      transaction,
      `INSERT INTO warranty_claims (number, unit_item_id, shipment_id, customer_id, customer_reference, failed_on, distance_km,
                                    symptom, installer, covered, coverage_reason, warranty_ends_on, state, unit_returned_at,
                                    returned_by_id, torn_down_at, torn_down_by_id, decision, decision_reason, decided_by_id,
                                    decided_at, closed_by_id, closed_at, opened_by_id, demo, created_at, updated_at)
       VALUES (:number, :unit, :shipment, :customer, :ref, :failedOn, :km, :symptom, :installer, :covered, :coverageReason,
               :endsOn, :state, :returnedAt, :returnedBy, :tornAt, :tornBy, :decision, :reason, :decidedBy, :decidedAt,
               :closedBy, :closedAt, :desk, true, :logged, :logged)
       RETURNING id`,
      {
        number,
        unit: unit!.id,
        shipment: unit!.shipment_id,
        customer: unit!.customer_id,
        ref: `RMA-${faker.string.numeric(5)}`,
        failedOn: c.failedOn,
        km: c.km,
        symptom: faker.helpers.arrayElement(SYMPTOMS[c.cause]!),
        installer: faker.helpers.arrayElement(INSTALLERS),
        covered: cover.covered,
        coverageReason: cover.reason,
        endsOn: cover.endsOn,
        state: c.state === 'closed' ? 'closed' : c.state,
        returnedAt: returned ? step(4) : null,
        returnedBy: returned ? dock.id : null,
        tornAt: torn ? step(7) : null,
        tornBy: torn ? floor.id : null,
        decision,
        reason,
        decidedBy: closed ? desk.id : null,
        decidedAt: closed ? step(10) : null,
        closedBy: closed ? desk.id : null,
        closedAt: closed ? step(11) : null,
        desk: desk.id,
        logged,
      },
    );
    const sign = (who: { id: number; name: string }, meaning: string, when: Date, why: string) =>
      sequelize.query(
        `INSERT INTO signatures (user_id, printed_name, meaning, reason, entity, entity_id, signed_at, created_at)
         VALUES (:id, :name, :meaning, :why, 'warranty_claim', :number, :when, :when)`,
        {
          replacements: { id: who.id, name: who.name, meaning: `Demo history: ${meaning}`, why, number, when },
          transaction,
        },
      );
    await sign(desk, `Logged warranty claim ${number} on ${unit!.serial}`, logged, 'Invented with the demo plant');
    if (returned) {
      await sequelize.query('UPDATE shipments SET returned_at = :at WHERE id = :id', {
        replacements: { at: step(4), id: unit!.shipment_id },
        transaction,
      });
      await sequelize.query(`UPDATE items SET status = 'returned' WHERE id = :id`, {
        replacements: { id: unit!.id },
        transaction,
      });
      await sign(dock, `Received ${unit!.serial} back under claim ${number}`, step(4), 'Invented with the demo plant');
    }
    if (!torn) continue;
    const [subject] = await q<{ item_id: number | null; lot_id: number | null }>(
      sequelize,
      transaction,
      c.concerns === 'lot'
        ? `SELECT NULL::int AS item_id, pl.id AS lot_id FROM unit_lots ul JOIN part_lots pl ON pl.id = ul.part_lot_id
            WHERE ul.unit_item_id = :unit AND pl.part_kind = 'pistons'`
        : c.concerns === 'unit'
          ? 'SELECT :unit::int AS item_id, NULL::int AS lot_id'
          : `SELECT i.id AS item_id, NULL::int AS lot_id FROM item_links l JOIN items i ON i.id = l.child_item_id
              WHERE l.parent_item_id = :unit AND l.link_type = 'installed_in' AND i.kind = :kind ORDER BY i.id LIMIT 1`,
      { unit: unit!.id, kind: c.concerns },
    );
    await sequelize.query(
      `INSERT INTO warranty_findings (claim_id, item_id, part_lot_id, cause_code_id, description, recorded_by_id, created_at)
       SELECT :claim, :item, :lot, id, :description, :by, :at FROM cause_codes WHERE code = :cause`,
      {
        replacements: {
          claim: claim!.id,
          item: c.concerns === 'lot' ? null : (subject?.item_id ?? unit!.id),
          lot: c.concerns === 'lot' ? subject!.lot_id : null,
          cause: c.cause,
          description: `${DEMO_CAUSE_CODES.find((d) => d.code === c.cause)?.description ?? (c.cause === 'NTF' ? 'Ran clean on the stand; nothing found on strip-down' : 'Damage consistent with the installation')} (invented for the demo).`,
          by: floor.id,
          at: step(7),
        },
        transaction,
      },
    );
    const reasonOut = `Taken out at the teardown of warranty claim ${number}`;
    await sequelize.query(
      `UPDATE items SET status = 'returned' WHERE id IN (SELECT child_item_id FROM item_links
         WHERE parent_item_id = :unit AND link_type = 'installed_in' AND removed_at IS NULL) AND status = 'installed';
       UPDATE item_links SET removed_at = :at, removed_reason = :why
        WHERE parent_item_id = :unit AND link_type = 'installed_in' AND removed_at IS NULL;
       UPDATE items SET status = 'torn_down' WHERE id = :unit;`,
      { replacements: { unit: unit!.id, at: step(7), why: reasonOut }, transaction },
    );
    await sign(
      floor,
      `Recorded the teardown of ${unit!.serial} for claim ${number}`,
      step(7),
      'Invented with the demo plant',
    );
    if (closed) {
      await sign(desk, `Decided claim ${number}: ${CLAIM_DECISION_LABELS[decision!].toLowerCase()}`, step(10), reason!);
      await sign(desk, `Closed claim ${number}`, step(11), 'Invented with the demo plant');
    }
  }
}
