import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { dateIn, warrantyCover, warrantyEndsOn } from '../../shared/domain/warranty.js';
import {
  RELEASE_MEANING,
  type BlockingReason,
  type ReleaseBody,
  type ReleaseCheckJson,
  type ShipmentJson,
  type WarrantyJson,
} from '../../shared/schemas/build.js';
import { PART_KIND_LABELS } from '../../shared/schemas/reference.js';
import { recordAudit, type Ctx } from '../audit.js';
import { AppError, invalid } from '../errors.js';
import { appLink } from '../mail/links.js';
import { enqueueMail } from '../mail/messages.js';
import { Customer, EngineFamily, Item, Shipment, User } from '../models/index.js';
import { moveItemQuietly } from './item-moves.js';
import { findBySerial } from './items.js';
import { plantSettings } from './plant.js';
import { signWithPassword } from './signatures.js';
import { currentResultSql } from './results/current.js';

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

export async function releaseCheck(
  sequelize: Sequelize,
  unit: Item,
  transaction?: Transaction,
): Promise<ReleaseCheckJson> {
  const reasons: BlockingReason[] = [];
  const checks: ReleaseCheckJson['checks'] = [];
  if (unit.kind !== 'long_block') {
    throw invalid(`${unit.serial} is a ${PART_KIND_LABELS[unit.kind].toLowerCase()}: only a long block is released.`);
  }
  const items = await genealogyOf(sequelize, unit.id, transaction);
  const manufactured = items.filter((i) => i.depth <= 1);
  const ids = items.map((i) => i.id);
  const serialOf = new Map(items.map((i) => [i.id, i.serial]));

  // required stages without a current pass (one query for the whole genealogy)
  const gaps = await sequelize.query<{
    item_id: number;
    stage_code: string;
    stage_name: string;
    run_test: boolean;
    verdict: string | null;
    accepted: boolean;
  }>(
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
    if (g.verdict === 'fail' && g.accepted) continue;
    const serial = serialOf.get(g.item_id)!;
    reasons.push({
      code: g.run_test ? 'run_test' : g.verdict ? 'stage_failed' : 'stage_missing',
      message:
        g.verdict === 'fail'
          ? `${serial}: ${g.stage_name} failed and has not passed since.`
          : `${serial}: ${g.stage_name} has no result yet.`,
      serial,
      link: itemLink(serial),
    });
  }
  checks.push({
    label: 'Every required stage of the unit and its parts has a current passing result',
    ok: !gaps.some((g) => !(g.verdict === 'fail' && g.accepted)),
    link: null,
  });

  const openNcrs = await sequelize.query<{ number: string; item_id: number | null; lot_code: string | null }>(
    `SELECT n.number, n.item_id, pl.lot_code
       FROM nonconformances n LEFT JOIN part_lots pl ON pl.id = n.part_lot_id
      WHERE n.state IN ('raised','in_review','decided')
        AND (n.item_id IN (:ids) OR n.part_lot_id IN (SELECT part_lot_id FROM unit_lots WHERE unit_item_id = :unit))
      ORDER BY n.id`,
    { type: QueryTypes.SELECT, replacements: { ids, unit: unit.id }, transaction },
  );
  for (const n of openNcrs) {
    const serial = n.item_id ? serialOf.get(n.item_id)! : null;
    reasons.push({
      code: n.item_id ? 'ncr_open' : 'lot_ncr_open',
      message: n.item_id
        ? `${n.number} is open on ${serial}.`
        : `${n.number} is open on lot ${n.lot_code}, which went into this unit.`,
      serial,
      link: `/ncrs/${n.number}`,
    });
  }
  checks.push({
    label: 'No NCR is open on the unit, its parts, their cores or its lots',
    ok: !openNcrs.length,
    link: null,
  });

  // the state of what is in it: a closed NCR can leave a scrapped part or a returned lot behind
  const held = new Set(openNcrs.map((n) => n.item_id));
  const badParts = items.filter(
    (i) => (i.depth <= 1 && i.status === 'scrapped') || (i.status === 'on_hold' && !held.has(i.id)),
  );
  for (const p of badParts) {
    const what = PART_KIND_LABELS[p.kind as keyof typeof PART_KIND_LABELS].toLowerCase();
    reasons.push({
      code: p.status === 'scrapped' ? 'part_scrapped' : 'part_on_hold',
      message:
        p.status === 'scrapped'
          ? `${p.serial} (${what}) has been scrapped: replace it before the unit ships.`
          : `${p.serial} (${what}) is on hold.`,
      serial: p.serial,
      link: itemLink(p.serial),
    });
  }
  checks.push({ label: 'Nothing in the unit is scrapped or on hold', ok: !badParts.length, link: null });
  const lots = await sequelize.query<{ lot_code: string; status: string; kind: string }>(
    `SELECT pl.lot_code, pl.status, pl.part_kind AS kind FROM unit_lots ul JOIN part_lots pl ON pl.id = ul.part_lot_id
      WHERE ul.unit_item_id = :unit AND pl.status <> 'usable' ORDER BY ul.id`,
    { type: QueryTypes.SELECT, replacements: { unit: unit.id }, transaction },
  );
  for (const l of lots) {
    reasons.push({
      code: 'lot_unusable',
      message: `Lot ${l.lot_code} (${l.kind.replace(/_/g, ' ')}) in this unit ${LOT_STATUS_WORDS[l.status] ?? `is ${l.status}`}: replace those parts before it ships.`,
      serial: null,
      link: `/lots/${encodeURIComponent(l.lot_code)}`,
    });
  }
  checks.push({ label: 'Every lot in the unit is usable', ok: !lots.length, link: null });

  // a plant names its own stages: the run test is the required stage its route marks as one, and a
  // route without one cannot release (a unit is not shipped untested because a route forgot it)
  const [marked] = await sequelize.query<{ any: boolean }>(
    `SELECT EXISTS (SELECT 1 FROM route_stages rs JOIN stages s ON s.id = rs.stage_id
                     WHERE rs.route_id = :route AND rs.required AND s.run_test) AS any`,
    { type: QueryTypes.SELECT, replacements: { route: unit.routeId ?? 0 }, transaction },
  );
  if (!marked?.any) {
    reasons.push({
      code: 'run_test',
      message: `${unit.serial}: its route has no required stage marked as the unit's run test; quality marks one on the Process page before it can ship.`,
      serial: unit.serial,
      link: itemLink(unit.serial),
    });
  }
  const runTestOk =
    !!marked?.any && !gaps.some((g) => g.item_id === unit.id && g.run_test && !(g.verdict === 'fail' && g.accepted));
  checks.push({ label: 'The run test passed', ok: runTestOk, link: itemLink(unit.serial) });

  const live = await Shipment.findOne({ where: { unitItemId: unit.id, returnedAt: null }, transaction });
  if (live) {
    reasons.unshift({
      code: 'shipped',
      message: `${unit.serial} has already shipped (${live.reference}).`,
      serial: unit.serial,
      link: itemLink(unit.serial),
    });
  }
  checks.push({ label: 'Not already shipped', ok: !live, link: null });
  // back from the field under a warranty claim: it ships again only once rebuilt (its shipment ended)
  if (unit.status === 'returned') {
    reasons.unshift({
      code: 'returned',
      message: `${unit.serial} came back from the field under a warranty claim: it waits for its teardown.`,
      serial: unit.serial,
      link: itemLink(unit.serial),
    });
  }
  return { serial: unit.serial, releasable: reasons.length === 0, reasons, checks };
}

