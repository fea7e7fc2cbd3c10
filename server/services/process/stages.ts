import { QueryTypes, type Sequelize } from 'sequelize';
import { RUN_TEST_ON_UNIT } from '../../../shared/schemas/process.js';
import type { ProcessStageJson, StageBody, UpdateStageBody } from '../../../shared/schemas/process.js';
import { recordAudit, type Ctx } from '../../audit.js';
import { conflict, invalid, notFound } from '../../errors.js';
import { Stage, Station } from '../../models/index.js';
import { partKindInUse } from './part-kinds.js';
import { taken } from './taken.js';

/** The plant's stages: a stage a station or a route still uses is not retired. */

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
