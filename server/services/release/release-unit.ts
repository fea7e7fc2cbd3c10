import { QueryTypes, type Sequelize } from 'sequelize';
import { dateIn, warrantyEndsOn } from '../../../shared/domain/warranty.js';
import { RELEASE_MEANING, type ReleaseBody } from '../../../shared/schemas/release.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { AppError, invalid } from '../../errors.js';
import { Customer, EngineFamily, Item, Shipment } from '../../models/index.js';
import { moveItemQuietly } from '../item-moves.js';
import { findBySerial } from '../items.js';
import { plantSettings } from '../plant.js';
import { signWithPassword } from '../signatures.js';
import { releaseCheck } from './check.js';
import { presentShipment } from './shipment.js';

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
