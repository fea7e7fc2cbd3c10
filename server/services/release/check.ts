import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { BlockingReason, ReleaseCheckJson } from '../../../shared/schemas/release.js';
import { PART_KIND_LABELS } from '../../../shared/schemas/reference.js';
import { invalid } from '../../errors.js';
import { Shipment, type Item } from '../../models/index.js';
import { currentResultSql } from '../results/current.js';

/**
 * The release gate. A long block may ship only when it and every part in its genealogy has a
 * current passing result at every required stage of its route (a failure accepted by a closed
 * use-as-is NCR counts as passed), no NCR on any of them or on a lot that went in is open, nothing
 * in it is scrapped or on hold, no lot in it is returned, scrapped or on hold, and the run test
 * passed after the last part was fitted. It looks at the state of what is in the unit, not only at
 * open NCRs: a closed NCR can leave a scrapped head or a returned lot behind.
 *
 * Release locks the unit's row and checks again inside the lock. Every path that can make a unit
 * unreleasable locks the units it reaches first (unit-locks.ts), so nothing slips in between.
 */

type Row = { id: number; serial: string; kind: string; status: string; family_id: number };

/** The unit, its installed parts and the cores they came from: one query, whatever the unit holds. */
export async function genealogyOf(sequelize: Sequelize, unitId: number, transaction?: Transaction) {
  return sequelize.query<Row & { depth: number }>(
    `WITH RECURSIVE g(id, depth) AS (
       SELECT :unitId::int, 0
       UNION
       SELECT CASE WHEN g.depth = 0 THEN l.child_item_id ELSE l.parent_item_id END, g.depth + 1
         FROM item_links l JOIN g
           ON (g.depth = 0 AND l.parent_item_id = g.id AND l.link_type = 'installed_in')
           OR (g.depth = 1 AND l.child_item_id = g.id AND l.link_type = 'harvested_from')
        WHERE l.removed_at IS NULL
     )
     SELECT DISTINCT i.id, i.serial, i.kind, i.status, i.engine_family_id AS family_id, g.depth
       FROM g JOIN items i ON i.id = g.id`,
    { type: QueryTypes.SELECT, replacements: { unitId }, transaction },
  );
}

const itemLink = (serial: string) => `/items/${serial}`;

const LOT_STATUS_WORDS: Record<string, string> = {
  returned: 'was returned to the supplier',
  scrapped: 'was scrapped',
  on_hold: 'is on hold',
};

/** What the gate has found so far: the reasons it refuses, and every check made. */
type Gate = { reasons: BlockingReason[]; checks: ReleaseCheckJson['checks'] };
type Genealogy = Awaited<ReturnType<typeof genealogyOf>>;
type Gap = {
  item_id: number;
  stage_code: string;
  stage_name: string;
  run_test: boolean;
  verdict: string | null;
  accepted: boolean;
};
type OpenNcr = { number: string; item_id: number | null; lot_code: string | null };

/** A failure accepted by a closed use-as-is NCR counts as passed. */
const open = (g: Gap) => !(g.verdict === 'fail' && g.accepted);

export async function releaseCheck(
  sequelize: Sequelize,
  unit: Item,
  transaction?: Transaction,
): Promise<ReleaseCheckJson> {
  const gate: Gate = { reasons: [], checks: [] };
  if (unit.kind !== 'long_block') {
    throw invalid(`${unit.serial} is a ${PART_KIND_LABELS[unit.kind].toLowerCase()}: only a long block is released.`);
  }
  const items = await genealogyOf(sequelize, unit.id, transaction);
  const gaps = await stagesWithoutPass(sequelize, gate, unit, items, transaction);
  const openNcrs = await ncrsOpen(sequelize, gate, unit, items, transaction);
  partsOutOfUse(gate, items, openNcrs);
  await lotsOutOfUse(sequelize, gate, unit, transaction);
  await runTestPassed(sequelize, gate, unit, gaps, transaction);
  await notShippedOrReturned(gate, unit, transaction);
  const { reasons, checks } = gate;
  return { serial: unit.serial, releasable: reasons.length === 0, reasons, checks };
}

