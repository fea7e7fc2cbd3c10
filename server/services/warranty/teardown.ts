import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { z } from 'zod';
import type { teardownClaimBody } from '../../../shared/schemas/warranty.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, invalid } from '../../errors.js';
import { enqueueMail, quoted } from '../../mail/messages.js';
import { CauseCode, Item, ItemLink, WarrantyFinding, type User, type WarrantyClaim } from '../../models/index.js';
import type { TeardownMeasurement } from '../../models/warranty.js';
import { claimUploads } from '../attachments.js';
import { moveItem, moveItemQuietly } from '../item-moves.js';
import { checkedSerial } from '../items.js';
import { signWithPassword } from '../signatures.js';
import { builtRecords, lotsOfUnit, partsAtShipment } from './claim-detail.js';
import { lockClaim, refuseStep } from './claim-steps.js';
import { claimDetail } from './claim-detail.js';
import { claimLink } from './common.js';
import { addressesOf } from './people.js';

type Teardown = z.output<typeof teardownClaimBody>;

/**
 * The returned unit torn down like a core: each finding recorded against the part (or the unit
 * itself, or a purchased lot) it concerns, with a cause code of the plant's own and what teardown
 * measured, checked against what was measured on that part when it was built (the same
 * characteristic, at one of the positions it was read at). The parts are taken out of the unit
 * (their links ended, kept, with the claim as the reason) and wait as returned parts; the unit is
 * torn down. One signed transaction; every problem in the findings is reported at once.
 */
export async function tearDownReturnedUnit(sequelize: Sequelize, ctx: Ctx, number: string, body: Teardown) {
  await sequelize.transaction(async (transaction) => {
    const claim = await lockClaim(sequelize, number, transaction, { unit: true });
    if (claim.state !== 'received') refuseStep(claim, 'torn down', ['received']);
    if (!claim.unitReturnedAt) {
      throw conflict(`The unit of ${number} has not come back yet: receiving takes it back first.`, {
        reason: 'not_returned',
      });
    }
    const unit = (await Item.findByPk(claim.unitItemId, { transaction, lock: transaction.LOCK.UPDATE }))!;
    const resolved = await resolveFindings(sequelize, transaction, claim, unit, body);
    const { user } = await signWithPassword(ctx, transaction, {
      entity: 'warranty_claim',
      entityId: number,
      meaning: `Recorded the teardown of ${unit.serial} for claim ${number}`,
      reason: body.notes || `${resolved.length} finding${resolved.length === 1 ? '' : 's'}`,
      password: body.password,
      refused: 'the teardown was not recorded.',
    });
    const summary = await storeFindings(ctx, transaction, claim, resolved, user);
    const { now, parts } = await takePartsOut(sequelize, ctx, transaction, unit, number);
    await moveItem(ctx, transaction, unit, { status: 'torn_down' }, 'item.torn_down', {
      claim: number,
      parts: parts.map((p) => p.serial),
    });
    await claim.update(
      { state: 'torn_down', tornDownAt: now, tornDownById: user.id, teardownNotes: body.notes },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'warranty_claim.torn_down',
      entity: 'warranty_claim',
      entityId: number,
      before: { state: 'received' },
      after: { state: 'torn_down', notes: body.notes, findings: summary, signedBy: user.name },
    });
    await mailTeardown(transaction, { number, unit, user, resolved, notes: body.notes });
  });
  return claimDetail(sequelize, number);
}

type Resolved = {
  f: Teardown['findings'][number];
  cause: CauseCode | undefined;
  itemId: number | null;
  lotId: number | null;
  measurements: TeardownMeasurement[];
};

/** Each finding matched to a part that shipped in the unit (or a lot that went in) and its built records; refused whole on any problem. */
async function resolveFindings(
  sequelize: Sequelize,
  transaction: Transaction,
  claim: WarrantyClaim,
  unit: Item,
  body: Teardown,
): Promise<Resolved[]> {
  const fitted = await partsAtShipment(sequelize, unit.id, claim.shipmentId, transaction);
  const lots = await lotsOfUnit(sequelize, unit.id, transaction);
  const records = await builtRecords(
    sequelize,
    fitted.map((p) => p.item_id),
    transaction,
  );
  const causes = await CauseCode.findAll({
    where: { code: { [Op.in]: body.findings.map((f) => f.causeCode) }, active: true },
    transaction,
  });
  const problems: Record<string, string> = {};
  const resolved = body.findings.map((f, i): Resolved => {
    const at = `findings.${i}`;
    const cause = causes.find((c) => c.code === f.causeCode);
    if (!cause) problems[`${at}.causeCode`] = `No cause code ${f.causeCode} in use.`;
    if (f.lotCode) {
      const lot = lots.find((l) => l.lot_code.toUpperCase() === f.lotCode!.toUpperCase());
      if (!lot) problems[`${at}.lotCode`] = `Lot ${f.lotCode} did not go into ${unit.serial}.`;
      return { f, cause, itemId: null, lotId: lot?.id ?? null, measurements: [] as TeardownMeasurement[] };
    }
    let serial: string | null = null;
    try {
      serial = checkedSerial(f.part!);
    } catch (e) {
      problems[`${at}.part`] = (e as Error).message;
    }
    const part = fitted.find((p) => p.serial === serial);
    if (serial && !part) problems[`${at}.part`] = `${serial} was not in ${unit.serial} when it shipped.`;
    const chars = new Map(part ? records.characteristics(part.item_id).map((c) => [c.code, c]) : []);
    const measurements = f.measurements.map((m, j): TeardownMeasurement => {
      const c = chars.get(m.characteristic);
      if (part && !c) {
        problems[`${at}.measurements.${j}.characteristic`] =
          `${m.characteristic} was not measured on ${part.serial} when it was built.`;
      } else if (c && !c.positions.some((p) => p.code === m.position)) {
        problems[`${at}.measurements.${j}.position`] =
          `${c.name} was measured at ${c.positions.map((p) => p.label).join(', ')}; choose one of them.`;
      }
      return { characteristic: m.characteristic, position: m.position, value: m.value, unit: c?.unit ?? null };
    });
    return { f, cause, itemId: part?.item_id ?? null, lotId: null, measurements };
  });
  if (Object.keys(problems).length) {
    throw invalid(`Nothing was recorded: ${Object.values(problems).join(' ')}`, problems);
  }
  return resolved;
}