export function warrantyOf(shipDate: string, months: number, km: number | null, today: string): WarrantyJson {
  const cover = warrantyCover({ startsOn: shipDate, months, km }, today);
  return {
    months,
    km,
    startsOn: shipDate,
    endsOn: cover.endsOn,
    inWarranty: cover.covered,
    daysLeft: cover.daysLeft,
    reason: cover.reason,
  };
}

export async function presentShipment(s: Shipment, transaction?: Transaction): Promise<ShipmentJson> {
  const [customer, by, plant] = await Promise.all([
    s.customerId ? Customer.findByPk(s.customerId, { transaction }) : null,
    User.findByPk(s.releasedById, { attributes: ['name'], transaction }),
    plantSettings(transaction),
  ]);
  const shipDate = s.shipDate ?? dateIn(plant.timeZone, s.shippedAt);
  return {
    customer: customer ? { code: customer.code, name: customer.name } : null,
    reference: s.reference,
    carrier: s.carrier,
    shipDate,
    releasedBy: by?.name ?? '',
    releasedAt: s.shippedAt.toISOString(),
    warranty: warrantyOf(shipDate, s.warrantyMonths ?? 0, s.warrantyKm, dateIn(plant.timeZone, new Date())),
  };
}

export async function checkUnit(sequelize: Sequelize, serial: string) {
  return releaseCheck(sequelize, await findBySerial(serial));
}