/** Required stages without a current pass, in one query for the whole genealogy. */
async function stagesWithoutPass(
  sequelize: Sequelize,
  gate: Gate,
  unit: Item,
  items: Genealogy,
  transaction?: Transaction,
) {
  const manufactured = items.filter((i) => i.depth <= 1);
  const serialOf = new Map(items.map((i) => [i.id, i.serial]));
  const gaps = await sequelize.query<Gap>(
    `SELECT i.id AS item_id, s.code AS stage_code, s.name AS stage_name, s.run_test, cur.verdict,
            EXISTS (SELECT 1 FROM nonconformances n WHERE n.stage_result_id = cur.id AND n.state = 'closed'
                     AND n.disposition = 'use_as_is') AS accepted
       FROM items i
       JOIN routes ro ON ro.id = i.route_id
       JOIN route_stages rs ON rs.route_id = ro.id AND rs.required
       JOIN stages s ON s.id = rs.stage_id
       LEFT JOIN LATERAL (${currentResultSql({
         columns: 'r.id, r.verdict',
         itemId: 'i.id',
         stageId: 's.id',
         // the unit's own stages count only when recorded after its last part went in
         also: `(i.id <> :unit OR r.finished_at >= (SELECT max(l.created_at) FROM item_links l
                   WHERE l.parent_item_id = :unit AND l.link_type = 'installed_in' AND l.removed_at IS NULL))`,
       })}) cur ON true
      WHERE i.id IN (:ids) AND (cur.verdict IS DISTINCT FROM 'pass')
      ORDER BY i.id, rs.position`,
    { type: QueryTypes.SELECT, replacements: { ids: manufactured.map((i) => i.id), unit: unit.id }, transaction },
  );
  for (const g of gaps) {
    if (!open(g)) continue;
    const serial = serialOf.get(g.item_id)!;
    gate.reasons.push({
      code: g.run_test ? 'run_test' : g.verdict ? 'stage_failed' : 'stage_missing',
      message:
        g.verdict === 'fail'
          ? `${serial}: ${g.stage_name} failed and has not passed since.`
          : `${serial}: ${g.stage_name} has no result yet.`,
      serial,
      link: itemLink(serial),
    });
  }
  gate.checks.push({
    label: 'Every required stage of the unit and its parts has a current passing result',
    ok: !gaps.some(open),
    link: null,
  });
  return gaps;
}

async function ncrsOpen(sequelize: Sequelize, gate: Gate, unit: Item, items: Genealogy, transaction?: Transaction) {
  const ids = items.map((i) => i.id);
  const serialOf = new Map(items.map((i) => [i.id, i.serial]));
  const openNcrs = await sequelize.query<OpenNcr>(
    `SELECT n.number, n.item_id, pl.lot_code
       FROM nonconformances n LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
      WHERE n.state IN ('raised','in_review','decided')
        AND (n.item_id IN (:ids) OR n.part_lot_id IN (SELECT part_lot_id FROM unit_lots WHERE unit_item_id = :unit))
      ORDER BY n.id`,
    { type: QueryTypes.SELECT, replacements: { ids, unit: unit.id }, transaction },
  );
  for (const n of openNcrs) {
    const serial = n.item_id ? serialOf.get(n.item_id)! : null;
    gate.reasons.push({
      code: n.item_id ? 'ncr_open' : 'lot_ncr_open',
      message: n.item_id
        ? `${n.number} is open on ${serial}.`
        : `${n.number} is open on lot ${n.lot_code}, which went into this unit.`,
      serial,
      link: `/ncrs/${n.number}`,
    });
  }
  gate.checks.push({
    label: 'No NCR is open on the unit, its parts, their cores or its lots',
    ok: !openNcrs.length,
    link: null,
  });
  return openNcrs;
}

