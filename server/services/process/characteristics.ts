import type { Sequelize } from 'sequelize';
import type { CharacteristicBody, CharacteristicJson } from '../../../shared/schemas/process.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, invalid, notFound } from '../../errors.js';
import { Characteristic, CharacteristicVersion, DefectCode, Stage, User } from '../../models/index.js';
import { taken } from './taken.js';

/** What a stage measures or checks; a change to one in use goes through characteristic-versions.ts. */

type ChangeDraft = CharacteristicJson['changeDraft'];

export function presentCharacteristic(
  c: Characteristic,
  stages: Map<number, Stage>,
  drafts: Map<number, ChangeDraft> = new Map(),
): CharacteristicJson {
  return {
    id: c.id,
    stage: stages.get(c.stageId)?.code ?? '',
    code: c.code,
    name: c.name,
    kind: c.kind,
    unit: c.unit,
    resolution: c.resolution === null ? null : Number(c.resolution),
    positions: c.positions as CharacteristicJson['positions'],
    critical: c.critical,
    optional: c.optional,
    defectCode: c.defectCode,
    gaugeKinds: c.gaugeKinds,
    matesWith: c.matesWith ?? null,
    retired: !!c.retiredAt,
    changeDraft: drafts.get(c.id) ?? null,
  };
}

/** The drafted changes waiting for approval, per characteristic (one at most each). */
async function changeDrafts(): Promise<Map<number, ChangeDraft>> {
  const rows = await CharacteristicVersion.findAll({ where: { status: 'draft' } });
  const ids = [...new Set(rows.map((r) => r.createdById).filter((x): x is number => !!x))];
  const names = new Map(
    (await User.findAll({ where: { id: ids }, attributes: ['id', 'name'] })).map((u) => [u.id, u.name]),
  );
  return new Map(
    rows.map((r) => [
      r.characteristicId,
      {
        id: r.id,
        version: r.version,
        note: r.note,
        createdById: r.createdById,
        createdBy: r.createdById ? (names.get(r.createdById) ?? null) : null,
      },
    ]),
  );
}

export async function listCharacteristics(stageCode?: string) {
  const stages = await Stage.findAll();
  const byId = new Map(stages.map((s) => [s.id, s]));
  const stage = stageCode ? stages.find((s) => s.code === stageCode) : undefined;
  if (stageCode && !stage) throw notFound('That stage');
  const rows = await Characteristic.findAll({
    where: stage ? { stageId: stage.id } : {},
    order: [
      ['stageId', 'ASC'],
      ['sortOrder', 'ASC'],
      ['id', 'ASC'],
    ],
  });
  const drafts = await changeDrafts();
  return rows.map((c) => presentCharacteristic(c, byId, drafts));
}

export async function createCharacteristic(sequelize: Sequelize, ctx: Ctx, body: CharacteristicBody) {
  return sequelize.transaction(async (transaction) => {
    const stage = await Stage.findOne({ where: { code: body.stage }, transaction });
    if (!stage || stage.retiredAt) throw invalid('Choose a stage in use.', { stage: 'Unknown or retired stage.' });
    if (body.defectCode) {
      const code = await DefectCode.findOne({ where: { code: body.defectCode, active: true }, transaction });
      if (!code) throw invalid(`There is no defect code ${body.defectCode} in use.`, { defectCode: 'Unknown code.' });
    }
    const last = (await Characteristic.max('sortOrder', { where: { stageId: stage.id }, transaction })) as
      number | null;
    const c = await Characteristic.create(
      {
        stageId: stage.id,
        code: body.code,
        name: body.name,
        kind: body.kind,
        unit: body.unit,
        resolution: body.resolution,
        positions: body.positions,
        derivation: null,
        critical: body.critical,
        optional: body.optional,
        sortOrder: (last ?? 0) + 1,
        physicalMin: body.physicalMin,
        physicalMax: body.physicalMax,
        defectCode: body.defectCode,
        help: body.help,
        gaugeKinds: body.gaugeKinds,
        matesWith: body.matesWith,
      },
      { transaction },
    ).catch(taken(`The code ${body.code} at ${stage.code}`));
    const json = presentCharacteristic(c, new Map([[stage.id, stage]]));
    await recordAudit(ctx, transaction, {
      action: 'characteristic.created',
      entity: 'characteristic',
      entityId: c.id,
      after: json,
    });
    return json;
  });
}

/** Retired: no station asks for it again; its readings and rules stay, and no rule can be drafted for it. */
export async function retireCharacteristic(sequelize: Sequelize, ctx: Ctx, id: number, reason: string) {
  return sequelize.transaction(async (transaction) => {
    const c = await Characteristic.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!c) throw notFound('That characteristic');
    if (c.retiredAt) throw conflict(`${c.name} is already retired.`);
    const stage = (await Stage.findByPk(c.stageId, { transaction }))!;
    const stages = new Map([[stage.id, stage]]);
    const before = presentCharacteristic(c, stages);
    await c.update({ retiredAt: new Date() }, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'characteristic.retired',
      entity: 'characteristic',
      entityId: c.id,
      before,
      after: { ...presentCharacteristic(c, stages), reason },
    });
    return presentCharacteristic(c, stages);
  });
}