export async function releaseUnit(sequelize: Sequelize, ctx: Ctx, serial: string, body: ReleaseBody) {
  return sequelize.transaction(async (transaction) => {
    const found = await findBySerial(serial, transaction);
    const unit = (await Item.findByPk(found.id, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const check = await releaseCheck(sequelize, unit, transaction);
    if (!check.releasable) {
      throw new AppError(
        'not_releasable',
        `${unit.serial} cannot ship yet: ${check.reasons.map((r) => r.message).join(' ')}`,
        undefined,
        {
          reasons: check.reasons,
        },
      );
    }
    const customer = await Customer.findByPk(body.customerId, { transaction });
    if (!customer) throw invalid('Choose a customer on file.', { customerId: 'Unknown customer.' });
    // the plant's calendar: not after today there, nor before the unit's last result
    const plant = await plantSettings(transaction);
    const today = dateIn(plant.timeZone, new Date());
    if (body.shipDate > today) {
      throw invalid(`The ship date cannot be after today (${today} at the plant).`, {
        shipDate: `Not after ${today}.`,
      });
    }
    const [last] = await sequelize.query<{ at: Date | null }>(
      'SELECT max(finished_at) AS at FROM stage_results WHERE item_id = :id',
      { type: QueryTypes.SELECT, replacements: { id: unit.id }, transaction },
    );
    const earliest = last?.at ? dateIn(plant.timeZone, new Date(last.at)) : null;
    if (earliest && body.shipDate < earliest) {
      throw invalid(`The ship date cannot be before the unit's last result, on ${earliest}.`, {
        shipDate: `Not before ${earliest}, the day of its last result.`,
      });
    }
    const family = (await EngineFamily.findByPk(unit.engineFamilyId, { transaction }))!;
    const { user, signature } = await signWithPassword(ctx, transaction, {
      entity: 'item',
      entityId: unit.serial,
      meaning: RELEASE_MEANING,
      reason: `Order ${body.reference} for ${customer.name}`,
      password: body.password,
      refused: 'the unit was not released.',
    });
    const warrantyEnd = warrantyEndsOn(body.shipDate, family.warrantyMonths);
    const shipment = await Shipment.create(
      {
        unitItemId: unit.id,
        customerId: customer.id,
        reference: body.reference,
        carrier: body.carrier || null,
        shippedAt: new Date(),
        releasedById: ctx.actor!.id,
        warrantyEndsOn: warrantyEnd,
        warrantyKm: family.warrantyKm,
        shipDate: body.shipDate,
        warrantyMonths: family.warrantyMonths,
        returnedAt: null,
      },
      { transaction },
    );
    const before = { status: unit.status };
    // the release's own event below carries the move, with the checks and the signature
    await moveItemQuietly(transaction, unit, { status: 'shipped', currentStageId: null });
    await recordAudit(ctx, transaction, {
      action: 'unit.released',
      entity: 'item',
      entityId: unit.serial,
      before,
      after: {
        status: 'shipped',
        customer: customer.code,
        reference: body.reference,
        shipDate: body.shipDate,
        warrantyEndsOn: warrantyEnd,
        checks: check.checks,
        signature: { printedName: user.name, meaning: signature.meaning, signedAt: signature.signedAt.toISOString() },
      },
    });
    return { check, shipment: await presentShipment(shipment, transaction) };
  });
}

/**
 * After an NCR closes or is voided: when the part sits in a finished unit that now passes the
 * gate, tell shipping it can go. Runs in the NCR step's transaction.
 */
export async function notifyIfReleasable(sequelize: Sequelize, itemId: number, transaction: Transaction) {
  const item = await Item.findByPk(itemId, { transaction });
  if (!item) return;
  let unit: Item | null = item.kind === 'long_block' ? item : null;
  if (!unit) {
    const [row] = await sequelize.query<{ parent_item_id: number }>(
      `SELECT parent_item_id FROM item_links WHERE child_item_id = :id AND link_type = 'installed_in' AND removed_at IS NULL`,
      { type: QueryTypes.SELECT, replacements: { id: itemId }, transaction },
    );
    unit = row ? await Item.findByPk(row.parent_item_id, { transaction }) : null;
  }
  if (!unit || unit.status !== 'finished') return;
  const check = await releaseCheck(sequelize, unit, transaction);
  if (!check.releasable) return;
  const shipping = await User.findAll({
    where: { role: 'shipping', active: true },
    attributes: ['email'],
    transaction,
  });
  await enqueueMail(
    transaction,
    shipping.map((u) => ({
      to: u.email,
      subject: `${unit.serial} can ship: nothing holds it any more`,
      text: [
        `The hold on ${unit.serial} has been cleared and it passes every check of the release gate.`,
        '',
        `Release it: ${appLink(`/release?serial=${unit.serial}`)}`,
        '',
        '— Coretrail',
      ].join('\n'),
      reason: 'unit.releasable',
    })),
  );
}
