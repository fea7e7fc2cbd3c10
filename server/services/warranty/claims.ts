import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { Paged } from '../../../shared/schemas/common.js';
import { PART_KIND_LABELS } from '../../../shared/schemas/reference.js';
import { dateIn, warrantyCover } from '../../../shared/domain/warranty.js';
import type {
  ClaimListQuery,
  ClaimState,
  ClaimSummaryJson,
  CoverageJson,
  CoverageQuery,
  logClaimBody,
} from '../../../shared/schemas/warranty.js';
import type { z } from 'zod';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, invalid } from '../../errors.js';
import { enqueueMail, quoted } from '../../mail/messages.js';
import { Customer, EngineFamily, Shipment, WarrantyClaim } from '../../models/index.js';
import { findBySerial } from '../items.js';
import { plantSettings } from '../plant.js';
import { signWithPassword } from '../signatures.js';
import { lockUnitsReachedBy } from '../unit-locks.js';
import { claimDetail } from './claim-detail.js';
import { claimLink, daysBetween, nextStep, shipDateOf } from './common.js';
import { addressesOf } from './people.js';

/**
 * Claims as the warranty desk logs them: by the unit's serial, with the customer, the day it
 * failed, the distance or hours, the symptom and the installer. Coverage is worked out at once from
 * the shipment's own terms (warrantyCover: calendar months clamped to the month's end, the end day
 * covered, the distance limit, whichever comes first) and kept with the claim as it was said.
 */

type LogClaim = z.output<typeof logClaimBody>;

async function nextNumber(sequelize: Sequelize, transaction: Transaction) {
  const [row] = await sequelize.query<{ n: string }>("SELECT nextval('warranty_claim_number_seq')::text AS n", {
    type: QueryTypes.SELECT,
    transaction,
  });
  return `WC-${new Date().getUTCFullYear()}-${row!.n.padStart(5, '0')}`;
}

/** The unit behind a serial, and its shipment now in the field; refusals say why in words. */
async function shippedUnit(serialInput: string, transaction?: Transaction) {
  const item = await findBySerial(serialInput, transaction);
  if (item.kind !== 'long_block') {
    throw invalid(
      `${item.serial} is a ${PART_KIND_LABELS[item.kind].toLowerCase()}: a claim is logged on the serial of the engine that shipped.`,
      { serial: 'Use the long block’s serial.' },
    );
  }
  const shipment = await Shipment.findOne({ where: { unitItemId: item.id, returnedAt: null }, transaction });
  if (!shipment) {
    throw conflict(
      item.status === 'returned' || item.status === 'torn_down'
        ? `${item.serial} is back at the plant under an earlier claim.`
        : `${item.serial} has not shipped, so it carries no warranty yet.`,
      { reason: 'not_shipped' },
    );
  }
  const family = (await EngineFamily.findByPk(item.engineFamilyId, { transaction }))!;
  return { item, shipment, family };
}

function coverOf(shipment: Shipment, family: EngineFamily, shipDate: string, failedOn: string, km: number | null) {
  return warrantyCover(
    { startsOn: shipDate, months: shipment.warrantyMonths ?? family.warrantyMonths, km: shipment.warrantyKm },
    failedOn,
    { km },
  );
}

function checkFailureDay(failedOn: string, shipDate: string, today: string) {
  if (failedOn > today) {
    throw invalid(`The failure date cannot be after today (${today} at the plant).`, {
      failedOn: `Not after ${today}.`,
    });
  }
  if (failedOn < shipDate) {
    throw invalid(`The unit shipped on ${shipDate}: it cannot have failed in service before that.`, {
      failedOn: `Not before ${shipDate}, its ship date.`,
    });
  }
}

/** Whether the unit is covered on that day at that distance, before anything is written. */
export async function claimCoverage(q: CoverageQuery): Promise<CoverageJson> {
  const { item, shipment, family } = await shippedUnit(q.serial);
  const plant = await plantSettings();
  const shipDate = shipDateOf(shipment, plant.timeZone);
  checkFailureDay(q.failedOn, shipDate, dateIn(plant.timeZone, new Date()));
  const cover = coverOf(shipment, family, shipDate, q.failedOn, q.km ?? null);
  const customer = shipment.customerId ? await Customer.findByPk(shipment.customerId) : null;
  return {
    unit: { serial: item.serial, familyCode: family.code, familyName: family.name, status: item.status },
    shipment: {
      reference: shipment.reference,
      shipDate,
      customer: customer ? { id: customer.id, code: customer.code, name: customer.name } : null,
    },
    covered: cover.covered,
    reason: cover.reason,
    endsOn: cover.endsOn,
    months: shipment.warrantyMonths ?? family.warrantyMonths,
    km: shipment.warrantyKm,
    daysInService: daysBetween(shipDate, q.failedOn),
  };
}

