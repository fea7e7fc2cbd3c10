import { Op, type Sequelize, type Transaction } from 'sequelize';
import type { CastingNumberBody, CastingNumberJson } from '../../../shared/schemas/process.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, notFound } from '../../errors.js';
import { EngineFamily, FamilyCastingNumber } from '../../models/index.js';
import { partKindInUse } from './part-kinds.js';
import { taken } from './taken.js';

/** The casting numbers each family accepts, and intake's warning on one it does not. */

const presentCasting = (r: FamilyCastingNumber, family: string): CastingNumberJson => ({
  id: r.id,
  family,
  castingNumber: r.castingNumber,
  partKind: r.partKind,
  note: r.note,
  retired: !!r.retiredAt,
});

async function familyOf(code: string, transaction?: Transaction) {
  const family = await EngineFamily.findOne({ where: { code }, transaction });
  if (!family) throw notFound(`Engine family ${code}`);
  return family;
}

export async function listCastingNumbers(familyCode: string) {
  const family = await familyOf(familyCode);
  const rows = await FamilyCastingNumber.findAll({
    where: { engineFamilyId: family.id },
    order: [['castingNumber', 'ASC']],
  });
  return rows.map((r) => presentCasting(r, family.code));
}

export async function addCastingNumber(sequelize: Sequelize, ctx: Ctx, familyCode: string, body: CastingNumberBody) {
  return sequelize.transaction(async (transaction) => {
    const family = await familyOf(familyCode, transaction);
    await partKindInUse(body.partKind, transaction);
    const row = await FamilyCastingNumber.create({ engineFamilyId: family.id, ...body }, { transaction }).catch(
      taken(`Casting number ${body.castingNumber} for ${family.code}`),
    );
    const json = presentCasting(row, family.code);
    await recordAudit(ctx, transaction, {
      action: 'casting_number.added',
      entity: 'family_casting_number',
      entityId: row.id,
      after: json,
    });
    return json;
  });
}

export async function retireCastingNumber(sequelize: Sequelize, ctx: Ctx, id: number) {
  return sequelize.transaction(async (transaction) => {
    const row = await FamilyCastingNumber.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw notFound('That casting number');
    if (row.retiredAt) throw conflict(`Casting number ${row.castingNumber} is already retired.`);
    const family = (await EngineFamily.findByPk(row.engineFamilyId, { transaction }))!;
    const before = presentCasting(row, family.code);
    await row.update({ retiredAt: new Date() }, { transaction });
    const json = presentCasting(row, family.code);
    await recordAudit(ctx, transaction, {
      action: 'casting_number.retired',
      entity: 'family_casting_number',
      entityId: row.id,
      before,
      after: json,
    });
    return json;
  });
}

/**
 * Intake's warning: the family lists the casting numbers it accepts and this is not one of them
 * (naming the family that does list it, if any). A family with no list warns on nothing.
 */
export async function castingNotAccepted(castingNumber: string, family: EngineFamily): Promise<string[]> {
  const number = castingNumber.trim().toUpperCase();
  const rows = await FamilyCastingNumber.findAll({
    where: {
      retiredAt: null,
      [Op.or]: [{ engineFamilyId: family.id }, { castingNumber: number }],
    },
  });
  const own = rows.filter((r) => r.engineFamilyId === family.id);
  if (!own.length || own.some((r) => r.castingNumber === number)) return [];
  const elsewhere = rows.filter((r) => r.castingNumber === number).map((r) => r.engineFamilyId);
  const names = elsewhere.length
    ? (await EngineFamily.findAll({ where: { id: elsewhere } })).map((f) => f.code).join(', ')
    : '';
  return [
    `Casting number ${number} is not one ${family.code} accepts${names ? `; ${names} lists it` : ''}. Check the family chosen.`,
  ];
}
