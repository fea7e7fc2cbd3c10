import { Op, QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { HoldJson } from '../../shared/schemas/results.js';
import { recordAudit, type Ctx } from '../audit.js';
import { DefectCode, Nonconformance, NonconformanceTransition } from '../models/index.js';
import type { Severity } from '../models/nonconformances.js';

/** Coretrail's NCR states. An NCR that is neither closed nor voided holds its item. */
export const NCR_STATES = ['raised', 'in_review', 'decided', 'closed', 'voided'] as const;
export type NcrState = (typeof NCR_STATES)[number];
export const NCR_STATE_LABELS: Record<NcrState, string> = {
  raised: 'Raised',
  in_review: 'In review',
  decided: 'Decided',
  closed: 'Closed',
  voided: 'Voided',
};
export const OPEN_NCR_STATES: NcrState[] = ['raised', 'in_review', 'decided'];

export async function openNcrsOf(itemId: number, transaction?: Transaction): Promise<HoldJson[]> {
  const rows = await Nonconformance.findAll({
    where: { itemId, state: { [Op.in]: OPEN_NCR_STATES } },
    order: [['id', 'ASC']],
    transaction,
  });
  return rows.map((n) => ({ number: n.number, state: n.state, description: n.description }));
}

/** NC-2026-00042: the year it was raised and a plant-wide running number. */
async function nextNumber(sequelize: Sequelize, transaction: Transaction) {
  const [row] = await sequelize.query<{ n: string }>("SELECT nextval('nonconformance_number_seq')::text AS n", {
    type: QueryTypes.SELECT,
    transaction,
  });
  return `NC-${new Date().getUTCFullYear()}-${row!.n.padStart(5, '0')}`;
}

export type FailingReading = {
  characteristic: string;
  name: string;
  position: string;
  positionLabel: string;
  value: number | null;
  passed: boolean | null;
  unit: string | null;
  lower: number | null;
  upper: number | null;
  reason: string;
  ruleVersion: number | null;
  location: string | null;
};

/**
 * Raises an NCR inside the caller's transaction (the failing result's, or a concern raised by hand),
 * with its first transition and an audit event.
 */
export async function raiseNonconformance(
  sequelize: Sequelize,
  ctx: Ctx,
  transaction: Transaction,
  input: {
    itemId: number;
    itemSerial: string;
    stageId: number | null;
    stageResultId: number | null;
    severity: Severity;
    defectCode: string | null;
    description: string;
    failing: FailingReading[];
  },
): Promise<Nonconformance> {
  const defect = input.defectCode ? await DefectCode.findOne({ where: { code: input.defectCode }, transaction }) : null;
  const ncr = await Nonconformance.create(
    {
      number: await nextNumber(sequelize, transaction),
      itemId: input.itemId,
      partLotId: null,
      stageResultId: input.stageResultId,
      stageId: input.stageId,
      defectCodeId: defect?.id ?? null,
      severity: input.severity,
      state: 'raised',
      description: input.description,
      failing: input.failing,
      disposition: null,
      dispositionReason: null,
      reworkStageId: null,
      raisedById: ctx.actor!.id,
      assigneeId: null,
      closedAt: null,
    },
    { transaction },
  );
  await NonconformanceTransition.create(
    {
      nonconformanceId: ncr.id,
      fromState: null,
      toState: 'raised',
      actorId: ctx.actor!.id,
      reason: input.stageResultId ? 'Raised by a failing station result' : 'Raised by hand',
    },
    { transaction },
  );
  await recordAudit(ctx, transaction, {
    action: 'ncr.raised',
    entity: 'nonconformance',
    entityId: ncr.number,
    after: {
      item: input.itemSerial,
      severity: ncr.severity,
      defectCode: defect?.code ?? null,
      stageResultId: ncr.stageResultId,
      description: ncr.description,
      failing: input.failing,
    },
  });
  return ncr;
}
