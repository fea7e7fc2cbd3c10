import type { Sequelize } from 'sequelize';
import type {
  CreateStationBody,
  EngineFamily as FamilyJson,
  FamilyBody,
  Stage as StageJson,
  Station as StationJson,
  UpdateStationBody,
} from '../../shared/schemas/reference.js';
import { displacementLitres } from '../../shared/domain/geometry.js';
import { recordAudit, type Ctx } from '../audit.js';
import { invalid, notFound } from '../errors.js';
import { EngineFamily, Stage, Station } from '../models/index.js';

export const presentStage = (s: Stage): StageJson => ({
  id: s.id,
  code: s.code,
  name: s.name,
  partKind: s.partKind,
  hazard: s.hazard,
});

export function presentStation(s: Station & { stage?: Stage | null }): StationJson {
  return {
    id: s.id,
    code: s.code,
    name: s.name,
    stageCode: s.stage?.code ?? null,
    stageName: s.stage?.name ?? null,
    location: s.location,
    active: s.active,
  };
}

export function presentFamily(f: EngineFamily): FamilyJson {
  return {
    id: f.id,
    code: f.code,
    name: f.name,
    description: f.description,
    layout: f.layout,
    cylinders: f.cylinders,
    boreMm: f.boreMm,
    strokeMm: f.strokeMm,
    headsPerEngine: f.headsPerEngine,
    warrantyMonths: f.warrantyMonths,
    warrantyKm: f.warrantyKm,
    active: f.active,
    displacementL: Math.round(displacementLitres(f.boreMm, f.strokeMm, f.cylinders) * 100) / 100,
  };
}

export const listStages = async () => (await Stage.findAll({ order: [['id', 'ASC']] })).map(presentStage);

export async function listStations() {
  const rows = await Station.findAll({ include: [{ model: Stage, as: 'stage' }], order: [['code', 'ASC']] });
  return rows.map(presentStation);
}

async function stageIdFor(code: string | null | undefined, transaction: import('sequelize').Transaction) {
  if (code === null || code === undefined) return code;
  const stage = await Stage.findOne({ where: { code }, transaction });
  if (!stage) throw invalid('There is no stage with that code.', { stageCode: 'Unknown stage.' });
  return stage.id;
}

const stationSnapshot = (s: Station) => ({
  code: s.code,
  name: s.name,
  stageId: s.stageId,
  location: s.location,
  active: s.active,
});

export async function createStation(sequelize: Sequelize, ctx: Ctx, body: CreateStationBody) {
  return sequelize.transaction(async (transaction) => {
    const stageId = (await stageIdFor(body.stageCode, transaction)) ?? null;
    const station = await Station.create(
      { code: body.code, name: body.name, stageId, location: body.location ?? '' },
      { transaction },
    );
    await recordAudit(ctx, transaction, {
      action: 'station.created',
      entity: 'station',
      entityId: station.id,
      after: stationSnapshot(station),
    });
    await station.reload({ include: [{ model: Stage, as: 'stage' }], transaction });
    return presentStation(station);
  });
}

export async function updateStation(sequelize: Sequelize, ctx: Ctx, id: number, body: UpdateStationBody) {
  return sequelize.transaction(async (transaction) => {
    const station = await Station.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!station) throw notFound('That station');
    const before = stationSnapshot(station);
    const { stageCode, ...rest } = body;
    const changes: Partial<{ name: string; location: string; active: boolean; stageId: number | null }> = { ...rest };
    if (stageCode !== undefined) changes.stageId = (await stageIdFor(stageCode, transaction)) ?? null;
    await station.update(changes, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'station.updated',
      entity: 'station',
      entityId: station.id,
      before,
      after: stationSnapshot(station),
    });
    await station.reload({ include: [{ model: Stage, as: 'stage' }], transaction });
    return presentStation(station);
  });
}

export const listFamilies = async () => (await EngineFamily.findAll({ order: [['code', 'ASC']] })).map(presentFamily);

export async function createFamily(sequelize: Sequelize, ctx: Ctx, body: FamilyBody) {
  return sequelize.transaction(async (transaction) => {
    const family = await EngineFamily.create(body, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'family.created',
      entity: 'engine_family',
      entityId: family.id,
      after: presentFamily(family),
    });
    return presentFamily(family);
  });
}

export async function updateFamily(sequelize: Sequelize, ctx: Ctx, id: number, body: FamilyBody) {
  return sequelize.transaction(async (transaction) => {
    const family = await EngineFamily.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!family) throw notFound('That engine family');
    const before = presentFamily(family);
    await family.update(body, { transaction });
    await recordAudit(ctx, transaction, {
      action: 'family.updated',
      entity: 'engine_family',
      entityId: family.id,
      before,
      after: presentFamily(family),
    });
    return presentFamily(family);
  });
}
