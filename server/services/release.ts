import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type {
  BlockingReason,
  ReleaseBody,
  ReleaseCheckJson,
  ShipmentJson,
  WarrantyJson,
} from '../../shared/schemas/build.js';
import { PART_KIND_LABELS } from '../../shared/schemas/reference.js';
import { recordAudit, type Ctx } from '../audit.js';
import { AppError, invalid } from '../errors.js';
import { appLink } from '../mail/links.js';
import { enqueueMail } from '../mail/messages.js';
import { Customer, EngineFamily, Item, Shipment, User } from '../models/index.js';
import { findBySerial } from './items.js';

/**
 * The release gate. A long block may ship only when it and every part in its genealogy has a
 * current passing result at every required stage of its route (a failure accepted by a closed
 * use-as-is NCR counts as passed), no NCR on any of them or on a lot that went in is open, and the
 * run test passed. Release locks the unit's row and checks again inside the lock; every path that
 * raises an NCR on a part takes the same lock first, so no NCR can slip in between.
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
    verdict: string | null;
    accepted: boolean;
  }>(
    `SELECT i.id AS item_id, s.code AS stage_code, s.name AS stage_name, cur.verdict,
            EXISTS (SELECT 1 FROM nonconformances n WHERE n.stage_result_id = cur.id AND n.state = 'closed'
                     AND n.disposition = 'use_as_is') AS accepted
       FROM items i
       JOIN routes ro ON ro.id = i.route_id
       JOIN route_stages rs ON rs.route_id = ro.id AND rs.required
       JOIN stages s ON s.id = rs.stage_id
       LEFT JOIN LATERAL (
         SELECT r.id, r.verdict FROM stage_results r
          WHERE r.item_id = i.id AND r.stage_id = s.id
            AND NOT EXISTS (SELECT 1 FROM stage_results x WHERE x.supersedes_id = r.id)
          ORDER BY r.finished_at DESC, r.id DESC LIMIT 1) cur ON true
      WHERE i.id IN (:ids) AND (cur.verdict IS DISTINCT FROM 'pass')
      ORDER BY i.id, rs.position`,
    { type: QueryTypes.SELECT, replacements: { ids: manufactured.map((i) => i.id) }, transaction },
  );
  for (const g of gaps) {
    if (g.verdict === 'fail' && g.accepted) continue;
    const serial = serialOf.get(g.item_id)!;
    reasons.push({
      code: g.stage_code === 'run-test' ? 'run_test' : g.verdict ? 'stage_failed' : 'stage_missing',
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

  const runTestOk = !gaps.some(
    (g) => g.item_id === unit.id && g.stage_code === 'run-test' && !(g.verdict === 'fail' && g.accepted),
  );
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
  return { serial: unit.serial, releasable: reasons.length === 0, reasons, checks };
}

export function warrantyOf(shipDate: string, months: number, km: number | null, today = new Date()): WarrantyJson {
  const start = new Date(`${shipDate}T00:00:00Z`);
  const end = new Date(start);
  end.setUTCMonth(end.getUTCMonth() + months);
  const day = new Date(`${today.toISOString().slice(0, 10)}T00:00:00Z`);
  const daysLeft = Math.round((end.getTime() - day.getTime()) / 86_400_000);
  return {
    months,
    km,
    startsOn: shipDate,
    endsOn: end.toISOString().slice(0, 10),
    inWarranty: daysLeft > 0 && day >= start,
    daysLeft: Math.max(0, daysLeft),
  };
}

export async function presentShipment(s: Shipment, transaction?: Transaction): Promise<ShipmentJson> {
  const [customer, by] = await Promise.all([
    s.customerId ? Customer.findByPk(s.customerId, { transaction }) : null,
    User.findByPk(s.releasedById, { attributes: ['name'], transaction }),
  ]);
  const shipDate = s.shipDate ?? s.shippedAt.toISOString().slice(0, 10);
  return {
    customer: customer ? { code: customer.code, name: customer.name } : null,
    reference: s.reference,
    carrier: s.carrier,
    shipDate,
    releasedBy: by?.name ?? '',
    releasedAt: s.shippedAt.toISOString(),
    warranty: warrantyOf(shipDate, s.warrantyMonths ?? 0, s.warrantyKm),
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
        409,
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
    const latest = new Date(Date.now() + 14 * 3600_000).toISOString().slice(0, 10);
    if (body.shipDate > latest)
      throw invalid('The ship date cannot be in the future.', { shipDate: 'Not in the future.' });
    const family = (await EngineFamily.findByPk(unit.engineFamilyId, { transaction }))!;
    const warranty = warrantyOf(body.shipDate, family.warrantyMonths, family.warrantyKm);
    const shipment = await Shipment.create(
      {
        unitItemId: unit.id,
        customerId: customer.id,
        reference: body.reference,
        carrier: body.carrier || null,
        shippedAt: new Date(),
        releasedById: ctx.actor!.id,
        warrantyEndsOn: warranty.endsOn,
        warrantyKm: family.warrantyKm,
        shipDate: body.shipDate,
        warrantyMonths: family.warrantyMonths,
        returnedAt: null,
      },
      { transaction },
    );
    const before = { status: unit.status };
    await unit.update({ status: 'shipped', currentStageId: null }, { transaction });
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
        warrantyEndsOn: warranty.endsOn,
        checks: check.checks,
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