/** The state of what is in it: a closed NCR can leave a scrapped part behind. */
function partsOutOfUse(gate: Gate, items: Genealogy, openNcrs: OpenNcr[]) {
  const held = new Set(openNcrs.map((n) => n.item_id));
  const badParts = items.filter(
    (i) => (i.depth <= 1 && i.status === 'scrapped') || (i.status === 'on_hold' && !held.has(i.id)),
  );
  for (const p of badParts) {
    const what = PART_KIND_LABELS[p.kind as keyof typeof PART_KIND_LABELS].toLowerCase();
    gate.reasons.push({
      code: p.status === 'scrapped' ? 'part_scrapped' : 'part_on_hold',
      message:
        p.status === 'scrapped'
          ? `${p.serial} (${what}) has been scrapped: replace it before the unit ships.`
          : `${p.serial} (${what}) is on hold.`,
      serial: p.serial,
      link: itemLink(p.serial),
    });
  }
  gate.checks.push({ label: 'Nothing in the unit is scrapped or on hold', ok: !badParts.length, link: null });
}

/** A closed NCR can leave a returned lot behind too. */
async function lotsOutOfUse(sequelize: Sequelize, gate: Gate, unit: Item, transaction?: Transaction) {
  const lots = await sequelize.query<{ lot_code: string; status: string; kind: string }>(
    `SELECT pl.lot_code, pl.status, pl.part_kind AS kind FROM unit_lots ul JOIN part_lots pl ON pl.id = ul.part_lot_id
      WHERE ul.unit_item_id = :unit AND pl.status <> 'usable' ORDER BY ul.id`,
    { type: QueryTypes.SELECT, replacements: { unit: unit.id }, transaction },
  );
  for (const l of lots) {
    gate.reasons.push({
      code: 'lot_unusable',
      message: `Lot ${l.lot_code} (${l.kind.replace(/_/g, ' ')}) in this unit ${LOT_STATUS_WORDS[l.status] ?? `is ${l.status}`}: replace those parts before it ships.`,
      serial: null,
      link: `/lots/${encodeURIComponent(l.lot_code)}`,
    });
  }
  gate.checks.push({ label: 'Every lot in the unit is usable', ok: !lots.length, link: null });
}

/**
 * A plant names its own stages: the run test is the required stage its route marks as one, and a
 * route without one cannot release (a unit is not shipped untested because a route forgot it).
 */
async function runTestPassed(sequelize: Sequelize, gate: Gate, unit: Item, gaps: Gap[], transaction?: Transaction) {
  const [marked] = await sequelize.query<{ any: boolean }>(
    `SELECT EXISTS (SELECT 1 FROM route_stages rs JOIN stages s ON s.id = rs.stage_id
                     WHERE rs.route_id = :route AND rs.required AND s.run_test) AS any`,
    { type: QueryTypes.SELECT, replacements: { route: unit.routeId ?? 0 }, transaction },
  );
  if (!marked?.any) {
    gate.reasons.push({
      code: 'run_test',
      message: `${unit.serial}: its route has no required stage marked as the unit's run test; quality marks one on the Process page before it can ship.`,
      serial: unit.serial,
      link: itemLink(unit.serial),
    });
  }
  const runTestOk = !!marked?.any && !gaps.some((g) => g.item_id === unit.id && g.run_test && open(g));
  gate.checks.push({ label: 'The run test passed', ok: runTestOk, link: itemLink(unit.serial) });
}

async function notShippedOrReturned(gate: Gate, unit: Item, transaction?: Transaction) {
  const live = await Shipment.findOne({ where: { unitItemId: unit.id, returnedAt: null }, transaction });
  if (live) {
    gate.reasons.unshift({
      code: 'shipped',
      message: `${unit.serial} has already shipped (${live.reference}).`,
      serial: unit.serial,
      link: itemLink(unit.serial),
    });
  }
  gate.checks.push({ label: 'Not already shipped', ok: !live, link: null });
  // back from the field under a warranty claim: it ships again only once rebuilt (its shipment ended)
  if (unit.status === 'returned') {
    gate.reasons.unshift({
      code: 'returned',
      message: `${unit.serial} came back from the field under a warranty claim: it waits for its teardown.`,
      serial: unit.serial,
      link: itemLink(unit.serial),
    });
  }
}
