import type { Sequelize } from 'sequelize';
import {
  PROCESS_DOCUMENT_FORMAT,
  crossCheck,
  type ProcessDocument,
  type ProcessDocumentInput,
} from '../../../shared/schemas/process-document.js';
import type { PositionScheme } from '../../../shared/domain/positions.js';
import type { CharacteristicBody } from '../../../shared/schemas/process.js';
import { invalid } from '../../errors.js';
import { settleRouteVersions } from './route-clock.js';
import {
  Characteristic,
  EngineFamily,
  FamilyCastingNumber,
  PartKindRow,
  Route,
  RouteStage,
  Stage,
} from '../../models/index.js';

const num = (v: unknown) => (v === null || v === undefined ? null : Number(v));

/** The plant's process definition as one document: what is in use, and the route versions in force. */
export async function exportProcessDocument(): Promise<ProcessDocumentInput> {
  await settleRouteVersions(Route.sequelize!);
  const [kinds, families, stages, characteristics, routes, castings] = await Promise.all([
    PartKindRow.findAll({ where: { retiredAt: null }, order: [['sortOrder', 'ASC']] }),
    EngineFamily.findAll({ order: [['code', 'ASC']] }),
    Stage.findAll({ where: { retiredAt: null }, order: [['id', 'ASC']] }),
    Characteristic.findAll({
      where: { retiredAt: null },
      order: [
        ['stageId', 'ASC'],
        ['sortOrder', 'ASC'],
      ],
    }),
    Route.findAll({ where: { active: true }, order: [['id', 'ASC']] }),
    FamilyCastingNumber.findAll({ where: { retiredAt: null }, order: [['id', 'ASC']] }),
  ]);
  const steps = await RouteStage.findAll({ where: { routeId: routes.map((r) => r.id) }, order: [['position', 'ASC']] });
  const allStages = new Map((await Stage.findAll()).map((s) => [s.id, s.code]));
  const familyCode = new Map(families.map((f) => [f.id, f.code]));
  return {
    format: PROCESS_DOCUMENT_FORMAT,
    version: 1,
    exportedAt: new Date().toISOString(),
    partKinds: kinds.map((k) => ({ code: k.code, name: k.name, serialized: k.serialized })),
    families: families.map((f) => ({
      code: f.code,
      name: f.name,
      description: f.description,
      layout: f.layout,
      cylinders: f.cylinders,
      boreMm: Number(f.boreMm),
      strokeMm: Number(f.strokeMm),
      headsPerEngine: f.headsPerEngine,
      warrantyMonths: f.warrantyMonths,
      warrantyKm: f.warrantyKm,
      active: f.active,
    })),
    stages: stages.map((s) => ({
      code: s.code,
      partKind: s.partKind,
      name: s.name,
      caution: s.hazard,
      hazardous: s.hazardous,
      runTest: s.runTest,
      description: s.description,
    })),
    // derived characteristics are computed by the product's own formulas: they travel with the code
    characteristics: characteristics
      .filter((c) => c.kind !== 'derived')
      .map((c) => ({
        stage: allStages.get(c.stageId)!,
        code: c.code,
        name: c.name,
        kind: c.kind as 'variable' | 'attribute',
        unit: c.unit,
        resolution: num(c.resolution),
        positions: c.positions as Exclude<PositionScheme, never>,
        critical: c.critical,
        optional: c.optional,
        defectCode: c.defectCode,
        gaugeKinds: c.gaugeKinds,
        matesWith: (c.matesWith ?? null) as CharacteristicBody['matesWith'],
        physicalMin: num(c.physicalMin),
        physicalMax: num(c.physicalMax),
        help: c.help,
      })),
    routes: routes.map((r) => ({
      family: familyCode.get(r.engineFamilyId)!,
      partKind: r.partKind,
      note: r.note,
      steps: steps
        .filter((s) => s.routeId === r.id)
        .map((s) => ({
          stage: allStages.get(s.stageId)!,
          required: s.required,
          reworkTo: s.reworkToStageId ? allStages.get(s.reworkToStageId)! : null,
        })),
    })),
    castingNumbers: castings.map((c) => ({
      family: familyCode.get(c.engineFamilyId)!,
      castingNumber: c.castingNumber,
      partKind: c.partKind,
      note: c.note,
    })),
  };
}

/**
 * Checks a document against the plant without changing anything: its shape was checked on the way
 * in (a 400 listing every field), and here every reference it makes. Replies with what an import
 * would add; a bad document is a 400 listing every problem by its path.
 */
export async function checkProcessDocument(_sequelize: Sequelize, doc: ProcessDocument) {
  const [kinds, families, stages] = await Promise.all([
    PartKindRow.findAll({ where: { retiredAt: null }, attributes: ['code'] }),
    EngineFamily.findAll({ attributes: ['code'] }),
    Stage.findAll({ where: { retiredAt: null }, attributes: ['code', 'partKind'] }),
  ]);
  const problems = crossCheck(doc, {
    partKinds: kinds.map((k) => k.code),
    families: families.map((f) => f.code),
    stages: stages.map((s) => ({ code: s.code, partKind: s.partKind })),
  });
  if (problems.length) {
    throw invalid(
      `The document has ${problems.length} problem${problems.length > 1 ? 's' : ''}; nothing was changed.`,
      Object.fromEntries(problems.map((p) => [p.path, p.message])),
    );
  }
  const knownKinds = new Set(kinds.map((k) => k.code));
  const knownFamilies = new Set(families.map((f) => f.code));
  const knownStages = new Set(stages.map((s) => s.code));
  return {
    ok: true,
    new: {
      partKinds: doc.partKinds.filter((k) => !knownKinds.has(k.code)).length,
      families: doc.families.filter((f) => !knownFamilies.has(f.code)).length,
      stages: doc.stages.filter((s) => !knownStages.has(s.code)).length,
    },
    routes: doc.routes.length,
    characteristics: doc.characteristics.length,
    castingNumbers: doc.castingNumbers.length,
  };
}
