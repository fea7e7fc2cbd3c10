import { Op } from 'sequelize';
import type { Role } from '../../../shared/roles.js';
import { type NcrDetail, type NcrState } from '../../../shared/schemas/ncr.js';
import { type Ctx } from '../../audit.js';
import {
  DefectCode,
  Item,
  NonconformanceTransition,
  PartLot,
  Signature,
  Stage,
  StageResult,
  Station,
  Supplier,
  User,
} from '../../models/index.js';
import { attachmentsOf } from '../attachments.js';
import { presentItem } from '../items.js';
import { ncrTimeline } from '../ncr-timeline.js';
import { presentSignature } from '../signatures.js';
import { ncrActionsOpen } from '../../../shared/domain/ncr-lifecycle.js';
import type { FailingReading } from './raise.js';
import { findNcr } from './steps.js';

export async function ncrDetail(number: string, ctx: Ctx): Promise<NcrDetail> {
  const ncr = await findNcr(number);
  const lot = ncr.partLotId
    ? await PartLot.findByPk(ncr.partLotId, { include: [{ model: Supplier, as: 'supplier' }] })
    : null;
  const [transitions, signatures, ownPhotos, resultPhotos, item, stage, reworkStage, defect, origin] =
    await Promise.all([
      NonconformanceTransition.findAll({ where: { nonconformanceId: ncr.id }, order: [['id', 'ASC']] }),
      Signature.findAll({ where: { entity: 'nonconformance', entityId: ncr.number }, order: [['id', 'ASC']] }),
      attachmentsOf('nonconformance', ncr.number),
      // the evidence taken with the failing result belongs to the NCR too
      ncr.stageResultId ? attachmentsOf('stage_result', ncr.stageResultId) : [],
      ncr.itemId ? Item.findByPk(ncr.itemId) : null,
      ncr.stageId ? Stage.findByPk(ncr.stageId) : null,
      ncr.reworkStageId ? Stage.findByPk(ncr.reworkStageId) : null,
      ncr.defectCodeId ? DefectCode.findByPk(ncr.defectCodeId) : null,
      ncr.stageResultId
        ? StageResult.findByPk(ncr.stageResultId, {
            include: [
              { model: Stage, as: 'stage', attributes: ['name'] },
              { model: Station, as: 'station', attributes: ['name'] },
              { model: User, as: 'operator', attributes: ['name'] },
            ],
          })
        : null,
    ]);
  const userIds = [
    ...new Set([ncr.raisedById, ncr.assigneeId, ncr.decidedById, ...transitions.map((t) => t.actorId)]),
  ].filter((x): x is number => x !== null);
  const users = new Map(
    (await User.findAll({ where: { id: { [Op.in]: userIds } }, attributes: ['id', 'name'] })).map((u) => [
      u.id,
      u.name,
    ]),
  );
  const presented = item ? await presentItem(item) : null;
  const o = origin as (StageResult & { stage?: Stage; station?: Station | null; operator?: User }) | null;
  const timeline = ncrTimeline(
    transitions.map((t) => ({
      at: t.createdAt,
      from: t.fromState as NcrState | null,
      to: t.toState as NcrState,
      actor: users.get(t.actorId) ?? '',
      reason: t.reason,
    })),
    signatures,
  );
  return {
    number: ncr.number,
    state: ncr.state as NcrState,
    severity: ncr.severity,
    lotCode: lot?.lotCode ?? null,
    awaitingSecondSignature: ncr.awaitingSecondSignature,
    assigneeId: ncr.assigneeId,
    lot: lot
      ? {
          lotCode: lot.lotCode,
          partNumber: lot.partNumber,
          kind: lot.partKind,
          supplier: (lot as PartLot & { supplier?: Supplier }).supplier?.name ?? '',
          status: lot.status,
        }
      : null,
    serial: item?.serial ?? null,
    itemKind: item?.kind ?? null,
    familyCode: presented?.family.code ?? null,
    stageCode: stage?.code ?? null,
    stageName: stage?.name ?? null,
    defectCode: defect?.code ?? null,
    description: ncr.description,
    disposition: ncr.disposition,
    raisedBy: users.get(ncr.raisedById) ?? '',
    assignee: ncr.assigneeId ? (users.get(ncr.assigneeId) ?? null) : null,
    raisedAt: ncr.createdAt.toISOString(),
    ageDays: Math.floor((Date.now() - ncr.createdAt.getTime()) / 86_400_000),
    failing: ncr.failing as FailingReading[],
    containment: ncr.containment,
    dispositionReason: ncr.dispositionReason,
    reworkStage: reworkStage ? { code: reworkStage.code, name: reworkStage.name } : null,
    decidedById: ncr.decidedById,
    decidedBy: ncr.decidedById ? (users.get(ncr.decidedById) ?? null) : null,
    decidedAt: ncr.decidedAt?.toISOString() ?? null,
    closedAt: ncr.closedAt?.toISOString() ?? null,
    stageResultId: ncr.stageResultId,
    origin: o
      ? {
          stageName: o.stage?.name ?? '',
          stationName: o.station?.name ?? null,
          operator: o.operator?.name ?? '',
          finishedAt: o.finishedAt.toISOString(),
        }
      : null,
    item: presented,
    timeline,
    signatures: signatures.map(presentSignature),
    photos: [...resultPhotos, ...ownPhotos],
    allowed: ncrActionsOpen(ncr, ctx.actor?.role as Role | undefined, ctx.actor?.id),
  };
}