/** The findings stored with their photos; what the audit event says of each. */
async function storeFindings(
  ctx: Ctx,
  transaction: Transaction,
  claim: WarrantyClaim,
  resolved: Resolved[],
  user: User,
) {
  const summary: Record<string, unknown>[] = [];
  for (const r of resolved) {
    const finding = await WarrantyFinding.create(
      {
        claimId: claim.id,
        itemId: r.itemId,
        partLotId: r.lotId,
        causeCodeId: r.cause!.id,
        description: r.f.description,
        measurements: r.measurements,
        recordedById: user.id,
      },
      { transaction },
    );
    await claimUploads(ctx, transaction, r.f.photoIds, 'warranty_finding', finding.id);
    summary.push({
      finding: finding.id,
      part: r.f.part ? checkedSerial(r.f.part) : null,
      lot: r.f.lotCode ?? null,
      cause: r.cause!.code,
      description: r.f.description,
      measurements: r.measurements,
      photoIds: r.f.photoIds,
    });
  }
  return summary;
}

/** The parts come out of the unit; a link is ended, never deleted, so the trail keeps what was in it. */
async function takePartsOut(sequelize: Sequelize, ctx: Ctx, transaction: Transaction, unit: Item, number: string) {
  const now = new Date();
  const reason = `Taken out at the teardown of warranty claim ${number}`;
  const links = await ItemLink.findAll({
    where: { parentItemId: unit.id, linkType: 'installed_in', removedAt: null },
    order: [['childItemId', 'ASC']],
    transaction,
  });
  const parts = links.length
    ? await Item.findAll({
        where: { id: { [Op.in]: links.map((l) => l.childItemId) } },
        order: [['id', 'ASC']],
        transaction,
        lock: transaction.LOCK.UPDATE,
      })
    : [];
  await sequelize.query(
    `UPDATE item_links SET removed_at = :now, removed_reason = :reason
      WHERE parent_item_id = :unit AND link_type = 'installed_in' AND removed_at IS NULL`,
    { type: QueryTypes.UPDATE, replacements: { now, reason, unit: unit.id }, transaction },
  );
  for (const part of parts) {
    const before = { status: part.status, installedIn: unit.serial };
    // a part held by an open NCR keeps its hold; the others wait as returned parts
    if (part.status === 'installed') await moveItemQuietly(transaction, part, { status: 'returned' });
    await recordAudit(ctx, transaction, {
      action: 'item.taken_out',
      entity: 'item',
      entityId: part.serial,
      before,
      after: { status: part.status, installedIn: null, reason },
    });
  }
  return { now, parts };
}

async function mailTeardown(
  transaction: Transaction,
  t: { number: string; unit: Item; user: User; resolved: Resolved[]; notes: string },
) {
  const { number, unit, user, resolved } = t;
  const to = await addressesOf(['warranty', 'quality'], transaction);
  const lines = resolved.map(
    (r) =>
      `- ${r.f.part ? checkedSerial(r.f.part) : `lot ${r.f.lotCode}`}: ${r.cause!.code} (${r.cause!.description}) — ${r.f.description.split('\n')[0]}`,
  );
  await enqueueMail(
    transaction,
    to.map((address) => ({
      to: address,
      subject: `Claim ${number}: teardown of ${unit.serial} recorded (${resolved.length} finding${resolved.length === 1 ? '' : 's'})`,
      text: [
        `${user.name} recorded the teardown of ${unit.serial} for claim ${number}:`,
        '',
        ...lines,
        ...(t.notes ? ['', quoted(t.notes)] : []),
        '',
        `Each finding beside what was measured on that part when it was built: ${claimLink(number)}`,
        '',
        '— Coretrail',
      ].join('\n'),
      reason: 'warranty_claim.torn_down',
    })),
  );
}