/** The desk logs a claim: signed, audited and mailed to receiving (who will take the unit back). */
export async function logClaim(sequelize: Sequelize, ctx: Ctx, body: LogClaim) {
  const number = await sequelize.transaction(async (transaction) => {
    const found = await findBySerial(body.serial, transaction);
    // the lock protocol: the unit first, as a release or a return of it takes it
    await lockUnitsReachedBy(sequelize, { itemId: found.id }, transaction);
    const { item, shipment, family } = await shippedUnit(found.serial, transaction);
    const open = await WarrantyClaim.findOne({
      where: { unitItemId: item.id, state: ['received', 'torn_down', 'decided'] },
      transaction,
    });
    if (open) {
      throw conflict(`${open.number} is still open on ${item.serial}: add to it, or close it first.`, {
        reason: 'claim_open',
        claim: open.number,
      });
    }
    const customer = await Customer.findByPk(body.customerId, { transaction });
    if (!customer) throw invalid('Choose a customer on file.', { customerId: 'Unknown customer.' });
    const plant = await plantSettings(transaction);
    const shipDate = shipDateOf(shipment, plant.timeZone);
    checkFailureDay(body.failedOn, shipDate, dateIn(plant.timeZone, new Date()));
    const cover = coverOf(shipment, family, shipDate, body.failedOn, body.distanceKm);
    const number = await nextNumber(sequelize, transaction);
    const { user } = await signWithPassword(ctx, transaction, {
      entity: 'warranty_claim',
      entityId: number,
      meaning: `Logged warranty claim ${number} on ${item.serial}`,
      reason: `${customer.name}: ${body.symptom}`.slice(0, 500),
      password: body.password,
      refused: 'the claim was not logged.',
    });
    const claim = await WarrantyClaim.create(
      {
        number,
        unitItemId: item.id,
        shipmentId: shipment.id,
        customerId: customer.id,
        customerReference: body.customerReference,
        failedOn: body.failedOn,
        distanceKm: body.distanceKm,
        hours: body.hours,
        symptom: body.symptom,
        installer: body.installer,
        covered: cover.covered,
        coverageReason: cover.reason,
        warrantyEndsOn: cover.endsOn,
        unitReturnedAt: null,
        returnedById: null,
        tornDownAt: null,
        tornDownById: null,
        decision: null,
        decisionReason: null,
        decidedById: null,
        decidedAt: null,
        closedById: null,
        closedAt: null,
        openedById: user.id,
      },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'warranty_claim.received',
      entity: 'warranty_claim',
      entityId: number,
      after: {
        unit: item.serial,
        shipment: shipment.reference,
        customer: customer.code,
        failedOn: body.failedOn,
        distanceKm: body.distanceKm,
        hours: body.hours,
        symptom: body.symptom,
        installer: body.installer,
        covered: claim.covered,
        coverageReason: claim.coverageReason,
        signedBy: user.name,
      },
    });
    const receiving = await addressesOf(['receiving'], transaction);
    await enqueueMail(
      transaction,
      receiving.map((to) => ({
        to,
        subject: `Claim ${number}: ${item.serial} is coming back`,
        text: [
          `The warranty desk logged claim ${number} on ${item.serial} (${family.code}, order ${shipment.reference}) for ${customer.name}.`,
          `Coverage: ${cover.reason}`,
          '',
          'What the customer reports:',
          quoted(body.symptom),
          '',
          `When the unit arrives, take it back against the claim: ${claimLink(number)}`,
          '',
          '— Coretrail',
        ].join('\n'),
        reason: 'warranty_claim.received',
      })),
    );
    return number;
  });
  return claimDetail(sequelize, number);
}

type ListRow = {
  number: string;
  state: ClaimState;
  demo: boolean;
  serial: string;
  family: string;
  customer: string;
  failed_on: string;
  distance_km: number | null;
  hours: number | null;
  covered: boolean;
  decision: ClaimSummaryJson['decision'];
  returned: boolean;
  created_at: Date;
};

export async function listClaims(sequelize: Sequelize, q: ClaimListQuery): Promise<Paged<ClaimSummaryJson>> {
  const where: string[] = [];
  const r: Record<string, unknown> = {};
  if (q.state === 'open') where.push("c.state <> 'closed'");
  else if (q.state) {
    where.push('c.state = :state');
    r.state = q.state;
  }
  if (q.waiting === 'return') where.push("c.state = 'received' AND c.unit_returned_at IS NULL");
  if (q.waiting === 'teardown') where.push("c.state = 'received' AND c.unit_returned_at IS NOT NULL");
  if (q.waiting === 'decision') where.push("c.state IN ('torn_down','decided')");
  if (q.q) {
    where.push("(c.number ILIKE :q OR u.serial ILIKE :q OR replace(u.serial, '-', '') ILIKE :q OR cu.name ILIKE :q)");
    r.q = `%${q.q.replace(/[\\%_]/g, (ch) => `\\${ch}`)}%`;
  }
  const filter = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const from = `FROM warranty_claims c JOIN items u ON u.id = c.unit_item_id
    JOIN engine_families f ON f.id = u.engine_family_id JOIN customers cu ON cu.id = c.customer_id`;
  const [rows, [count]] = await Promise.all([
    sequelize.query<ListRow>(
      `SELECT c.number, c.state, c.demo, u.serial, f.code AS family, cu.name AS customer,
              to_char(c.failed_on, 'YYYY-MM-DD') AS failed_on, c.distance_km, c.hours, c.covered, c.decision,
              c.unit_returned_at IS NOT NULL AS returned, c.created_at
         ${from} ${filter} ORDER BY c.created_at DESC, c.id DESC LIMIT :limit OFFSET :offset`,
      { type: QueryTypes.SELECT, replacements: { ...r, limit: q.pageSize, offset: (q.page - 1) * q.pageSize } },
    ),
    sequelize.query<{ n: number }>(`SELECT count(*)::int AS n ${from} ${filter}`, {
      type: QueryTypes.SELECT,
      replacements: r,
    }),
  ]);
  return {
    rows: rows.map((x) => ({
      number: x.number,
      state: x.state,
      demo: x.demo,
      unit: { serial: x.serial, familyCode: x.family },
      customer: x.customer,
      failedOn: x.failed_on,
      distanceKm: x.distance_km,
      hours: x.hours === null ? null : Number(x.hours),
      covered: x.covered,
      decision: x.decision,
      unitReturned: x.returned,
      next: nextStep(x.state, x.returned),
      openedAt: new Date(x.created_at).toISOString(),
    })),
    total: count?.n ?? 0,
    page: q.page,
    pageSize: q.pageSize,
  };
}
