import { Op, QueryTypes, UniqueConstraintError, type Sequelize, type Transaction } from 'sequelize';
import { RUN_TEST_ON_UNIT } from '../../shared/schemas/process.js';
import type {
  CastingNumberBody,
  CastingNumberJson,
  CharacteristicBody,
  CharacteristicJson,
  PartKindBody,
  PartKindJson,
  ProcessStageJson,
  StageBody,
  UpdateStageBody,
} from '../../shared/schemas/process.js';
import { recordAudit, type Ctx } from '../audit.js';
import { conflict, invalid, notFound } from '../errors.js';
import {
  Characteristic,
  DefectCode,
  EngineFamily,
  FamilyCastingNumber,
  PartKindRow,
  Stage,
  Station,
} from '../models/index.js';

/**
 * The plant's own part kinds, stages, characteristics and casting numbers. Nothing in use is
 * deleted: a row is retired, and every change writes its audit event in the same transaction.
 * Routes, which are versions under change control, are in process-routes.ts.
 */

const taken = (what: string) => (e: unknown) => {
  if (e instanceof UniqueConstraintError) throw conflict(`${what} is already taken.`);
  throw e;
};

export const presentPartKind = (k: PartKindRow): PartKindJson => ({
  code: k.code,
  name: k.name,
  serialized: k.serialized,
  builtIn: k.builtIn,
  retired: !!k.retiredAt,
});

export async function listPartKinds() {
  const rows = await PartKindRow.findAll({
    order: [
      ['sortOrder', 'ASC'],
      ['code', 'ASC'],
    ],
  });
  return rows.map(presentPartKind);
}

export async function partKindInUse(code: string, transaction: Transaction) {
  const kind = await PartKindRow.findByPk(code, { transaction });
  if (!kind || kind.retiredAt) {
    throw invalid(`There is no part kind "${code}" in use.`, { partKind: 'Unknown or retired part kind.' });
  }
  return kind;
}

export async function createPartKind(sequelize: Sequelize, ctx: Ctx, body: PartKindBody) {
  return sequelize.transaction(async (transaction) => {
    const kind = await PartKindRow.create(body, { transaction }).catch(taken(`The part kind code ${body.code}`));
    await recordAudit(ctx, transaction, {
      action: 'part_kind.created',
      entity: 'part_kind',
      entityId: kind.code,
      after: presentPartKind(kind),
    });
    return presentPartKind(kind);
  });
}

export async function updatePartKind(
  sequelize: Sequelize,
  ctx: Ctx,
  code: string,
  body: { name?: string; serialized?: boolean; retired?: boolean },
) {
  return sequelize.transaction(async (transaction) => {
    const kind = await PartKindRow.findByPk(code, { transaction, lock: transaction.LOCK.UPDATE });
    if (!kind) throw notFound('That part kind');
    if (kind.builtIn && (body.retired || body.serialized === false)) {
      throw conflict(`${kind.name} is one the build and teardown work with: it stays in use and serialized.`);
    }
    const before = presentPartKind(kind);
    const { retired, ...rest } = body;
    await kind.update(
      { ...rest, ...(retired === undefined ? {} : { retiredAt: retired ? (kind.retiredAt ?? new Date()) : null }) },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: retired ? 'part_kind.retired' : 'part_kind.updated',
      entity: 'part_kind',
      entityId: kind.code,
      before,
      after: presentPartKind(kind),
    });
    return presentPartKind(kind);
  });
}

export function presentProcessStage(s: Stage, stations: Station[]): ProcessStageJson {
  return {
    id: s.id,
    code: s.code,
    name: s.name,
    partKind: s.partKind,
    caution: s.hazard,
    hazardous: s.hazardous,
    runTest: s.runTest,
    description: s.description,
    retired: !!s.retiredAt,
    stations: stations.filter((st) => st.stageId === s.id).map((st) => st.code),
  };
}

export async function listProcessStages() {
  const [stages, stations] = await Promise.all([
    Stage.findAll({ order: [['id', 'ASC']] }),
    Station.findAll({ where: { active: true }, order: [['code', 'ASC']] }),
  ]);
  return stages.map((s) => presentProcessStage(s, stations));
}

export async function createStage(sequelize: Sequelize, ctx: Ctx, body: StageBody) {
  return sequelize.transaction(async (transaction) => {
    await partKindInUse(body.partKind, transaction);
    const stage = await Stage.create(
      {
        code: body.code,
        name: body.name,
        partKind: body.partKind as Stage['partKind'],
        hazard: body.caution,
        hazardous: body.hazardous,
        runTest: body.runTest,
        description: body.description,
      },
      { transaction },
    ).catch(taken(`The stage code ${body.code}`));
    const json = presentProcessStage(stage, []);
    await recordAudit(ctx, transaction, { action: 'stage.created', entity: 'stage', entityId: stage.id, after: json });
    return json;
  });
}

export async function updateStage(sequelize: Sequelize, ctx: Ctx, id: number, body: UpdateStageBody) {
  return sequelize.transaction(async (transaction) => {
    const stage = await Stage.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!stage) throw notFound('That stage');
    const stations = await Station.findAll({ where: { stageId: stage.id }, transaction });
    const before = presentProcessStage(stage, stations);
    const hazardous = body.hazardous ?? stage.hazardous;
    const cautionText = body.caution !== undefined ? body.caution : stage.hazard;
    if (hazardous && !cautionText) {
      throw invalid('Work that can hurt someone needs a caution for the station screen.', {
        caution: 'Write the caution.',
      });
    }
    if (body.runTest && stage.partKind !== 'long_block') {
      throw invalid(RUN_TEST_ON_UNIT.message, { runTest: RUN_TEST_ON_UNIT.message });
    }
    if (body.retired && !stage.retiredAt) {
      const serving = stations.filter((s) => s.active);
      if (serving.length) {
        throw conflict(
          `Station ${serving.map((s) => s.code).join(', ')} still records this stage: move or retire it first.`,
        );
      }
      const [row] = await sequelize.query<{ n: number }>(
        `SELECT count(*)::int AS n FROM route_stages rs JOIN routes r ON r.id = rs.route_id
          WHERE rs.stage_id = :id AND r.status IN ('approved','draft')`,
        { replacements: { id: stage.id }, transaction, type: QueryTypes.SELECT },
      );
      if (row && row.n > 0) {
        throw conflict('A route in force or in draft still goes through this stage: change the route first.');
      }
    }
    await stage.update(
      {
        ...(body.name !== undefined ? { name: body.name } : {}),
        ...(body.description !== undefined ? { description: body.description } : {}),
        hazard: cautionText,
        hazardous,
        ...(body.runTest === undefined ? {} : { runTest: body.runTest }),
        ...(body.retired === undefined ? {} : { retiredAt: body.retired ? (stage.retiredAt ?? new Date()) : null }),
      },
      { transaction },
    );
    const after = presentProcessStage(stage, stations);
    await recordAudit(ctx, transaction, {
      action: body.retired ? 'stage.retired' : 'stage.updated',
      entity: 'stage',
      entityId: stage.id,
      before,
      after,
    });
    return after;
  });
}

export function presentCharacteristic(c: Characteristic, stages: Map<number, Stage>): CharacteristicJson {
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
  };
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
  return rows.map((c) => presentCharacteristic(c, byId));
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
